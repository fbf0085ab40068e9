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
