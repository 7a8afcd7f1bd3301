"""Log-ratio analysis by numpy.linalg.svd (Greenacre & Lewi 2009, J. Classification 26:29-54; METHODS.md LRA).

Z = D_r^(1/2) Yc D_w^(1/2) with Yc the weighted clr centred with row weights 1/n; Z = U S V'.
stdin: {"values": n x J, "weights": J, "dimensions": d}
stdout: {"singularValues": [...], "principal": n x d (D_r^(-1/2) U S), "standard": J x d (D_w^(-1/2) V),
         "totalVariance": float}
"""
import json
import sys

import numpy as np

d = json.load(sys.stdin)
X = np.array(d["values"], dtype=float)
w = np.array(d["weights"], dtype=float)
k = d["dimensions"]
n, J = X.shape
L = np.log(X)
clr = L - (L @ w)[:, None]
Z = np.sqrt(1.0 / n) * (clr - clr.mean(axis=0)) * np.sqrt(w)
U, s, Vt = np.linalg.svd(Z, full_matrices=False)
print(json.dumps({
    "singularValues": s[: min(J - 1, n - 1)].tolist(),
    "principal": (np.sqrt(n) * U[:, :k] * s[:k]).tolist(),
    "standard": (Vt[:k, :].T / np.sqrt(w)[:, None]).tolist(),
    "totalVariance": float((Z ** 2).sum()),
}))
