"""The stateless computations through the client, compared with numpy (Debian's python3-numpy).

Sources of the formulas: Aitchison (1986) The Statistical Analysis of Compositional Data (closure, clr, alr,
centre, variation matrix, distance); Egozcue et al. (2003) Math. Geol. 35:279-300 (ilr = clr V);
Martín-Fernández, Barceló-Vidal & Pawlowsky-Glahn (2003) Math. Geol. 35:253-278 (multiplicative replacement);
Greenacre (2019) Compositional Data Analysis in Practice (ratio selection, J-1 connected ratios explain all).
"""
import unittest

import numpy as np
import pandas as pd

from partwise_client import PartwiseError, log_moments
from support import PARTS, assert_close, client, closure, clr, seeded_table


class ComputeTest(unittest.TestCase):
    @classmethod
    def setUpClass(cls):
        cls.pw = client()
        cls.x, cls.ids = seeded_table()
        cls.frame = pd.DataFrame(cls.x, columns=PARTS, index=pd.Index(cls.ids, name="id"))

    def test_clr_coordinates_equal_numpy(self):
        answer = self.pw.coordinates(self.frame, "clr")
        self.assertEqual(list(answer.index), self.ids)
        assert_close(clr(self.x), answer.to_numpy(), "clr")

    def test_alr_coordinates_equal_numpy(self):
        answer = self.pw.coordinates(self.frame, {"type": "alr", "denominator": "Cl"})
        j = PARTS.index("Cl")
        expected = np.log(np.delete(self.x, j, axis=1) / self.x[:, [j]])  # alr (Aitchison 1986, Def. 4.1)
        assert_close(expected, answer.to_numpy(), "alr on Cl")

    def test_ilr_coordinates_are_clr_times_the_returned_orthonormal_basis(self):
        answer = self.pw.coordinates(self.frame, "ilr")
        basis = np.array(answer.attrs["basis"])
        self.assertEqual(basis.shape, (len(PARTS), len(PARTS) - 1))
        assert_close(np.eye(len(PARTS) - 1), basis.T @ basis, "V'V = I")
        assert_close(np.zeros(len(PARTS) - 1), basis.sum(axis=0), "contrasts sum to 0")
        assert_close(clr(self.x) @ basis, answer.to_numpy(), "ilr = clr V")

    def test_inverse_of_clr_recovers_the_closed_table(self):
        coordinates = self.pw.coordinates(self.frame, "clr")
        back = self.pw.inverse(coordinates, PARTS, "clr", total=100)
        self.assertEqual(list(back.columns), PARTS)
        self.assertEqual(list(back.index), self.ids)
        assert_close(closure(self.x, 100), back.to_numpy(), "inverse clr")

    def test_prepare_replaces_a_zero_multiplicatively_and_closes(self):
        x = self.x[:3].copy()
        x[1, 7] = 0.0
        answer = self.pw.prepare(pd.DataFrame(x, columns=PARTS), zeros={"method": "multiplicative", "detectionLimits": {"NO3": 0.05}, "fraction": 0.65}, total=1)
        replaced = x.copy()
        c = x[1].sum()
        replaced[1] = x[1] * (1 - 0.65 * 0.05 / c)  # Martín-Fernández et al. 2003, eq. 3, in the row's units
        replaced[1, 7] = 0.65 * 0.05
        assert_close(closure(replaced), answer.to_numpy(), "prepared")
        imputed = answer.attrs["imputed"]
        self.assertEqual([(i["row"], i["part"]) for i in imputed], [(1, "NO3")])
        assert_close(closure(replaced)[1, 7], imputed[0]["value"], "the imputed value, in the closed units")

    def test_summary_equals_numpy_centre_and_variation_matrix(self):
        answer = self.pw.summary(self.frame)
        ddof = 1 if answer["divisor"] == "n-1" else 0
        centre = closure(np.exp(np.log(self.x).mean(axis=0))[None, :])[0]  # closed geometric mean
        assert_close(centre, answer["center"].to_numpy(), "centre")
        logs = np.log(self.x)
        variation = np.array([[np.var(logs[:, i] - logs[:, j], ddof=ddof) for j in range(8)] for i in range(8)])
        assert_close(variation, answer["variationMatrix"].to_numpy(), "variation matrix")
        self.assertEqual(list(answer["variationMatrix"].columns), PARTS)
        assert_close(np.cov(clr(self.x), rowvar=False, ddof=ddof), answer["clrCovariance"].to_numpy(), "clr covariance")

    def test_distances_are_euclidean_distances_of_clr(self):
        answer = self.pw.distances(self.frame.head(10))
        z = clr(self.x[:10])
        expected = np.sqrt(((z[:, None, :] - z[None, :, :]) ** 2).sum(axis=2))  # Aitchison distance
        assert_close(expected, answer.to_numpy(), "distances")
        self.assertEqual(list(answer.index), self.ids[:10])
        self.assertEqual(list(answer.columns), self.ids[:10])

    def test_selection_from_moments_matches_selection_from_the_table(self):
        amalgamations = {"hardness": ["Ca", "Mg"]}
        from_table = self.pw.select_ratios(self.frame, amalgamations=amalgamations, max_ratios=4)
        moments = log_moments(self.frame, amalgamations)
        from_moments = self.pw.select_ratios(moments=moments, amalgamations=amalgamations, max_ratios=4)
        self.assertEqual([s["label"] for s in from_table["steps"]], [s["label"] for s in from_moments["steps"]])
        assert_close([s["explained"] for s in from_table["steps"]], [s["explained"] for s in from_moments["steps"]], "explained")
        self.assertEqual(len(from_table["steps"]), 4)
        explained = [s["explained"] for s in from_table["steps"]]
        self.assertEqual(explained, sorted(explained))

    def test_a_chain_of_j_minus_1_ratios_explains_everything_and_reconstructs_the_table(self):
        chain = [f"{a}/{b}" for a, b in zip(PARTS, PARTS[1:])]
        evaluation = self.pw.evaluate_ratios(self.frame, chain)
        assert_close(1.0, evaluation["explained"], "explained by a spanning chain (Greenacre 2019)")
        self.assertEqual(evaluation["rank"], len(PARTS) - 1)
        self.assertTrue(evaluation["invertible"])
        values = pd.DataFrame(np.log(self.x[:, :-1] / self.x[:, 1:]), index=pd.Index(self.ids, name="id"))
        back = self.pw.reconstruct(values, PARTS, chain, total=1)
        assert_close(closure(self.x), back.to_numpy(), "reconstructed")

    def test_lra_inertia_equals_numpy_svd_of_centred_clr(self):
        answer = self.pw.lra(self.frame, weights="equal")
        z = clr(self.x)
        s = np.linalg.svd(z - z.mean(axis=0), compute_uv=False)[: len(PARTS) - 1]
        assert_close(s ** 2 / (s ** 2).sum(), answer["inertia"][: len(PARTS) - 1], "inertia fractions")
        self.assertTrue(self.pw.lra(self.frame, svg=True).lstrip().startswith("<"))

    def test_a_zero_under_reject_raises_with_the_problem_document_and_pointer(self):
        with self.assertRaises(PartwiseError) as caught:
            self.pw.coordinates([[1.0, 0.0]], "clr", parts=["Ca", "Mg"])
        e = caught.exception
        self.assertEqual((e.status, e.type), (422, "/problems/zero-value"))
        self.assertEqual(e.pointers, ["/rows/0/1"])
        self.assertTrue(e.title and e.detail and e.request_id)
        self.assertEqual(e.problem["status"], 422)

    def test_a_missing_cell_is_a_4xx_pointing_at_it(self):
        with self.assertRaises(PartwiseError) as caught:
            self.pw.coordinates(pd.DataFrame({"Ca": [1.0, np.nan], "Mg": [2.0, 3.0]}), "clr")
        self.assertEqual(caught.exception.status // 100, 4)
        self.assertIn("/rows/1/0", caught.exception.pointers)

    def test_without_frames_tables_come_back_as_dicts(self):
        plain = client(frames=False)
        answer = plain.coordinates(self.x[:2].tolist(), "clr", parts=PARTS, ids=self.ids[:2])
        self.assertLessEqual({"columns", "ids", "rows", "imputed"}, set(answer))
        self.assertEqual(answer["ids"], self.ids[:2])
        assert_close(clr(self.x[:2]), answer["rows"], "clr as lists")
        self.assertIsInstance(plain.summary(self.x.tolist(), parts=PARTS)["center"], dict)

    def test_health_and_readiness(self):
        self.assertIn("status", self.pw.health())
        self.assertIn("status", self.pw.ready())
