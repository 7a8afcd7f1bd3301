"""text/csv in and out (API.md Conventions): the same numbers as JSON, options as query parameters."""
import numpy as np

import reference as ref
import tables
from service import assert_close, assert_equal, columns_as_pairs, post_csv, read_csv, table_csv


def check_alr_from_csv_to_csv(base):
    """POST /v1/coordinates with a CSV body, transform=alr&denominator=..., Accept: text/csv (Aitchison 1986)."""
    for k, (n, J) in enumerate([(1, 3), (20, 6), (75, 11)]):
        x = tables.positive(5000 + k, n, J)
        parts = tables.names(J)
        ids = tables.ids(n)
        d = k % J
        text = post_csv(base, "/v1/coordinates", table_csv(parts, x, ids), {"transform": "alr", "denominator": parts[d]})
        header, got_ids, rows = read_csv(text)
        assert_equal(ids, got_ids, "ids column")
        assert_equal(J - 1, len(header), "alr column count")
        expected = ref.alr(x, d)
        pairs = columns_as_pairs(header, parts)
        if pairs is not None:
            expected = np.column_stack([ref.pairwise(x, p, q) for p, q in pairs])
        assert_close(expected, rows, f"alr via CSV n={n} J={J}")


def check_csv_without_ids_answers_json(base):
    """A CSV body without an id column and a JSON answer (clr; Aitchison 1986)."""
    x = tables.positive(5100, 10, 5)
    answer = post_csv(base, "/v1/coordinates", table_csv(tables.names(5), x), {"transform": "clr"}, accept_csv=False)
    assert_close(ref.clr(x), answer["rows"], "clr via CSV body")


def check_prepare_from_csv_with_query_options(base):
    """POST /v1/compositions/prepare?zeros=multiplicative&detectionLimit=..&fraction=..&total=100 as CSV both ways
    (Martín-Fernández et al. 2003)."""
    x, limits = tables.with_zeros(5200, 40, 7)
    parts = tables.names(7)
    limit = float(limits.min())
    params = {"zeros": "multiplicative", "detectionLimit": repr(limit), "fraction": "0.6", "total": "100"}
    header, ids, rows = read_csv(post_csv(base, "/v1/compositions/prepare", table_csv(parts, x, tables.ids(40)), params))
    assert_equal(parts, header, "header")
    assert_equal(tables.ids(40), ids, "ids column")
    replaced, _ = ref.multiplicative_replacement(x, np.full(7, limit), 0.6)
    assert_close(ref.closure(replaced, 100), rows, "prepare via CSV")


def check_bayesian_replacement_from_csv(base):
    """zeros=bayesian-multiplicative&prior=perks as query parameters (Martín-Fernández et al. 2015)."""
    x = tables.counts(5300, 15, 5)
    params = {"zeros": "bayesian-multiplicative", "prior": "perks"}
    header, _, rows = read_csv(post_csv(base, "/v1/compositions/prepare", table_csv(tables.names(5), x.astype(int)), params))
    replaced, _ = ref.bayesian_multiplicative(x, "perks")
    assert_close(ref.closure(replaced), rows, "bayesian via CSV")
