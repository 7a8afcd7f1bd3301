"""Retries and credentials against a scripted local HTTP server (127.0.0.1, PARTWISE_FAKE_PORT or 5368)."""
import os
import socket
import unittest

import requests

from partwise_client import Client, PartwiseError, RetryPolicy
from partwise_client.retry import parse_retry_after
from scripted_server import serve

PORT = int(os.environ.get("PARTWISE_FAKE_PORT", "5368"))


PROBLEM = {"Content-Type": "application/problem+json"}
RESULTS = {"results": [{"sampleId": "a", "distance": 1.0, "squaredDistance": 1.0, "pValue": 0.5, "flagged": False,
                        "reasons": [], "ruleViolations": [], "imputed": [], "flagId": None, "duplicate": False}]}


def problem(status, type_="/problems/storage-unavailable"):
    return {"type": type_, "title": "t", "status": status, "detail": "d", "errors": [{"pointer": "/samples/0", "detail": "x"}]}


class RetryTest(unittest.TestCase):
    @classmethod
    def setUpClass(cls):
        cls.server = serve(PORT)

    @classmethod
    def tearDownClass(cls):
        cls.server.shutdown()
        cls.server.server_close()

    def setUp(self):
        self.server.script.clear()
        self.server.seen.clear()
        self.sleeps = []
        self.pw = Client(f"http://127.0.0.1:{PORT}", api_key="k-123",
                         retry=RetryPolicy(attempts=4, backoff=0.01, sleep=self.sleeps.append))

    def sample(self):
        return {"id": "a", "values": {"Ca": 1.0, "Mg": 2.0}}

    def test_503_and_429_are_retried_with_the_same_body_honouring_retry_after(self):
        self.server.script[:] = [(503, dict(PROBLEM, **{"Retry-After": "2"}), problem(503)),
                                 (429, dict(PROBLEM, **{"Retry-After": "1"}), problem(429, "/problems/rate-limited")),
                                 (200, {"Content-Type": "application/json"}, RESULTS)]
        results = self.pw.screen("b1", self.sample())
        self.assertEqual(results[0]["sampleId"], "a")
        self.assertEqual(len(self.server.seen), 3)
        self.assertEqual(self.sleeps, [2.0, 1.0])
        bodies = {r["body"] for r in self.server.seen}
        self.assertEqual(len(bodies), 1, "every attempt sends the same samples, so a retry is idempotent")
        self.assertEqual(self.server.seen[0]["path"], "/v1/baselines/b1/screenings")

    def test_the_key_goes_as_a_bearer_token(self):
        self.server.script[:] = [(200, {"Content-Type": "application/json"}, {"items": []})]
        self.assertEqual(self.pw.baselines(), [])
        self.assertEqual(self.server.seen[0]["headers"].get("Authorization"), "Bearer k-123")

    def test_other_4xx_are_never_retried_and_raise_the_problem(self):
        for status in (400, 401, 403, 404, 409, 410, 422):
            self.server.script[:] = [(status, PROBLEM, problem(status, "/problems/x")), (200, {}, RESULTS)]
            self.server.seen.clear()
            with self.assertRaises(PartwiseError) as caught:
                self.pw.screen("b1", self.sample())
            self.assertEqual(len(self.server.seen), 1, f"{status} was retried")
            e = caught.exception
            self.assertEqual((e.status, e.type, e.pointers), (status, "/problems/x", ["/samples/0"]))
        self.assertEqual(self.sleeps, [])

    def test_503_after_every_attempt_raises_with_retry_after(self):
        self.server.script[:] = [(503, dict(PROBLEM, **{"Retry-After": "0"}), problem(503))] * 4
        with self.assertRaises(PartwiseError) as caught:
            self.pw.screen("b1", self.sample())
        self.assertEqual(len(self.server.seen), 4)
        self.assertEqual((caught.exception.status, caught.exception.retry_after), (503, 0.0))

    def test_a_non_problem_error_body_still_gives_a_problem(self):
        self.server.script[:] = [(502, {"Content-Type": "text/html"}, b"<html>bad gateway</html>")]
        with self.assertRaises(PartwiseError) as caught:
            self.pw.summary([[1, 2]], parts=["a", "b"])
        self.assertEqual((caught.exception.status, caught.exception.type), (502, "about:blank"))

    def test_creating_a_baseline_and_reviewing_are_not_retried(self):
        self.server.script[:] = [(503, PROBLEM, problem(503)), (201, {}, {})]
        with self.assertRaises(PartwiseError):
            self.pw.create_baseline([[1, 2]], "n", parts=["a", "b"])
        self.server.script[:] = [(503, PROBLEM, problem(503)), (200, {}, {})]
        with self.assertRaises(PartwiseError):
            self.pw.review_flag("f1", "confirmed")
        self.assertEqual(len(self.server.seen), 2)

    def test_connection_errors_back_off_then_raise(self):
        with socket.socket() as s:  # a port nothing listens on
            s.bind(("127.0.0.1", 0))
            closed = s.getsockname()[1]
        pw = Client(f"http://127.0.0.1:{closed}", retry=RetryPolicy(attempts=3, backoff=0.5, jitter=0, sleep=self.sleeps.append))
        with self.assertRaises(requests.ConnectionError):
            pw.screen("b1", self.sample())
        self.assertEqual(self.sleeps, [0.5, 1.0])

    def test_flags_send_if_none_match_and_read_304(self):
        self.server.script[:] = [(304, {"ETag": '"e1"'}, b"")]
        page = self.pw.flags(etag='"e1"', wait_seconds=1)
        self.assertTrue(page.not_modified)
        self.assertEqual(self.server.seen[0]["headers"].get("If-None-Match"), '"e1"')
        self.assertIn("waitSeconds=1", self.server.seen[0]["path"])

    def test_retry_after_as_an_http_date(self):
        # RFC 9110, 10.2.3: Retry-After is delay-seconds or an HTTP-date.
        self.assertEqual(parse_retry_after("120"), 120.0)
        self.assertEqual(parse_retry_after("Wed, 21 Oct 2015 07:28:10 GMT", now=1445412480.0), 10.0)
        self.assertIsNone(parse_retry_after("soon"))
