"""Comparables: exact nearest reference seasons of other players, only for the rows needed."""

from __future__ import annotations

import numpy as np
import pandas as pd
from scipy.spatial.distance import cdist

from drift.measure.comparables import comparables, needed_rows, run_comparables


class _Model:
    def __init__(self, q, reference):
        self.components_ = np.zeros((q, 1))
        self.reference_seasons_ = reference


def _placements(n_players=40, seasons=("2021", "2022", "2023"), q=3, seed=0):
    rng = np.random.default_rng(seed)
    rows = [{"player_id": f"P{i}", "player": f"Player {i}", "season": s, "team": "AAA",
             "role": f"R{i % 3 + 1}"} for s in seasons for i in range(n_players)]
    frame = pd.DataFrame(rows)
    for j in range(q):
        frame[f"pc{j + 1}"] = rng.standard_normal(len(frame))
    return frame


def test_nearest_other_players_agree_with_brute_force():
    placements = _placements()
    model = _Model(3, ["2021", "2022"])
    out = run_comparables(model, placements, pd.DataFrame({"status": [], "player_id": [], "season_to": []}))
    pool = placements[placements["season"].isin(["2021", "2022"])].reset_index(drop=True)
    # reference: scipy's cdist, brute force over every pool row
    d = cdist(placements[["pc1", "pc2", "pc3"]], pool[["pc1", "pc2", "pc3"]])
    d[placements["player_id"].to_numpy()[:, None] == pool["player_id"].to_numpy()[None]] = np.inf
    for i in (0, 17, 99):
        want = pool.iloc[np.argsort(d[i], kind="stable")[:5]]
        got = out[(out["player_id"] == placements.at[i, "player_id"]) & (out["season"] == placements.at[i, "season"])]
        assert list(got["rank"]) == [1, 2, 3, 4, 5]
        assert list(zip(got["comp_player_id"], got["comp_season"])) == list(zip(want["player_id"], want["season"]))
        np.testing.assert_allclose(got["distance"], np.sort(d[i])[:5])
    assert (out["player_id"] != out["comp_player_id"]).all()


def test_searching_some_rows_gives_those_rows_the_same_comparables():
    placements = _placements(seed=1)
    model = _Model(3, ["2021", "2022", "2023"])
    full = comparables(model, placements, placements)
    rows = np.array([3, 50, 101])
    some = comparables(model, placements, placements, rows=rows)
    keys = set(zip(placements["player_id"][rows], placements["season"][rows]))
    expected = full[[k in keys for k in zip(full["player_id"], full["season"])]].reset_index(drop=True)
    pd.testing.assert_frame_equal(some, expected)


def test_large_leagues_search_only_where_a_move_is_not_steady():
    placements = _placements(n_players=10)
    moves = pd.DataFrame({"player_id": ["P1", "P2", "P3", "P1"], "season_to": ["2022", "2023", "2022", "2022"],
                          "status": ["changed", "steady", "shifted", "changed"]})
    assert needed_rows(placements, moves, all_rows=len(placements)) is None
    rows = needed_rows(placements, moves, all_rows=5)
    picked = set(zip(placements["player_id"][rows], placements["season"][rows]))
    assert picked == {("P1", "2022"), ("P3", "2022")}
