"""Reading one export file into raw tables, and season labels from names.

A file is read as what its first bytes say it is, whatever its name: an Excel workbook
(``.xlsx``/``.xlsm`` by openpyxl, ``.xls`` by xlrd), Parquet, or delimited text. A
password-protected (encrypted) workbook, a web page saved as ``.xls`` and spreadsheet
kinds drift cannot read (``.ods``, ``.xlsb``, ``.numbers``) are refused in plain words.

* Text (CSV, TSV): encoding and separator detected or taken from ``[intake.csv]``, every
  record checked before pandas reads it (:mod:`drift.intake._text`): a short or long row,
  a blank row inside, a quote left open or a last row cut short is refused with its row
  number, so no value is ever shifted into the wrong column.
* Excel: the sheet holding drift's required columns is used (or ``[intake] sheet``).
  The header may sit below title rows (the first of the first 20 rows that holds
  the required columns). Several data sheets with the same columns are read whole,
  each a table; with different columns they are refused. Hidden sheets are skipped and said.
* Parquet: as stored.

Duplicate column names are refused in every format. The table type, season labels from
file and sheet names and the duplicate check live in :mod:`drift.rawtables`, shared with
:mod:`drift.workbooks`.
"""

from __future__ import annotations

from pathlib import Path

from drift.constants import DISTRIBUTION
from drift.errors import InputError
from drift.intake._rawtables import (ENCRYPTED_MESSAGE, MAX_HEADER_ROW, RawTable, normalise_season, refuse_duplicates,
                                     season_label)

__all__ = ["MAX_HEADER_ROW", "RawTable", "normalise_season", "read_tables", "season_label", "TEXT_SUFFIXES",
           "WORKBOOK_SUFFIXES", "UNREADABLE_SUFFIXES", "season_files"]


def _read_csv(path: Path, text_columns, csv_format, *, raw=None, said=()):
    import io

    import pandas as pd

    from drift.intake._cells import EMPTY_MARKERS
    from drift.intake._text import read_delimited

    text, header, form = read_delimited(path, separator=csv_format.get("separator"),
                                        encoding=csv_format.get("encoding"), raw=raw)
    refuse_duplicates(header, path)
    names = [str(c).strip() for c in header]
    text_columns = text_columns(names)
    markers = sorted({m for m in EMPTY_MARKERS} | {m.upper() for m in EMPTY_MARKERS} |
                     {m.title() for m in EMPTY_MARKERS})
    dtypes = {name: str for name in names if name in text_columns}
    frame = pd.read_csv(io.StringIO(text), sep=form.separator, header=0, names=names, dtype=dtypes,
                        keep_default_na=False, na_values=markers, skipinitialspace=True)
    unnamed = [j for j, name in enumerate(names) if not name]
    for j in unnamed:  # a trailing separator gives an empty, unnamed column: dropped; one with values refused
        if frame.iloc[:, j].notna().any():
            raise InputError(f"column {j + 1} has values but no name in the header row; give it a name or "
                             "delete it", file=path)
    if unnamed:
        frame = frame.iloc[:, [j for j in range(len(names)) if j not in unnamed]]
    return [RawTable(frame, str(path), 2, *season_label(path.stem), form=form.describe(),
                     said=tuple(said) + form.said())]


#: what a file's first bytes say it is
_ZIP, _OLE, _PARQUET = b"PK\x03\x04", b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1", b"PAR1"
#: the stream an encrypted Office file keeps its workbook in (names are UTF-16 in the container)
_ENCRYPTED = "EncryptedPackage".encode("utf-16-le")
TEXT_SUFFIXES = (".csv", ".tsv")
WORKBOOK_SUFFIXES = (".xlsx", ".xlsm", ".xls")
#: table files drift cannot read: refused by name, never skipped
UNREADABLE_SUFFIXES = {".ods": "an OpenDocument spreadsheet", ".xlsb": "a binary Excel workbook (.xlsb)",
                       ".numbers": "a Numbers document", ".xltx": "an Excel template", ".xlt": "an Excel template"}


def _content(path: Path) -> str:
    with open(path, "rb") as fh:
        head = fh.read(8)
    if head.startswith(_ZIP):
        return "zip"
    if head.startswith(_OLE):
        return "ole"
    if head.startswith(_PARQUET):
        return "parquet"
    return "text"


def _read_by_content(path: Path, kind: str, suffix: str, *, text_columns, recognise, required, sheet, csv):
    """Excel and text are told apart by their first bytes, not their names (exports misname them)."""
    from drift.intake._workbooks import read_workbook

    named = f"despite its '{suffix}' name" if suffix else "despite its name"
    if kind == "ole":
        if _ENCRYPTED in path.read_bytes():
            raise InputError(ENCRYPTED_MESSAGE, file=path)
        said = () if suffix == ".xls" else (f"is an Excel 97-2003 workbook (.xls) {named}; read as one",)
        return read_workbook(path, required=required, sheet=sheet, recognise=recognise, engine="xlrd",
                             said=said)
    if kind == "zip":
        said = () if suffix in (".xlsx", ".xlsm") else (f"is an Excel workbook (.xlsx) {named}; read as one",)
        return read_workbook(path, required=required, sheet=sheet, recognise=recognise, engine="openpyxl",
                             said=said)
    raw = path.read_bytes()
    if suffix not in WORKBOOK_SUFFIXES:
        return _read_csv(path, text_columns, csv, raw=raw)
    if raw[:512].lstrip(b"\xef\xbb\xbf \t\r\n").startswith(b"<"):
        raise InputError(f"is a web page or XML file {named}, not an Excel workbook; open it in Excel and "
                         "save it as .xlsx (Excel Workbook), or export the table as CSV", file=path)
    if suffix != ".xls":
        raise InputError("cannot read file (it is not an Excel workbook); check it opens and is not corrupt",
                         file=path)
    try:  # web exports often write tab-separated text under an .xls name
        return _read_csv(path, text_columns, csv, raw=raw, said=(f"is text {named}; read as delimited text",))
    except InputError as exc:
        raise InputError(f"is text {named} (not an Excel workbook), and read as text: {exc.message}",
                         file=exc.file, row=exc.row, column=exc.column) from None


def season_files(paths, supported) -> list[Path]:
    """The files to read: given files, and the season files of given folders.

    A folder's files with a ``supported`` suffix are read, and so are those of
    :data:`UNREADABLE_SUFFIXES` (refused by name when read): a spreadsheet drift cannot
    read is never skipped, which would lose its season without a word.
    """
    readable = tuple(supported) + tuple(UNREADABLE_SUFFIXES)
    files = []
    for p in paths:
        p = Path(p)
        if not p.exists():
            raise InputError("path not found; give a season file or a folder of them", file=p)
        if p.is_dir():
            found = sorted(f for f in p.iterdir() if f.is_file() and f.suffix.lower() in readable
                           and not f.name.startswith(("~$", ".")))
            if not found:
                raise InputError(
                    f"folder holds no season files ({', '.join(supported)})", file=p)
            files.extend(found)
        elif p.suffix.lower() in readable:
            files.append(p)
        else:
            raise InputError(
                f"unsupported file type '{p.suffix}'; use one of {', '.join(supported)}", file=p)
    return files


def read_tables(path: Path, *, text_columns, recognise, required=(), sheet=None, csv=None):
    """Read one file into :class:`RawTable` s (one, or one per Excel data sheet).

    ``text_columns``: a function from the header's names to those to keep as text
    (ids, names, teams), so they are never parsed as numbers. ``recognise``: a
    function from a list of column names to the set of drift's names they provide;
    a sheet or header row is a data one when it provides every name in ``required``.
    ``csv``: the config's ``[intake.csv]`` (``separator``, ``encoding``) for text files.
    """
    import pandas as pd

    suffix = path.suffix.lower()
    csv = csv or {}
    try:
        if suffix in UNREADABLE_SUFFIXES:
            raise InputError(f"is {UNREADABLE_SUFFIXES[suffix]}, which drift cannot read; save it as .xlsx "
                             "(Excel Workbook) or .csv", file=path)
        kind = _content(path)
        if kind != "parquet" and suffix != ".parquet":
            return _read_by_content(path, kind, suffix, text_columns=text_columns, recognise=recognise,
                                    required=required, sheet=sheet, csv=csv)
        try:
            frame = pd.read_parquet(path)
        except ImportError:
            raise InputError(f"reading Parquet needs pyarrow: pip install pyarrow (or '{DISTRIBUTION}[parquet]')",
                             file=path) from None
        refuse_duplicates(frame.columns, path)
        frame.columns = [str(c).strip() for c in frame.columns]
        return [RawTable(frame, str(path), 2, *season_label(path.stem), form="Parquet")]
    except InputError:
        raise
    except (pd.errors.EmptyDataError, StopIteration):
        raise InputError("file is empty; remove it or add its season's rows", file=path) from None
    except Exception as exc:  # any reader failure is the user's file, not our bug
        reason = str(exc).splitlines()[0] if str(exc) else type(exc).__name__
        raise InputError(f"cannot read file ({reason}); check it opens and is not corrupt", file=path) from None
