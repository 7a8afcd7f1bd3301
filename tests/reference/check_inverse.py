"""POST /v1/coordinates/inverse: back-transforms to the closed table (METHODS.md, Back-transform; API.md)."""
import numpy as np

import reference as ref
import tables
from service import assert_close, assert_equal, post_json


def _inverse(base, parts, transform, coordinates, total=None):
    body = {"parts": parts, "transform": transform, "rows": np.asarray(coordinates).tolist()}
    if total is not None:
        body["total"] = total
    answer = post_json(base, "/v1/coordinates/inverse", body)
    assert_equal(parts, answer.get("parts"), "parts of the closed table")
    return np.asarray(answer["rows"], dtype=float)


def check_inverse_clr_gives_the_closed_table(base):
    """x = C(exp(clr)) (Aitchison 1986), default total 1 and total 100."""
    for k, (n, J) in enumerate(tables.SIZES):
        x = tables.positive(2000 + k, n, J)
        parts = tables.names(J)
        total = 100.0 if k % 2 else None
        rows = _inverse(base, parts, {"type": "clr"}, ref.clr(x), total)
        assert_close(ref.closure(x, total or 1.0), rows, f"clr inverse n={n} J={J}")
        assert_close(ref.clr_inverse(ref.clr(x), total or 1.0), rows, f"C(exp(y)) n={n} J={J}")


def check_inverse_alr_puts_the_denominator_back_in_its_place(base):
    """x = C([exp(alr), 1]) with the 1 at the denominator's place (Aitchison 1986); named and default denominator."""
    for k, (n, J) in enumerate(tables.SIZES):
        x = tables.positive(2100 + k, n, J)
        parts = tables.names(J)
        d = (3 * k + 1) % J
        rows = _inverse(base, parts, {"type": "alr", "denominator": parts[d]}, ref.alr(x, d), 1000.0)
        assert_close(ref.closure(x, 1000.0), rows, f"alr inverse n={n} J={J} denominator {parts[d]}")
        rows = _inverse(base, parts, {"type": "alr"}, ref.alr(x, J - 1))
        assert_close(ref.alr_inverse(ref.alr(x, J - 1), J - 1), rows, f"alr inverse, last part, n={n} J={J}")


def check_inverse_ilr_with_pivot_and_partition_bases(base):
    """x = C(exp(V z)) for the pivot basis (Fišerová & Hron 2011) and a partition basis (Egozcue & Pawlowsky-Glahn 2005)."""
    rng = np.random.default_rng(2200)
    for k, (n, J) in enumerate(tables.SIZES):
        x = tables.positive(2200 + k, n, J)
        parts = tables.names(J)
        rows = _inverse(base, parts, {"type": "ilr"}, ref.ilr(x, ref.pivot_basis(J)))
        assert_close(ref.closure(x), rows, f"pivot inverse n={n} J={J}")
        partition = ref.random_partition(J, rng)
        V = ref.partition_basis(partition)
        rows = _inverse(base, parts, {"type": "ilr", "partition": partition}, ref.ilr(x, V), 100.0)
        assert_close(ref.closure(x, 100.0), rows, f"partition inverse n={n} J={J}")


def check_inverse_of_a_spanning_tree_of_pairwise_ratios(base):
    """J - 1 pairwise ratios on a spanning tree of the parts determine the closed composition
    (Greenacre 2020, Applied Computing and Geosciences 5:100017): the inverse gives back C(x)."""
    rng = np.random.default_rng(2300)
    for k, (n, J) in enumerate([(5, 3), (20, 6), (40, 10)]):
        x = tables.positive(2300 + k, n, J)
        parts = tables.names(J)
        order = rng.permutation(J)
        edges = [(int(order[i]), int(order[rng.integers(i)])) for i in range(1, J)]  # random tree
        ratios = [{"num": [parts[p]], "den": [parts[q]]} for p, q in edges]
        values = np.column_stack([ref.pairwise(x, p, q) for p, q in edges])
        rows = _inverse(base, parts, {"type": "ratios", "ratios": ratios}, values, 1.0)
        assert_close(ref.closure(x), rows, f"ratio-set inverse n={n} J={J}", rel=1e-9)
