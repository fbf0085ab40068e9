"""Delimited text: encodings and separators detected and said, any valid quoted cell, cut files refused."""

from __future__ import annotations

import warnings

import pandas as pd
import pytest
from exports import small_league, write_text_export

from drift.config import Config
from drift.errors import DataQualityWarning, InputError
from drift.intake.read import read_seasons


def _read(path, config=None):
    """read_seasons, returning (raw, the warnings it gave)."""
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", DataQualityWarning)
        raw = read_seasons(path, config)
    return raw, [str(w.message) for w in caught]


def _error(path, config=None):
    with pytest.raises(InputError) as info:
        read_seasons(path, config)
    return str(info.value)


@pytest.fixture(scope="module")
def league():
    return small_league(seasons=("2023-24",))


@pytest.fixture(scope="module")
def expected(league, tmp_path_factory):
    """The league as read from a plain comma-separated UTF-8 export: what every other form must give."""
    folder = tmp_path_factory.mktemp("plain")
    write_text_export(league, folder)
    raw, said = _read(folder)
    assert not said  # plain CSV UTF-8 is the default: nothing to say
    return raw.table.drop(columns="source_file")


@pytest.mark.parametrize("encoding, label", [
    ("utf-8-sig", None), ("utf-16", "UTF-16"), ("utf-16-le", "UTF-16"), ("cp1252", "Windows-1252")])
@pytest.mark.parametrize("separator, word", [(",", None), (";", "semicolon"), ("\t", "tab"), ("|", "bar")])
def test_encoding_and_separator_are_detected_and_said(league, expected, tmp_path, encoding, label, separator,
                                                      word):
    write_text_export(league, tmp_path, separator=separator, encoding=encoding,
                      line_end="\r\n" if separator == ";" else "\n")
    raw, said = _read(tmp_path)
    pd.testing.assert_frame_equal(raw.table.drop(columns="source_file"), expected)
    assert "Rémy Varton" in set(raw.table["player"])  # accents read right in every encoding
    text = " ".join(said)
    assert (f"read as {label} text, not UTF-8" in text) == (label is not None)
    assert (f"read as {word}-separated text" in text) == (word is not None)
    listed = raw.reading.sources["read_as"].iloc[0]
    assert listed.startswith("text, ") and (word or "comma") in listed


def test_semicolons_with_decimal_commas(league, expected, tmp_path):
    write_text_export(league, tmp_path, separator=";", decimal=",", encoding="cp1252")
    raw, said = _read(tmp_path)
    pd.testing.assert_frame_equal(raw.table.drop(columns="source_file"), expected, check_exact=False)
    assert any("decimal commas parsed as numbers" in s for s in said)


def test_separator_and_encoding_given_in_the_config_are_used_and_not_said(league, expected, tmp_path):
    write_text_export(league, tmp_path, separator=";", encoding="cp1252")
    raw, said = _read(tmp_path, Config(csv={"separator": "semicolon", "encoding": "windows-1252"}))
    pd.testing.assert_frame_equal(raw.table.drop(columns="source_file"), expected)
    assert not said


def test_wrong_encoding_in_the_config_is_refused_at_its_row(league, tmp_path):
    write_text_export(league, tmp_path, encoding="utf-16")
    msg = _error(tmp_path, Config(csv={"encoding": "utf-8"}))
    assert "2023-24.csv, row 1: is not valid utf-8 text" in msg and "[intake.csv] encoding" in msg


@pytest.mark.parametrize("inside", ["\r", "\n", "\r\n", "\u2028", "\u0085", "\x0c", ";", ",", '""'])
def test_any_valid_quoted_cell_is_read(league, expected, tmp_path, inside):
    path = write_text_export(league, tmp_path)[0]
    text = path.read_text(encoding="utf-8").replace("Rémy Varton", f'"Rémy{inside}Varton"', 1)
    path.write_text(text, encoding="utf-8", newline="")
    raw, _ = _read(tmp_path)
    names = list(raw.table["player"])
    shown = inside.replace('""', '"')
    assert f"Rémy{shown}Varton" in names  # the cell, as written
    pd.testing.assert_frame_equal(raw.table.drop(columns=["source_file", "player"]),
                                  expected.drop(columns="player"))


def test_unquoted_unicode_line_separators_are_part_of_a_cell(league, expected, tmp_path):
    path = write_text_export(league, tmp_path)[0]
    text = path.read_text(encoding="utf-8").replace("Rémy Varton", "Rémy\u2028Var\x85ton", 1)
    path.write_text(text, encoding="utf-8", newline="")
    raw, _ = _read(tmp_path)
    assert "Rémy\u2028Var\x85ton" in set(raw.table["player"]) and len(raw.table) == len(expected)


def test_broken_utf8_byte_is_refused_at_its_row(league, tmp_path):
    path = write_text_export(league, tmp_path)[0]
    data = path.read_bytes()
    at = data.index(b"Orren")
    path.write_bytes(data[:at] + b"\xff" + data[at + 1:])  # the file also holds UTF-8 accents
    row = data[:at].count(b"\n") + 1
    msg = _error(tmp_path)
    assert f"2023-24.csv, row {row}: is UTF-8 text with a broken byte" in msg and "0xff" in msg


def test_binary_data_in_a_text_file_is_refused(tmp_path):
    (tmp_path / "2023-24.csv").write_bytes(b"player_id,team\x00\x01\x02,games\n" * 3)
    assert "is not a text file (it holds binary data)" in _error(tmp_path)


def test_quote_left_open_is_refused_with_its_row(league, tmp_path):
    path = write_text_export(league, tmp_path)[0]
    lines = path.read_text(encoding="utf-8").splitlines(keepends=True)
    lines[5] = lines[5].replace("Rémy", '"Rémy', 1) if "Rémy" in lines[5] else lines[5].replace(",", ',"', 1)
    path.write_text("".join(lines), encoding="utf-8")
    msg = _error(tmp_path)
    assert "row 6: a quote opens a cell that never closes" in msg


def test_file_cut_inside_its_last_cell_is_refused_with_the_row(league, tmp_path):
    path = write_text_export(league, tmp_path)[0]
    text = path.read_text(encoding="utf-8")
    rows = text.count("\n")
    path.write_text(text[:-4], encoding="utf-8")  # '0.5321\n' -> '0.53': the right number of fields
    msg = _error(tmp_path)
    assert f"row {rows}: the file ends inside its last row" in msg and "column 'TS_PCT'" in msg
    assert "looks cut short" in msg


def test_file_cut_inside_a_row_is_refused_with_the_row(league, tmp_path):
    path = write_text_export(league, tmp_path)[0]
    text = path.read_text(encoding="utf-8")
    rows = text.count("\n")
    path.write_text(text[: text.rindex("\n", 0, len(text) - 1) + 20], encoding="utf-8")
    assert f"row {rows}: row has" in _error(tmp_path) and "cut short" in _error(tmp_path)


def test_whole_file_without_a_final_line_break_is_read(league, expected, tmp_path):
    write_text_export(league, tmp_path, final_line_break=False)  # as some spreadsheet tools write it
    raw, _ = _read(tmp_path)
    pd.testing.assert_frame_equal(raw.table.drop(columns="source_file"), expected)


def test_cut_last_cell_among_fixed_decimals_is_caught_however_it_is_cut(league, tmp_path):
    table = league.copy()
    table["ts_pct"] = table["ts_pct"].map(lambda v: f"{v:.4f}")  # fixed decimals, as Excel writes them
    path = write_text_export(table, tmp_path)[0]
    text = path.read_text(encoding="utf-8").rstrip("\n")
    for cut in range(1, 6):  # '0.5321' -> '0.532', '0.53', '0.5', '0.', '0'
        path.write_text(text[:-cut], encoding="utf-8")
        assert "looks cut short" in _error(tmp_path), cut


def test_windows_1252_with_a_byte_pair_that_looks_like_utf8_is_still_windows_1252(league, tmp_path):
    table = league.copy()
    table.loc[0, "player"] = "LÉ’Varton"  # 0xC9 0x92 in Windows-1252: a valid UTF-8 pair by chance
    write_text_export(table, tmp_path, encoding="cp1252")
    raw, said = _read(tmp_path)
    assert raw.table.loc[0, "player"] == "LÉ’Varton" and "Rémy Varton" in set(raw.table["player"])
    assert any("read as Windows-1252 text" in s for s in said)


def test_unnamed_columns_are_dropped_when_empty_and_refused_when_not(league, expected, tmp_path):
    path = write_text_export(league, tmp_path)[0]
    lines = path.read_text(encoding="utf-8").splitlines()
    path.write_text("\n".join(line + "," for line in lines) + "\n", encoding="utf-8")  # a trailing separator
    raw, _ = _read(tmp_path)
    pd.testing.assert_frame_equal(raw.table.drop(columns="source_file"), expected)
    lines = [line + ("," if i != 3 else ",7") for i, line in enumerate(lines)]
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    assert "column 15 has values but no name" in _error(tmp_path)
