"""Stints of traded players: kept as stints, combined with sample weights, totals never double-counted."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from drift.intake._stints import combine_stints
from drift.intake.features import feature_spec


def _traded():
    base = {"player_id": "T1", "player": "Traded One", "season": "2022-23"}
    rows = [
        {**base, "team": "AAA", "games": 30, "minutes": 600, "share_spot_up": 0.5, "ppp_spot_up": 1.2, "usage_pct": 15.0},
        {**base, "team": "BBB", "games": 40, "minutes": 1400, "share_spot_up": 0.2, "ppp_spot_up": 0.9, "usage_pct": 25.0},
        {"player_id": "S1", "player": "Stays", "season": "2022-23", "team": "AAA", "games": 70, "minutes": 2000,
         "share_spot_up": 0.3, "ppp_spot_up": 1.0, "usage_pct": 20.0},
    ]
    t = pd.DataFrame(rows)
    t["source_file"], t["source_row"] = "x.csv", range(2, 2 + len(t))
    return t


_TOTAL = {"player_id": "T1", "player": "Traded One", "season": "2022-23", "team": "TOT", "games": 70,
          "minutes": 2000, "share_spot_up": 0.31, "ppp_spot_up": 1.01, "usage_pct": 22.0,
          "source_file": "x.csv", "source_row": 9}


def test_stints_kept_and_season_combined_by_minutes():
    spec = feature_spec(("share_spot_up", "ppp_spot_up", "usage_pct"))
    seasons, stints = combine_stints(_traded(), spec)
    assert list(stints["stint"]) == [1, 2] and list(stints["team"]) == ["AAA", "BBB"]
    row = seasons.set_index("player_id").loc["T1"]
    assert row["games"] == 70 and row["minutes"] == 2000
    assert row["team"] == "AAA/BBB" and row["n_stints"] == 2
    # shares and rates weighted by minutes (hand computation)
    assert row["usage_pct"] == pytest.approx((600 * 15 + 1400 * 25) / 2000)
    assert row["share_spot_up"] == pytest.approx((600 * 0.5 + 1400 * 0.2) / 2000)
    # an efficiency is weighted by its play type's sample: minutes x share
    w1, w2 = 600 * 0.5, 1400 * 0.2
    assert row["ppp_spot_up"] == pytest.approx((w1 * 1.2 + w2 * 0.9) / (w1 + w2))


def test_total_row_is_used_and_minutes_are_not_counted_twice():
    t = _traded()
    t = pd.concat([t, pd.DataFrame([_TOTAL])], ignore_index=True)
    seasons, stints = combine_stints(t, feature_spec(("share_spot_up", "ppp_spot_up", "usage_pct")),
                                     total_marker="TOT")
    row = seasons.set_index("player_id").loc["T1"]
    assert row["minutes"] == 2000 and row["usage_pct"] == 22.0 and row["share_spot_up"] == 0.31
    assert len(stints) == 2 and "TOT" not in set(stints["team"])
    assert len(seasons) == 2


def test_stint_column_orders_stints():
    t = _traded()
    t["stint"] = [2, 1, 1]
    _, stints = combine_stints(t, feature_spec(("share_spot_up", "ppp_spot_up", "usage_pct")))
    assert list(stints["team"]) == ["BBB", "AAA"]


def test_unused_play_type_in_one_stint():
    t = _traded()
    t.loc[0, "ppp_spot_up"] = np.nan
    t.loc[0, "share_spot_up"] = 0.0
    seasons, _ = combine_stints(t, feature_spec(("share_spot_up", "ppp_spot_up", "usage_pct")))
    assert seasons.set_index("player_id").loc["T1", "ppp_spot_up"] == pytest.approx(0.9)


def test_total_row_wins_over_a_lone_stint():
    t = _traded().iloc[[1, 2]]  # only the second stint of the traded player is in the file
    t = pd.concat([t, pd.DataFrame([_TOTAL])], ignore_index=True)
    seasons, stints = combine_stints(t, feature_spec(("share_spot_up", "ppp_spot_up", "usage_pct")),
                                     total_marker="TOT")
    assert len(seasons) == 2 and stints.empty
    assert seasons.set_index("player_id").loc["T1", "minutes"] == 2000


# --- combined rows found from the data, whatever their marker ------------------------------------

def _league():
    from exports import small_league

    return small_league(seasons=("2022-23", "2023-24"), traded=3, three_teams=1, seed=4)


def test_no_combined_row_in_an_export_without_them():
    from drift.intake._stints import find_combined

    t = _league()
    t["source_file"], t["source_row"] = "x.csv", range(2, 2 + len(t))
    assert find_combined(t, total_marker="TOT").empty  # traded players' stints are never taken for totals


@pytest.mark.parametrize("marker, how", [("TOT", "marker"), ("{n}TM", "sum"), ("SUM", "sum")])
def test_combined_rows_are_found_by_marker_or_sums(marker, how):
    from exports import with_combined_rows

    from drift.intake._stints import find_combined

    t = with_combined_rows(_league(), marker)
    t["source_file"], t["source_row"] = "x.csv", range(2, 2 + len(t))
    found = find_combined(t, total_marker="TOT")
    assert len(found) == 8 and set(found["how"]) == {how}  # 4 traded players x 2 seasons
    assert set(found["team"]) == ({"TOT"} if marker == "TOT" else {"SUM"} if marker == "SUM" else {"2TM", "3TM"})


def test_combined_rows_whose_sums_are_off_are_found_by_their_team():
    from exports import with_combined_rows

    from drift.intake._stints import find_combined

    t = with_combined_rows(_league(), "{n}TM")
    t["minutes"] = t["minutes"].astype(float)
    combined = t["team"].str.endswith("TM")
    t.loc[combined, "minutes"] *= 1.15  # an export whose totals count something more (overtime, ...)
    t["source_file"], t["source_row"] = "x.csv", range(2, 2 + len(t))
    found = find_combined(t, total_marker=None)
    assert len(found) == 8 and set(found["how"]) == {"label"}


def test_a_team_with_players_of_its_own_is_never_a_combined_row():
    from exports import with_combined_rows

    from drift.intake._stints import find_combined

    t = with_combined_rows(_league(), "{n}TM")
    t["minutes"] = t["minutes"].astype(float)
    t.loc[t["team"].str.endswith("TM"), "minutes"] *= 1.06
    t.loc[t["team"].str.endswith("TM"), "team"] = "ALD"  # a real team's name on the total rows
    t = t.drop_duplicates(["player_id", "season", "team"])
    t["source_file"], t["source_row"] = "x.csv", range(2, 2 + len(t))
    assert find_combined(t, total_marker=None).empty  # no sum matches and ALD is a team: stints stay


def test_an_export_with_2tm_rows_is_read_like_one_without(tmp_path):
    import warnings

    from exports import with_combined_rows, write_text_export

    from drift.api import prepare
    from drift.errors import DataQualityWarning

    league = _league()
    write_text_export(league, tmp_path / "plain")
    write_text_export(with_combined_rows(league, "{n}TM"), tmp_path / "totals")
    plain = prepare(tmp_path / "plain")
    with pytest.warns(DataQualityWarning, match=r"8 combined row\(s\) .* 8 as the sum of the player's other rows"):
        totals = prepare(tmp_path / "totals")
    key = ["season", "player_id"]
    a, b = plain.seasons.sort_values(key).reset_index(drop=True), totals.seasons.sort_values(key).reset_index(drop=True)
    assert len(a) == len(b) and not b["team"].str.contains("TM").any()
    pd.testing.assert_frame_equal(a[key + ["games", "minutes", "possessions", "team", "n_stints"]],
                                  b[key + ["games", "minutes", "possessions", "team", "n_stints"]])
    assert not totals.stints["team"].str.contains("TM").any() and len(totals.stints) == len(plain.stints)
    assert len(totals.combined) == 8 and any("8 combined row(s)" in n for n in totals.reading.notes)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        assert plain.combined.empty and not any("combined" in n for n in plain.reading.notes)


def test_marker_rows_are_counted_and_said_without_a_warning(tmp_path):
    import warnings

    from exports import with_combined_rows, write_text_export

    from drift.api import prepare

    write_text_export(with_combined_rows(_league(), "TOT"), tmp_path)
    with warnings.catch_warnings():
        warnings.simplefilter("error")  # the config's own marker: nothing to warn about
        prepared = prepare(tmp_path)
    assert list(prepared.combined["how"].unique()) == ["marker"]
    assert any("8 by the team marker 'TOT'" in n for n in prepared.reading.notes)
