"""The committed demo bodies (demo/, the invented groundwater network) post as they are and give what numpy gives."""
import json
import pathlib

import numpy as np

import reference as ref
from service import assert_close, assert_equal, post_json

DEMO = pathlib.Path(__file__).resolve().parents[2] / "demo"


def _load(name):
    return json.loads((DEMO / name).read_text(encoding="utf-8"))


def _replaced(body):
    """The body's table after its multiplicative zero policy (Martín-Fernández et al. 2003)."""
    x = np.asarray(body["rows"], dtype=float)
    zeros = body["zeros"]
    assert_equal("multiplicative", zeros["method"], "demo zero policy")
    limits = np.array([zeros["detectionLimits"][p] for p in body["parts"]])
    return ref.multiplicative_replacement(x, limits, zeros.get("fraction", 0.65))[0]


def check_demo_baseline_prepares_and_summarises_like_numpy(base):
    """demo/wells-baseline.json on /v1/compositions/prepare and /v1/summary (Aitchison 1986; Greenacre 2019)."""
    body = _load("wells-baseline.json")
    x = _replaced(body)
    prepared = post_json(base, "/v1/compositions/prepare", body)
    assert_close(ref.closure(x), prepared["rows"], "demo baseline closed")
    assert_equal(int((np.asarray(body["rows"]) == 0).sum()), len(prepared["imputed"]), "demo zeros imputed")
    summary = post_json(base, "/v1/summary", body)
    ddof = ref.ddof_of(summary["divisor"])
    T = ref.variation_matrix(x, ddof)
    assert_close(T, summary["variationMatrix"], "demo variation matrix")
    assert_close(ref.total_variance(T, np.full(8, 1 / 8)), summary["totalVariance"], "demo total variance")


def check_demo_ilr_and_ratio_bodies_give_numpy_coordinates(base):
    """demo/coordinates-ilr.json (Fišerová & Hron 2011) and demo/coordinates-ratios.json (labels as in API.md)."""
    body = _load("coordinates-ilr.json")
    answer = post_json(base, "/v1/coordinates", body)
    assert_close(ref.ilr(_replaced(body), ref.pivot_basis(8)), answer["rows"], "demo ilr")
    body = _load("coordinates-ratios.json")
    answer = post_json(base, "/v1/coordinates", body)
    assert_equal(["Na/Cl", "Na/Ca", "Cl/HCO3", "NO3/Cl", "(Ca+Mg)/(Na+K)", "g(Ca,Mg)/g(HCO3,SO4)"], answer["columns"], "demo ratio labels")
    x = _replaced(body)
    ix = {p: j for j, p in enumerate(body["parts"])}
    assert_close(ref.amalgamation(x, [ix["Ca"], ix["Mg"]], [ix["Na"], ix["K"]]), np.asarray(answer["rows"])[:, 4], "demo amalgamation")


def check_demo_drift_raises_sodium_to_calcium_and_chloride_to_bicarbonate(base):
    """demo/well-11-drift-ratios.json: ln(Na/Ca) and ln(Cl/HCO3) of the drifting well rise from January to June
    (the scenario's invented brine mixing; values also against numpy)."""
    body = _load("well-11-drift-ratios.json")
    answer = post_json(base, "/v1/coordinates", body)
    assert_equal(["Na/Ca", "Cl/HCO3"], answer["columns"], "drift ratio labels")
    rows = np.asarray(answer["rows"], dtype=float)
    x = _replaced(body)
    ix = {p: j for j, p in enumerate(body["parts"])}
    assert_close(ref.pairwise(x, ix["Na"], ix["Ca"]), rows[:, 0], "ln(Na/Ca)")
    for c in range(2):
        if not rows[-6:, c].mean() > rows[:6, c].mean() + 1.0:
            raise AssertionError(f"{answer['columns'][c]} does not rise: first {rows[:6, c].mean():.3f}, last {rows[-6:, c].mean():.3f}")
