"""Cells: empty markers alike in every format, numbers parsed once, bad cells named."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from conftest import small_table

from drift.errors import InputError
from drift.intake._cells import EMPTY_MARKERS, numeric_column
from drift.intake.read import read_seasons

WHERE = {"file": "f.csv", "column": "x"}


@pytest.mark.parametrize("suffix", [".csv", ".xlsx", ".parquet"])
def test_empty_markers_mean_missing_in_every_format(tmp_path, suffix):
    t = small_table(seasons=("2024-25",)).drop(columns="season").astype({"ppp_spot_up": object})
    for i, marker in enumerate(["n/a", "-", "NA", ""]):
        t.loc[i, "ppp_spot_up"] = marker
    if suffix == ".parquet":  # a text column, as a typed file would store it
        t["ppp_spot_up"] = t["ppp_spot_up"].astype(str)
    path = tmp_path / f"2024-25{suffix}"
    {"csv": t.to_csv, "xlsx": t.to_excel, "parquet": t.to_parquet}[suffix[1:]](path, index=False)
    raw = read_seasons(path)
    assert raw.table["ppp_spot_up"].isna().sum() == 4
    assert np.isfinite(raw.table["ppp_spot_up"].iloc[4:]).all()


def test_marker_list_is_documented():
    assert {"", "n/a", "na", "-"} <= set(EMPTY_MARKERS)


def test_a_few_bad_cells_are_named():
    s = pd.Series(["1.5", "2", "abc", "3", "x1", "", "n/a"], dtype=object)
    with pytest.raises(InputError) as info:
        numeric_column(s, where=WHERE)
    assert "2 value(s) are not numbers: row 4 'abc', row 6 'x1'" in str(info.value)


def test_whole_column_of_percent_strings_is_parsed_and_said():
    values, how = numeric_column(pd.Series(["15.9%", "20 %", "", "7%"]), where=WHERE)
    np.testing.assert_allclose(values, [15.9, 20.0, np.nan, 7.0])
    assert how == "percent strings"


def test_mixed_percent_signs_are_refused():
    with pytest.raises(InputError, match="some cells have a % sign and some do not"):
        numeric_column(pd.Series(["15.9%", "0.2", "7%"]), where=WHERE)


def test_whole_column_of_decimal_commas_is_parsed_and_said():
    values, how = numeric_column(pd.Series(["15,9", "20,25", "7"]), where=WHERE)
    np.testing.assert_allclose(values, [15.9, 20.25, 7.0])
    assert how == "decimal commas"


def test_thousands_or_decimal_comma_is_refused():
    with pytest.raises(InputError, match="could be decimal commas or thousands separators"):
        numeric_column(pd.Series(["2,480", "1,989"]), where=WHERE)


def test_numbers_parsed_by_the_reader_are_taken_as_they_are():
    values, how = numeric_column(pd.Series([1.0, np.nan, 3.5]), where=WHERE)
    np.testing.assert_allclose(values, [1.0, np.nan, 3.5])
    assert how == ""


def test_percent_strings_in_a_file_are_reported(tmp_path):
    from drift.errors import DataQualityWarning

    t = small_table(seasons=("2024-25",)).drop(columns="season")
    t["usage_pct"] = [f"{v:.1f}%" for v in t["usage_pct"]]
    t.to_csv(tmp_path / "2024-25.csv", index=False)
    with pytest.warns(DataQualityWarning, match="usage_pct: percent strings parsed as numbers"):
        raw = read_seasons(tmp_path)
    assert raw.reading.units["usage_pct"] == "percent" and raw.table["usage_pct"].between(12, 30).all()
