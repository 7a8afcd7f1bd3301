"""POST /v1/ratio-sets/evaluate and /v1/ratio-sets/reconstruct, and /v1/coordinates/inverse with type ratios, against
numpy and scipy (ratio_set_reference.py; Greenacre 2019; Gower 1975; Greenacre 2020)."""
import json
import pathlib
import subprocess
import sys

import numpy as np

import reference as ref
import tables
from service import ServiceError, assert_close, assert_equal, post_json

HERE = pathlib.Path(__file__).resolve().parent


def _reference(x, w, ratios):
    out = subprocess.run([sys.executable, str(HERE / "ratio_set_reference.py")], input=json.dumps({"values": x.tolist(), "weights": list(w), "ratios": ratios}),
                         capture_output=True, text=True, check=True)
    return json.loads(out.stdout)


def _named(ratios, parts):
    return [{"num": [parts[j] for j in r["num"]], "den": [parts[j] for j in r["den"]], "kind": r["kind"]} for r in ratios]


def check_evaluate_against_least_squares_and_scipy_procrustes(base):
    """explained, explainedAlone and uniqueContribution by numpy.linalg.lstsq; Procrustes as sqrt(1 - disparity) of
    scipy.spatial.procrustes with zero padding; mixed pairwise, amalgamation and balance ratios."""
    sets = [
        (6, [{"num": [0], "den": [1], "kind": "pairwise"}, {"num": [2, 3], "den": [4], "kind": "amalgamation"}, {"num": [0, 5], "den": [2], "kind": "balance"}]),
        (5, [{"num": [0], "den": [1], "kind": "pairwise"}, {"num": [1], "den": [2], "kind": "pairwise"}, {"num": [3], "den": [4], "kind": "pairwise"}]),
        (8, [{"num": [0, 1], "den": [2, 3], "kind": "amalgamation"}, {"num": [4], "den": [5], "kind": "pairwise"}, {"num": [6], "den": [0, 7], "kind": "balance"}, {"num": [4], "den": [6], "kind": "pairwise"}]),
    ]
    for k, (J, ratios) in enumerate(sets):
        x = tables.positive(6000 + k, 40, J)
        parts = tables.names(J)
        for weights in ("equal", "mean"):
            w = np.full(J, 1.0 / J) if weights == "equal" else (x / x.sum(axis=1, keepdims=True)).mean(axis=0)
            answer = post_json(base, "/v1/ratio-sets/evaluate", {"parts": parts, "rows": x.tolist(), "ratios": _named(ratios, parts), "weights": weights})
            r = _reference(x, w, ratios)
            what = f"set {k} {weights}"
            assert_close(r["explained"], answer["explained"], "explained " + what, rel=1e-9, abs_=1e-9)
            assert_close(r["alone"], [p["explainedAlone"] for p in answer["perRatio"]], "alone " + what, rel=1e-9, abs_=1e-9)
            assert_close(r["unique"], [p["uniqueContribution"] for p in answer["perRatio"]], "unique " + what, rel=1e-8, abs_=1e-8)
            assert_close(r["procrustes"][-1], answer["procrustes"], "procrustes " + what, rel=1e-8, abs_=1e-8)
            assert_equal(len(ratios), answer["rank"], "rank " + what)


def _tree(rng, J):
    order = rng.permutation(J)
    return [(int(order[i]), int(order[rng.integers(i)])) for i in range(1, J)]


def check_reconstruct_of_a_spanning_tree_and_of_amalgamations(base):
    """Forward pairwise ratios of a random spanning tree give back C(x) (Greenacre 2020); so do ratios of
    amalgamations that determine the parts, solved in numpy with numpy.linalg.solve for comparison."""
    rng = np.random.default_rng(6100)
    for k, (n, J) in enumerate([(5, 3), (20, 6), (40, 10)]):
        x = tables.positive(6100 + k, n, J)
        parts = tables.names(J)
        edges = _tree(rng, J)
        ratios = [{"num": [parts[p]], "den": [parts[q]]} for p, q in edges]
        values = np.column_stack([ref.pairwise(x, p, q) for p, q in edges])
        answer = post_json(base, "/v1/ratio-sets/reconstruct", {"parts": parts, "ratios": ratios, "rows": values.tolist(), "total": 100.0})
        assert_close(ref.closure(x, 100.0), answer["rows"], f"tree reconstruct n={n} J={J}", rel=1e-9)
        inverse = post_json(base, "/v1/coordinates/inverse", {"parts": parts, "transform": {"type": "ratios", "ratios": ratios}, "rows": values.tolist(), "total": 100.0})
        assert_close(answer["rows"], inverse["rows"], f"coordinates/inverse = reconstruct n={n} J={J}", rel=1e-12, abs_=1e-12)
    # (p1+p2)/p3, p1/p2, (p3+p4)/p5, p4/p5 for J = 5, checked against the linear system solved by numpy.
    x = tables.positive(6150, 12, 5)
    parts = tables.names(5)
    spec = [([0, 1], [2]), ([0], [1]), ([2, 3], [4]), ([3], [4])]
    ratios = [{"num": [parts[j] for j in a], "den": [parts[j] for j in b], "kind": "amalgamation" if len(a) + len(b) > 2 else "pairwise"} for a, b in spec]
    values = np.column_stack([np.log(x[:, a].sum(axis=1) / x[:, b].sum(axis=1)) for a, b in spec])
    answer = post_json(base, "/v1/ratio-sets/reconstruct", {"parts": parts, "ratios": ratios, "rows": values.tolist()})
    expected = []
    for row in values:
        A = np.zeros((5, 5))
        for i, (a, b) in enumerate(spec):
            A[i, a] = 1.0
            A[i, b] = -np.exp(row[i])
        A[4, :] = 1.0
        expected.append(np.linalg.solve(A, np.r_[np.zeros(4), 1.0]))
    assert_close(np.array(expected), answer["rows"], "amalgamation reconstruct vs numpy.linalg.solve", rel=1e-9)
    assert_close(ref.closure(x), answer["rows"], "amalgamation reconstruct vs C(x)", rel=1e-9)


def check_reconstruct_refuses_incomplete_sets_and_infeasible_values(base):
    """A set with a cycle that misses a part is 422 singular-ratio-set; values that need a negative part are 422
    infeasible-ratio-values at their row (METHODS.md, Back-transform)."""
    parts = tables.names(4)
    cycle = [{"num": ["p1"], "den": ["p2"]}, {"num": ["p2"], "den": ["p3"]}, {"num": ["p3"], "den": ["p1"]}]
    for path, body in [("/v1/ratio-sets/reconstruct", {"parts": parts, "ratios": cycle, "rows": [[0.1, 0.2, -0.3]]}),
                       ("/v1/coordinates/inverse", {"parts": parts, "transform": {"type": "ratios", "ratios": cycle}, "rows": [[0.1, 0.2, -0.3]]})]:
        problem = post_json(base, path, body, expect=422)
        assert_equal("/problems/singular-ratio-set", problem["type"], path + " problem type")
    infeasible = [{"num": ["p1", "p2"], "den": ["p3"], "kind": "amalgamation"}, {"num": ["p1"], "den": ["p3"]}, {"num": ["p4"], "den": ["p3"]}]
    problem = post_json(base, "/v1/ratio-sets/reconstruct", {"parts": parts, "ratios": infeasible, "rows": [[0.0, np.log(2.0), 0.0]]}, expect=422)
    assert_equal("/problems/infeasible-ratio-values", problem["type"], "infeasible problem type")
    assert_equal(["/rows/0"], [e["pointer"] for e in problem["errors"]], "infeasible pointer")
