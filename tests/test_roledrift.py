"""Role-definition drift: a planted shift of one role is recovered in feature units."""

from __future__ import annotations

import numpy as np
import pytest

from drift.measure.role_drift import drift_headlines, role_drift


def _spot_up_role(model):
    return model.role_ids_[int(np.argmax([d.startswith("spot-up heavy") for d in model.role_descriptions_]))]


def test_planted_shift_in_one_role_is_recovered(demo_model, demo_prepared):
    kept = demo_prepared.kept.copy()
    roles = demo_model.predict(kept)
    spot = _spot_up_role(demo_model)
    before = role_drift(demo_model, kept, seed=0)
    last = (kept["season"] == "2024-25").to_numpy() & (roles == spot)
    kept.loc[last, "three_pa_rate"] += 0.08  # spot-up wings shoot more threes in the last season
    after = role_drift(demo_model, kept, seed=0)

    def value(drift, role):
        return drift[(drift["role"] == role) & (drift["feature"] == "three_pa_rate")].set_index("season")["value"]

    assert (value(after, spot) - value(before, spot))["2024-25"] == pytest.approx(0.08, abs=0.02)
    assert (value(after, spot) - value(before, spot)).drop("2024-25").abs().max() < 0.01
    for role in set(demo_model.role_ids_) - {spot}:
        assert abs((value(after, role) - value(before, role))["2024-25"]) < 0.02


def test_demo_league_trend_is_recovered(demo_model, demo_prepared):
    """Known truth: three-point rate rises 0.008 a season league-wide, 0.020 for spot-up wings."""
    from drift.sim.demo import SPOT_UP_EXTRA_TREND, THREE_RATE_TREND

    drift = role_drift(demo_model, demo_prepared.kept, seed=0)
    three = drift[(drift["feature"] == "three_pa_rate") & (drift["season"] == "2024-25")].set_index("role")
    spot = _spot_up_role(demo_model)
    expected = 5 * (THREE_RATE_TREND + SPOT_UP_EXTRA_TREND)
    print(f"spot-up role three-point rate, 2019-20 to 2024-25: {three.loc[spot, 'change_from_first']:+.3f} "
          f"(truth {expected:+.3f})")
    assert three.loc[spot, "change_from_first"] == pytest.approx(expected, abs=0.03)
    heads = drift_headlines(drift)
    assert "three-point rate up" in heads.loc[heads["role"] == spot, "text"].iloc[0]


def test_every_season_and_role_is_reported(demo_model, demo_prepared):
    drift = role_drift(demo_model, demo_prepared.kept, seed=0)
    assert set(drift["season"]) == set(demo_prepared.kept["season"])
    per = drift.groupby("season")["role"].nunique()
    assert (per == len(demo_model.role_ids_)).all()
    assert drift["match_cost"].max() < 0.5  # each season's groups sit close to the reference roles


def test_no_drift_is_called_when_seasons_are_shuffled(demo_model, demo_prepared):
    """Known truth: with season labels shuffled among rows, no role definition truly moves."""
    rng = np.random.default_rng(5)
    kept = demo_prepared.kept.copy()
    kept["season"] = rng.permutation(kept["season"].to_numpy())
    drift = role_drift(demo_model, kept, seed=0)
    share = drift["beyond_noise"].mean()
    print(f"share of role-season-feature centres called beyond noise with shuffled seasons: {share:.4f}")
    assert share < 0.01
    assert len(drift_headlines(drift)) <= 1
