"""Stored baselines, screening (stored and inline), flags with ETag and long poll, and review, through the client.

The Mahalanobis distance is checked with numpy from the baseline document's own basis, location and covariance:
d^2 = (z - m)' S^-1 (z - m) with z = clr(x) V (Mahalanobis 1936; ilr coordinates: Egozcue et al. 2003).
"""
import threading
import time
import unittest
import uuid

import numpy as np
import pandas as pd

from partwise_client import PartwiseError
from support import PARTS, assert_close, client, clr, seeded_table


def far_sample(sample_id, scale=40.0):
    """A sample with Na and Cl far above the reference table's (about 10 mg/L each)."""
    values = {p: 10.0 for p in PARTS}
    values["Na"] *= scale
    values["Cl"] *= scale
    return {"id": sample_id, "values": values, "observedAt": "2026-03-02T10:30:00Z", "source": "client-test"}


class BaselinesTest(unittest.TestCase):
    @classmethod
    def setUpClass(cls):
        cls.pw = client()
        x, ids = seeded_table(rows=60, seed=11)
        cls.x = x
        cls.reference = pd.DataFrame(x, columns=PARTS, index=pd.Index(ids, name="id"))
        cls.name = f"client-test {uuid.uuid4().hex[:8]}"
        cls.doc = cls.pw.create_baseline(cls.reference, cls.name, description="invented test data", scatter="classical",
                                         rules=[{"ratio": "Cl/HCO3", "max": 5.0}])
        cls.tag = uuid.uuid4().hex[:8]  # fresh sample ids per run: the store keeps screenings

    def test_the_created_document_is_listed_and_read_back(self):
        self.assertEqual(self.doc["name"], self.name)
        self.assertEqual(self.doc["scatter"], "classical")
        self.assertEqual(self.doc["parts"], PARTS)
        self.assertIn(self.doc["id"], [b["id"] for b in self.pw.baselines()])
        self.assertEqual(self.pw.baseline(self.doc["id"])["location"], self.doc["location"])
        self.assertEqual(self.pw.find_baseline(self.name)["id"], self.doc["id"])

    def test_classical_location_is_the_mean_of_the_ilr_coordinates(self):
        basis = np.array(self.doc["basis"])
        assert_close((clr(self.x) @ basis).mean(axis=0), self.doc["location"], "location")

    def test_screening_distance_equals_numpy_mahalanobis_and_a_repeat_is_a_duplicate(self):
        sample = far_sample(f"client-{self.tag}/far")
        first = self.pw.screen(self.doc["id"], sample)[0]
        v = np.array([sample["values"][p] for p in PARTS])[None, :]
        z = (clr(v) @ np.array(self.doc["basis"]))[0] - np.array(self.doc["location"])
        d2 = z @ np.linalg.solve(np.array(self.doc["covariance"]), z)
        assert_close(d2, first["squaredDistance"], "d^2")
        assert_close(np.sqrt(d2), first["distance"], "d")
        self.assertTrue(first["flagged"])
        self.assertTrue(first["flagId"])
        self.assertFalse(first["duplicate"])
        self.assertTrue(0.0 <= first["pValue"] < 0.025)
        self.assertTrue(first["reasons"] and all(len(r["expected"]) == 2 for r in first["reasons"]))
        self.assertEqual([r["label"] for r in first["ruleViolations"]], ["Cl/HCO3"])  # 400/10 > 5
        again = self.pw.screen(self.doc["id"], sample)[0]
        self.assertTrue(again["duplicate"])
        self.assertEqual(again["distance"], first["distance"])
        inline = self.pw.screen_inline(self.pw.baseline(self.doc["id"]), sample)[0]
        assert_close(first["distance"], inline["distance"], "inline screening of the same document")

    def test_the_same_id_with_other_values_is_a_409(self):
        sample = far_sample(f"client-{self.tag}/conflict")
        self.pw.screen(self.doc["id"], sample)
        with self.assertRaises(PartwiseError) as caught:
            self.pw.screen(self.doc["id"], far_sample(sample["id"], scale=41.0))
        self.assertEqual(caught.exception.status, 409)

    def test_a_frame_of_samples_screens_in_batches(self):
        frame = self.reference.head(7).copy()
        frame.index = [f"client-{self.tag}/ref-{i}" for i in range(7)]
        frame.index.name = "id"
        results = self.pw.screen(self.doc["id"], frame, batch_size=3, source="client-test")
        self.assertEqual([r["sampleId"] for r in results], list(frame.index))
        self.assertTrue(all(r["squaredDistance"] >= 0 for r in results))

    def test_flags_list_etag_long_poll_and_review(self):
        baseline_id = self.doc["id"]
        flagged = self.pw.screen(baseline_id, far_sample(f"client-{self.tag}/flag-1"))[0]
        page = self.pw.flags(baseline=baseline_id, limit=500)
        self.assertIn(flagged["flagId"], [f["id"] for f in page.items])
        self.assertTrue(page.etag)
        unchanged = self.pw.flags(baseline=baseline_id, limit=500, etag=page.etag)
        self.assertTrue(unchanged.not_modified)
        self.assertEqual(unchanged.items, [])

        # A long poll with the ETag returns when a new flag arrives, before its wait is over.
        later = threading.Timer(1.0, lambda: self.pw.screen(baseline_id, far_sample(f"client-{self.tag}/flag-2")))
        started = time.monotonic()
        later.start()
        try:
            woke = self.pw.flags(baseline=baseline_id, limit=500, etag=page.etag, wait_seconds=20)
        finally:
            later.join()
        self.assertLess(time.monotonic() - started, 15)
        self.assertFalse(woke.not_modified)
        self.assertIn(f"client-{self.tag}/flag-2", [f["sampleId"] for f in woke.items])

        reviewed = self.pw.review_flag(flagged["flagId"], "confirmed", note="test review", reviewer="client-test")
        self.assertEqual(reviewed["status"], "confirmed")
        self.assertEqual(reviewed["review"]["note"], "test review")
        confirmed = list(self.pw.iter_flags(baseline=baseline_id, status="confirmed"))
        self.assertIn(flagged["flagId"], [f["id"] for f in confirmed])

    def test_bad_flag_queries_and_unknown_ids_raise_problems(self):
        with self.assertRaises(PartwiseError) as caught:
            self.pw.flags(limit=501)
        self.assertEqual((caught.exception.status, caught.exception.pointers), (400, ["/limit"]))
        with self.assertRaises(PartwiseError) as caught:
            self.pw.baseline("0" * 32)
        self.assertEqual(caught.exception.status, 404)

    def test_a_retired_baseline_refuses_screening_with_410(self):
        doc = self.pw.create_baseline(self.reference, self.name + " retired", scatter="classical")
        self.pw.retire_baseline(doc["id"])
        self.assertTrue(self.pw.baseline(doc["id"])["retiredAt"])
        self.assertNotIn(doc["id"], [b["id"] for b in self.pw.baselines(active=True)])
        with self.assertRaises(PartwiseError) as caught:
            self.pw.screen(doc["id"], far_sample(f"client-{self.tag}/retired"))
        self.assertEqual(caught.exception.status, 410)
