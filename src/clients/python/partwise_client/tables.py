"""Conversions between the caller's tables and the service's Table shape ``{"parts", "rows", "ids"}``.

A table may be given as
  * a pandas DataFrame: one column per part; the index holds the sample ids (a default RangeIndex sends no ids),
    or a column named ``id`` does;
  * a list of dicts, one per sample: ``{"id": "well-07/2026-03-02", "Ca": 31.9, ...}`` (``id`` optional);
  * a list of lists (or tuples) of numbers, with ``parts`` (and optionally ``ids``) given beside it;
  * a dict already in the service's shape (``parts``, ``rows``, optional ``ids``).
Answers that are tables come back as DataFrames with the sample ids as the index when pandas is installed, else
as ``{"columns", "ids", "rows"}`` dicts.
"""
import math

try:  # pandas is optional: without it tables come back as plain dicts
    import pandas as _pd
except ImportError:  # pragma: no cover - exercised only where pandas is missing
    _pd = None

ID_COLUMN = "id"


def pandas_available():
    """True when pandas can be imported, so answers can be DataFrames."""
    return _pd is not None


def _number(value):
    """A float for JSON; NaN, infinities and missing cells become None so the service points at the cell (400)."""
    if value is None:
        return None
    v = float(value)
    return v if math.isfinite(v) else None


def _is_frame(data):
    return _pd is not None and isinstance(data, _pd.DataFrame)


def to_table(data, parts=None, ids=None):
    """Returns ``{"parts": [...], "rows": [[...]], "ids": [...]}`` (``ids`` only when known) from ``data``.

    Args:
        data: a DataFrame, a list of dicts, a list of lists or a Table dict (see the module's docstring).
        parts: the parts to send, in this order; required for a list of lists, optional otherwise (a subset
            or reordering of the columns).
        ids: sample ids, overriding those found in ``data``.

    Raises:
        ValueError: when the shape cannot be told (a list of lists without ``parts``, an empty list without parts).
        TypeError: when ``data`` is of no supported kind.
    """
    found_ids = None
    if _is_frame(data):
        frame = data
        if ID_COLUMN in frame.columns:
            found_ids = [str(v) for v in frame[ID_COLUMN]]
            frame = frame.drop(columns=[ID_COLUMN])
        elif not _is_default_index(frame.index):
            found_ids = [str(v) for v in frame.index]
        names = [str(c) for c in frame.columns] if parts is None else list(parts)
        selected = frame if parts is None else frame[list(parts)]
        rows = [[_number(v) for v in row] for row in selected.itertuples(index=False, name=None)]
    elif isinstance(data, dict) and "rows" in data:
        names = list(parts if parts is not None else data["parts"])
        rows = [[_number(v) for v in row] for row in data["rows"]]
        found_ids = data.get("ids")
    elif isinstance(data, (list, tuple)):
        if len(data) and isinstance(data[0], dict):
            names = list(parts) if parts is not None else [k for k in data[0] if k != ID_COLUMN]
            if all(ID_COLUMN in r for r in data):
                found_ids = [str(r[ID_COLUMN]) for r in data]
            rows = [[_number(r.get(p)) for p in names] for r in data]
        else:
            if parts is None:
                raise ValueError("a list of rows needs `parts` (the part names, one per column)")
            names = list(parts)
            rows = [[_number(v) for v in row] for row in data]
    else:
        raise TypeError(f"cannot make a table of {type(data).__name__}: give a DataFrame, a list of dicts or a list of lists with parts")
    table = {"parts": names, "rows": rows}
    chosen = ids if ids is not None else found_ids
    if chosen is not None:
        table["ids"] = [str(i) for i in chosen]
    return table


def rows_and_ids(data):
    """(rows, ids or None) of a matrix of numbers that is not a composition (coordinates, ratio values).

    ``data``: a DataFrame (index: the ids unless the default 0..n-1), a table dict of an answer
    (``{"columns", "ids", "rows"}``) or of a request (``{"rows", "ids"}``), or a list of lists.
    """
    if _is_frame(data):
        ids = None if _is_default_index(data.index) else [str(v) for v in data.index]
        return [[_number(v) for v in row] for row in data.itertuples(index=False, name=None)], ids
    if isinstance(data, dict):
        return [[_number(v) for v in row] for row in data["rows"]], data.get("ids")
    return [[_number(v) for v in row] for row in data], None


def _is_default_index(index):
    """True for the unnamed 0..n-1 RangeIndex pandas gives a frame without ids."""
    return isinstance(index, _pd.RangeIndex) and index.name is None and index.start == 0 and index.step == 1


def from_table(columns, rows, ids=None, frames=True, attrs=None):
    """An answer's table: a DataFrame (index: the sample ids, named ``id``) or a ``{"columns", "ids", "rows"}`` dict.

    Args:
        columns: the column labels (part names or log-ratio labels).
        rows: the rows of numbers.
        ids: the sample ids, or None (then the index is 0..n-1).
        frames: return a DataFrame when pandas is installed; False gives the dict.
        attrs: the rest of the answer (``imputed``, ``basis``, ...), kept in ``DataFrame.attrs`` or in the dict.
    """
    attrs = dict(attrs or {})
    if frames and _pd is not None:
        index = _pd.Index(ids, name=ID_COLUMN) if ids is not None else None
        frame = _pd.DataFrame([list(r) for r in rows], columns=list(columns), index=index, dtype=float)
        frame.attrs.update(attrs)
        return frame
    out = {"columns": list(columns), "ids": list(ids) if ids is not None else None, "rows": [list(r) for r in rows]}
    out.update(attrs)
    return out


def square(matrix, names, frames=True):
    """A square matrix labelled by ``names`` on both sides: a DataFrame, or the list of lists as it came."""
    if frames and _pd is not None:
        return _pd.DataFrame(matrix, index=list(names), columns=list(names), dtype=float)
    return matrix


def series(values, names, frames=True):
    """A vector labelled by ``names``: a pandas Series, or a dict from name to value."""
    if frames and _pd is not None:
        return _pd.Series(values, index=list(names), dtype=float)
    return dict(zip(names, values))


def to_samples(data, observed_at=None, source=None):
    """Screening samples ``[{"id", "values": {part: value}, "observedAt", "source"}]`` from the caller's data.

    ``data`` is a DataFrame (index or ``id`` column: the sample ids; optional ``observedAt`` and ``source``
    columns), a list of such dicts already in the service's shape, a list of flat dicts
    (``{"id": ..., "Ca": ..., "observedAt": ...}``) or one sample dict. Every sample needs an id: screening is
    idempotent on it, which is what makes a retry safe.
    """
    meta = ("observedAt", "source", ID_COLUMN)
    if isinstance(data, dict):
        data = [data]
    if _is_frame(data):
        records = []
        frame = data
        if ID_COLUMN not in frame.columns:
            frame = frame.reset_index().rename(columns={frame.index.name or "index": ID_COLUMN})
        records = frame.to_dict(orient="records")
    else:
        records = list(data)
    samples = []
    for k, r in enumerate(records):
        if "values" in r:
            sample = dict(r)
            sample["values"] = {p: _number(v) for p, v in r["values"].items()}
        else:
            sample = {"values": {str(p): _number(v) for p, v in r.items() if p not in meta}}
            for key in meta:
                if key in r and r[key] is not None:
                    sample[key] = r[key]
        if sample.get(ID_COLUMN) is None:
            raise ValueError(f"sample {k} has no id: screening needs one per sample (it makes a retry idempotent)")
        sample[ID_COLUMN] = str(sample[ID_COLUMN])
        if observed_at is not None and "observedAt" not in sample:
            sample["observedAt"] = observed_at
        if source is not None and "source" not in sample:
            sample["source"] = source
        if "observedAt" in sample and not isinstance(sample["observedAt"], str):
            sample["observedAt"] = _timestamp(sample["observedAt"])
        samples.append(sample)
    return samples


def _timestamp(value):
    """An ISO 8601 text of a datetime or pandas Timestamp (UTC assumed when naive)."""
    text = value.isoformat()
    return text if (value.tzinfo is not None) else text + "Z"


def log_moments(data, amalgamations=None, parts=None):
    """The ``moments`` body of ``/v1/ratio-selection`` computed here: count, names and covariance (divisor n - 1).

    The covariance is that of the natural logs of the parts, then of each named amalgamation's sum, in the order
    of ``names`` (API.md, "moments"). Every value must be > 0: replace or drop zeros first. Pure Python; for data
    too large for memory compute the same sums in a distributed engine instead (README, "Selecting ratios").
    """
    table = to_table(data, parts=parts)
    names = list(table["parts"])
    amalgamations = dict(amalgamations or {})
    index = {p: j for j, p in enumerate(names)}
    columns = names + list(amalgamations)
    logs = []
    for i, row in enumerate(table["rows"]):
        if any(v is None or v <= 0 for v in row):
            raise ValueError(f"row {i} has a zero, negative or missing value: a log of it has no value")
        values = [math.log(v) for v in row]
        values += [math.log(sum(row[index[q]] for q in members)) for members in amalgamations.values()]
        logs.append(values)
    n = len(logs)
    if n < 2:
        raise ValueError("moments need at least two rows")
    m = len(columns)
    means = [sum(r[a] for r in logs) / n for a in range(m)]
    covariance = [[0.0] * m for _ in range(m)]
    for a in range(m):
        for b in range(a, m):
            c = sum((r[a] - means[a]) * (r[b] - means[b]) for r in logs) / (n - 1)
            covariance[a][b] = covariance[b][a] = c
    return {"names": columns, "covariance": covariance, "count": n}
