"""CSV text byte-identical to ``DataFrame.to_csv(path, index=False)``, about twice as fast.

pandas formats each float with numpy's shortest round-trip text and passes every
cell through the csv module; here each column is formatted once as a list of
strings (Python's ``repr`` gives the same shortest text as numpy) and rows are
joined in blocks, so memory stays bounded. Columns of other dtypes, a text cell
with a carriage return, or a single-column table go to pandas unchanged: the
output is then pandas' own. Spreadsheet safety is :mod:`drift.output.tables`'s job;
this module only formats.
"""

from __future__ import annotations

__all__ = ["write_frame", "BLOCK_ROWS"]

#: rows formatted at once (bounds the memory of the string cells)
BLOCK_ROWS = 50_000
_QUOTE_IF = (",", '"', "\n")


def _quoted(text: str) -> str:
    # the csv module's minimal quoting with pandas' settings (delimiter ",", lineterminator "\n")
    if any(c in text for c in _QUOTE_IF):
        return '"' + text.replace('"', '""') + '"'
    return text


def _text_cell(value) -> str:
    if value is None or (isinstance(value, float) and value != value):
        return ""
    try:
        import pandas as pd

        if value is pd.NA:
            return ""
    except ImportError:  # pragma: no cover
        pass
    return _quoted(str(value))


def _formatter(series):
    """A function formatting a block of ``series`` values as strings, or None to leave it to pandas."""
    import numpy as np
    import pandas as pd

    dtype = series.dtype
    if dtype == np.float64:
        def floats(values):
            out = [repr(v) for v in values.tolist()]
            for i in np.flatnonzero(np.isnan(values)):
                out[i] = ""
            return out
        return floats
    if dtype.kind in "iu" and isinstance(dtype, np.dtype):
        return lambda values: [str(v) for v in values.tolist()]
    if dtype == np.bool_:
        return lambda values: ["True" if v else "False" for v in values.tolist()]
    if dtype == object or isinstance(dtype, pd.StringDtype):
        return _texts
    return None


def _texts(values):
    """Text cells of a block, each distinct text formatted once (names, teams and roles repeat)."""
    import numpy as np
    import pandas as pd

    if pd.api.types.infer_dtype(values, skipna=True) != "string":
        return [_text_cell(v) for v in values]  # mixed cells: 1 and 1.0 must not be merged as one
    codes, uniques = pd.factorize(values, use_na_sentinel=True)
    table = np.array([_quoted(str(v)) for v in uniques] + [""], dtype=object)
    return table[codes].tolist()  # code -1 (a missing cell) picks the trailing ""


def _has_carriage_return(series) -> bool:
    import numpy as np

    if series.dtype.kind in "fiub":
        return False
    return any(isinstance(v, str) and "\r" in v for v in np.asarray(series, dtype=object))


def write_frame(frame, path) -> None:
    """Write ``frame`` exactly as ``frame.to_csv(path, index=False)`` would."""
    formatters = [_formatter(frame[c]) for c in frame.columns] if frame.columns.is_unique else [None]
    if (len(frame.columns) < 2 or any(f is None for f in formatters)
            or any(_has_carriage_return(frame[c]) for c in frame.columns)
            or any("\r" in str(c) for c in frame.columns)):
        frame.to_csv(path, index=False)
        return
    columns = [frame[c].to_numpy() for c in frame.columns]
    with open(path, "w", encoding="utf-8", newline="") as out:
        out.write(",".join(_quoted(str(c)) for c in frame.columns) + "\n")
        for start in range(0, len(frame), BLOCK_ROWS):
            cells = [fmt(col[start:start + BLOCK_ROWS]) for fmt, col in zip(formatters, columns)]
            out.write("".join(",".join(row) + "\n" for row in zip(*cells)))
