"""Reading one export file into raw tables, and season labels from names.

* CSV: every line must have as many fields as the header; a short or long row
  (a truncated last row included) is refused with its row number, so no value is
  ever shifted into the wrong column. Blank lines are allowed only at the end.
* Excel: the sheet holding drift's required columns is used (or ``[intake] sheet``).
  The header may sit below title rows (the first of the first 20 rows that holds
  the required columns). Several data sheets with the same columns are read whole,
  each a table; with different columns they are refused.
* Parquet: as stored.

Duplicate column names are refused in every format. The table type, season labels from
file and sheet names and the duplicate check live in :mod:`drift.rawtables`, shared with
:mod:`drift.workbooks`.
"""

from __future__ import annotations

from pathlib import Path

from drift.constants import DISTRIBUTION
from drift.errors import InputError
from drift.intake._rawtables import MAX_HEADER_ROW, RawTable, normalise_season, refuse_duplicates, season_label

__all__ = ["MAX_HEADER_ROW", "RawTable", "normalise_season", "read_tables", "season_label"]


def _check_csv_shape(path: Path):
    """Refuse rows whose field count differs from the header's (one cheap pass over the text)."""
    import csv
    import io

    text = path.read_text(encoding="utf-8-sig")
    lines = text.splitlines()
    while lines and not lines[-1].strip():
        lines.pop()
    if not lines:
        raise InputError("file is empty; remove it or add its season's rows", file=path)
    if '"' in text:
        counts = [len(r) for r in csv.reader(io.StringIO("\n".join(lines)))]
    else:
        counts = [ln.count(",") + 1 if ln.strip() else 0 for ln in lines]
    width = counts[0]
    for i, n in enumerate(counts[1:], start=2):
        if n != width:
            last = " (the last row: is the file cut short?)" if i == len(counts) else ""
            what = "is empty" if n == 0 else f"has {n} fields where the header has {width}"
            raise InputError(f"row {what}{last}; every row needs one value per column (leave a cell "
                             "empty, not missing)", file=path, row=i)


def _read_csv(path: Path, text_columns):
    import pandas as pd

    from drift.intake._cells import EMPTY_MARKERS

    _check_csv_shape(path)
    # pandas renames a repeated header to NAME.1: read the raw first line to see repeats
    refuse_duplicates(_raw_header(path), path)
    header = pd.read_csv(path, nrows=0, encoding="utf-8-sig")
    names = [str(c).strip() for c in header.columns]
    text_columns = text_columns(names)
    markers = sorted({m for m in EMPTY_MARKERS} | {m.upper() for m in EMPTY_MARKERS} |
                     {m.title() for m in EMPTY_MARKERS})
    dtypes = {raw: str for raw, name in zip(header.columns, names) if name in text_columns}
    frame = pd.read_csv(path, dtype=dtypes, keep_default_na=False, na_values=markers,
                        skipinitialspace=True, encoding="utf-8-sig")
    frame.columns = names
    return [RawTable(frame, str(path), 2, *season_label(path.stem))]


def _raw_header(path: Path):
    import csv

    with open(path, encoding="utf-8-sig", newline="") as fh:
        return next(csv.reader(fh), [])


def read_tables(path: Path, *, text_columns, recognise, required=(), sheet=None):
    """Read one file into :class:`RawTable` s (one, or one per Excel data sheet).

    ``text_columns``: a function from the header's names to those to keep as text
    (ids, names, teams), so they are never parsed as numbers. ``recognise``: a
    function from a list of column names to the set of drift's names they provide;
    a sheet or header row is a data one when it provides every name in ``required``.
    """
    import pandas as pd

    suffix = path.suffix.lower()
    try:
        if suffix == ".csv":
            return _read_csv(path, text_columns)
        if suffix == ".xlsx":
            from drift.intake._workbooks import read_workbook

            return read_workbook(path, required=required, sheet=sheet, recognise=recognise)
        try:
            frame = pd.read_parquet(path)
        except ImportError:
            raise InputError(f"reading Parquet needs pyarrow: pip install pyarrow (or '{DISTRIBUTION}[parquet]')",
                             file=path) from None
        refuse_duplicates(frame.columns, path)
        frame.columns = [str(c).strip() for c in frame.columns]
        return [RawTable(frame, str(path), 2, *season_label(path.stem))]
    except InputError:
        raise
    except (pd.errors.EmptyDataError, StopIteration):
        raise InputError("file is empty; remove it or add its season's rows", file=path) from None
    except UnicodeDecodeError:
        raise InputError("file is not UTF-8 text; save it as CSV UTF-8", file=path) from None
    except Exception as exc:  # any reader failure is the user's file, not our bug
        reason = str(exc).splitlines()[0] if str(exc) else type(exc).__name__
        raise InputError(f"cannot read file ({reason}); check it opens and is not corrupt", file=path) from None
