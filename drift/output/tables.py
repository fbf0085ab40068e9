"""CSV files safe to open in a spreadsheet.

A spreadsheet runs a cell that begins with ``=``, ``+``, ``-`` or ``@`` as a formula (and
some also after a leading tab or carriage return), so a player named ``=HYPERLINK(...)`` in
an export could act when the CSV is opened. drift writes such *text* cells with a leading
apostrophe (``'=HYPERLINK(...)``), the spreadsheet convention for "this is text". Numbers
are never changed: a negative number is a number, not text.
"""

from __future__ import annotations

__all__ = ["neutralise", "write_csv", "RISKY_STARTS"]

#: first characters that make a spreadsheet treat a text cell as a formula
RISKY_STARTS = ("=", "+", "-", "@", "\t", "\r")


def _safe(value):
    if isinstance(value, str) and value.startswith(RISKY_STARTS):
        return "'" + value
    return value


def _neutralised(series):
    """``series.map(_safe)``, computed once per distinct text when every cell is text or missing."""
    import pandas as pd

    if pd.api.types.infer_dtype(series, skipna=True) != "string":
        return series.map(_safe)
    risky = series.str.startswith(RISKY_STARTS, na=False)
    if not risky.any():
        return series
    out = series.copy()
    out[risky] = "'" + series[risky]
    return out


def neutralise(frame):
    """A copy of ``frame`` whose text cells cannot start a spreadsheet formula."""
    import pandas as pd

    out = frame.copy()
    for col in out.columns:
        series = out[col]
        if pd.api.types.is_object_dtype(series) or pd.api.types.is_string_dtype(series):
            out[col] = _neutralised(series)
    safe_names = [_safe(c) if isinstance(c, str) else c for c in out.columns]
    out.columns = safe_names
    return out


def write_csv(frame, path, **kwargs):
    """Write ``frame`` like ``DataFrame.to_csv(path, index=False)``, with text neutralised."""
    if kwargs:
        neutralise(frame).to_csv(path, index=False, **kwargs)
        return
    from drift.output._fastcsv import write_frame  # the same bytes as to_csv, formatted column by column

    write_frame(neutralise(frame), path)
