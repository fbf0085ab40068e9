"""Placing new files with a saved model: what is written and what is returned."""

from __future__ import annotations

import pandas as pd

from drift.api import place_files
from drift.placing import Placed


def test_place_files_returns_what_it_wrote(demo_model, tmp_path):
    from conftest import DEMO

    model_path = tmp_path / "model.json"
    demo_model.save(model_path)
    season = sorted(DEMO.glob("*.csv"))[-1]
    placed = place_files(model_path, season, tmp_path / "placed.csv")
    assert isinstance(placed, Placed) and placed.path == tmp_path / "placed.csv"
    written = pd.read_csv(placed.path, dtype={"season": str})
    assert len(written) == len(placed.placements) > 100
    assert set(written["role"]) <= set(demo_model.role_ids_)
    # the model's own filters were applied: every excluded row says why, as a code and in words
    excluded = pd.read_csv(placed.excluded_path)
    assert len(excluded) == len(placed.excluded) > 0
    assert set(excluded["reason_code"]) <= {"few_games", "few_minutes", "few_games+few_minutes"}
