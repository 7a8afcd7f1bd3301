"""POST /v1/summary: center, variation matrix, total variance, part contributions, clr covariance (API.md)."""
import numpy as np

import reference as ref
import tables
from service import assert_close, assert_equal, post_json


def _summary(base, x, parts, weights=None, zeros=None):
    body = {"parts": parts, "rows": np.asarray(x).tolist()}
    if weights is not None:
        body["weights"] = weights
    if zeros is not None:
        body["zeros"] = zeros
    return post_json(base, "/v1/summary", body)


def _check(answer, x, w, what):
    """Compares every field with numpy, using the divisor the answer states."""
    J = x.shape[1]
    ddof = ref.ddof_of(answer.get("divisor"))
    assert_close(ref.center(x), answer["center"], f"{what}: center (closed geometric mean, Aitchison 1986)")
    T = ref.variation_matrix(x, ddof)
    assert_close(T, answer["variationMatrix"], f"{what}: variation matrix (Aitchison 1986)")
    tv = ref.total_variance(T, w)
    assert_close(tv, answer["totalVariance"], f"{what}: total variance sum_(i<j) w_i w_j T_ij (Greenacre 2019)")
    clr = ref.clr(x, w)
    var_clr = np.var(clr, axis=0, ddof=ddof)
    assert_close(tv, float(np.sum(w * var_clr)), f"{what}: numpy identity TV = sum_j w_j var(clr_j)")
    contributions = np.asarray(answer["partContributions"], dtype=float)
    # A part's contribution is w_j var(clr_j); reported as a fraction of TV (summing to 1) or as variance (to TV).
    if abs(contributions.sum() - 1.0) <= 1e-9:
        assert_close(w * var_clr / tv, contributions, f"{what}: part contributions as fractions of TV")
    else:
        assert_close(w * var_clr, contributions, f"{what}: part contributions w_j var(clr_j)")
    assert_close(np.cov(clr, rowvar=False, ddof=ddof), answer["clrCovariance"], f"{what}: clr covariance (numpy.cov)")
    assert_equal((J, J), np.asarray(answer["clrCovariance"]).shape, f"{what}: clr covariance shape")
    if "weights" in answer:  # the service also reports the part weights it used (normalised to sum 1)
        assert_close(w, answer["weights"], f"{what}: weights used")


def check_summary_with_equal_weights(base):
    """Equal part weights 1/J, several sizes (Aitchison 1986; Greenacre 2019)."""
    for k, (n, J) in enumerate([(2, 3), (6, 4), (15, 5), (40, 7), (25, 8), (9, 10), (120, 12)]):
        x = tables.positive(3000 + k, n, J)
        _check(_summary(base, x, tables.names(J)), x, np.full(J, 1.0 / J), f"equal weights n={n} J={J}")


def check_summary_with_a_weights_map(base):
    """Part weights from a map, normalised to sum 1 (API.md; weighted clr: Greenacre & Lewi 2009)."""
    rng = np.random.default_rng(3100)
    for k, (n, J) in enumerate([(30, 4), (50, 9), (12, 12)]):
        x = tables.positive(3100 + k, n, J)
        parts = tables.names(J)
        raw = rng.uniform(0.1, 3.0, J)
        weights = {p: float(raw[j]) for j, p in enumerate(parts)}
        _check(_summary(base, x, parts, weights=weights), x, ref.normalise_weights(weights, parts), f"weights map n={n} J={J}")


def check_summary_with_mean_weights(base):
    """`mean` weights: the mean closed proportions (Greenacre & Lewi 2009)."""
    x = tables.positive(3200, 45, 7)
    w = ref.closure(x).mean(axis=0)
    _check(_summary(base, x, tables.names(7), weights="mean"), x, w, "mean weights")


def check_summary_after_multiplicative_replacement(base):
    """Summary of a table with zeros replaced multiplicatively (Martín-Fernández et al. 2003)."""
    x, limits = tables.with_zeros(3300, 60, 8)
    parts = tables.names(8)
    zeros = {"method": "multiplicative", "detectionLimits": {p: float(limits[j]) for j, p in enumerate(parts)}}
    replaced, _ = ref.multiplicative_replacement(x, limits)
    _check(_summary(base, x, parts, zeros=zeros), replaced, np.full(8, 1 / 8), "after replacement")
