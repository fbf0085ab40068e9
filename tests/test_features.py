"""Families, exposure, unused shares and the sample filters."""

from __future__ import annotations

import numpy as np
import pandas as pd

from drift.intake.features import apply_filters, exposure_matrix, feature_spec, fill_unused_shares


def test_families_and_pairs():
    spec = feature_spec(("share_cut", "ppp_cut", "ppp_post_up", "usage_pct", "ts_pct", "three_pa_rate"))
    assert spec.families == ("share", "efficiency", "efficiency", "rate", "shooting", "shooting")
    assert spec.share_of == {"ppp_cut": "share_cut"}


def test_exposure_uses_possessions_and_share():
    t = pd.DataFrame({"minutes": [1000.0, 500.0], "possessions": [400.0, 150.0],
                      "share_cut": [0.25, 0.0], "ppp_cut": [1.2, np.nan], "usage_pct": [20.0, np.nan]})
    e = exposure_matrix(t, feature_spec(("share_cut", "ppp_cut", "usage_pct")))
    np.testing.assert_allclose(e, [[400, 100, 400], [150, 0, 0]])


def test_unused_shares_become_zero_and_are_counted():
    t = pd.DataFrame({"share_cut": [0.2, np.nan, np.nan], "ppp_cut": [1.0, np.nan, np.nan]})
    out, counts = fill_unused_shares(t, feature_spec(("share_cut", "ppp_cut")))
    assert list(out["share_cut"]) == [0.2, 0.0, 0.0] and counts == {"share_cut": 2}
    assert out["ppp_cut"].isna().sum() == 2  # efficiencies stay missing: no sample


def test_filters_list_every_excluded_row_with_reason():
    t = pd.DataFrame({"player_id": ["a", "b", "c", "d"], "player": list("ABCD"), "season": "2022",
                      "team": "X", "games": [25, 10, 40, 5], "minutes": [500, 300, 200, 20]})
    kept, excluded = apply_filters(t, min_games=20, min_minutes_per_game=10)
    assert list(kept["player_id"]) == ["a"]
    reasons = dict(zip(excluded["player_id"], excluded["reason"]))
    assert set(reasons) == {"b", "c", "d"}
    assert "games 10 < min_games 20" in reasons["b"]
    assert "minutes per game 5.0" in reasons["c"]
    assert "games" in reasons["d"] and "minutes per game" in reasons["d"]
