"""POST /v1/distances: the Aitchison distance matrix (Aitchison 1986) against scipy.spatial.distance."""
import numpy as np
from scipy.spatial.distance import pdist, squareform

import reference as ref
import tables
from service import assert_close, assert_equal, post_json


def check_distances_equal_scipy_euclidean_distances_of_clr(base):
    """Aitchison distance = Euclidean distance of clr vectors: scipy pdist + squareform (Aitchison 1986)."""
    for k, (n, J) in enumerate([(1, 3), (2, 4), (15, 5), (40, 8), (150, 12)]):
        x = tables.positive(4000 + k, n, J)
        ids = tables.ids(n)
        answer = post_json(base, "/v1/distances", {"parts": tables.names(J), "rows": x.tolist(), "ids": ids})
        assert_equal(ids, answer.get("ids"), "ids")
        expected = squareform(pdist(ref.clr(x))) if n > 1 else np.zeros((1, 1))
        assert_close(expected, answer["matrix"], f"distances n={n} J={J}")


def check_distances_equal_euclidean_distances_of_any_orthonormal_ilr(base):
    """The same distances from pivot and partition ilr coordinates (Egozcue et al. 2003), with scipy pdist."""
    rng = np.random.default_rng(4100)
    x = tables.positive(4100, 30, 9)
    matrix = np.asarray(post_json(base, "/v1/distances", {"parts": tables.names(9), "rows": x.tolist()})["matrix"])
    assert_close(squareform(pdist(ref.ilr(x, ref.pivot_basis(9)))), matrix, "distances vs pivot ilr")
    V = ref.partition_basis(ref.random_partition(9, rng))
    assert_close(squareform(pdist(ref.ilr(x, V))), matrix, "distances vs partition ilr")


def check_distances_after_bayesian_replacement_of_counts(base):
    """Distances of counts with zeros under the Jeffreys prior (Martín-Fernández et al. 2015), scipy pdist."""
    x = tables.counts(4200, 25, 6)
    answer = post_json(base, "/v1/distances", {"parts": tables.names(6), "rows": x.tolist(),
                                                "zeros": {"method": "bayesian-multiplicative", "prior": "jeffreys"}})
    replaced, _ = ref.bayesian_multiplicative(x, "jeffreys")
    assert_close(squareform(pdist(ref.clr(replaced))), answer["matrix"], "distances after replacement")
