"""Placement of full, partial and out-of-reference seasons."""

from __future__ import annotations

import numpy as np


def test_placement_columns_and_probabilities(demo_model, demo_prepared):
    placed = demo_model.place(demo_prepared.kept)
    ids = demo_model.role_ids_
    probs = placed[[f"prob_{r}" for r in ids]].to_numpy()
    np.testing.assert_allclose(probs.sum(axis=1), 1.0)
    dists = placed[[f"dist_{r}" for r in ids]].to_numpy()
    rows = np.arange(len(probs))
    # the role is the role of highest membership, its membership the largest, the second role the next
    top = probs.argmax(axis=1)
    assert (placed["role"].to_numpy() == np.asarray(ids)[top]).all()
    np.testing.assert_allclose(placed["role_prob"], probs.max(axis=1))
    second = np.argsort(-probs, axis=1, kind="stable")[:, 1]
    assert (placed["second_role"].to_numpy() == np.asarray(ids)[second]).all()
    assert (placed["role_prob"] >= 1 / len(ids)).all()  # never a near-zero number for the role shown
    np.testing.assert_allclose(placed["distance"], dists[rows, top])
    np.testing.assert_allclose(placed["margin"], dists[rows, second] - dists[rows, top])
    # it is the nearest centre but for a few boundary seasons (the posterior weighs roles by their
    # size and each season's own noise)
    nearest = dists.argmin(axis=1)
    assert (top == nearest).mean() > 0.97
    # about 1% of the pool lies beyond its own 99th percentile
    assert 0.003 < placed["out_of_reference"].mean() < 0.03


def test_partial_season_places_near_its_full_season(demo_model, demo_prepared):
    """A player's first 25 games are noisier, but mostly keep the full season's role."""
    kept = demo_prepared.kept
    regulars = kept[kept["minutes"] > 1800].copy()
    partial = regulars.copy()
    partial["games"] = 25
    partial["minutes"] = partial["minutes"] * 25 / regulars["games"]
    partial["possessions"] = partial["possessions"] * 25 / regulars["games"]
    full, part = demo_model.place(regulars), demo_model.place(partial)
    a, b = full["role"].to_numpy(), part["role"].to_numpy()
    assert (a == b).mean() > 0.95
    # the same style on a quarter of the sample is less certain: memberships widen
    assert part["role_prob"].mean() < full["role_prob"].mean()
    assert (part["role_prob"] >= 0.99).mean() < (full["role_prob"] >= 0.99).mean()


def test_extreme_season_is_out_of_reference(demo_model, demo_prepared):
    row = demo_prepared.kept.iloc[[0]].copy()
    row["usage_pct"] = 60.0
    row["ast_pct"] = 80.0
    row["orb_pct"] = 30.0
    placed = demo_model.place(row)
    assert bool(placed["out_of_reference"].iloc[0])
