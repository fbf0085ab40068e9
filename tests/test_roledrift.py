"""Role-definition drift: a planted shift of one role is recovered in feature units."""

from __future__ import annotations

import numpy as np
import pytest

from drift.roledrift import drift_headlines, role_drift


def test_planted_shift_in_one_role_is_recovered(demo_model, demo_prepared):
    kept = demo_prepared.kept.copy()
    roles = demo_model.predict(kept)
    spot = demo_model.role_ids_[int(np.argmax([d.startswith("spot-up heavy") for d in demo_model.role_descriptions_]))]
    last = (kept["season"] == "2024-25").to_numpy() & (roles == spot)
    kept.loc[last, "three_pa_rate"] += 0.08  # spot-up wings shoot more threes in the last season
    drift = role_drift(demo_model, kept)
    row = drift[(drift["role"] == spot) & (drift["feature"] == "three_pa_rate")].set_index("season")
    moved = row.loc["2024-25", "value"] - row.loc["2023-24", "value"]
    assert moved == pytest.approx(0.08, abs=0.025)
    others = drift[(drift["role"] != spot) & (drift["feature"] == "three_pa_rate")].set_index(["role", "season"])
    for role in set(others.index.get_level_values(0)):
        assert abs(others.loc[(role, "2024-25"), "value"] - others.loc[(role, "2023-24"), "value"]) < 0.03
    heads = drift_headlines(drift)
    text = heads.loc[heads["role"] == spot, "text"].iloc[0]
    assert "three-point rate up" in text


def test_every_season_and_role_is_reported(demo_model, demo_prepared):
    drift = role_drift(demo_model, demo_prepared.kept)
    assert set(drift["season"]) == set(demo_prepared.kept["season"])
    per = drift.groupby("season")["role"].nunique()
    assert (per == len(demo_model.role_ids_)).all()
    assert drift["match_cost"].max() < 0.5  # each season's groups sit close to the reference roles
