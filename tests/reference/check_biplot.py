"""The baseline biplot (GET /v1/baselines/{id}/biplot) against numpy: the principal axes of the reference samples'
clr covariance by numpy.linalg.eigh (the clr principal components, Aitchison 1983, Biometrika 70:57-65; the
compositional biplot, Aitchison & Greenacre 2002, Applied Statistics 51:375-392), the flagged samples' scores
(clr(x) − mean clr) · v_k, and the reference ellipse's semi-axes √(χ²_{J−1}(0.975) λ_k) with scipy.stats.chi2.

With classical scatter (mean, covariance with divisor n − 1) in full-rank coordinates the baseline's clr-form scatter
is exactly np.cov of the reference samples' clr vectors, so the check needs nothing from the service's internals."""
import uuid

import numpy as np
import requests
from scipy.stats import chi2

import reference as ref
import tables
from service import TIMEOUT, ServiceError, assert_close, assert_equal, post_json


def _get_json(base, path):
    response = requests.get(base + path, timeout=TIMEOUT)
    if response.status_code != 200:
        raise ServiceError(f"GET {path}: status {response.status_code}: {response.text[:800]}")
    return response.json()


def check_biplot_axes_and_scores_equal_numpy_eigh_of_the_clr_covariance(base):
    """Variances, axes (up to sign), explained fractions, ellipse and the scores of flagged samples, J = 4 and 6."""
    for k, (n, J) in enumerate([(60, 4), (90, 6)]):
        names = tables.names(J)
        x = tables.positive(7300 + k, n, J, sigma=0.5)
        later = tables.positive(7400 + k, 8, J, sigma=1.5)
        doc = post_json(base, "/v1/baselines", {"name": f"ref-biplot-{uuid.uuid4().hex}", "parts": names,
                                                "rows": x.tolist(), "scatter": "classical"}, expect=201)
        samples = [{"id": f"b{k}-{i}", "values": dict(zip(names, map(float, row)))} for i, row in enumerate(later)]
        results = post_json(base, f"/v1/baselines/{doc['id']}/screenings", {"samples": samples})["results"]
        flagged = [(i, r["flagId"]) for i, r in enumerate(results) if r["flagged"]]
        assert flagged, "the check needs flagged samples"
        answer = _get_json(base, f"/v1/baselines/{doc['id']}/biplot?flags=" + ",".join(f for _, f in flagged))

        c = ref.clr(x)
        mu = c.mean(axis=0)
        S = np.cov(c, rowvar=False, ddof=1)
        w, V = np.linalg.eigh(S)
        order = np.argsort(w)[::-1][: J - 1]
        w, V = w[order], V[:, order]
        scale = w[0]
        assert_close(w, answer["variances"], f"variances J={J}", rel=1e-9, abs_=1e-12 * scale)
        assert_close(np.trace(S), answer["totalVariance"], "trace", rel=1e-9)
        assert_close(w[:2] / np.trace(S), answer["explained"], "explained", rel=1e-9)
        coords = np.array(answer["partCoordinates"])
        signs = np.sign(np.sum(V[:, :2] * coords, axis=0))
        assert_close(V[:, :2] * signs, coords, "axes", rel=1e-8, abs_=1e-8)
        threshold = chi2.ppf(0.975, J - 1)
        assert_close(np.sqrt(threshold * w[:2]), answer["ellipse"]["semiAxes"], "ellipse semi-axes", rel=1e-9)

        placed = answer["samples"]
        assert_equal([f for _, f in flagged], [s["flagId"] for s in placed], "flags in the order asked")
        rows = np.array([later[i] for i, _ in flagged])
        scores = (ref.clr(rows) - mu) @ V
        assert_close(scores[:, :2] * signs, [s["scores"] for s in placed], "scores", rel=1e-8, abs_=1e-8 * np.sqrt(scale))
        assert_close(np.sum(scores ** 2 / w, axis=1), [s["squaredDistance"] for s in placed], "d² from all axes", rel=1e-8)
        assert_close([results[i]["squaredDistance"] for i, _ in flagged], [s["squaredDistance"] for s in placed],
                     "d² as screened", rel=1e-8)
