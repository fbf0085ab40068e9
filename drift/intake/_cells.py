"""Cell values: empty-cell markers, and numbers parsed once per column.

Every format (CSV, Excel, Parquet) goes through the same two functions, so a
cell means the same wherever it was typed:

* :data:`EMPTY_MARKERS` (compared after trimming spaces, ignoring case) are empty
  cells: a missing value.
* :func:`numeric_column` turns a column into floats in one pass. A column the
  reader already parsed as numbers is taken as it is; a text column is converted
  once. A whole column of percent strings (``"15.9%"``) or of decimal commas
  (``"15,9"``) is parsed and the conversion is reported; a column with only some
  cells that are not numbers is refused, naming those cells.
"""

from __future__ import annotations

import re

from drift.errors import InputError

__all__ = ["EMPTY_MARKERS", "numeric_column", "text_column", "is_empty_marker"]

#: cell texts read as an empty cell in every format (trimmed, any case)
EMPTY_MARKERS = ("", "n/a", "na", "nan", "-", "--", "\u2013", "\u2014", "null", "none", "#n/a", "?")
_PERCENT = re.compile(r"^[-+]?(\d+(\.\d*)?|\.\d+)\s*%$")
_DECIMAL_COMMA = re.compile(r"^[-+]?\d*,\d+$")
_INTEGER = re.compile(r"^[-+]?\d+$")
_THOUSANDS = re.compile(r"^[-+]?\d{1,3}(,\d{3})+$")


def is_empty_marker(series):
    """Boolean mask of cells that are empty or an :data:`EMPTY_MARKERS` text."""
    import pandas as pd

    text = series.astype("string").str.strip().str.lower()
    return series.isna().to_numpy() | text.isin(EMPTY_MARKERS).fillna(True).to_numpy() | pd.isna(text).to_numpy()


def text_column(series):
    """Trimmed text with empty markers as missing; whole numbers read by Excel lose their ``.0``."""
    import pandas as pd

    if series.dtype == object:
        series = series.map(lambda v: str(int(v)) if isinstance(v, float) and v.is_integer() else v)
    text = series.astype("string").str.strip()
    return text.mask(pd.Series(is_empty_marker(series), index=series.index))


def _cells(text, mask, first_row, limit=5):
    import numpy as np

    idx = np.flatnonzero(mask)
    shown = ", ".join(f"row {first_row + i} {text.iloc[i]!r}" for i in idx[:limit])
    more = f" and {len(idx) - limit} more" if len(idx) > limit else ""
    return shown + more, len(idx)


#: no count, rate or sample size in a season comes near this; larger values are broken cells
#: (squares of them overflow the arithmetic and would turn results into NaN)
MAX_MAGNITUDE = 1e9


def numeric_column(series, *, where: dict, first_row: int = 2):
    """Floats from one column, parsed once.

    Parameters
    ----------
    series : Series
        As the reader gave it (floats, or objects/strings).
    where : dict
        ``file`` and ``column`` for error messages.
    first_row : int
        Spreadsheet row number of the first value (a CSV's header is row 1).

    Returns
    -------
    values : ndarray of float (NaN where empty)
    how : str
        ``""`` for plain numbers, ``"percent strings"`` (values kept in percent
        units, the ``%`` dropped) or ``"decimal commas"``.

    Raises
    ------
    InputError
        Some cells are not numbers, a value is infinite, or commas are ambiguous.
    """
    import numpy as np
    import pandas as pd

    how = ""
    if pd.api.types.is_numeric_dtype(series.dtype) and not pd.api.types.is_bool_dtype(series.dtype):
        values = series.to_numpy(dtype=float, na_value=np.nan)
    else:
        empty = is_empty_marker(series)
        values = pd.to_numeric(series.mask(empty), errors="coerce").to_numpy(dtype=float, na_value=np.nan)
        bad = ~empty & np.isnan(values)
        if bad.any():
            values, how = _unusual_text(series, empty, bad, where, first_row)
    infinite = np.isinf(values)
    if infinite.any():
        i = int(np.flatnonzero(infinite)[0])
        raise InputError(f"value {series.iloc[i]!r} is infinite; give a finite number or leave it empty",
                         row=first_row + i, **where)
    huge = np.abs(values) > MAX_MAGNITUDE
    if huge.any():
        i = int(np.flatnonzero(huge)[0])
        raise InputError(f"value {series.iloc[i]!r} is too large (beyond {MAX_MAGNITUDE:.0e}) for any count or "
                         "rate; check the cell", row=first_row + i, **where)
    return values, how


def _unusual_text(series, empty, bad, where, first_row):
    """A whole column of percent strings or decimal commas is parsed; anything else is refused."""
    import numpy as np
    import pandas as pd

    text = series.astype("string").str.strip().fillna("")
    filled = ~empty
    percent = text.str.match(_PERCENT.pattern).to_numpy(dtype=bool)
    comma = text.str.match(_DECIMAL_COMMA.pattern).to_numpy(dtype=bool)
    integer = text.str.match(_INTEGER.pattern).to_numpy(dtype=bool)
    if percent[filled].all():
        values = pd.to_numeric(text.str.rstrip("%").str.strip().mask(empty), errors="coerce")
        return values.to_numpy(dtype=float, na_value=np.nan), "percent strings"
    if (comma | integer)[filled].all():
        if text[comma].str.match(_THOUSANDS.pattern).all():
            shown, _ = _cells(text, comma, first_row, limit=2)
            raise InputError(
                f"commas in {shown} could be decimal commas or thousands separators; re-export the "
                "file with a dot as the decimal mark and no thousands separators", **where)
        values = pd.to_numeric(text.str.replace(",", ".", regex=False).mask(empty), errors="coerce")
        return values.to_numpy(dtype=float, na_value=np.nan), "decimal commas"
    shown, n = _cells(text, bad, first_row)
    if percent[filled].any():
        hint = "some cells have a % sign and some do not; give the whole column in one form"
    else:
        hint = ("this column must be numeric; fix these cells or leave them empty (empty cells and "
                f"{', '.join(repr(m) for m in EMPTY_MARKERS[1:5])} ... mean missing)")
    raise InputError(f"{n} value(s) are not numbers: {shown}; {hint}", **where)
