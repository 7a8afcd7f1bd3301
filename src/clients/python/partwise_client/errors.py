"""The exception raised for every 4xx/5xx answer: it carries the service's RFC 9457 problem document."""


class PartwiseError(Exception):
    """An error answer of the Partwise service (HTTP 4xx or 5xx).

    Attributes:
        problem: the problem document as the service sent it (a dict), or one made from the status when the
            answer was not ``application/problem+json`` (a proxy's HTML page, an empty body).
        type: the stable problem type, for example ``/problems/zero-value`` (``about:blank`` when none was sent).
        title: the problem's short title.
        status: the HTTP status code (an int).
        detail: the explanation of this occurrence.
        errors: a list of ``{"pointer": "/rows/3/5", "detail": "..."}`` with RFC 6901 JSON pointers into the
            request (empty when the service gave none).
        pointers: the pointers of ``errors``, in order.
        request_id: the ``X-Request-Id`` of the answer, to quote when reporting it.
        retry_after: seconds from ``Retry-After`` (429, 503), or None.
        method, url: the request that failed.
    """

    def __init__(self, problem, status, method=None, url=None, request_id=None, retry_after=None):
        self.problem = dict(problem or {})
        self.status = int(self.problem.get("status") or status)
        self.type = self.problem.get("type") or "about:blank"
        self.title = self.problem.get("title") or ""
        self.detail = self.problem.get("detail") or ""
        self.errors = list(self.problem.get("errors") or [])
        self.pointers = [e.get("pointer") for e in self.errors if isinstance(e, dict)]
        self.request_id = request_id
        self.retry_after = retry_after
        self.method = method
        self.url = url
        super().__init__(self._message())

    def _message(self):
        head = f"{self.status} {self.type}"
        if self.title:
            head += f": {self.title}"
        if self.detail:
            head += f" ({self.detail})"
        lines = [head]
        for e in self.errors:
            if isinstance(e, dict):
                lines.append(f"  at {e.get('pointer')}: {e.get('detail')}")
        if self.method and self.url:
            lines.append(f"  request: {self.method} {self.url}" + (f" [X-Request-Id {self.request_id}]" if self.request_id else ""))
        return "\n".join(lines)
