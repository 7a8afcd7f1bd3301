"""Conversions between callers' tables and the service's Table shape; no service needed."""
import math
import unittest

import numpy as np
import pandas as pd

from partwise_client import from_table, log_moments, ratio, to_samples, to_table


class TablesTest(unittest.TestCase):
    def test_a_frame_sends_its_columns_as_parts_and_its_index_as_ids(self):
        frame = pd.DataFrame({"Ca": [1.0, 2.0], "Mg": [3.0, 4.0]}, index=pd.Index(["a", "b"], name="id"))
        self.assertEqual(to_table(frame), {"parts": ["Ca", "Mg"], "rows": [[1.0, 3.0], [2.0, 4.0]], "ids": ["a", "b"]})

    def test_a_frame_with_the_default_index_sends_no_ids_and_an_id_column_is_used(self):
        frame = pd.DataFrame({"Ca": [1, 2], "Mg": [3, 4]})
        self.assertNotIn("ids", to_table(frame))
        frame["id"] = ["x", "y"]
        self.assertEqual(to_table(frame)["ids"], ["x", "y"])
        self.assertEqual(to_table(frame)["parts"], ["Ca", "Mg"])

    def test_parts_select_and_order_columns(self):
        frame = pd.DataFrame({"Ca": [1.0], "Mg": [2.0], "Na": [3.0]})
        self.assertEqual(to_table(frame, parts=["Na", "Ca"])["rows"], [[3.0, 1.0]])

    def test_lists_of_dicts_and_lists_of_lists(self):
        records = [{"id": "a", "Ca": 1, "Mg": 2}, {"id": "b", "Ca": 3, "Mg": 4}]
        self.assertEqual(to_table(records), {"parts": ["Ca", "Mg"], "rows": [[1.0, 2.0], [3.0, 4.0]], "ids": ["a", "b"]})
        self.assertEqual(to_table([[1, 2]], parts=["Ca", "Mg"]), {"parts": ["Ca", "Mg"], "rows": [[1.0, 2.0]]})
        with self.assertRaises(ValueError):
            to_table([[1, 2]])

    def test_missing_and_non_finite_cells_are_sent_as_null_for_the_service_to_point_at(self):
        frame = pd.DataFrame({"Ca": [1.0, np.nan], "Mg": [math.inf, 2.0]})
        self.assertEqual(to_table(frame)["rows"], [[1.0, None], [None, 2.0]])

    def test_answers_become_frames_indexed_by_id_with_the_rest_in_attrs(self):
        frame = from_table(["clr(Ca)", "clr(Mg)"], [[0.5, -0.5]], ["a"], attrs={"imputed": []})
        self.assertEqual(list(frame.columns), ["clr(Ca)", "clr(Mg)"])
        self.assertEqual(frame.index.name, "id")
        self.assertEqual(frame.loc["a", "clr(Mg)"], -0.5)
        self.assertEqual(frame.attrs["imputed"], [])
        plain = from_table(["x"], [[1.0]], None, frames=False)
        self.assertEqual(plain, {"columns": ["x"], "ids": None, "rows": [[1.0]]})

    def test_samples_from_a_frame_carry_ids_values_and_metadata(self):
        frame = pd.DataFrame({"Ca": [1.0], "Mg": [2.0], "observedAt": ["2026-01-07T10:30:00Z"]},
                             index=pd.Index(["well-11/2026-01-07"], name="id"))
        self.assertEqual(to_samples(frame, source="lab"), [{"values": {"Ca": 1.0, "Mg": 2.0}, "id": "well-11/2026-01-07",
                                                           "observedAt": "2026-01-07T10:30:00Z", "source": "lab"}])
        with self.assertRaises(ValueError):
            to_samples([{"Ca": 1.0, "Mg": 2.0}])

    def test_ratio_shorthands(self):
        self.assertEqual(ratio("Na/Cl"), {"num": ["Na"], "den": ["Cl"]})
        self.assertEqual(ratio((["Ca", "Mg"], ["Na", "K"], "amalgamation")),
                         {"num": ["Ca", "Mg"], "den": ["Na", "K"], "kind": "amalgamation"})
        with self.assertRaises(ValueError):
            ratio("NaCl")

    def test_log_moments_equal_numpy_covariance_of_the_logs(self):
        # Reference: numpy.cov with ddof=1 of the logs of the parts and of the amalgamations' sums (API.md, moments).
        rng = np.random.default_rng(7)
        x = np.exp(rng.normal(1.0, 0.5, size=(12, 4)))
        frame = pd.DataFrame(x, columns=["Ca", "Mg", "Na", "K"])
        m = log_moments(frame, {"hardness": ["Ca", "Mg"]})
        logs = np.column_stack([np.log(x), np.log(x[:, 0] + x[:, 1])])
        self.assertEqual(m["names"], ["Ca", "Mg", "Na", "K", "hardness"])
        self.assertEqual(m["count"], 12)
        np.testing.assert_allclose(np.array(m["covariance"]), np.cov(logs, rowvar=False, ddof=1), rtol=1e-12, atol=1e-14)
        with self.assertRaises(ValueError):
            log_moments([[1.0, 0.0], [1.0, 2.0]], parts=["a", "b"])
