"""Stepwise log-ratio selection by its definition (Greenacre 2019, Math. Geosci. 51:649-682), in numpy.

For every candidate at every step, regress every weighted clr column on the chosen ratio columns plus the
candidate (numpy.linalg.lstsq) and keep the candidate with the largest explained fraction
1 - sum_j w_j RSS_j / (n TV). Candidates, their order, the 1e-9 tie rule, the dependence rule
(residual variance <= 1e-12 trace(K0)) and the stopping rule are those of METHODS.md.

stdin: {"values": n x J, "weights": J, "amalgamations": [[part indices]], "excluded": [bool] | null,
        "maxRatios": int, "target": float}
stdout: {"steps": [{"p": int, "q": int, "explained": float}]}
"""
import json
import sys

import numpy as np

d = json.load(sys.stdin)
X = np.array(d["values"], dtype=float)
w = np.array(d["weights"], dtype=float)
amal = d["amalgamations"]
n, J = X.shape
excluded = d.get("excluded") or [False] * J
max_ratios = d["maxRatios"]
target = d.get("target", 1.0)

L = np.log(X)
sums = [np.log(X[:, a].sum(axis=1)) for a in amal]
G = np.column_stack([L] + sums) if sums else L
M = G.shape[1]
clr = L - (L @ w)[:, None]
Z = (clr - clr.mean(axis=0)) * np.sqrt(w)
tss = (Z ** 2).sum()
trace_k0 = G.var(axis=0).sum()

sets = [[j] for j in range(J)] + amal
usable = [not excluded[j] for j in range(J)] + [all(not excluded[p] for p in a) for a in amal]
candidates = [(p, q) for p in range(M) for q in range(p + 1, M)
              if usable[p] and usable[q] and not set(sets[p]) & set(sets[q])]


def column(p, q):
    x = G[:, p] - G[:, q]
    return x - x.mean()


def rss(columns):
    A = np.column_stack(columns)
    coef, *_ = np.linalg.lstsq(A, Z, rcond=None)
    return ((Z - A @ coef) ** 2).sum()


def residual_variance(columns, x):
    if not columns:
        return (x ** 2).mean()
    A = np.column_stack(columns)
    coef, *_ = np.linalg.lstsq(A, x, rcond=None)
    return ((x - A @ coef) ** 2).mean()


steps, chosen, explained = [], [], 0.0
while len(steps) < max_ratios and explained < target - 1e-12:
    fractions = []
    for p, q in candidates:
        x = column(p, q)
        if residual_variance(chosen, x) <= 1e-12 * trace_k0:
            fractions.append(-np.inf)
        else:
            fractions.append(1 - rss(chosen + [x]) / tss)
    best = max(fractions)
    if best == -np.inf:
        break
    k = next(i for i, f in enumerate(fractions) if f >= best - 1e-9)
    chosen.append(column(*candidates[k]))
    explained = fractions[k]
    steps.append({"p": candidates[k][0], "q": candidates[k][1], "explained": float(explained)})

print(json.dumps({"steps": steps}))
