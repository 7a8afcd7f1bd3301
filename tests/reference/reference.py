"""numpy implementations of the published formulas the service computes, written from METHODS.md.

Each function names its source. They are written independently of the service's C# code, only from the papers'
formulas, so a check compares two implementations.
"""
import numpy as np


def closure(x, total=1.0):
    """C(x) = kappa x / sum(x), row-wise (Aitchison 1986, The Statistical Analysis of Compositional Data)."""
    x = np.asarray(x, dtype=float)
    return total * x / x.sum(axis=1, keepdims=True)


def multiplicative_replacement(x, limits, fraction=0.65):
    """Multiplicative replacement (Martín-Fernández, Barceló-Vidal & Pawlowsky-Glahn 2003, Math. Geol. 35:253-278).

    In each row's own units: c the row sum, delta_j = fraction * limit_j for every zero cell, every non-zero cell
    times (1 - sum of deltas / c). `limits` holds one detection limit per part (NaN where a part has none).
    Returns the replaced table (rows still summing to c) and the list of replaced (row, part index, value).
    """
    x = np.asarray(x, dtype=float)
    out = x.copy()
    imputed = []
    for i in range(x.shape[0]):
        zero = x[i] == 0
        if not zero.any():
            continue
        c = x[i].sum()
        delta = fraction * np.asarray(limits, dtype=float)[zero]
        if np.any(np.isnan(delta)):
            raise ValueError("a zero in a part without a detection limit")
        out[i, ~zero] = x[i, ~zero] * (1.0 - delta.sum() / c)
        out[i, zero] = delta
        imputed.extend((i, int(j), float(out[i, j])) for j in np.flatnonzero(zero))
    return out, imputed


PRIOR_STRENGTH = {
    # s for a row of J parts and total N (Martín-Fernández, Hron, Templ, Filzmoser & Palarea-Albaladejo 2015,
    # Statistical Modelling 15:134-158, Table 1).
    "bayes-laplace": lambda J, N: float(J),
    "jeffreys": lambda J, N: J / 2.0,
    "perks": lambda J, N: 1.0,
    "square-root": lambda J, N: float(np.sqrt(N)),
}


def bayesian_multiplicative(counts, prior):
    """Bayesian-multiplicative replacement of count zeros (Martín-Fernández et al. 2015).

    t_j = 1/J, strength s by prior; zero cells r_j = t_j s / (N + s); non-zero r_j = (n_j / N)(1 - sum_zero t_k s / (N + s)).
    Returns proportions (rows sum to 1) and the list of replaced (row, part index, proportion).
    """
    n = np.asarray(counts, dtype=float)
    J = n.shape[1]
    out = n / n.sum(axis=1, keepdims=True)
    imputed = []
    for i in range(n.shape[0]):
        zero = n[i] == 0
        if not zero.any():
            continue
        N = n[i].sum()
        s = PRIOR_STRENGTH[prior](J, N)
        r_zero = (1.0 / J) * s / (N + s)
        out[i, zero] = r_zero
        out[i, ~zero] = (n[i, ~zero] / N) * (1.0 - zero.sum() * r_zero)
        imputed.extend((i, int(j), float(out[i, j])) for j in np.flatnonzero(zero))
    return out, imputed


def normalise_weights(weights, parts):
    """Part weights from a map part -> positive number, normalised to sum 1 (API.md, Conventions of `weights`)."""
    w = np.array([float(weights[p]) for p in parts])
    return w / w.sum()


def clr(x, w=None):
    """clr_j = ln x_j - sum_k w_k ln x_k, w = 1/J by default (Aitchison 1986; weighted: Greenacre & Lewi 2009)."""
    L = np.log(np.asarray(x, dtype=float))
    J = L.shape[1]
    w = np.full(J, 1.0 / J) if w is None else np.asarray(w, dtype=float)
    return L - (L @ w)[:, None]


def alr(x, d):
    """alr_j = ln(x_j / x_D) for every j != D, parts in table order (Aitchison 1986)."""
    L = np.log(np.asarray(x, dtype=float))
    keep = [j for j in range(L.shape[1]) if j != d]
    return L[:, keep] - L[:, [d]]


def pivot_basis(J):
    """V (J x J-1) of pivot coordinates z_i = sqrt((J-i)/(J-i+1)) ln(x_i / g(x_{i+1..J})), i = 1..J-1
    (Fišerová & Hron 2011, Math. Geosci. 43:455-468): column i has sqrt((J-i)/(J-i+1)) at part i and
    -1/sqrt((J-i)(J-i+1)) at each later part."""
    V = np.zeros((J, J - 1))
    for i in range(1, J):
        V[i - 1, i - 1] = np.sqrt((J - i) / (J - i + 1))
        V[i:, i - 1] = -1.0 / np.sqrt((J - i) * (J - i + 1))
    return V


def partition_basis(partition):
    """V (J x J-1) of a sequential binary partition: in each row with r parts +1 and s parts -1, coefficient
    +sqrt(s / (r (r+s))) on the +1 parts and -sqrt(r / (s (r+s))) on the -1 parts
    (Egozcue & Pawlowsky-Glahn 2005, Math. Geol. 37:795-828)."""
    P = np.asarray(partition, dtype=float)
    V = np.zeros((P.shape[1], P.shape[0]))
    for k, row in enumerate(P):
        r = np.sum(row == 1)
        s = np.sum(row == -1)
        V[row == 1, k] = np.sqrt(s / (r * (r + s)))
        V[row == -1, k] = -np.sqrt(r / (s * (r + s)))
    return V


def ilr(x, V):
    """z = V' ln x, row-wise: n x (J-1) (Egozcue et al. 2003, Math. Geol. 35:279-300)."""
    return np.log(np.asarray(x, dtype=float)) @ V


def random_partition(J, rng):
    """A random sequential binary partition of J parts: J-1 rows of +1 / -1 / 0, each splitting one group in two."""
    rows = []
    groups = [list(rng.permutation(J))]
    while groups:
        g = groups.pop()
        if len(g) < 2:
            continue
        cut = int(rng.integers(1, len(g)))
        plus, minus = g[:cut], g[cut:]
        row = np.zeros(J, dtype=int)
        row[plus] = 1
        row[minus] = -1
        rows.append(row.tolist())
        groups.extend([plus, minus])
    return rows


def pairwise(x, i, j):
    """ln(x_i / x_j)."""
    x = np.asarray(x, dtype=float)
    return np.log(x[:, i] / x[:, j])


def amalgamation(x, num, den):
    """ln(sum_A x / sum_B x) for disjoint part sets A, B (METHODS.md, Transforms)."""
    x = np.asarray(x, dtype=float)
    return np.log(x[:, num].sum(axis=1) / x[:, den].sum(axis=1))


def balance(x, num, den):
    """sqrt(r s / (r + s)) ln(g(num) / g(den)), g the geometric mean (Egozcue & Pawlowsky-Glahn 2005)."""
    L = np.log(np.asarray(x, dtype=float))
    r, s = len(num), len(den)
    return np.sqrt(r * s / (r + s)) * (L[:, num].mean(axis=1) - L[:, den].mean(axis=1))


def clr_inverse(y, total=1.0):
    """x = C(exp(y)) (METHODS.md, Back-transform)."""
    return closure(np.exp(np.asarray(y, dtype=float)), total)


def alr_inverse(y, d, total=1.0):
    """x = C([exp(y), 1]) with the 1 at the denominator's place d (METHODS.md, Back-transform)."""
    y = np.asarray(y, dtype=float)
    e = np.insert(np.exp(y), d, 1.0, axis=1)
    return closure(e, total)


def ilr_inverse(z, V, total=1.0):
    """x = C(exp(V z)) (METHODS.md, Back-transform)."""
    return closure(np.exp(np.asarray(z, dtype=float) @ V.T), total)


def ddof_of(divisor):
    """numpy's ddof for the service's `divisor` field ("n" or "n-1")."""
    if divisor == "n":
        return 0
    if divisor == "n-1":
        return 1
    raise AssertionError(f"divisor must be 'n' or 'n-1', got {divisor!r}")


def center(x):
    """The closed geometric mean of the rows, C(exp(mean ln x)) (Aitchison 1986)."""
    return closure(np.exp(np.log(np.asarray(x, dtype=float)).mean(axis=0))[None, :])[0]


def variation_matrix(x, ddof):
    """T_ij = var(ln(x_i / x_j)) (Aitchison 1986)."""
    L = np.log(np.asarray(x, dtype=float))
    J = L.shape[1]
    T = np.zeros((J, J))
    for i in range(J):
        for j in range(J):
            T[i, j] = np.var(L[:, i] - L[:, j], ddof=ddof)
    return T


def total_variance(T, w):
    """TV = sum_{i<j} w_i w_j T_ij (METHODS.md, Variance; Greenacre 2019)."""
    J = len(w)
    return float(sum(w[i] * w[j] * T[i, j] for i in range(J) for j in range(i + 1, J)))
