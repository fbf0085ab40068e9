"""Reading files: season labels from names, CSV row shapes, duplicate names, Excel sheets."""

from __future__ import annotations

import pandas as pd
import pytest
from conftest import small_table

from drift.errors import InputError
from drift.intake._readers import season_label
from drift.intake.read import read_seasons


@pytest.mark.parametrize("name, season", [
    ("2024-25", "2024-25"), ("team1610_2024-25", "2024-25"), ("export_2023-24_final", "2023-24"),
    ("2024-2025", "2024-25"), ("2024_25", "2024-25"), ("1999-00", "1999-00"), ("2023", "2023"),
    ("stats 2019-20 regular", "2019-20"), ("1610_2024", "2024"),
])
def test_season_from_name(name, season):
    assert season_label(name) == (season, None)


@pytest.mark.parametrize("name, words", [
    ("2023-24_vs_2024-25", "several seasons"), ("export_2025_2024-25", "not two consecutive"),
    ("2024-26", "not two consecutive"), ("players", "holds no season"), ("team1610", "holds no season"),
])
def test_ambiguous_or_missing_season_names_are_refused(name, words):
    label, problem = season_label(name)
    assert label is None and words in problem


def _error(path, config=None):
    with pytest.raises(InputError) as info:
        read_seasons(path, config)
    return str(info.value)


def _one_season():
    return small_table(seasons=("2024-25",)).drop(columns="season")


def test_team_number_in_file_name_is_not_a_season(tmp_path):
    _one_season().to_csv(tmp_path / "team1610_2024-25.csv", index=False)
    assert set(read_seasons(tmp_path).table["season"]) == {"2024-25"}


def test_file_name_without_a_season_is_refused(tmp_path):
    _one_season().to_csv(tmp_path / "team1610.csv", index=False)
    assert "team1610.csv: the name 'team1610' holds no season" in _error(tmp_path)


def test_season_column_disagreeing_with_file_name_is_refused(tmp_path):
    t = small_table(seasons=("2023-24",))
    t.to_csv(tmp_path / "2024-25.csv", index=False)
    msg = _error(tmp_path)
    assert "row 2, column 'season': season '2023-24' disagrees with the season '2024-25'" in msg


def test_short_row_is_refused_with_its_number(tmp_path):
    path = tmp_path / "2024-25.csv"
    _one_season().to_csv(path, index=False)
    lines = path.read_text().splitlines()
    lines[3] = ",".join(lines[3].split(",")[:-2])
    path.write_text("\n".join(lines) + "\n")
    assert "row 4: row has 7 fields where the header has 9" in _error(path)


def test_long_row_is_refused_with_its_number(tmp_path):
    path = tmp_path / "2024-25.csv"
    _one_season().to_csv(path, index=False)
    lines = path.read_text().splitlines()
    lines[2] += ",7"
    path.write_text("\n".join(lines) + "\n")
    assert "row 3: row has 10 fields where the header has 9" in _error(path)


def test_truncated_last_row_is_refused(tmp_path):
    path = tmp_path / "2024-25.csv"
    _one_season().to_csv(path, index=False)
    text = path.read_text().rstrip("\n")
    path.write_text(text[: text.rfind(",")])
    msg = _error(path)
    assert "row 7: row has 8 fields where the header has 9 (the last row: is the file cut short?)" in msg


def test_duplicate_column_names_are_refused(tmp_path):
    path = tmp_path / "2024-25.csv"
    t = _one_season()
    t.insert(len(t.columns), "usage_pct_2", t["usage_pct"])
    t.to_csv(path, index=False)
    path.write_text(path.read_text().replace("usage_pct_2", "usage_pct", 1))
    assert "column name(s) ['usage_pct'] appear more than once" in _error(path)


def test_two_columns_read_as_one_name_are_refused(tmp_path):
    t = _one_season()
    t["USG_PCT"] = t["usage_pct"]
    t.to_csv(tmp_path / "2024-25.csv", index=False)
    assert "columns ['usage_pct', 'USG_PCT'] would all be read as 'usage_pct'" in _error(tmp_path)


def _book(path, sheets):
    with pd.ExcelWriter(path) as writer:
        for name, (frame, startrow) in sheets.items():
            frame.to_excel(writer, sheet_name=name, index=False, startrow=startrow)


def test_notes_sheet_first_and_title_rows_above_the_header(tmp_path):
    path = tmp_path / "2024-25.xlsx"
    notes = pd.DataFrame({"About": ["exported for the staff", "minutes are totals"]})
    _book(path, {"Notes": (notes, 0), "Players": (_one_season(), 3)})
    raw = read_seasons(path)
    assert len(raw.table) == 6 and raw.table["source_row"].iloc[0] == 5  # header on row 4
    assert raw.table["source_file"].iloc[0].endswith("sheet 'Players'")


def test_several_data_sheets_alike_are_read_whole(tmp_path):
    path = tmp_path / "league.xlsx"
    a = small_table(seasons=("2023-24",)).drop(columns="season")
    _book(path, {"2023-24": (a, 0), "2024-25": (a, 0)})
    assert sorted(read_seasons(path).table["season"].unique()) == ["2023-24", "2024-25"]


def test_several_data_sheets_that_differ_are_refused(tmp_path):
    path = tmp_path / "2024-25.xlsx"
    _book(path, {"A": (_one_season(), 0), "B": (_one_season().drop(columns="ts_pct"), 0)})
    msg = _error(path)
    assert "several data sheets ('A', 'B') whose columns differ" in msg and "[intake] sheet" in msg


def test_named_sheet_is_read_and_a_missing_one_refused(tmp_path):
    from drift.config import Config

    path = tmp_path / "2024-25.xlsx"
    _book(path, {"A": (_one_season(), 0), "B": (_one_season().drop(columns="ts_pct"), 0)})
    assert "ts_pct" not in read_seasons(path, Config(sheet="B")).features
    assert "has no sheet 'C'" in _error(path, Config(sheet="C"))


def test_no_header_row_is_refused_clearly(tmp_path):
    path = tmp_path / "2024-25.xlsx"
    _book(path, {"Notes": (pd.DataFrame({"About": ["x"]}), 0),
                 "Data": (_one_season().drop(columns="minutes"), 2)})
    msg = _error(path)
    assert "no sheet has a header row" in msg and "sheet 'Data' lacks ['minutes']" in msg


def test_blank_row_inside_an_excel_table_is_refused(tmp_path):
    path = tmp_path / "2024-25.xlsx"
    t = _one_season().astype(object)
    t.loc[2, :] = None
    _book(path, {"Data": (t, 0)})
    assert "row 4: row is empty inside the table" in _error(path)


# --- Excel kinds, hidden sheets, encrypted workbooks, files misnamed -----------------------------

def _xls(path, sheets):
    """An Excel 97-2003 workbook written by xlwt: {name: (frame, hidden)}."""
    import xlwt

    book = xlwt.Workbook()
    for name, (frame, hidden) in sheets.items():
        sheet = book.add_sheet(name)
        for j, column in enumerate(frame.columns):
            sheet.write(0, j, column)
        for i, row in enumerate(frame.itertuples(index=False), start=1):
            for j, value in enumerate(row):
                sheet.write(i, j, value.item() if hasattr(value, "item") else value)
        if hidden:
            sheet.visibility = 1
    book.save(str(path))


def test_xls_workbook_is_read_like_its_csv(tmp_path):
    t = _one_season()
    t.to_csv(tmp_path / "2024-25.csv", index=False)
    (tmp_path / "book").mkdir()
    _xls(tmp_path / "book" / "2024-25.xls", {"Players": (t, False)})
    from_csv = read_seasons(tmp_path / "2024-25.csv").table.drop(columns="source_file")
    raw = read_seasons(tmp_path / "book")
    pd.testing.assert_frame_equal(raw.table.drop(columns="source_file"), from_csv)
    assert raw.reading.sources["read_as"].iloc[0] == "Excel workbook (.xls)"


def test_xls_in_a_folder_is_never_skipped(tmp_path):
    t = small_table(seasons=("2023-24",)).drop(columns="season")
    t.to_csv(tmp_path / "2023-24.csv", index=False)
    _xls(tmp_path / "2024-25.xls", {"Players": (t, False)})
    assert sorted(read_seasons(tmp_path).table["season"].unique()) == ["2023-24", "2024-25"]


def test_hidden_sheets_are_skipped_and_said(tmp_path):
    import warnings

    from drift.errors import DataQualityWarning

    path = tmp_path / "league.xlsx"
    a = small_table(seasons=("2023-24",)).drop(columns="season")
    _book(path, {"2023-24": (a, 0), "2022-23": (a, 0)})
    from openpyxl import load_workbook

    book = load_workbook(path)
    book["2022-23"].sheet_state = "hidden"
    book.save(path)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", DataQualityWarning)
        raw = read_seasons(path)
    assert list(raw.table["season"].unique()) == ["2023-24"]
    assert any("hidden sheet(s) '2022-23' skipped" in str(w.message) for w in caught)
    from drift.config import Config

    assert list(read_seasons(path, Config(sheet="2022-23")).table["season"].unique()) == ["2022-23"]


def test_hidden_sheets_of_an_xls_are_skipped_and_only_hidden_data_refused(tmp_path):
    import warnings

    a = small_table(seasons=("2023-24",)).drop(columns="season")
    _xls(tmp_path / "2023-24.xls", {"Shown": (a, False), "Old": (a.head(2), True)})
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        assert len(read_seasons(tmp_path / "2023-24.xls").table) == len(a)
    _xls(tmp_path / "2022-23.xls", {"Notes": (pd.DataFrame({"About": ["x"]}), False), "Data": (a, True)})
    assert "its only data sheet(s) ['Data'] are hidden" in _error(tmp_path / "2022-23.xls")


def test_encrypted_workbook_is_refused_in_plain_words(tmp_path):
    import msoffcrypto.format.ooxml

    plain = tmp_path / "plain.xlsx"
    _book(plain, {"Players": (_one_season(), 0)})
    locked = tmp_path / "2024-25.xlsx"
    with open(plain, "rb") as src, open(locked, "wb") as dst:
        msoffcrypto.format.ooxml.OOXMLFile(src).encrypt("secret", dst)
    msg = _error(locked)
    assert "protected with a password (encrypted)" in msg and "remove the password" in msg
    assert "install" not in msg


def test_encrypted_xls_is_refused_in_plain_words(tmp_path, monkeypatch):
    import xlrd

    def locked(*args, **kwargs):  # what xlrd raises for a BIFF workbook with a password
        raise xlrd.biffh.XLRDError("Workbook is encrypted")

    _xls(tmp_path / "2024-25.xls", {"Players": (_one_season(), False)})
    monkeypatch.setattr(xlrd, "open_workbook", locked)
    assert "protected with a password (encrypted)" in _error(tmp_path / "2024-25.xls")


def test_web_page_saved_as_xls_is_refused(tmp_path):
    (tmp_path / "2024-25.xls").write_text("<html><table><tr><td>PLAYER_ID</td></tr></table></html>")
    assert "is a web page or XML file despite its '.xls' name" in _error(tmp_path)


def test_tab_text_saved_as_xls_is_read_as_text_and_said(tmp_path):
    import warnings

    t = _one_season()
    t.to_csv(tmp_path / "2024-25.xls", sep="\t", index=False)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        raw = read_seasons(tmp_path)
    assert len(raw.table) == len(t)
    assert any("is text despite its '.xls' name; read as delimited text" in str(w.message) for w in caught)


def test_workbook_named_csv_is_read_as_one(tmp_path):
    import warnings

    _book(tmp_path / "2024-25.csv", {"Players": (_one_season(), 0)})
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        assert len(read_seasons(tmp_path).table) == 6
    assert any("is an Excel workbook (.xlsx) despite its '.csv' name" in str(w.message) for w in caught)


@pytest.mark.parametrize("suffix", [".ods", ".xlsb", ".numbers"])
def test_spreadsheets_drift_cannot_read_are_refused_not_skipped(tmp_path, suffix):
    _one_season().to_csv(tmp_path / "2023-24.csv", index=False)
    (tmp_path / f"2024-25{suffix}").write_bytes(b"PK\x03\x04 not read")
    assert f"2024-25{suffix}: is " in _error(tmp_path) and "save it as .xlsx" in _error(tmp_path)


def test_misspelt_required_column_gets_the_closest_names(tmp_path):
    t = _one_season().rename(columns={"team": "TEAM_ABREVIATION"})
    t.to_csv(tmp_path / "2024-25.csv", index=False)
    msg = _error(tmp_path)
    assert "missing required column(s) ['team']; did you mean TEAM_ABREVIATION (for team)?" in msg
    assert 'If so, rename it or map it in the config: [columns] team = "TEAM_ABREVIATION"' in msg
    _book(tmp_path / "2024-25.xlsx", {"Players": (t, 2)})
    assert "lacks ['team'] (did you mean TEAM_ABREVIATION (for team)?)" in _error(tmp_path / "2024-25.xlsx")


def test_one_column_header_says_the_separator(tmp_path):
    (tmp_path / "2024-25.csv").write_text("player_id:team:games:minutes:usage_pct\nP1:AAA:50:900:20\n")
    assert "the header reads as one column" in _error(tmp_path) and "[intake.csv] separator" in _error(tmp_path)
