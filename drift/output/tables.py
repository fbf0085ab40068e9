"""CSV files safe to open in a spreadsheet.

A spreadsheet runs a cell that begins with ``=``, ``+``, ``-`` or ``@`` as a formula (and
some also after a leading tab or carriage return), so a player named ``=HYPERLINK(...)`` in
an export could act when the CSV is opened. drift writes such *text* cells with a leading
apostrophe (``'=HYPERLINK(...)``), the spreadsheet convention for "this is text". Numbers
are never changed: a negative number is a number, not text.
"""

from __future__ import annotations

__all__ = ["neutralise", "write_csv", "write_parquet", "write_table", "with_role_names", "ROLE_COLUMNS",
           "RISKY_STARTS", "check_parquet"]

#: columns holding a role id; each gets a ``<column>_name`` column beside it in the written tables
ROLE_COLUMNS = ("role", "second_role", "role_from", "role_to", "projected_role", "comp_role")

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


def with_role_names(frame, names):
    """``frame`` with the role's name beside every role-id column (``role_from`` -> ``role_from_name``
    right after it), unless the table has that column already. ``names`` maps role id -> name; an id
    the map lacks (or a missing id) gets an empty name."""
    if frame is None or not len(frame.columns):
        return frame
    out = frame
    for col in ROLE_COLUMNS:
        named = f"{col}_name"
        if col in out.columns and named not in out.columns:
            if out is frame:
                out = frame.copy()
            values = out[col].map(names).where(out[col].notna(), "")
            out.insert(out.columns.get_loc(col) + 1, named, values.fillna("").astype(object))
    return out


def check_parquet(what="--format parquet"):
    """Refuse Parquet output before any work when pyarrow is missing (it is the optional extra ``parquet``)."""
    import importlib.util

    from drift.constants import DISTRIBUTION
    from drift.errors import ConfigError

    if importlib.util.find_spec("pyarrow") is None:
        raise ConfigError(f"{what} needs pyarrow: pip install pyarrow (or '{DISTRIBUTION}[parquet]'), "
                          "or write CSV (the default)")


def write_parquet(frame, path):
    """Write ``frame`` as Parquet with the same columns and values as its CSV (text is not prefixed:
    a Parquet file is not opened as a spreadsheet)."""
    frame.to_parquet(path, index=False)


def write_table(frame, path, *, table_format="csv"):
    """Write ``frame`` to ``path`` with its extension replaced by the format's ("placements.parquet")."""
    from pathlib import Path

    path = Path(path).with_suffix(f".{table_format}")
    if table_format == "parquet":
        write_parquet(frame, path)
    else:
        write_csv(frame, path)
    return path
