"""Second moments of the augmented logs, as a distributed engine would send them: numpy.cov (divisor n - 1) of
ln x_1 .. ln x_J and then ln of each amalgamation's sum.

stdin: {"values": n x J, "amalgamations": [[part indices]]}
stdout: {"covariance": (J + m) x (J + m), "count": n}
"""
import json
import sys

import numpy as np

d = json.load(sys.stdin)
X = np.array(d["values"], dtype=float)
G = np.column_stack([np.log(X)] + [np.log(X[:, a].sum(axis=1)) for a in d["amalgamations"]])
print(json.dumps({"covariance": np.cov(G, rowvar=False, ddof=1).tolist(), "count": X.shape[0]}))
