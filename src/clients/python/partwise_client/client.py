"""The Partwise client: one method per endpoint of the v1 contract (openapi/partwise.v1.json)."""
import os

import requests

from . import tables
from .errors import PartwiseError
from .retry import NO_RETRY, RetryPolicy, parse_retry_after

DEFAULT_URL = "http://127.0.0.1:5080"


def ratio(spec, kind=None):
    """A Ratio object of the contract from ``"Na/Cl"``, ``("Na", "Cl")``, ``(["Ca", "Mg"], ["Na", "K"], "amalgamation")``
    or a dict already in shape (``{"num": [...], "den": [...], "kind": ...}``)."""
    if isinstance(spec, dict):
        return spec
    if isinstance(spec, str):
        num, sep, den = spec.partition("/")
        if not sep or not num or not den:
            raise ValueError(f"'{spec}' is not a pairwise ratio like 'Na/Cl'")
        spec = (num, den)
    num, den = spec[0], spec[1]
    kind = kind if kind is not None else (spec[2] if len(spec) > 2 else None)
    out = {"num": [num] if isinstance(num, str) else list(num), "den": [den] if isinstance(den, str) else list(den)}
    if kind is not None:
        out["kind"] = kind
    return out


def _zeros(zeros):
    """A zero policy: None (the service's default, reject), a method name, or the policy dict."""
    if zeros is None or isinstance(zeros, dict):
        return zeros
    return {"method": str(zeros)}


def _transform(transform):
    """A transform: a type name ("clr", "ilr", "pairwise") or the transform dict."""
    if isinstance(transform, dict):
        out = dict(transform)
        if "ratios" in out:
            out["ratios"] = [ratio(r) for r in out["ratios"]]
        return out
    return {"type": str(transform)}


def _weights(weights):
    if weights is None or isinstance(weights, str):
        return weights
    return {str(k): float(v) for k, v in dict(weights).items()}


def _drop_none(body):
    return {k: v for k, v in body.items() if v is not None}


class FlagPage:
    """One page of ``GET /v1/flags``.

    Attributes:
        items: the flags (dicts as the service sends them), oldest first.
        next: the cursor for the following page (pass it as ``after``), or None.
        has_more: whether more flags follow at once.
        etag: the page's ``ETag``; pass it as ``etag`` to wait for a change (304 while there is none).
        not_modified: True when the service answered 304 to ``etag``: ``items`` is then empty.
    """

    def __init__(self, items, next_cursor, has_more, etag, not_modified):
        self.items = items
        self.next = next_cursor
        self.has_more = has_more
        self.etag = etag
        self.not_modified = not_modified

    def __repr__(self):
        return f"FlagPage(items={len(self.items)}, next={self.next!r}, etag={self.etag!r}, not_modified={self.not_modified})"


class Client:
    """A caller of one Partwise service.

    Args:
        url: the service's base address; defaults to ``$PARTWISE_URL`` or http://127.0.0.1:5080.
        api_key: sent as ``Authorization: Bearer <key>``; defaults to ``$PARTWISE_KEY``. With no key configured
            on the service it serves loopback callers without one.
        timeout: seconds per request (connect and read); long polls add their wait to it.
        retry: a RetryPolicy for the idempotent requests (GETs, computations, screenings); None for the default
            (5 attempts, 0.5 s doubling, 30 s at most), ``retry=False`` for none.
        frames: return tables as pandas DataFrames (index: the sample ids); defaults to True when pandas is
            installed. With False (or without pandas) tables are ``{"columns", "ids", "rows"}`` dicts.
        session: a requests.Session to reuse (connection pooling, proxies, certificates).

    Every error answer (4xx, 5xx) raises PartwiseError carrying the problem document; a connection that still
    fails after the retries raises requests' own ConnectionError or Timeout.
    """

    def __init__(self, url=None, api_key=None, timeout=60.0, retry=None, frames=None, session=None):
        self.url = (url or os.environ.get("PARTWISE_URL") or DEFAULT_URL).rstrip("/")
        self.api_key = api_key if api_key is not None else (os.environ.get("PARTWISE_KEY") or None)
        self.timeout = timeout
        self.retry = NO_RETRY if retry is False else (retry or RetryPolicy())
        self.frames = tables.pandas_available() if frames is None else bool(frames) and tables.pandas_available()
        self.session = session or requests.Session()

    # --- transport ---------------------------------------------------------------------------------------------
    def _headers(self, extra=None):
        headers = {"Accept": "application/json"}
        if self.api_key:
            headers["Authorization"] = f"Bearer {self.api_key}"
        headers.update(extra or {})
        return headers

    def request(self, method, path, body=None, params=None, headers=None, retry=True, timeout=None, ok=(200,)):
        """Sends one request and returns the requests.Response; raises PartwiseError for a status not in ``ok``.

        ``retry`` True uses the client's RetryPolicy (only for requests that are safe to repeat).
        """
        policy = self.retry if retry else NO_RETRY
        url = self.url + path
        params = _drop_none(params or {})
        for attempt in range(policy.attempts):
            last = attempt == policy.attempts - 1
            try:
                response = self.session.request(
                    method, url, json=body, params=params or None, headers=self._headers(headers),
                    timeout=timeout if timeout is not None else self.timeout)
            except Exception as error:  # noqa: BLE001 - only connection errors and timeouts are retried
                if last or not policy.retryable_exception(error):
                    raise
                policy.sleep(policy.delay(attempt))
                continue
            if response.status_code in ok:
                return response
            retry_after = parse_retry_after(response.headers.get("Retry-After"))
            if not last and policy.retryable_status(response.status_code):
                policy.sleep(policy.delay(attempt, retry_after))
                continue
            raise self._error(response, method, url, retry_after)
        raise AssertionError("unreachable")  # pragma: no cover

    @staticmethod
    def _error(response, method, url, retry_after):
        problem = None
        try:
            parsed = response.json()
            if isinstance(parsed, dict):
                problem = parsed
        except ValueError:
            pass
        if problem is None:
            problem = {"type": "about:blank", "title": response.reason or "", "status": response.status_code,
                       "detail": (response.text or "")[:500]}
        return PartwiseError(problem, response.status_code, method, url,
                             response.headers.get("X-Request-Id"), retry_after)

    def _post(self, path, body, retry=True, ok=(200,), accept=None):
        headers = {"Accept": accept} if accept else None
        response = self.request("POST", path, body=_drop_none(body), retry=retry, ok=ok, headers=headers)
        return response.text if accept else response.json()

    def _table_answer(self, answer, columns_key="columns", extra=()):
        attrs = {k: answer[k] for k in extra if k in answer}
        return tables.from_table(answer[columns_key], answer["rows"], answer.get("ids"), self.frames, attrs)

    @staticmethod
    def _table_body(table, parts=None, ids=None, **options):
        body = tables.to_table(table, parts=parts, ids=ids)
        body.update(options)
        return body

    # --- operations --------------------------------------------------------------------------------------------
    def health(self):
        """``GET /healthz``: ``{"status": ...}`` while the process is alive."""
        return self.request("GET", "/healthz").json()

    def ready(self):
        """``GET /readyz``: ``{"status": ...}`` when storage is reachable; PartwiseError 503 otherwise (not retried)."""
        return self.request("GET", "/readyz", retry=False).json()

    # --- stateless computations --------------------------------------------------------------------------------
    def prepare(self, table, zeros=None, total=None, parts=None, ids=None):
        """``POST /v1/compositions/prepare``: the table closed to ``total`` (default 1) after zero replacement.

        Returns a table (DataFrame with ids as index; ``attrs["imputed"]`` lists replaced cells as
        ``{row, part, value}``, rows 0-based).
        """
        answer = self._post("/v1/compositions/prepare", self._table_body(table, parts, ids, zeros=_zeros(zeros), total=total))
        return self._table_answer(answer, "parts", extra=("imputed",))

    def coordinates(self, table, transform="clr", zeros=None, parts=None, ids=None):
        """``POST /v1/coordinates``: log-ratio coordinates of every row.

        Args:
            table: the compositions (see partwise_client.tables).
            transform: "clr", "alr", "ilr", "pairwise", or a dict such as ``{"type": "alr", "denominator": "Cl"}``,
                ``{"type": "ilr", "partition": [[1, 1, -1, ...], ...]}``, ``{"type": "ratios", "ratios": ["Na/Cl", ...]}``.
            zeros: None (reject), "multiplicative", or a policy dict with ``detectionLimits`` and ``fraction``.

        Returns a table whose columns are the coordinates' labels; ``attrs`` holds ``imputed`` and, for ilr, ``basis``.
        """
        answer = self._post("/v1/coordinates", self._table_body(table, parts, ids, zeros=_zeros(zeros), transform=_transform(transform)))
        return self._table_answer(answer, extra=("imputed", "basis"))

    def inverse(self, coordinates, parts, transform="clr", total=None, ids=None):
        """``POST /v1/coordinates/inverse``: compositions (closed to ``total``, default 1) from coordinates.

        ``coordinates`` is a DataFrame (index: ids), a list of lists or the table dict of ``coordinates()``;
        ``parts`` names the parts of the compositions. Works for clr, alr, ilr and invertible ratio sets.
        """
        rows, found = tables.rows_and_ids(coordinates)
        body = {"parts": list(parts), "rows": rows, "transform": _transform(transform), "total": total,
                "ids": list(ids) if ids is not None else found}
        answer = self._post("/v1/coordinates/inverse", body)
        return self._table_answer(answer, "parts")

    def summary(self, table, zeros=None, weights=None, parts=None):
        """``POST /v1/summary``: centre, variation matrix, total variance, part contributions, clr covariance.

        With frames, ``center`` and ``partContributions`` are Series and ``variationMatrix`` and ``clrCovariance``
        DataFrames labelled by part; the other fields (``totalVariance``, ``divisor``, ``weights``, ``imputed``)
        are as the service sends them.
        """
        answer = self._post("/v1/summary", self._table_body(table, parts, zeros=_zeros(zeros), weights=_weights(weights)))
        names = answer["parts"]
        for key in ("center", "partContributions"):
            if key in answer:
                answer[key] = tables.series(answer[key], names, self.frames)
        for key in ("variationMatrix", "clrCovariance"):
            if key in answer:
                answer[key] = tables.square(answer[key], names, self.frames)
        return answer

    def distances(self, table, zeros=None, parts=None, ids=None):
        """``POST /v1/distances``: the Aitchison distance matrix (at most 5,000 rows), labelled by sample id.

        With frames, a square DataFrame with ids on both sides and ``attrs["imputed"]``; else the answer dict.
        """
        answer = self._post("/v1/distances", self._table_body(table, parts, ids, zeros=_zeros(zeros)))
        if not self.frames:
            return answer
        labels = answer.get("ids") or list(range(len(answer["matrix"])))
        frame = tables.square(answer["matrix"], labels, True)
        frame.index.name = tables.ID_COLUMN
        frame.attrs["imputed"] = answer.get("imputed", [])
        return frame

    def select_ratios(self, table=None, moments=None, zeros=None, amalgamations=None, force=None, exclude=None,
                      max_ratios=None, explained=None, weights=None, parts=None, svg=False):
        """``POST /v1/ratio-selection``: the stepwise choice of log-ratios explaining the most log-ratio variance.

        Give either ``table`` or ``moments`` (``{"names", "covariance", "count"}``, see tables.log_moments).
        ``amalgamations`` maps a name to its parts (``{"hardness": ["Ca", "Mg"]}``); ``force`` lists ratios always
        in, ``exclude`` parts never used; ``max_ratios`` and ``explained`` stop early.
        Returns the answer dict (``totalVariance``, ``steps`` [{ratio, label, explained, gain, procrustes}],
        ``graph``, ``invertible``), or the SVG picture's text with ``svg=True``.
        """
        if (table is None) == (moments is None):
            raise ValueError("give either a table or moments")
        body = self._table_body(table, parts) if table is not None else {"moments": moments}
        stop = _drop_none({"maxRatios": max_ratios, "explained": explained})
        body.update(zeros=_zeros(zeros), amalgamations=amalgamations, force=[ratio(r) for r in force] if force else None,
                    exclude=list(exclude) if exclude else None, stop=stop or None, weights=_weights(weights))
        return self._post("/v1/ratio-selection", body, accept="image/svg+xml" if svg else None)

    def evaluate_ratios(self, table, ratios, zeros=None, weights=None, parts=None):
        """``POST /v1/ratio-sets/evaluate``: how much of the log-ratio variance a chosen set of ratios explains.

        ``ratios`` are Ratio dicts or "Na/Cl" strings. Returns ``explained``, ``procrustes``, ``rank``,
        ``invertible`` and ``perRatio`` [{label, explainedAlone, uniqueContribution}].
        """
        body = self._table_body(table, parts, zeros=_zeros(zeros), ratios=[ratio(r) for r in ratios], weights=_weights(weights))
        return self._post("/v1/ratio-sets/evaluate", body)

    def reconstruct(self, values, parts, ratios, total=None, ids=None):
        """``POST /v1/ratio-sets/reconstruct``: compositions from the values (natural logs) of an invertible ratio set.

        ``values`` is a DataFrame (one column per ratio, in the order of ``ratios``; index: ids) or a list of lists.
        """
        ratio_list = [ratio(r) for r in ratios]
        rows, found = tables.rows_and_ids(values)
        body = {"parts": list(parts), "ratios": ratio_list, "rows": rows, "total": total,
                "ids": list(ids) if ids is not None else found}
        return self._table_answer(self._post("/v1/ratio-sets/reconstruct", body), "parts")

    def lra(self, table, zeros=None, weights=None, dimensions=None, parts=None, svg=False):
        """``POST /v1/lra``: log-ratio analysis (singular values, inertia, row principal and part standard coordinates).

        Returns the answer dict, or the biplot of dimensions 1 and 2 as SVG text with ``svg=True``.
        """
        body = self._table_body(table, parts, zeros=_zeros(zeros), weights=_weights(weights), dimensions=dimensions)
        return self._post("/v1/lra", body, accept="image/svg+xml" if svg else None)

    # --- baselines -------------------------------------------------------------------------------------------------
    def create_baseline(self, table, name, description=None, zeros=None, coordinates=None, scatter=None, cutoff=None,
                        rules=None, amalgamations=None, parts=None, ids=None):
        """``POST /v1/baselines`` (admin): fits and stores a screening baseline from reference samples.

        ``coordinates``: None (ilr), ``{"type": "ratios", "ratios": [...]}`` or ``{"type": "selection", "maxRatios": 4}``;
        ``scatter``: "robust" (default) or "classical"; ``cutoff``: the quantile (default 0.975); ``rules``:
        ``[{"ratio": "Cl/HCO3", "max": 0.5}]`` on the ratio's value. Returns the baseline document. Not retried
        (each call stores a new baseline).
        """
        if isinstance(coordinates, str):
            coordinates = {"type": coordinates}
        elif isinstance(coordinates, dict) and "ratios" in coordinates:
            coordinates = dict(coordinates, ratios=[ratio(r) for r in coordinates["ratios"]])
        rule_list = [dict(r, ratio=ratio(r["ratio"])) for r in rules] if rules else None
        body = self._table_body(table, parts, ids, name=name, description=description, zeros=_zeros(zeros),
                                coordinates=coordinates, scatter=scatter, cutoff=cutoff, rules=rule_list,
                                amalgamations=amalgamations)
        return self._post("/v1/baselines", body, retry=False, ok=(201,))

    def baselines(self, active=None):
        """``GET /v1/baselines``: the stored baseline documents (a list); ``active=True`` leaves out retired ones."""
        params = {"active": None if active is None else str(bool(active)).lower()}
        return self.request("GET", "/v1/baselines", params=params).json()["items"]

    def baseline(self, baseline_id):
        """``GET /v1/baselines/{id}``: one baseline document (portable: ``screen_inline`` screens the same with it)."""
        return self.request("GET", f"/v1/baselines/{baseline_id}").json()

    def find_baseline(self, name):
        """The newest stored baseline document named ``name``, or None."""
        found = [b for b in self.baselines() if b.get("name") == name]
        return max(found, key=lambda b: (b.get("createdAt") or "", b.get("version") or 0)) if found else None

    def retire_baseline(self, baseline_id):
        """``DELETE /v1/baselines/{id}`` (admin): retires it; screening it then raises PartwiseError 410."""
        self.request("DELETE", f"/v1/baselines/{baseline_id}", retry=False, ok=(204,))

    # --- screening ---------------------------------------------------------------------------------------------------
    def screen(self, baseline_id, samples, batch_size=500, observed_at=None, source=None):
        """``POST /v1/baselines/{id}/screenings``: screens samples against a stored baseline; returns the results.

        ``samples``: a DataFrame (index or ``id`` column: sample ids; optional ``observedAt``, ``source`` columns),
        a list of sample dicts, or one sample. Every sample needs an id. Sent in batches of ``batch_size``
        (the service takes at most 1,000 per request). Connection errors, 503 and 429 are retried with backoff:
        the same ids make it idempotent (a sample already screened comes back with ``duplicate: true``); the
        same id with other values raises PartwiseError 409.

        Each result: ``sampleId``, ``distance`` (Mahalanobis), ``pValue``, ``flagged``, ``reasons``
        [{label, value, z, expected [low, high]}], ``ruleViolations``, ``flagId``, ``duplicate``.
        """
        items = tables.to_samples(samples, observed_at, source)
        results = []
        for start in range(0, len(items), batch_size):
            body = {"samples": items[start:start + batch_size]}
            results.extend(self._post(f"/v1/baselines/{baseline_id}/screenings", body)["results"])
        return results

    def screen_inline(self, baseline, samples, observed_at=None, source=None):
        """``POST /v1/screenings``: screens samples against a baseline document sent with them; nothing is stored."""
        items = tables.to_samples(samples, observed_at, source)
        return self._post("/v1/screenings", {"baseline": baseline, "samples": items})["results"]

    # --- flags -----------------------------------------------------------------------------------------------------
    def flags(self, baseline=None, status=None, after=None, limit=None, wait_seconds=None, etag=None):
        """``GET /v1/flags``: one page of flags (a FlagPage).

        ``status``: "open" (default), "confirmed", "dismissed" or "any"; ``after``: the cursor of the previous
        page; ``limit`` at most 500; ``wait_seconds`` (at most 30) waits for a flag when there is none yet;
        ``etag`` (a previous page's) sends If-None-Match: while nothing changed the service answers 304 and the
        page has ``not_modified`` True and no items.
        """
        params = {"baseline": baseline, "status": status, "after": after, "limit": limit, "waitSeconds": wait_seconds}
        headers = {"If-None-Match": etag} if etag else None
        timeout = self.timeout + (wait_seconds or 0)
        response = self.request("GET", "/v1/flags", params=params, headers=headers, timeout=timeout, ok=(200, 304))
        tag = response.headers.get("ETag", etag)
        if response.status_code == 304:
            return FlagPage([], after, False, tag, True)
        page = response.json()
        return FlagPage(page.get("items", []), page.get("next"), bool(page.get("hasMore")), tag, False)

    def iter_flags(self, baseline=None, status=None, limit=500):
        """Every flag that matches, page after page (follows ``next`` until no more)."""
        after = None
        while True:
            page = self.flags(baseline=baseline, status=status, after=after, limit=limit)
            yield from page.items
            if not page.has_more or not page.next:
                return
            after = page.next

    def review_flag(self, flag_id, status, note=None, reviewer=None):
        """``POST /v1/flags/{id}/review`` (reviewer): ``status`` "confirmed" or "dismissed"; returns the flag."""
        body = {"status": status, "note": note, "reviewer": reviewer}
        return self._post(f"/v1/flags/{flag_id}/review", body, retry=False)
