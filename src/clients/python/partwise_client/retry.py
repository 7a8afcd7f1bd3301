"""When and how long to wait before trying a request again."""
import email.utils
import random
import time

import requests


class RetryPolicy:
    """Exponential backoff for requests that are safe to send again.

    A request is tried again after a connection error or timeout, or an answer of 503 (storage unavailable) or
    429 (over a rate limit), at most ``attempts`` times in all. The wait is the answer's ``Retry-After`` when it
    has one (capped at ``max_delay``), else ``backoff * 2**k`` for the k-th retry (capped at ``max_delay``), with
    up to ``jitter`` of it taken off at random so that many callers do not retry in step. No other 4xx is ever
    retried: the same request would fail the same way.

    Only idempotent requests use it: GETs, the stateless computations, and screenings (the service keeps one
    result per baseline and sample id, so the same samples sent twice give the stored results, ``duplicate: true``).
    """

    RETRY_STATUSES = (429, 503)

    def __init__(self, attempts=5, backoff=0.5, max_delay=30.0, jitter=0.25, sleep=time.sleep):
        if attempts < 1:
            raise ValueError("attempts must be at least 1")
        self.attempts = int(attempts)
        self.backoff = float(backoff)
        self.max_delay = float(max_delay)
        self.jitter = float(jitter)
        self.sleep = sleep

    def delay(self, retry, retry_after=None):
        """Seconds to wait before retry number ``retry`` (0 for the first retry)."""
        if retry_after is not None:
            return min(self.max_delay, max(0.0, retry_after))
        base = min(self.max_delay, self.backoff * (2 ** retry))
        return base * (1.0 - self.jitter * random.random())

    @staticmethod
    def retryable_status(status):
        """True for the statuses worth another try (429, 503)."""
        return status in RetryPolicy.RETRY_STATUSES

    @staticmethod
    def retryable_exception(error):
        """True for failures to reach the service or to get its answer (connection refused or reset, timeouts)."""
        return isinstance(error, (requests.ConnectionError, requests.Timeout))


NO_RETRY = RetryPolicy(attempts=1)


def parse_retry_after(value, now=None):
    """Seconds from a ``Retry-After`` header: delta-seconds or an HTTP-date (RFC 9110, 10.2.3); None if absent or bad."""
    if value is None:
        return None
    value = value.strip()
    if value.isdigit():
        return float(value)
    try:
        when = email.utils.parsedate_to_datetime(value)
    except (TypeError, ValueError):
        return None
    if when is None:
        return None
    now = time.time() if now is None else now
    return max(0.0, when.timestamp() - now)
