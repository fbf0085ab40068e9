"""A table as read from an export file, and the season a file or sheet name gives.

Shared by :mod:`drift.readers` (CSV, Parquet, and the dispatch by file type) and
:mod:`drift.workbooks` (Excel), so neither imports the other's internals.

Season labels (:func:`season_label`): a file or sheet name gives a season when it
holds exactly one of ``YYYY-YY`` (``2024-25``; ``_`` or ``/`` may stand for ``-``), ``YYYY-YYYY`` (``2024-2025``,
written ``2024-25``) or a lone year ``YYYY`` (1900-2099), not touching other
digits. Two years must be consecutive. ``team1610_2024-25`` gives ``2024-25``;
``2023-24_vs_2024-25`` or ``export_2025_2024-25`` are ambiguous and refused.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from drift.errors import InputError

__all__ = ["MAX_HEADER_ROW", "RawTable", "normalise_season", "refuse_duplicates", "season_label",
           "ENCRYPTED_MESSAGE"]

#: a header row is looked for in a sheet's first this-many rows
MAX_HEADER_ROW = 20
#: an encrypted (password-protected) workbook, in the user's words
ENCRYPTED_MESSAGE = ("the workbook is protected with a password (encrypted), so drift cannot open it; open it in "
                     "Excel, remove the password (File > Info > Protect Workbook), save it, and run again (or "
                     "save the sheet as CSV)")
_SEASON = re.compile(r"(?<![0-9])((?:19|20)\d{2})(?:[-_/](\d{4}|\d{2}))?(?![0-9])")


@dataclass(frozen=True)
class RawTable:
    """One table as read: ``frame`` with the export's column names, where it came from,
    the spreadsheet row of its first data row, and a season label from its file/sheet name.

    ``form`` says how the file was read (``"text, semicolon-separated, Windows-1252"``,
    ``"Excel workbook (.xls)"``); ``said`` holds notes on what the reader detected or skipped.
    """

    frame: object
    where: str
    first_row: int
    name_season: str | None
    name_problem: str | None
    form: str = ""
    said: tuple = ()


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


def refuse_duplicates(columns, where):
    """Refuse a header that names a column twice (``where``: the file or sheet, for the message)."""
    seen, dups = set(), []
    for c in columns:
        key = str(c).strip()
        if key in seen:
            dups.append(key)
        seen.add(key)
    if dups:
        raise InputError(f"column name(s) {sorted(set(dups))} appear more than once; rename or delete "
                         "the copies so each column has one name", file=where)
