"""POST /v1/coordinates: clr, weighted clr, alr, ilr (pivot and partition), pairwise and ratio sets (API.md)."""
import itertools

import numpy as np

import reference as ref
import tables
from service import (assert_close, assert_equal, columns_as_pairs, columns_as_parts, post_json)


def _coordinates(base, x, parts, transform, ids=None, zeros=None):
    body = {"parts": parts, "rows": np.asarray(x).tolist(), "transform": transform}
    if ids is not None:
        body["ids"] = ids
    if zeros is not None:
        body["zeros"] = zeros
    answer = post_json(base, "/v1/coordinates", body)
    columns = answer.get("columns")
    if not isinstance(columns, list) or len(set(columns)) != len(columns) or not all(isinstance(c, str) and c for c in columns):
        raise AssertionError(f"`columns` must be unique non-empty labels, got {columns!r}")
    rows = np.asarray(answer["rows"], dtype=float)
    if rows.shape != (len(x), len(columns)):
        raise AssertionError(f"rows have shape {rows.shape}, expected {(len(x), len(columns))}")
    assert_equal(ids, answer.get("ids"), "ids echoed")
    return answer, columns, rows


def _by_part_labels(expected, columns, parts):
    """Reorders expected per-part columns to the answer's labels when each label names one part (else table order)."""
    order = columns_as_parts(columns, parts)
    return expected if order is None else expected[:, order]


def check_clr_matches_numpy(base):
    """clr_j = ln x_j - mean_k ln x_k (Aitchison 1986), several sizes, with and without ids."""
    for k, (n, J) in enumerate(tables.SIZES):
        x = tables.positive(1000 + k, n, J)
        parts = tables.names(J)
        ids = tables.ids(n) if k % 2 == 0 else None
        _, columns, rows = _coordinates(base, x, parts, {"type": "clr"}, ids=ids)
        assert_equal(J, len(columns), f"clr column count J={J}")
        assert_close(_by_part_labels(ref.clr(x), columns, parts), rows, f"clr n={n} J={J}")


def check_weighted_clr_with_a_weights_map(base):
    """Weighted clr_j = ln x_j - sum_k w_k ln x_k, w normalised to sum 1 (Greenacre & Lewi 2009, J. Classif. 26:29-54)."""
    rng = np.random.default_rng(1100)
    for k, (n, J) in enumerate([(20, 4), (35, 9), (3, 12)]):
        x = tables.positive(1100 + k, n, J)
        parts = tables.names(J)
        raw = rng.uniform(0.2, 5.0, J)
        weights = {p: float(raw[j]) for j, p in enumerate(parts)}
        _, columns, rows = _coordinates(base, x, parts, {"type": "clr", "weights": weights})
        expected = ref.clr(x, ref.normalise_weights(weights, parts))
        assert_close(_by_part_labels(expected, columns, parts), rows, f"weighted clr n={n} J={J}")


def check_alr_with_a_given_denominator(base):
    """alr_j = ln(x_j / x_D) with D named, the other parts in table order (Aitchison 1986)."""
    for k, (n, J) in enumerate(tables.SIZES):
        x = tables.positive(1200 + k, n, J)
        parts = tables.names(J)
        d = (k * 5) % J
        _, columns, rows = _coordinates(base, x, parts, {"type": "alr", "denominator": parts[d]})
        assert_equal(J - 1, len(columns), "alr column count")
        expected = ref.alr(x, d)
        pairs = columns_as_pairs(columns, parts)
        if pairs is not None:  # labels name numerator and denominator: follow them
            assert_equal([d] * (J - 1), [q for _, q in pairs], "alr denominators read from labels")
            expected = np.column_stack([ref.pairwise(x, p, q) for p, q in pairs])
        assert_close(expected, rows, f"alr n={n} J={J} denominator {parts[d]}")


def check_alr_defaults_to_the_last_part(base):
    """alr without a denominator uses the last part (API.md) (Aitchison 1986)."""
    x = tables.positive(1300, 25, 6)
    parts = tables.names(6)
    _, columns, rows = _coordinates(base, x, parts, {"type": "alr"})
    pairs = columns_as_pairs(columns, parts)
    if pairs is not None:
        assert_equal([5] * 5, [q for _, q in pairs], "alr denominators read from labels")
    assert_close(ref.alr(x, 5), rows, "alr, default denominator")


def _check_basis(answer, expected_V, J, what):
    basis = np.asarray(answer.get("basis"), dtype=float)
    if basis.shape != (J, J - 1):
        raise AssertionError(f"{what}: basis must be J x J-1 = {(J, J - 1)}, got {basis.shape}")
    # Egozcue et al. 2003: V'V = I and V'1 = 0.
    assert_close(np.eye(J - 1), basis.T @ basis, f"{what}: basis orthonormal")
    assert_close(np.zeros(J - 1), basis.T @ np.ones(J), f"{what}: basis orthogonal to ones")
    assert_close(expected_V, basis, f"{what}: basis")
    return basis


def check_ilr_with_the_default_pivot_basis(base):
    """Pivot coordinates (Fišerová & Hron 2011) and their basis; z = V' ln x (Egozcue et al. 2003)."""
    for k, (n, J) in enumerate(tables.SIZES):
        x = tables.positive(1400 + k, n, J)
        parts = tables.names(J)
        answer, columns, rows = _coordinates(base, x, parts, {"type": "ilr"})
        assert_equal(J - 1, len(columns), "ilr column count")
        V = _check_basis(answer, ref.pivot_basis(J), J, f"pivot J={J}")
        assert_close(ref.ilr(x, ref.pivot_basis(J)), rows, f"pivot coordinates n={n} J={J}")
        assert_close(ref.clr(x) @ V, rows, f"pivot coordinates = clr V, n={n} J={J}")


def check_ilr_from_a_sequential_binary_partition(base):
    """Balances of a sequential binary partition (Egozcue & Pawlowsky-Glahn 2005): coefficients and coordinates."""
    rng = np.random.default_rng(1500)
    for k, (n, J) in enumerate(tables.SIZES):
        x = tables.positive(1500 + k, n, J)
        parts = tables.names(J)
        partition = ref.random_partition(J, rng)
        answer, columns, rows = _coordinates(base, x, parts, {"type": "ilr", "partition": partition})
        V = ref.partition_basis(partition)
        _check_basis(answer, V, J, f"partition J={J}")
        assert_close(ref.ilr(x, V), rows, f"balances n={n} J={J}")
        for c, row in enumerate(partition):  # each coordinate is sqrt(rs/(r+s)) ln(g(+)/g(-))
            plus = [j for j in range(J) if row[j] == 1]
            minus = [j for j in range(J) if row[j] == -1]
            assert_close(ref.balance(x, plus, minus), rows[:, c], f"balance {c} n={n} J={J}")


def check_pairwise_log_ratios(base):
    """All J(J-1)/2 ln(x_i / x_j); labels name the pair (API.md `Na/Cl` form)."""
    for k, (n, J) in enumerate(tables.SIZES):
        x = tables.positive(1600 + k, n, J)
        parts = tables.names(J)
        _, columns, rows = _coordinates(base, x, parts, {"type": "pairwise"})
        assert_equal(J * (J - 1) // 2, len(columns), "pairwise column count")
        pairs = columns_as_pairs(columns, parts)
        if pairs is None:
            raise AssertionError(f"pairwise labels should name two parts each, got {columns[:5]}...")
        assert_equal(sorted(itertools.combinations(range(J), 2)), sorted(tuple(sorted(p)) for p in pairs), "every pair once")
        assert_equal([f"{parts[p]}/{parts[q]}" for p, q in pairs], columns, "pairwise labels `num/den`")
        expected = np.column_stack([ref.pairwise(x, p, q) for p, q in pairs])
        assert_close(expected, rows, f"pairwise n={n} J={J}")


IONS = ["Ca", "Mg", "Na", "K", "HCO3", "Cl", "SO4", "NO3"]


def check_ratio_set_with_pairwise_amalgamation_and_balance(base):
    """A ratio set: ln(Na/Cl), ln((Ca+Mg)/(Na+K)) and the balance sqrt(rs/(r+s)) ln(g(Ca,Mg)/g(Na,K));
    labels exactly as API.md documents them (`Na/Cl`, `(Ca+Mg)/(Na+K)`, `g(Ca,Mg)/g(Na,K)`)."""
    ix = {p: j for j, p in enumerate(IONS)}
    for k, n in enumerate([1, 12, 80]):
        x = tables.positive(1700 + k, n, len(IONS)) * 10
        ratios = [
            {"num": ["Na"], "den": ["Cl"]},
            {"num": ["Ca", "Mg"], "den": ["Na", "K"], "kind": "amalgamation"},
            {"num": ["Ca", "Mg"], "den": ["Na", "K"], "kind": "balance"},
            {"num": ["HCO3"], "den": ["Ca"]},
            {"num": ["SO4", "NO3", "Cl"], "den": ["HCO3"], "kind": "amalgamation"},
            {"num": ["SO4", "NO3", "Cl"], "den": ["HCO3", "Mg"], "kind": "balance"},
        ]
        _, columns, rows = _coordinates(base, x, IONS, {"type": "ratios", "ratios": ratios}, ids=tables.ids(n, "w"))
        assert_equal(["Na/Cl", "(Ca+Mg)/(Na+K)", "g(Ca,Mg)/g(Na,K)", "HCO3/Ca", "(SO4+NO3+Cl)/HCO3", "g(SO4,NO3,Cl)/g(HCO3,Mg)"],
                     columns, "ratio labels")
        idx = lambda names: [ix[p] for p in names]
        expected = np.column_stack([
            ref.pairwise(x, ix["Na"], ix["Cl"]),
            ref.amalgamation(x, idx(["Ca", "Mg"]), idx(["Na", "K"])),
            ref.balance(x, idx(["Ca", "Mg"]), idx(["Na", "K"])),
            ref.pairwise(x, ix["HCO3"], ix["Ca"]),
            ref.amalgamation(x, idx(["SO4", "NO3", "Cl"]), idx(["HCO3"])),
            ref.balance(x, idx(["SO4", "NO3", "Cl"]), idx(["HCO3", "Mg"])),
        ])
        assert_close(expected, rows, f"ratio set n={n}")


def check_coordinates_after_multiplicative_replacement(base):
    """clr of a table with zeros under multiplicative replacement (Martín-Fernández et al. 2003; Aitchison 1986)."""
    x, limits = tables.with_zeros(1800, 40, 8)
    parts = tables.names(8)
    zeros = {"method": "multiplicative", "detectionLimits": {p: float(limits[j]) for j, p in enumerate(parts)}}
    answer, columns, rows = _coordinates(base, x, parts, {"type": "clr"}, zeros=zeros)
    replaced, imputed = ref.multiplicative_replacement(x, limits)
    assert_close(_by_part_labels(ref.clr(replaced), columns, parts), rows, "clr after replacement")
    assert_equal(len(imputed), len(answer.get("imputed", [])), "number of imputed cells listed")
