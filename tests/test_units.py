"""Units: shares in percent, per-game minutes and possessions, rates across seasons."""

from __future__ import annotations

import numpy as np
import pytest
from conftest import small_table

from drift.config import Config
from drift.errors import DataQualityWarning, InputError
from drift.intake.read import read_seasons


def _write(tmp_path, t, season="2024-25"):
    path = tmp_path / f"{season}.csv"
    t.drop(columns="season").to_csv(path, index=False)
    return path


def _shares(seasons=("2024-25",)):
    t = small_table(seasons=seasons)
    t["share_cut"] = 1.0 - t["share_spot_up"]  # complete: rows sum to 1
    t["ppp_cut"] = 1.1
    return t


def test_shares_in_percent_are_converted_and_said(tmp_path):
    t = _shares()
    t[["share_spot_up", "share_cut"]] *= 100
    with pytest.warns(DataQualityWarning, match="play-type shares in percent"):
        raw = read_seasons(_write(tmp_path, t))
    np.testing.assert_allclose(raw.table[["share_spot_up", "share_cut"]].sum(axis=1), 1.0)


def test_shares_summing_above_one_are_refused(tmp_path):
    t = _shares()
    t.loc[2, "share_cut"] += 0.2
    with pytest.raises(InputError, match=r"add up to more than 1 in 1 row\(s\): row 4 \(1.20\)"):
        read_seasons(_write(tmp_path, t))


def test_rows_with_incomplete_shares_are_warned(tmp_path):
    t = _shares()
    t.loc[1, "share_cut"] = 0.0
    with pytest.warns(DataQualityWarning, match=r"1 row\(s\) whose play-type shares add up to less than 0.9"):
        read_seasons(_write(tmp_path, t))


def test_one_share_above_one_among_fractions_is_refused(tmp_path):
    t = _shares()
    t.loc[0, "share_spot_up"] = 12.0
    with pytest.raises(InputError, match=r'share 12 is above 1 .*\[intake.units\] share_spot_up = "percent"'):
        read_seasons(_write(tmp_path, t))


def test_per_game_minutes_are_converted_and_said(tmp_path):
    t = small_table(seasons=("2024-25",))
    t["minutes"] = t["minutes"] / t["games"]
    with pytest.warns(DataQualityWarning, match="minutes per game, multiplied by games"):
        raw = read_seasons(_write(tmp_path, t))
    np.testing.assert_allclose(raw.table["minutes"], 1500)


def test_per_game_or_total_cannot_be_told_early_in_a_season(tmp_path):
    t = small_table(seasons=("2024-25",))
    t["games"], t["minutes"] = 3, 45
    with pytest.raises(InputError, match=r'\[intake.units\] minutes = "total" or "per_game"'):
        read_seasons(_write(tmp_path, t))
    raw = read_seasons(tmp_path, Config(units={"minutes": "total"}))
    assert (raw.table["minutes"] == 45).all()


def test_games_as_an_average_are_refused(tmp_path):
    t = small_table(seasons=("2024-25",)).astype({"games": float})
    t.loc[0, "games"] = 61.5
    with pytest.raises(InputError, match="row 2, column 'games': value 61.5 is not a whole number"):
        read_seasons(_write(tmp_path, t))


def test_a_season_of_rates_in_fractions_is_converted_to_the_others_unit(tmp_path):
    t = small_table(seasons=("2022-23", "2023-24", "2024-25"))
    t.loc[t.season == "2024-25", "usage_pct"] /= 100
    for s, block in t.groupby("season"):
        _write(tmp_path, block, s)
    with pytest.warns(DataQualityWarning, match="usage_pct in fractions, converted to percent"):
        raw = read_seasons(tmp_path)
    assert raw.table["usage_pct"].between(12, 30).all() and raw.reading.units["usage_pct"] == "percent"


def test_rates_whose_unit_cannot_be_told_are_refused(tmp_path):
    t = small_table(seasons=("2023-24", "2024-25"))
    t.loc[t.season == "2024-25", "usage_pct"] /= 1000  # neither fractions nor percent of the same thing
    t.loc[t.season == "2023-24", "usage_pct"] = 25.0
    for s, block in t.groupby("season"):
        _write(tmp_path, block, s)
    with pytest.raises(InputError, match=r"do not say which is right.*\[intake.units\] usage_pct"):
        read_seasons(tmp_path)


@pytest.mark.parametrize("scale, unit, shown", [(1.0, "fractions", "(3.00)"), (100.0, "percent", "(300.00%)")])
def test_shares_adding_up_to_three_are_refused_never_rescaled(tmp_path, scale, unit, shown):
    t = _shares()
    t["share_iso"] = 1.0
    t["share_post"] = 1.0  # columns read as shares that are not parts of one whole: rows add to 3
    t[["share_spot_up", "share_cut", "share_iso", "share_post"]] *= scale
    with pytest.raises(InputError) as info:
        read_seasons(_write(tmp_path, t))
    msg = str(info.value)
    assert f"row 2: play-type shares add up to more than 1 in 6 row(s): row 2 {shown}" in msg
    assert f"read as {unit}" in msg and "rather than rescale" in msg


def test_per_game_minutes_show_their_unit_after_conversion(tmp_path):
    t = small_table(seasons=("2024-25",))
    t["minutes"] = t["minutes"] / t["games"]
    with pytest.warns(DataQualityWarning, match="minutes per game, multiplied by games"):
        raw = read_seasons(_write(tmp_path, t))
    columns = raw.reading.columns.set_index("column")
    assert columns.loc["minutes", "unit"] == "per game -> season total"
    assert columns.loc["games", "unit"] == "season total"
