"""Principal axes of a baseline's clr-form scatter by numpy.linalg.eigh (the clr principal components of Aitchison
1983, Biometrika 70:57-65; compositional biplot: Aitchison & Greenacre 2002, Applied Statistics 51:375-392).

stdin: {"scatter": J x J (S_clr), "location": J (mu_clr), "values": m x J (positive), "p": rank}
stdout: {"variances": the p largest eigenvalues, decreasing; "axes": p x J (their eigenvectors);
         "scores": m x p ((clr(x) - mu_clr) @ V); "trace": trace S_clr}
"""
import json
import sys

import numpy as np

d = json.load(sys.stdin)
S = np.array(d["scatter"], dtype=float)
mu = np.array(d["location"], dtype=float)
X = np.array(d["values"], dtype=float)
p = int(d["p"])
w, V = np.linalg.eigh(S)          # ascending
order = np.argsort(w)[::-1][:p]
w, V = w[order], V[:, order]
L = np.log(X)
clr = L - L.mean(axis=1, keepdims=True)
print(json.dumps({
    "variances": w.tolist(),
    "axes": V.T.tolist(),
    "scores": ((clr - mu) @ V).tolist(),
    "trace": float(np.trace(S)),
}))
