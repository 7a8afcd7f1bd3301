"""Reference values for a ratio set, from numpy and scipy.

explained: 1 - sum_j w_j RSS_j / (n TV), regressing every weighted clr column on the set with numpy.linalg.lstsq
(Greenacre 2019, Math. Geosci. 51:649-682); alone[i]: the same for ratio i by itself; unique[i]: explained by the
set less explained by the set without ratio i; procrustes[k]: sqrt(1 - d) with d the disparity of
scipy.spatial.procrustes between the weighted clr Z and the first k+1 ratio columns padded with zero columns to J
(Gower 1975, Psychometrika 40:33-51).

stdin: {"values": n x J, "weights": J, "ratios": [{"num": [idx], "den": [idx], "kind": "pairwise"|"amalgamation"|"balance"}]}
stdout: {"explained": float, "alone": [..], "unique": [..], "procrustes": [..]}
"""
import json
import sys

import numpy as np
from scipy.spatial import procrustes

d = json.load(sys.stdin)
X = np.array(d["values"], dtype=float)
w = np.array(d["weights"], dtype=float)
n, J = X.shape
L = np.log(X)
clr = L - (L @ w)[:, None]
Z = (clr - clr.mean(axis=0)) * np.sqrt(w)
tss = (Z ** 2).sum()


def ratio(r):
    num, den = r["num"], r["den"]
    if r["kind"] == "balance":
        a, b = len(num), len(den)
        return np.sqrt(a * b / (a + b)) * (L[:, num].mean(axis=1) - L[:, den].mean(axis=1))
    if r["kind"] == "amalgamation":
        return np.log(X[:, num].sum(axis=1) / X[:, den].sum(axis=1))
    return L[:, num[0]] - L[:, den[0]]


cols = [ratio(r) for r in d["ratios"]]
cols = [c - c.mean() for c in cols]


def explained(columns):
    if not columns:
        return 0.0
    A = np.column_stack(columns)
    coef, *_ = np.linalg.lstsq(A, Z, rcond=None)
    return 1 - ((Z - A @ coef) ** 2).sum() / tss


full = explained(cols)
alone = [explained([c]) for c in cols]
unique = [full - explained(cols[:i] + cols[i + 1:]) for i in range(len(cols))]
pro = []
for k in range(1, len(cols) + 1):
    B = np.zeros((n, J))
    B[:, :k] = np.column_stack(cols[:k])
    _, _, disparity = procrustes(Z, B)
    pro.append(float(np.sqrt(1 - disparity)))

print(json.dumps({"explained": float(full), "alone": [float(a) for a in alone],
                  "unique": [float(u) for u in unique], "procrustes": pro}))
