"""Excel workbooks: find the data sheet(s) and the header row, read them whole or refuse.

A sheet is a *data sheet* when one of its first :data:`~drift.rawtables.MAX_HEADER_ROW`
rows names every required column (after the config's ``[columns]`` map and drift's
name rules). Title rows above that header are skipped; sheets without such a row
(notes, read-me, pivot sheets) are skipped. Hidden sheets are skipped and said (unless
``[intake] sheet`` names one). Several data sheets are read whole when their columns
agree and refused when they differ, so a workbook is never read half. ``.xlsx`` is read by
openpyxl, ``.xls`` by xlrd; an encrypted workbook is refused in plain words.
"""

from __future__ import annotations

from pathlib import Path

from drift.errors import InputError
from drift.intake._rawtables import ENCRYPTED_MESSAGE, MAX_HEADER_ROW, RawTable, refuse_duplicates, season_label

__all__ = ["read_workbook"]


def _header_row(rows, required, recognise):
    """(index of the header row, what it lacks at best) in the sheet's first rows.

    When no row names every required column, what the best row lacks comes with the
    export's closest names (``lacks ['team'] (did you mean TEAM_ABREVIATION ...)``).
    """
    from drift.intake._names import did_you_mean

    best, best_names = sorted(required), []
    for i, row in enumerate(rows[:MAX_HEADER_ROW]):
        names = [str(v).strip() for v in row if v is not None and str(v).strip() and str(v) != "nan"]
        lacking = sorted(set(required) - recognise(names))
        if not lacking:
            return i, []
        if len(lacking) < len(best):
            best, best_names = lacking, names
    close, _ = did_you_mean(best, best_names)
    return None, f"{best} ({close})" if close else best


def _table(raw, header_at, where):
    """The sheet below its header as a DataFrame of objects; blank rows inside refused."""
    import pandas as pd

    body = raw.iloc[header_at + 1:]
    filled = body.notna().any(axis=1).to_numpy()
    last = len(filled) - 1 - filled[::-1].argmax() if filled.any() else -1
    body = body.iloc[: last + 1]
    gaps = ~filled[: last + 1]
    if gaps.any():
        row = header_at + 2 + int(gaps.argmax())
        raise InputError("row is empty inside the table; delete it so the rows below are not cut off",
                         file=where, row=row)
    header = raw.iloc[header_at].tolist()
    keep, names = [], []
    for j, name in enumerate(header):
        text = "" if name is None or (isinstance(name, float) and pd.isna(name)) else str(name).strip()
        if not text:
            if body.iloc[:, j].notna().any():
                raise InputError(f"column {j + 1} has values but no name in the header row "
                                 f"(row {header_at + 1}); give it a name or delete it", file=where)
            continue
        keep.append(j)
        names.append(text)
    refuse_duplicates(names, where)
    frame = body.iloc[:, keep].copy()
    frame.columns = names
    return frame.reset_index(drop=True)


def _xls_cell(cell, xlrd):
    kind = cell.ctype
    if kind in (xlrd.XL_CELL_EMPTY, xlrd.XL_CELL_BLANK):
        return None
    if kind == xlrd.XL_CELL_ERROR:  # '#N/A' and the like: an empty marker like any other
        return xlrd.error_text_from_code.get(cell.value, "#N/A")
    return cell.value


class _Book:
    """A workbook's sheet names, which are shown, and each sheet as a frame of cells (header=None).

    ``.xlsx`` goes through pandas and openpyxl; ``.xls`` through xlrd directly (pandas is
    retiring its xlrd engine), its cells typed the same way (empty -> None, errors -> their text).
    """

    def __init__(self, path, engine):
        self.path, self.engine = path, engine
        if engine == "xlrd":
            try:
                import xlrd
            except ImportError:
                raise InputError("reading .xls workbooks needs xlrd: pip install xlrd (or save the file as "
                                 ".xlsx)", file=path) from None
            self._xlrd = xlrd
            self.book = _refusing_encrypted(lambda: xlrd.open_workbook(str(path), on_demand=True), path)
            self.names = list(self.book.sheet_names())
            self.shown = {n: self.book.sheet_by_name(n).visibility == 0 for n in self.names}
        else:
            import pandas as pd

            self.book = _refusing_encrypted(lambda: pd.ExcelFile(path, engine=engine), path)
            self.names = list(self.book.sheet_names)
            self.shown = {ws.title: getattr(ws, "sheet_state", "visible") == "visible"
                          for ws in self.book.book.worksheets}

    def sheet(self, name):
        import pandas as pd

        if self.engine != "xlrd":
            return pd.read_excel(self.book, sheet_name=name, header=None, dtype=object)
        sheet = self.book.sheet_by_name(name)
        rows = [[_xls_cell(c, self._xlrd) for c in sheet.row(i)] for i in range(sheet.nrows)]
        return pd.DataFrame(rows, dtype=object)

    def close(self):
        if self.engine == "xlrd":
            self.book.release_resources()
        else:
            self.book.close()


def _refusing_encrypted(open_book, path):
    try:
        return open_book()
    except InputError:
        raise
    except Exception as exc:
        if "encrypt" in str(exc).lower():  # xlrd: "Workbook is encrypted"
            raise InputError(ENCRYPTED_MESSAGE, file=path) from None
        raise


def _data_sheets(book, names, required, recognise):
    found, skipped = [], {}
    for name in names:
        raw = book.sheet(name)
        raw = raw.astype(object).where(raw.notna(), None)
        at, lacking = _header_row(raw.values.tolist(), required, recognise)
        if at is None:
            skipped[name] = lacking
        else:
            found.append((name, raw, at))
    return found, skipped


def read_workbook(path: Path, *, required, sheet=None, recognise, engine="openpyxl", said=()):
    """Every data sheet of a workbook as :class:`RawTable` s (see the module docstring).

    ``engine``: ``"openpyxl"`` (``.xlsx``) or ``"xlrd"`` (``.xls``); ``said``: notes the caller
    adds to every table (what the file turned out to be).
    """
    book = _Book(path, engine)
    try:
        names = book.names
        if sheet is not None:
            if sheet not in names:
                raise InputError(f"has no sheet {sheet!r} (config [intake] sheet); its sheets: {names}",
                                 file=path)
            names, hidden = [sheet], []
        else:
            hidden = [n for n in names if not book.shown.get(n, True)]
            names = [n for n in names if book.shown.get(n, True)]
        found, skipped = _data_sheets(book, names, required, recognise)
        if not found and hidden and _data_sheets(book, hidden, required, recognise)[0]:
            raise InputError(f"its only data sheet(s) {hidden} are hidden; unhide the one to read, or name it "
                             "with [intake] sheet", file=path)
    finally:
        book.close()
    if hidden:
        said = tuple(said) + (f"hidden sheet(s) {', '.join(repr(n) for n in hidden)} skipped (name one with "
                              "[intake] sheet to read it)",)
    if not found:
        detail = "; ".join(f"sheet {n!r} lacks {lack}" for n, lack in skipped.items())
        raise InputError(
            f"no sheet has a header row (within its first {MAX_HEADER_ROW} rows) naming the required columns "
            f"({detail}); map your names in the config's [columns] table, or name the sheet with "
            "[intake] sheet", file=path)
    form = f"Excel workbook ({'.xls' if engine == 'xlrd' else '.xlsx'})"
    tables = []
    for name, raw, at in found:
        where = f"{path}, sheet {name!r}"
        label, problem = season_label(name)
        if label is None:
            label, problem = season_label(path.stem)
        tables.append(RawTable(_table(raw, at, where), where, at + 2, label, problem, form=form, said=said))
    if len(tables) > 1:
        first = list(tables[0].frame.columns)
        for t in tables[1:]:
            if sorted(t.frame.columns) != sorted(first):
                extra = sorted(set(t.frame.columns) ^ set(first))
                raise InputError(
                    f"has several data sheets ({', '.join(repr(n) for n, _, _ in found)}) whose columns differ "
                    f"({extra[:6]}); name the one to read with [intake] sheet, or give them the same columns "
                    "to read them all", file=path)
    return tables
