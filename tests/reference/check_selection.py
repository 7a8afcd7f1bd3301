"""POST /v1/ratio-selection: the stepwise path against its definition (Greenacre 2019, Math. Geosci. 51:649-682),
Procrustes against scipy.spatial.procrustes (Gower 1975), and the path from moments against the path from the table."""
import json
import subprocess
import sys
import pathlib

import numpy as np
from scipy.spatial import procrustes

import tables
from service import assert_close, assert_equal, post_json

HERE = pathlib.Path(__file__).resolve().parent
TOL = 1e-8

# (seed, n, J, amalgamations as part indices)
CASES = [(4100, 30, 5, [[0, 1]]), (4101, 60, 7, [[0, 1], [4, 5, 6]]), (4102, 25, 6, [[2, 3, 4]]), (4103, 80, 8, [[0, 1], [2, 3]])]


def _run(script, payload):
    out = subprocess.run([sys.executable, str(HERE / script)], input=json.dumps(payload), capture_output=True, text=True, check=True)
    return json.loads(out.stdout)


def _body(x, parts, amal):
    return {"parts": parts, "rows": x.tolist(), "amalgamations": {f"a{k}": [parts[j] for j in a] for k, a in enumerate(amal)}}


def _label(p, q, parts, amal):
    names = parts + [f"a{k}" for k in range(len(amal))]
    return f"{names[p]}/{names[q]}"


def _columns(x, amal):
    L = np.log(x)
    return np.column_stack([L] + [np.log(x[:, a].sum(axis=1)) for a in amal])


def check_selection_path_matches_the_naive_refit(base):
    """Every candidate refitted by numpy.linalg.lstsq at every step (ratio_selection_naive.py): the same ratios in the
    same order, and the same cumulative fractions to 1e-8."""
    for seed, n, J, amal in CASES:
        x = tables.positive(seed, n, J)
        parts = tables.names(J)
        answer = post_json(base, "/v1/ratio-selection", _body(x, parts, amal))
        naive = _run("ratio_selection_naive.py", {"values": x.tolist(), "weights": [1.0 / J] * J, "amalgamations": amal, "maxRatios": J - 1, "target": 1.0})
        assert_equal([_label(s["p"], s["q"], parts, amal) for s in naive["steps"]], [s["label"] for s in answer["steps"]], f"path seed={seed}")
        assert_close([s["explained"] for s in naive["steps"]], [s["explained"] for s in answer["steps"]], f"explained seed={seed}", rel=TOL, abs_=TOL)


def check_selection_with_mean_weights_and_exclusions_matches_the_naive_refit(base):
    """The same with mean part weights (Greenacre & Lewi 2009) and an excluded part."""
    for seed, n, J, amal in CASES[:3]:
        x = tables.positive(seed + 50, n, J)
        parts = tables.names(J)
        w = (x / x.sum(axis=1, keepdims=True)).mean(axis=0)
        excluded = [j == J - 1 for j in range(J)]
        amal = [a for a in amal if J - 1 not in a] or amal
        body = dict(_body(x, parts, amal), weights="mean", exclude=[parts[J - 1]])
        answer = post_json(base, "/v1/ratio-selection", body)
        naive = _run("ratio_selection_naive.py", {"values": x.tolist(), "weights": (w / w.sum()).tolist(), "amalgamations": amal,
                                                   "excluded": excluded, "maxRatios": J - 2, "target": 1.0})
        assert_equal([_label(s["p"], s["q"], parts, amal) for s in naive["steps"]], [s["label"] for s in answer["steps"]], f"weighted path seed={seed}")
        assert_close([s["explained"] for s in naive["steps"]], [s["explained"] for s in answer["steps"]], f"weighted explained seed={seed}", rel=TOL, abs_=TOL)


def check_selection_procrustes_is_that_of_scipy(base):
    """Procrustes = sqrt(1 - d), d the disparity of scipy.spatial.procrustes between the weighted clr and the chosen
    ratio columns padded with zero columns to J (Gower 1975; METHODS.md)."""
    for seed, n, J, amal in CASES:
        x = tables.positive(seed, n, J)
        parts = tables.names(J)
        answer = post_json(base, "/v1/ratio-selection", _body(x, parts, amal))
        G = _columns(x, amal)
        L = np.log(x)
        clr = L - L.mean(axis=1, keepdims=True)
        Z = (clr - clr.mean(axis=0)) * np.sqrt(1.0 / J)
        names = parts + [f"a{k}" for k in range(len(amal))]
        cols = []
        for k, step in enumerate(answer["steps"]):
            p, q = (names.index(s) for s in step["label"].split("/"))
            cols.append(G[:, p] - G[:, q])
            B = np.zeros((n, J))
            B[:, : k + 1] = np.column_stack(cols)
            _, _, d = procrustes(Z, B)
            assert_close(np.sqrt(1 - d), step["procrustes"], f"procrustes seed={seed} step {k + 1}", rel=TOL, abs_=TOL)


def check_selection_from_numpy_cov_moments_gives_the_tables_path(base):
    """moments = numpy.cov (ddof 1) of the logs and the amalgamations' log sums (log_moments.py): the same path."""
    for seed, n, J, amal in CASES:
        x = tables.positive(seed, n, J)
        parts = tables.names(J)
        body = _body(x, parts, amal)
        from_table = post_json(base, "/v1/ratio-selection", body)
        m = _run("log_moments.py", {"values": x.tolist(), "amalgamations": amal})
        moments = {"names": parts + list(body["amalgamations"]), "covariance": m["covariance"], "count": m["count"]}
        from_moments = post_json(base, "/v1/ratio-selection", {"moments": moments, "amalgamations": body["amalgamations"]})
        assert_equal([s["label"] for s in from_table["steps"]], [s["label"] for s in from_moments["steps"]], f"moments path seed={seed}")
        assert_close([s["explained"] for s in from_table["steps"]], [s["explained"] for s in from_moments["steps"]], f"moments explained seed={seed}", rel=TOL, abs_=TOL)
        assert_close([s["procrustes"] for s in from_table["steps"]], [s["procrustes"] for s in from_moments["steps"]], f"moments procrustes seed={seed}", rel=TOL, abs_=TOL)


def spark_snippet_moments(x, amalgamations):
    """The Spark snippet's arithmetic, in numpy: the README computes, over a DataFrame of the parts, the count n, the sums
    s_a = sum ln c_a and the cross-products S_ab = sum ln c_a ln c_b of the columns c = (parts, then each amalgamation's
    sum), and then cov_ab = (S_ab - s_a s_b / n) / (n - 1)."""
    logs = np.column_stack([np.log(x)] + [np.log(x[:, a].sum(axis=1)) for a in amalgamations])
    n = logs.shape[0]
    s = logs.sum(axis=0)
    S = logs.T @ logs
    return ((S - np.outer(s, s) / n) / (n - 1)).tolist(), n


def check_selection_from_the_spark_snippets_moments(base):
    """The moments as the README's Spark snippet computes them (sums and cross-products) give the table's path."""
    for seed, n, J, amal in CASES:
        x = tables.positive(seed, n, J)
        parts = tables.names(J)
        body = _body(x, parts, amal)
        from_table = post_json(base, "/v1/ratio-selection", body)
        covariance, count = spark_snippet_moments(x, amal)
        assert_close(np.cov(_columns(x, amal), rowvar=False, ddof=1), covariance, f"snippet covariance seed={seed}", rel=1e-8, abs_=1e-10)
        moments = {"names": parts + list(body["amalgamations"]), "covariance": covariance, "count": count}
        answer = post_json(base, "/v1/ratio-selection", {"moments": moments, "amalgamations": body["amalgamations"]})
        assert_equal([s["label"] for s in from_table["steps"]], [s["label"] for s in answer["steps"]], f"snippet path seed={seed}")
        assert_close([s["explained"] for s in from_table["steps"]], [s["explained"] for s in answer["steps"]], f"snippet explained seed={seed}", rel=TOL, abs_=TOL)
