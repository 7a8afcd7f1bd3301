"""POST /v1/compositions/prepare: closure to a total and the zero policies (API.md, compute table)."""
import numpy as np

import reference as ref
import tables
from service import assert_close, assert_equal, post_json


def _table_body(x, parts, ids=None, **options):
    body = {"parts": parts, "rows": x.tolist()}
    if ids is not None:
        body["ids"] = ids
    body.update(options)
    return body


def _answer_rows(answer, parts, n):
    assert_equal(parts, answer["parts"], "parts of the closed table")
    rows = np.asarray(answer["rows"], dtype=float)
    assert_equal((n, len(parts)), rows.shape, "shape of the closed table")
    return rows


def _check_imputed(answer, expected, parts, rows, what):
    """`imputed` lists exactly the replaced cells, each with the value now in the returned table."""
    listed = answer.get("imputed")
    if listed is None:
        raise AssertionError(f"{what}: no `imputed` list in the answer")
    index = {p: j for j, p in enumerate(parts)}
    got = {}
    for item in listed:
        j = item["part"] if isinstance(item["part"], int) else index[item["part"]]
        got[(int(item["row"]), j)] = float(item["value"])
    assert_equal(sorted((i, j) for i, j, _ in expected), sorted(got), f"{what}: replaced cells")
    for (i, j), value in got.items():
        assert_close(rows[i, j], value, f"{what}: imputed value at row {i}, part {parts[j]} against the table")


def check_closure_to_one_by_default(base):
    """Closure C(x) = x / sum(x) (Aitchison 1986) on tables of several sizes, default total 1."""
    for k, (n, J) in enumerate(tables.SIZES):
        x = tables.positive(100 + k, n, J)
        parts = tables.names(J)
        answer = post_json(base, "/v1/compositions/prepare", _table_body(x, parts, tables.ids(n)))
        rows = _answer_rows(answer, parts, n)
        assert_close(ref.closure(x), rows, f"closure n={n} J={J}")
        assert_equal(tables.ids(n), answer.get("ids"), "ids echoed")
        assert_equal([], answer.get("imputed", []), "nothing imputed without zeros")


def check_closure_to_a_given_total(base):
    """Closure to kappa = 100 and 1e6 (Aitchison 1986)."""
    for total in (100.0, 1e6):
        x = tables.positive(200, 20, 6)
        parts = tables.names(6)
        answer = post_json(base, "/v1/compositions/prepare", _table_body(x, parts, total=total))
        assert_close(ref.closure(x, total), _answer_rows(answer, parts, 20), f"closure to {total}")


def check_zero_under_default_reject_policy_is_a_422_pointing_at_the_cell(base):
    """API.md: a zero under `reject` (the default) is a 422 problem with a JSON pointer /rows/i/j."""
    x = tables.positive(300, 4, 5)
    x[2, 3] = 0.0
    problem = post_json(base, "/v1/compositions/prepare", _table_body(x, tables.names(5)), expect=422)
    assert_equal("/problems/zero-value", problem.get("type"), "problem type")
    pointers = [e.get("pointer") for e in problem.get("errors", [])]
    if "/rows/2/3" not in pointers:
        raise AssertionError(f"errors should point at /rows/2/3, got {pointers}")


def check_multiplicative_replacement_with_a_limit_per_part(base):
    """Multiplicative replacement with a detectionLimits map (Martín-Fernández et al. 2003), fraction 0.65 by default."""
    for k, (n, J) in enumerate(tables.SIZES):
        x, limits = tables.with_zeros(400 + k, n, J)
        parts = tables.names(J)
        zeros = {"method": "multiplicative", "detectionLimits": {p: float(limits[j]) for j, p in enumerate(parts)}}
        answer = post_json(base, "/v1/compositions/prepare", _table_body(x, parts, zeros=zeros))
        replaced, imputed = ref.multiplicative_replacement(x, limits, 0.65)
        expected = ref.closure(replaced)
        rows = _answer_rows(answer, parts, n)
        assert_close(expected, rows, f"multiplicative n={n} J={J}")
        _check_imputed(answer, imputed, parts, rows, f"multiplicative n={n} J={J}")


def check_multiplicative_replacement_with_a_partial_map_and_a_fraction(base):
    """A map naming only the parts that have zeros, fraction 0.5, closed to 100 (Martín-Fernández et al. 2003)."""
    J, n = 9, 50
    x, limits = tables.with_zeros(500, n, J, rate=0.15, zero_parts=[2, 7])
    parts = tables.names(J)
    partial = np.full(J, np.nan)
    partial[[2, 7]] = limits[[2, 7]]
    zeros = {"method": "multiplicative", "detectionLimits": {parts[2]: float(limits[2]), parts[7]: float(limits[7])}, "fraction": 0.5}
    answer = post_json(base, "/v1/compositions/prepare", _table_body(x, parts, zeros=zeros, total=100))
    replaced, imputed = ref.multiplicative_replacement(x, partial, 0.5)
    rows = _answer_rows(answer, parts, n)
    assert_close(ref.closure(replaced, 100), rows, "multiplicative, partial map")
    _check_imputed(answer, imputed, parts, rows, "multiplicative, partial map")


def check_multiplicative_replacement_with_one_limit_for_all_parts(base):
    """detectionLimits as a single number (API.md), fraction 0.8 (Martín-Fernández et al. 2003)."""
    J, n = 6, 30
    x, limits = tables.with_zeros(600, n, J, rate=0.1)
    limit = float(limits.min())
    parts = tables.names(J)
    zeros = {"method": "multiplicative", "detectionLimits": limit, "fraction": 0.8}
    answer = post_json(base, "/v1/compositions/prepare", _table_body(x, parts, zeros=zeros))
    replaced, imputed = ref.multiplicative_replacement(x, np.full(J, limit), 0.8)
    rows = _answer_rows(answer, parts, n)
    assert_close(ref.closure(replaced), rows, "multiplicative, one limit")
    _check_imputed(answer, imputed, parts, rows, "multiplicative, one limit")


def check_multiplicative_replacement_keeps_ratios_among_non_zero_parts(base):
    """Martín-Fernández et al. (2003): ratios among non-zero parts of a row are preserved exactly."""
    J, n = 8, 40
    x, limits = tables.with_zeros(700, n, J, rate=0.12)
    parts = tables.names(J)
    zeros = {"method": "multiplicative", "detectionLimits": {p: float(limits[j]) for j, p in enumerate(parts)}}
    rows = np.asarray(post_json(base, "/v1/compositions/prepare", _table_body(x, parts, zeros=zeros))["rows"])
    for i in range(n):
        nz = np.flatnonzero(x[i] > 0)
        assert_close(np.log(x[i, nz] / x[i, nz[0]]), np.log(rows[i, nz] / rows[i, nz[0]]), f"log-ratios of row {i}")


def check_bayesian_multiplicative_replacement_with_each_prior(base):
    """Bayesian-multiplicative replacement of count zeros, four priors (Martín-Fernández et al. 2015, Table 1)."""
    for prior in ("bayes-laplace", "jeffreys", "perks", "square-root"):
        for k, (n, J) in enumerate([(12, 4), (40, 7), (25, 12), (1, 5)]):
            x = tables.counts(800 + k, n, J)
            parts = tables.names(J)
            zeros = {"method": "bayesian-multiplicative", "prior": prior}
            answer = post_json(base, "/v1/compositions/prepare", _table_body(x, parts, zeros=zeros, total=100))
            replaced, imputed = ref.bayesian_multiplicative(x, prior)
            rows = _answer_rows(answer, parts, n)
            assert_close(ref.closure(replaced, 100), rows, f"{prior} n={n} J={J}")
            _check_imputed(answer, imputed, parts, rows, f"{prior} n={n} J={J}")


def check_bayesian_multiplicative_refuses_non_integer_rows(base):
    """API.md: `bayesian-multiplicative` takes integer rows only (a 422 problem otherwise)."""
    x = tables.counts(900, 5, 4)
    x[1, 2] += 0.5
    post_json(base, "/v1/compositions/prepare",
              _table_body(x, tables.names(4), zeros={"method": "bayesian-multiplicative", "prior": "perks"}), expect=422)
