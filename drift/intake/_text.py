"""Delimited text (CSV, TSV): the encoding, the separator, and every record checked before pandas reads it.

* **Encoding** (:func:`decode`): the config's ``[intake.csv] encoding`` when given; else a
  byte-order mark (UTF-8, UTF-16, UTF-32); else UTF-16 without a mark when every other byte
  of the start is zero; else UTF-8; else Windows-1252, unless most of the file's non-ASCII
  bytes form UTF-8 sequences: then it is a UTF-8 file with a broken byte, refused at that
  row, never read as another encoding (which would garble every accented name).
* **Separator** (:func:`sniff_separator`): ``[intake.csv] separator`` when given; else, of
  comma, semicolon, tab and bar, the one that splits the header into two or more names and
  the most of the first rows into as many fields (ties go to the comma).
* **Records** (:func:`check_records`): read as RFC 4180 says, so a quoted cell may hold the
  separator, quotes written twice and any line break (CR, LF, form feed, U+0085, U+2028);
  outside quotes only CR and LF end a row. Every row needs the header's number of fields;
  blank rows only at the end; a quote left open is refused. A file cut inside its last cell
  still has the right number of fields, so when the file does not end with a line break its
  last cell is compared with the rest of its column and refused when it is shorter, or has
  fewer decimals, than (nearly) every other (:func:`_looks_cut`).

Rows are numbered as a spreadsheet shows them: the header is row 1, and a row whose quoted
cell holds a line break is still one row.
"""

from __future__ import annotations

import csv
import io
import re
from dataclasses import dataclass

from drift.errors import InputError

__all__ = ["TextFormat", "read_delimited", "decode", "sniff_separator", "check_records", "SEPARATORS"]

#: separators drift detects, and their names
SEPARATORS = {",": "comma", ";": "semicolon", "\t": "tab", "|": "bar"}
_BOMS = ((b"\xff\xfe\x00\x00", "utf-32", "UTF-32"), (b"\x00\x00\xfe\xff", "utf-32", "UTF-32"),
         (b"\xef\xbb\xbf", "utf-8-sig", "UTF-8 with a byte-order mark"), (b"\xff\xfe", "utf-16", "UTF-16"),
         (b"\xfe\xff", "utf-16", "UTF-16"))
_UTF8_SEQUENCE = re.compile(rb"[\xc2-\xdf][\x80-\xbf]|[\xe0-\xef][\x80-\xbf]{2}|[\xf0-\xf4][\x80-\xbf]{3}")
#: the sniffer reads this much of the file's start
_SNIFF_CHARS = 65536
_SNIFF_ROWS = 50
#: a last cell shorter than all but this share of its column looks cut (when the file has no final line break)
_CUT_SHARE = 0.02
_CUT_MIN_ROWS = 50
_NUMBER = re.compile(r"^[-+]?(\d+([.,]\d*)?|[.,]\d+)%?$")


@dataclass(frozen=True)
class TextFormat:
    """How a text file was read: the separator, the encoding's name, and whether drift chose them."""

    separator: str
    encoding: str
    detected_separator: bool
    detected_encoding: bool

    def describe(self) -> str:
        """``"text, semicolon-separated, Windows-1252"``: what ``drift check`` lists per file."""
        return f"text, {SEPARATORS.get(self.separator, repr(self.separator))}-separated, {self.encoding}"

    def said(self) -> tuple:
        """Notes for what drift detected and that differs from plain comma-separated UTF-8."""
        notes = []
        if self.detected_separator and self.separator != ",":
            notes.append(f"read as {SEPARATORS[self.separator]}-separated text (detected from the header; "
                         "set [intake.csv] separator if wrong)")
        if self.detected_encoding and not self.encoding.startswith("UTF-8"):
            check = " (check accented names; set [intake.csv] encoding if they look wrong)" \
                if self.encoding == "Windows-1252" else ""
            notes.append(f"read as {self.encoding} text, not UTF-8{check}")
        return tuple(notes)


def _row_of(raw: bytes, offset: int) -> int:
    return raw.count(b"\n", 0, offset) + 1


def decode(raw: bytes, where, encoding=None):
    """(text, the encoding's name, detected?) for a file's bytes; see the module docstring."""
    import codecs

    if encoding is not None:
        name = codecs.lookup(encoding).name
        try:
            return raw.decode(name).removeprefix("\ufeff"), encoding, False
        except UnicodeDecodeError as exc:
            raise InputError(f"is not valid {encoding} text (byte {exc.start}); fix [intake.csv] encoding or "
                             "save the file as CSV UTF-8", file=where, row=_row_of(raw, exc.start)) from None
    for mark, codec, label in _BOMS:
        if raw.startswith(mark):
            try:
                return raw.decode(codec), label, True
            except UnicodeDecodeError as exc:
                raise InputError(f"starts with a {label} byte-order mark but is not {label} text (byte "
                                 f"{exc.start}); save it again as CSV UTF-8", file=where) from None
    head = raw[:4096]
    if b"\x00" in head:
        half = max(1, len(head) // 2)
        even, odd = head[0::2].count(0), head[1::2].count(0)
        codec = "utf-16-le" if odd > 0.4 * half and even < 0.05 * half else (
            "utf-16-be" if even > 0.4 * half and odd < 0.05 * half else None)
        if codec is None:
            raise InputError("is not a text file (it holds binary data); give a CSV, .xlsx, .xls or .parquet "
                             "file", file=where)
        try:
            return raw.decode(codec), "UTF-16", True
        except UnicodeDecodeError:
            raise InputError("looks like UTF-16 text without a byte-order mark but does not decode as one; "
                             "save it as CSV UTF-8", file=where) from None
    try:
        return raw.decode("utf-8"), "UTF-8", True
    except UnicodeDecodeError as exc:
        bad = exc.start
    sequences = _UTF8_SEQUENCE.findall(raw)
    stray = len(raw.translate(None, bytes(range(128)))) - sum(len(q) for q in sequences)
    if len(sequences) > stray:  # mostly UTF-8: a broken byte, not another encoding
        raise InputError(f"is UTF-8 text with a broken byte (byte {bad}, value 0x{raw[bad]:02x}); fix that "
                         "cell or export the file again", file=where, row=_row_of(raw, bad))
    try:
        return raw.decode("cp1252"), "Windows-1252", True
    except UnicodeDecodeError as exc:
        raise InputError(f"is neither UTF-8 nor Windows-1252 text (byte {exc.start}); save it as CSV UTF-8, or "
                         "name its encoding in the config: [intake.csv] encoding = \"...\"", file=where,
                         row=_row_of(raw, exc.start)) from None


def _records(text, separator, limit=None):
    reader = csv.reader(io.StringIO(text, newline=""), delimiter=separator)
    out = []
    for record in reader:
        out.append(record)
        if limit is not None and len(out) >= limit:
            break
    return out


def sniff_separator(text: str, separator=None):
    """(separator, detected?): the config's, else the best of :data:`SEPARATORS` on the file's first rows."""
    if separator is not None:
        return separator, False
    head = text[:_SNIFF_CHARS]
    if len(text) > _SNIFF_CHARS:  # drop the row the cut may have split
        head = head[: max(head.rfind("\n"), 0)] or head
    best, best_score = ",", (-1.0, 0)
    for sep in SEPARATORS:
        try:
            rows = [r for r in _records(head, sep, limit=_SNIFF_ROWS) if any(c.strip() for c in r)]
        except csv.Error:
            continue
        if not rows or len(rows[0]) < 2:
            continue
        width = len(rows[0])
        agree = sum(len(r) == width for r in rows[1:]) / max(1, len(rows) - 1)
        score = (agree, width)
        if score > best_score:
            best, best_score = sep, score
    return best, True


def _blank(record) -> bool:
    return not any(cell.strip() for cell in record)


def _decimals(cell: str) -> int:
    cell = cell.strip().rstrip("%")
    for mark in ".,":
        if mark in cell:
            return len(cell) - cell.index(mark) - 1
    return 0


def _looks_cut(cell: str, others: list):
    """Why a file's very last cell looks cut short, or None (see the module docstring)."""
    import numpy as np

    filled = [o.strip() for o in others if o.strip()]
    if len(filled) < 3:
        return None
    text = cell.strip()
    if not text:
        empty_share = 1 - len(filled) / len(others)
        return "is empty where its column is filled" if empty_share <= _CUT_SHARE else None
    lengths = np.array([len(o) for o in filled])
    many = len(filled) >= _CUT_MIN_ROWS
    if len(text) < lengths.min() or (many and np.mean(lengths <= len(text)) <= _CUT_SHARE):
        every = "every" if len(text) < lengths.min() else "nearly every"
        return f"is shorter than {every} other value of its column"
    if _NUMBER.match(text) and all(_NUMBER.match(o) for o in filled):
        places = np.array([_decimals(o) for o in filled])
        d = _decimals(text)
        if d < places.min() or (many and np.mean(places <= d) <= _CUT_SHARE):
            every = "every" if d < places.min() else "nearly every"
            return f"has {d} decimal(s) where {every} other value of its column has more"
    return None


def _shape(records, where):
    """(header, the last column's cells of the data rows, the last row's number), streaming the records.

    Only one column is kept in memory: a long file is checked in one pass without a copy of
    every cell.
    """
    header, last_cells, width = None, [], 0
    blank_at, bad, last = None, None, 0
    for i, record in enumerate(records, start=1):
        if _blank(record):
            blank_at = blank_at or i
            continue
        if header is None:
            header, width, last = record, len(record), i
            continue
        if blank_at is not None or bad is not None:
            row, n = (blank_at, 0) if blank_at is not None and (bad is None or blank_at < bad[0]) else bad
            _refuse_width(row, n, width, False, where)
        if len(record) != width:
            bad = (i, len(record))
        else:
            last_cells.append(record[-1])
        last = i
    if header is None:
        raise InputError("file is empty; remove it or add its season's rows", file=where)
    if bad is not None:
        _refuse_width(bad[0], bad[1], width, True, where)
    return header, last_cells, last


def _refuse_width(row, n, width, is_last, where):
    cut = " (the last row: is the file cut short?)" if is_last else ""
    what = "is empty" if n == 0 else f"has {n} fields where the header has {width}"
    raise InputError(f"row {what}{cut}; every row needs one value per column (leave a cell empty, not missing)",
                     file=where, row=row)


def check_records(text: str, separator: str, where):
    """Refuse rows of the wrong width, blank rows inside, a quote left open and a cut last row.

    Returns the header's names.
    """
    try:
        header, last_cells, last = _shape(csv.reader(io.StringIO(text, newline=""), delimiter=separator,
                                                     strict=True), where)
    except csv.Error as exc:
        if "unexpected end of data" in str(exc):
            done = sum(1 for _ in csv.reader(io.StringIO(text, newline=""), delimiter=separator))
            raise InputError("a quote opens a cell that never closes before the file ends (the file is cut "
                             "short, or a closing quote is missing); fix the quotes or export the file again",
                             file=where, row=max(done, 1)) from None
        # a stray quote inside a cell ('12"5'): read as pandas reads it
        header, last_cells, last = _shape(csv.reader(io.StringIO(text, newline=""), delimiter=separator), where)
    if last_cells and not text.rstrip(" \t\x1a").endswith(("\n", "\r")):
        why = _looks_cut(last_cells[-1], last_cells[:-1])
        if why:
            raise InputError(
                f"the file ends inside its last row: there is no line break after it and its last cell "
                f"{last_cells[-1]!r} (column {header[-1].strip()!r}) {why}, so the file looks cut short; "
                "export it again (if it is whole, end it with a line break)", file=where, row=last)
    return [str(c) for c in header]


def read_delimited(path, *, separator=None, encoding=None, raw=None):
    """(text, header, :class:`TextFormat`) of a delimited text file, every record checked."""
    if raw is None:
        raw = path.read_bytes()
    text, enc_name, enc_detected = decode(raw, path, encoding)
    if not text.strip():
        raise InputError("file is empty; remove it or add its season's rows", file=path)
    sep, sep_detected = sniff_separator(text, separator)
    header = check_records(text, sep, path)
    return text, header, TextFormat(sep, enc_name, sep_detected, enc_detected)
