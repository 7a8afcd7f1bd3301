"""Stored baselines and screening (POST /v1/baselines, /v1/baselines/{id}/screenings, /v1/screenings) against numpy
and scipy: the squared Mahalanobis distance d² = (y − μ)' Σ⁻¹ (y − μ) (Mahalanobis 1936) in log-ratio coordinates,
which does not depend on the full-rank coordinates chosen (Filzmoser & Hron 2008, Math. Geosci. 40:233-248), its
p-value 1 − F_χ²(d²; J − 1) and threshold χ²_{J−1}(cutoff) from scipy.stats.chi2."""
import uuid

import numpy as np
from scipy.stats import chi2, norm

import reference as ref
import tables
from service import assert_close, assert_equal, post_json


def _samples(x, names, prefix):
    return [{"id": f"{prefix}-{i}", "values": dict(zip(names, map(float, row)))} for i, row in enumerate(x)]


def _mahalanobis2(y, mu, cov):
    d = y - mu
    return np.einsum("ij,ij->i", d, np.linalg.solve(cov, d.T).T)


def check_classical_baseline_distances_equal_numpy_mahalanobis_in_alr(base):
    """Classical scatter: numpy mean and np.cov (ddof 1) of alr coordinates; d² by np.linalg.solve; scipy chi2."""
    for k, (n, J) in enumerate([(40, 4), (80, 7)]):
        names = tables.names(J)
        x = tables.positive(5000 + k, n, J, sigma=0.5)
        later = tables.positive(5100 + k, 12, J, sigma=0.8)
        doc = post_json(base, "/v1/baselines", {"name": f"ref-classical-{uuid.uuid4().hex}", "parts": names,
                                                "rows": x.tolist(), "scatter": "classical"}, expect=201)
        answer = post_json(base, f"/v1/baselines/{doc['id']}/screenings", {"samples": _samples(later, names, f"c{k}")})
        y = ref.alr(x, J - 1)
        d2 = _mahalanobis2(ref.alr(later, J - 1), y.mean(axis=0), np.cov(y, rowvar=False, ddof=1))
        results = answer["results"]
        assert_close(d2, [r["squaredDistance"] for r in results], f"d² n={n} J={J}", rel=1e-9, abs_=1e-9)
        assert_close(np.sqrt(d2), [r["distance"] for r in results], "d", rel=1e-9, abs_=1e-9)
        assert_close(chi2.sf(d2, J - 1), [r["pValue"] for r in results], "p-value", rel=1e-7, abs_=1e-12)
        threshold = chi2.ppf(0.975, J - 1)
        assert_close(threshold, doc["threshold"], "threshold", rel=1e-9)
        assert_equal([bool(v) for v in d2 > threshold], [r["flagged"] for r in results], "flagged")


def check_classical_reasons_equal_numpy_z_scores_of_pairwise_ratios(base):
    """Reasons: the three pairwise ratios with the largest |z|, z = (ln r − mean) / sd (ddof 1) of ln r over the
    reference samples, expected = exp(mean ± Φ⁻¹(0.975) sd) (scipy.stats.norm)."""
    J = 5
    names = tables.names(J)
    x = tables.positive(5200, 50, J, sigma=0.4)
    sample = tables.positive(5201, 1, J, sigma=1.2)
    doc = post_json(base, "/v1/baselines", {"name": f"ref-reasons-{uuid.uuid4().hex}", "parts": names,
                                            "rows": x.tolist(), "scatter": "classical"}, expect=201)
    result = post_json(base, f"/v1/baselines/{doc['id']}/screenings", {"sample": _samples(sample, names, "z")[0]})["results"][0]
    candidates = []
    for i in range(J):
        for j in range(i + 1, J):
            v = np.log(x[:, i] / x[:, j])
            m, s = v.mean(), v.std(ddof=1)
            z = (np.log(sample[0, i] / sample[0, j]) - m) / s
            candidates.append((abs(z), f"{names[i]}/{names[j]}", z, sample[0, i] / sample[0, j], m, s))
    candidates.sort(key=lambda c: -c[0])
    top = candidates[:3]
    assert_equal([c[1] for c in top], [r["label"] for r in result["reasons"]], "reason labels")
    q = norm.ppf(0.975)
    for c, r in zip(top, result["reasons"]):
        assert_close(c[2], r["z"], f"z of {c[1]}", rel=1e-9, abs_=1e-9)
        assert_close(c[3], r["value"], f"value of {c[1]}")
        assert_close([np.exp(c[4] - q * c[5]), np.exp(c[4] + q * c[5])], r["expected"], f"expected of {c[1]}", rel=1e-9)


def check_robust_baseline_screens_with_its_documents_location_and_scatter(base):
    """Robust scatter: d² from the document's own location and covariance in its ilr basis (numpy), for the stored
    screening and the inline one (POST /v1/screenings with the document as GET returns it)."""
    J = 6
    names = tables.names(J)
    x = tables.positive(5300, 70, J, sigma=0.5)
    later = tables.positive(5301, 10, J, sigma=0.9)
    doc = post_json(base, "/v1/baselines", {"name": f"ref-robust-{uuid.uuid4().hex}", "parts": names, "rows": x.tolist()}, expect=201)
    assert_equal("robust", doc["scatter"], "scatter")
    V = np.asarray(doc["basis"])
    assert_close(ref.pivot_basis(J), V, "basis")
    d2 = _mahalanobis2(ref.ilr(later, V), np.asarray(doc["location"]), np.asarray(doc["covariance"]))
    samples = _samples(later, names, "rob")
    stored = post_json(base, f"/v1/baselines/{doc['id']}/screenings", {"samples": samples})["results"]
    inline = post_json(base, "/v1/screenings", {"baseline": doc, "samples": samples})["results"]
    assert_close(d2, [r["squaredDistance"] for r in stored], "stored d²", rel=1e-9, abs_=1e-9)
    assert_close(d2, [r["squaredDistance"] for r in inline], "inline d²", rel=1e-9, abs_=1e-9)
    again = post_json(base, f"/v1/baselines/{doc['id']}/screenings", {"samples": samples})["results"]
    assert_equal([True] * len(samples), [r["duplicate"] for r in again], "duplicates")
