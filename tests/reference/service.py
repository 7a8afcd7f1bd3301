"""HTTP access to the service under test, the one tolerance rule of the checks, and reading column labels."""
import csv
import io
import re

import numpy as np
import requests

TIMEOUT = 120

# The checks compare with numpy to 1e-10, relative and absolute: |a - b| <= ABS + REL * max(|a|, |b|).
REL = 1e-10
ABS = 1e-10


class ServiceError(AssertionError):
    """The service answered with another status than expected."""


def post_json(base, path, body, expect=200, headers=None):
    """POSTs a JSON body and returns the parsed JSON answer; a status other than `expect` fails the check."""
    response = requests.post(base + path, json=body, timeout=TIMEOUT, headers=headers or {})
    if response.status_code != expect:
        raise ServiceError(f"POST {path}: status {response.status_code}, expected {expect}: {response.text[:800]}")
    return response.json()


def post_csv(base, path, text, params=None, accept_csv=True, expect=200):
    """POSTs a text/csv body with options as query parameters; returns the response text (CSV) or JSON."""
    headers = {"Content-Type": "text/csv"}
    if accept_csv:
        headers["Accept"] = "text/csv"
    response = requests.post(base + path, data=text.encode("utf-8"), params=params or {}, headers=headers, timeout=TIMEOUT)
    if response.status_code != expect:
        raise ServiceError(f"POST {path} (text/csv): status {response.status_code}, expected {expect}: {response.text[:800]}")
    if accept_csv:
        media = response.headers.get("Content-Type", "")
        if not media.startswith("text/csv"):
            raise ServiceError(f"POST {path}: asked for text/csv, got Content-Type '{media}'")
        return response.text
    return response.json()


def table_csv(parts, rows, ids=None):
    """A CSV body: header of part names (with a first column `id` when ids are given), full-precision numbers."""
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow((["id"] if ids is not None else []) + list(parts))
    for i, row in enumerate(rows):
        writer.writerow(([ids[i]] if ids is not None else []) + [repr(float(v)) for v in row])
    return out.getvalue()


def read_csv(text):
    """(header, ids or None, float matrix) of a CSV answer; a first column named `id` holds the ids."""
    rows = list(csv.reader(io.StringIO(text)))
    rows = [r for r in rows if r]
    header, body = rows[0], rows[1:]
    if header and header[0] == "id":
        return header[1:], [r[0] for r in body], np.array([[float(v) for v in r[1:]] for r in body])
    return header, None, np.array([[float(v) for v in r] for r in body])


def assert_close(expected, actual, what, rel=REL, abs_=ABS):
    """Element-wise |a - e| <= abs + rel max(|a|, |e|), same shapes; the message names the worst element."""
    e = np.asarray(expected, dtype=float)
    a = np.asarray(actual, dtype=float)
    if e.shape != a.shape:
        raise AssertionError(f"{what}: shape {a.shape}, expected {e.shape}")
    if not np.all(np.isfinite(a)):
        raise AssertionError(f"{what}: non-finite values in the answer")
    bound = abs_ + rel * np.maximum(np.abs(e), np.abs(a))
    excess = np.abs(a - e) - bound
    if e.size and np.max(excess) > 0:
        k = np.unravel_index(np.argmax(excess), e.shape)
        raise AssertionError(
            f"{what}: at {tuple(int(i) for i in k)} expected {e[k]!r}, got {a[k]!r} (|diff| {abs(a[k] - e[k]):.3e})")


def assert_equal(expected, actual, what):
    if expected != actual:
        raise AssertionError(f"{what}: expected {expected!r}, got {actual!r}")


def parts_in_label(label, parts):
    """The part names that occur in a column label, in the order they occur (labels are read, not assumed)."""
    names = set(parts)
    return [t for t in re.findall(r"[A-Za-z0-9_]+", label) if t in names]


def columns_as_parts(columns, parts):
    """For clr-like answers: the part index of every column when each label names exactly one part, else None."""
    index = {p: j for j, p in enumerate(parts)}
    found = [parts_in_label(c, parts) for c in columns]
    if all(len(f) == 1 for f in found) and len({f[0] for f in found}) == len(columns):
        return [index[f[0]] for f in found]
    return None


def columns_as_pairs(columns, parts):
    """For ratio answers: (numerator, denominator) indices of every column whose label names two parts, else None."""
    index = {p: j for j, p in enumerate(parts)}
    found = [parts_in_label(c, parts) for c in columns]
    if all(len(f) == 2 for f in found):
        return [(index[f[0]], index[f[1]]) for f in found]
    return None
