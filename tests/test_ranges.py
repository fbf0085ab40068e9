"""Plausibility ranges: impossible values refused naming file, row, the export's column, drift's name and value.

The ranges are common practice, no source (drift/intake/_ranges.py states each); the values
refused here are the ones a broken export was seen to hold.
"""

from __future__ import annotations

import warnings

import pytest
from exports import small_league, write_text_export

from drift.errors import InputError
from drift.intake.read import read_seasons


@pytest.fixture
def league():
    return small_league(seasons=("2023-24",))


def _row_of(league, i):
    return i + 2  # one file, header on row 1, rows in order


def _error(folder):
    with pytest.raises(InputError) as info:
        read_seasons(folder)
    return str(info.value)


@pytest.mark.parametrize("column, value, export_name, words", [
    ("orb_pct", 401.0, "OREB_PCT", "an offensive rebound rate lies between 0 and 100 (read in percent)"),
    ("stl_pct", 489.0, "STL_PCT", "a steal rate lies between 0 and 100"),
    ("ppp_spot_up", 272.0, "SPOTUP_PPP", "points per possession lie between 0 and 4"),
    ("games", 500, "GP", "games must lie between 0 and 120 in a season"),
    ("ts_pct", 1.7, "TS_PCT", "a true shooting percentage lies between 0 and 1.5 (read in fractions)"),
])
def test_impossible_value_is_refused_with_where_and_what(league, tmp_path, column, value, export_name, words):
    league.loc[7, column] = value
    write_text_export(league, tmp_path)
    msg = _error(tmp_path)
    drift_name = f" (drift's {column})" if column not in ("games",) else " (drift's games)"
    assert f"2023-24.csv, row {_row_of(league, 7)}, column '{export_name}'{drift_name}: value {value:g} is " \
           f"impossible: {words}" in msg
    assert "common practice" in msg


def test_minutes_per_game_above_a_game_with_overtimes_are_refused(league, tmp_path):
    league.loc[3, ["games", "minutes"]] = [10, 3000]  # 300 minutes a game
    write_text_export(league, tmp_path)
    msg = _error(tmp_path)
    assert "row 5, column 'MIN' (drift's minutes): value 3000 is impossible: 300.0 minutes per game" in msg


def test_one_long_overtime_game_is_possible(league, tmp_path):
    league.loc[3, ["games", "minutes", "possessions"]] = [1, 63, 20]  # every minute of a triple overtime
    write_text_export(league, tmp_path)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        assert read_seasons(tmp_path).table.loc[3, "minutes"] == 63


def test_free_throw_rate_is_checked_only_on_a_real_sample(tmp_path):
    league = small_league(seasons=("2023-24",))
    league["ft_rate"] = 0.25
    league.loc[2, ["games", "minutes", "possessions", "ft_rate"]] = [2, 30, 10, 8.0]  # 1 shot, 8 free throws
    write_text_export(league, tmp_path)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        raw = read_seasons(tmp_path)
    assert raw.reading.units["ft_rate"] == "fraction" and raw.table.loc[2, "ft_rate"] == 8.0
    league.loc[5, "ft_rate"] = 8.0  # the same over a season's minutes: impossible
    write_text_export(league, tmp_path)
    assert "row 7, column 'ft_rate': value 8 is impossible: a free-throw rate lies between 0 and 5" in _error(tmp_path)


def test_minutes_without_games_are_refused(league, tmp_path):
    league.loc[3, "games"] = 0
    write_text_export(league, tmp_path)
    assert "minutes without a game played" in _error(tmp_path)


def test_possessions_far_too_few_for_the_minutes_are_refused(league, tmp_path):
    league["possessions"] = league["possessions"].astype(float)
    league.loc[4, ["minutes", "possessions"]] = [2415, 0.99]
    write_text_export(league, tmp_path)
    msg = _error(tmp_path)
    assert "row 6, column 'POSS' (drift's possessions): value 0.99 is impossible" in msg
    assert "possessions per minute beside 2415 minutes, below 0.04" in msg


def test_possessions_far_too_many_for_the_minutes_are_refused(league, tmp_path):
    league.loc[4, "possessions"] = league.loc[4, "minutes"] * 5
    write_text_export(league, tmp_path)
    assert "more than 3 possessions per minute played" in _error(tmp_path)


def test_one_impossible_per_game_cell_is_refused_not_read_as_totals(league, tmp_path):
    league["minutes"] = (league["minutes"] / league["games"]).round(1)
    league.loc[6, "minutes"] = 300.0
    write_text_export(league, tmp_path)
    msg = _error(tmp_path)
    assert "row 8, column 'MIN' (drift's minutes): value 300 is impossible per game" in msg
    assert '[intake.units] minutes = "total"' in msg


def test_extreme_but_possible_values_are_read(league, tmp_path):
    league.loc[1, "ppp_spot_up"] = 4.0  # every possession an and-one three
    league.loc[2, "ts_pct"] = 1.2  # a fraction above 1 in a small sample: still fractions
    league.loc[3, ["games", "minutes", "possessions", "orb_pct"]] = [1, 6, 3, 150.0]  # estimates leave
    league.loc[4, "usage_pct"] = 0.0  # the range in a few minutes of play
    write_text_export(league, tmp_path)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        raw = read_seasons(tmp_path)
    assert raw.reading.units["ts_pct"] == "fraction" and raw.reading.units["orb_pct"] == "percent"
    assert raw.table.loc[3, "orb_pct"] == 150.0


def test_rates_in_fractions_are_checked_in_fractions(league, tmp_path):
    league["orb_pct"] = (league["orb_pct"] / 100).round(4)
    league.loc[5, "orb_pct"] = -0.02
    write_text_export(league, tmp_path)
    msg = _error(tmp_path)
    assert "value -0.02 is impossible: an offensive rebound rate lies between 0 and 1 (read in fractions)" in msg
