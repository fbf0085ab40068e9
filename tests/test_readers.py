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
