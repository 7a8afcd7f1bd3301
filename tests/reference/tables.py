"""Seeded random tables for the checks (numpy's default_rng), so every run posts the same numbers."""
import numpy as np

# (rows, parts): single rows, few and many rows, J from 3 to 12.
SIZES = [(1, 3), (6, 4), (15, 5), (40, 7), (25, 8), (9, 10), (120, 12), (30, 3)]


def names(J):
    """Generic part names p1..pJ (invented)."""
    return [f"p{j + 1}" for j in range(J)]


def ids(n, prefix="s"):
    return [f"{prefix}-{i:04d}" for i in range(n)]


def positive(seed, n, J, sigma=0.9):
    """An n x J log-normal table around part levels spread over four orders of magnitude."""
    rng = np.random.default_rng(seed)
    levels = rng.uniform(-3.0, 6.0, J)
    return np.exp(levels + sigma * rng.standard_normal((n, J)))


def with_zeros(seed, n, J, rate=0.08, zero_parts=None):
    """A positive table with zeros at about `rate` of the cells of `zero_parts` (default: all parts); at least one
    zero, at least two non-zero cells per row. Returns (table, limits): each part's detection limit is at most half
    its smallest non-zero value, so every replacement stays below the observed values."""
    rng = np.random.default_rng(seed + 7919)
    x = positive(seed, n, J)
    parts = list(range(J)) if zero_parts is None else list(zero_parts)
    mask = np.zeros_like(x, dtype=bool)
    mask[:, parts] = rng.random((n, len(parts))) < rate
    if not mask.any():
        mask[rng.integers(n), parts[rng.integers(len(parts))]] = True
    for i in range(n):
        while (~mask[i]).sum() < 2:
            mask[i, np.flatnonzero(mask[i])[0]] = False
    x[mask] = 0.0
    # A part that is zero in every row (possible with one row) takes half the table's smallest value. Limits are
    # also kept below 2% of the smallest row total, so that the replacements of a row (at most J of them) stay well
    # below its total, as with real detection limits; the service refuses replacements that reach a row's total.
    floor = 0.5 * x[x > 0].min()
    cap = 0.02 * x.sum(axis=1).min()
    limits = np.array([min(cap, 0.5 * x[x[:, j] > 0, j].min() if (x[:, j] > 0).any() else floor) for j in range(J)])
    return x, limits


def counts(seed, n, J):
    """Integer count rows (multinomial, totals 20-400, some rare parts) with zeros in some cells."""
    rng = np.random.default_rng(seed)
    p = rng.dirichlet(np.full(J, 0.7))
    p = np.maximum(p, 0.005)
    p /= p.sum()
    x = np.array([rng.multinomial(int(rng.integers(20, 400)), p) for _ in range(n)], dtype=float)
    x[0, int(np.argmin(p))] = 0.0  # at least one zero
    for i in range(n):  # at least two non-zero counts per row
        if (x[i] > 0).sum() < 2:
            x[i, :2] += 1
    return x
