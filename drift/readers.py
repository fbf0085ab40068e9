"""Reading one export file into raw tables, and season labels from names.

* CSV: every line must have as many fields as the header; a short or long row
  (a truncated last row included) is refused with its row number, so no value is
  ever shifted into the wrong column. Blank lines are allowed only at the end.
* Excel: the sheet holding drift's required columns is used (or ``[intake] sheet``).
  The header may sit below title rows (the first of the first 20 rows that holds
  the required columns). Several data sheets with the same columns are read whole,
  each a table; with different columns they are refused.
* Parquet: as stored.

Duplicate column names are refused in every format.

Season labels (:func:`season_label`): a file or sheet name gives a season when it
holds exactly one of ``YYYY-YY`` (``2024-25``; ``_`` or ``/`` may stand for ``-``), ``YYYY-YYYY`` (``2024-2025``,
written ``2024-25``) or a lone year ``YYYY`` (1900-2099), not touching other
digits. Two years must be consecutive. ``team1610_2024-25`` gives ``2024-25``;
``2023-24_vs_2024-25`` or ``export_2025_2024-25`` are ambiguous and refused.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from pathlib import Path

from .errors import InputError

__all__ = ["RawTable", "read_tables", "season_label", "normalise_season", "MAX_HEADER_ROW"]

MAX_HEADER_ROW = 20
_SEASON = re.compile(r"(?<![0-9])((?:19|20)\d{2})(?:[-_/](\d{4}|\d{2}))?(?![0-9])")


@dataclass(frozen=True)
class RawTable:
    """One table as read: ``frame`` with the export's column names, where it came from,
    the spreadsheet row of its first data row, and a season label from its file/sheet name."""

    frame: object
    where: str
    first_row: int
    name_season: str | None
    name_problem: str | None


def normalise_season(text: str) -> str:
    """``'2024-2025'`` -> ``'2024-25'``; any other label is returned trimmed."""
    text = str(text).strip()
    m = re.fullmatch(r"((?:19|20)\d{2})[-/]((?:19|20)\d{2})", text)
    if m and int(m.group(2)) == int(m.group(1)) + 1:
        return f"{m.group(1)}-{m.group(2)[2:]}"
    if re.fullmatch(r"\d{4}\.0", text):  # a year read as a float from a spreadsheet
        return text[:4]
    return text


def season_label(name: str):
    """(label, problem): the season a file or sheet name holds, or why it holds none."""
    found = []
    for m in _SEASON.finditer(name):
        first, second = m.group(1), m.group(2)
        if second is None:
            found.append(first)
            continue
        end = int(second) if len(second) == 4 else int(first[:2] + second)
        if end != int(first) + 1 and not (len(second) == 2 and int(second) == (int(first) + 1) % 100):
            return None, (f"'{m.group(0)}' in the name {name!r} is not two consecutive years; name the file "
                          "like 2024-25.csv or add a season column")
        found.append(f"{first}-{(int(first) + 1) % 100:02d}")
    found = list(dict.fromkeys(found))
    if not found:
        return None, (f"the name {name!r} holds no season (2024-25, 2024-2025 or 2024); name the file "
                      "like 2024-25.csv or add a season column")
    if len(found) > 1:
        return None, (f"the name {name!r} holds several seasons ({', '.join(found)}); keep one in the name "
                      "or add a season column")
    return found[0], None


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


def _refuse_duplicates(columns, where):
    seen, dups = set(), []
    for c in columns:
        key = str(c).strip()
        if key in seen:
            dups.append(key)
        seen.add(key)
    if dups:
        raise InputError(f"column name(s) {sorted(set(dups))} appear more than once; rename or delete "
                         "the copies so each column has one name", file=where)


def _read_csv(path: Path, text_columns):
    import pandas as pd

    from .cells import EMPTY_MARKERS

    _check_csv_shape(path)
    # pandas renames a repeated header to NAME.1: read the raw first line to see repeats
    _refuse_duplicates(_raw_header(path), path)
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
            from .workbooks import read_workbook

            return read_workbook(path, required=required, sheet=sheet, recognise=recognise)
        try:
            frame = pd.read_parquet(path)
        except ImportError:
            raise InputError("reading Parquet needs pyarrow: pip install 'drift[parquet]'", file=path) from None
        _refuse_duplicates(frame.columns, path)
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
