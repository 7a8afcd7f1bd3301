"""What the client's tests share: the client under test, seeded tables and the one tolerance rule."""
import os

import numpy as np

from partwise_client import Client

URL = os.environ.get("PARTWISE_URL", "http://127.0.0.1:5080")
PARTS = ["Ca", "Mg", "Na", "K", "HCO3", "Cl", "SO4", "NO3"]

# |a - e| <= ABS + REL * max(|a|, |e|), as tests/reference/service.py: the service and numpy differ only in rounding.
REL = 1e-9
ABS = 1e-10


def client(**options):
    """A client of the service under test (PARTWISE_URL), with a short backoff."""
    return Client(URL, **options)


def seeded_table(rows=30, parts=PARTS, seed=20251202):
    """Positive invented concentrations (log-normal around 10 mg/L), seeded; ids `s000`, `s001`, ..."""
    rng = np.random.default_rng(seed)
    x = np.exp(rng.normal(np.log(10.0), 0.6, size=(rows, len(parts))))
    return x, [f"s{i:03d}" for i in range(rows)]


def assert_close(expected, actual, what):
    """Element-wise closeness with the shapes equal; names the worst element."""
    e = np.asarray(expected, dtype=float)
    a = np.asarray(actual, dtype=float)
    assert e.shape == a.shape, f"{what}: shape {a.shape}, expected {e.shape}"
    assert np.all(np.isfinite(a)), f"{what}: non-finite values"
    excess = np.abs(a - e) - (ABS + REL * np.maximum(np.abs(a), np.abs(e)))
    if e.size and excess.max() > 0:
        k = np.unravel_index(np.argmax(excess), e.shape)
        raise AssertionError(f"{what}: at {k} expected {e[k]!r}, got {a[k]!r}")


def closure(x, total=1.0):
    """C(x) = total * x / sum(x), row by row (Aitchison 1986, Def. 2.8)."""
    x = np.asarray(x, dtype=float)
    return total * x / x.sum(axis=1, keepdims=True)


def clr(x):
    """clr(x)_j = ln x_j - mean_k ln x_k (Aitchison 1986, Def. 4.6)."""
    logs = np.log(np.asarray(x, dtype=float))
    return logs - logs.mean(axis=1, keepdims=True)
