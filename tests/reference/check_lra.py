"""POST /v1/lra: singular values and coordinates against numpy.linalg.svd up to sign (lra_reference.py;
Greenacre & Lewi 2009, J. Classification 26:29-54)."""
import json
import pathlib
import subprocess
import sys

import numpy as np

import tables
from service import assert_close, post_json

HERE = pathlib.Path(__file__).resolve().parent


def _reference(x, w, d):
    out = subprocess.run([sys.executable, str(HERE / "lra_reference.py")], input=json.dumps({"values": x.tolist(), "weights": list(w), "dimensions": d}),
                         capture_output=True, text=True, check=True)
    return json.loads(out.stdout)


def _signs(reference, answer):
    """The sign of each dimension that makes the answer's part coordinates agree with the reference's."""
    return np.sign(np.sum(np.asarray(reference) * np.asarray(answer), axis=0))


def check_lra_against_numpy_svd(base):
    """Equal and mean weights on seeded tables: singular values, inertia s^2 / TV, principal and standard coordinates
    (up to one sign per dimension) and contributions V^2."""
    for k, (n, J) in enumerate([(15, 5), (40, 7), (25, 8), (120, 12), (30, 3)]):
        x = tables.positive(5000 + k, n, J)
        parts = tables.names(J)
        for weights in ("equal", "mean"):
            d = min(2, J - 1)
            answer = post_json(base, "/v1/lra", {"parts": parts, "rows": x.tolist(), "weights": weights, "dimensions": d})
            w = np.full(J, 1.0 / J) if weights == "equal" else (x / x.sum(axis=1, keepdims=True)).mean(axis=0)
            assert_close(w, answer["weights"], f"weights {weights} n={n} J={J}")
            ref = _reference(x, w, d)
            what = f"{weights} n={n} J={J}"
            assert_close(ref["singularValues"], answer["singularValues"], "singular values " + what)
            assert_close(np.square(ref["singularValues"]) / ref["totalVariance"], answer["inertia"], "inertia " + what)
            assert_close(ref["totalVariance"], answer["totalVariance"], "total variance " + what)
            signs = _signs(ref["standard"], answer["parts"]["standard"])
            assert_close(np.asarray(ref["standard"]) * signs, answer["parts"]["standard"], "standard " + what, rel=1e-9, abs_=1e-9)
            assert_close(np.asarray(ref["principal"]) * signs, answer["rows"]["principal"], "principal " + what, rel=1e-9, abs_=1e-9)
            V = np.asarray(ref["standard"]) * np.sqrt(w)[:, None]
            assert_close(V ** 2, answer["parts"]["contributions"], "contributions " + what, rel=1e-9, abs_=1e-9)


def check_lra_biplot_is_svg_with_the_inertia(base):
    """Accept: image/svg+xml gives an SVG whose axis titles carry the JSON answer's inertia in percent."""
    import requests
    import xml.etree.ElementTree as ET
    x = tables.positive(5100, 20, 6)
    body = {"parts": tables.names(6), "rows": x.tolist()}
    answer = post_json(base, "/v1/lra", body)
    response = requests.post(base + "/v1/lra", json=body, headers={"Accept": "image/svg+xml"}, timeout=60)
    assert response.headers["Content-Type"].startswith("image/svg+xml"), response.headers["Content-Type"]
    root = ET.fromstring(response.content)
    texts = [t.text for t in root.iter("{http://www.w3.org/2000/svg}text")]
    for k in (0, 1):
        title = f"Dimension {k + 1} ({answer['inertia'][k] * 100:.1f}%)"
        assert title in texts, f"no axis title {title!r} in {texts}"
    circles = [c for c in root.iter("{http://www.w3.org/2000/svg}circle")]
    assert len(circles) == 20, f"{len(circles)} circles for 20 samples"
