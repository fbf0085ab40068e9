"""Player moves: calibration by simulation, detection against the demo league's truth."""

from __future__ import annotations

import numpy as np
import pytest
from sklearn.metrics import roc_auc_score

from drift.measure.moves import pair_moves, requested_pairs
from drift.model.noise import consecutive_pairs


def _with_truth(moves, truth):
    t = truth[truth["stint"] == 0][["player_id", "season", "true_role"]]
    a = moves.merge(t.rename(columns={"season": "season_from", "true_role": "true_from"}),
                    on=["player_id", "season_from"])
    a = a.merge(t.rename(columns={"season": "season_to", "true_role": "true_to"}), on=["player_id", "season_to"])
    a["real_change"] = a["true_from"] != a["true_to"]
    return a


@pytest.fixture(scope="module")
def simulated():
    """A second league from another seed: the model never saw it while we tuned anything."""
    import tempfile
    from pathlib import Path

    from drift.api import analyse, fit_model, prepare
    from drift.sim.demo import generate_league, write_league

    league = generate_league(seed=11)
    with tempfile.TemporaryDirectory() as tmp:
        write_league(Path(tmp), league)
        prepared = prepare(tmp)
        model = fit_model(prepared)
        analysis = analyse(prepared, model)
    moves = analysis.moves[analysis.moves["kind"] == "consecutive"]
    return _with_truth(moves, league.truth.astype({"season": str}))


def test_no_change_players_beyond_noise_near_nominal_rate(simulated):
    null = simulated[~simulated["real_change"]]
    rate = (null["p_value"] < 0.05).mean()
    print(f"simulation: {rate:.1%} of {len(null)} no-change pairs beyond noise at the 5% level")
    assert 0.03 <= rate <= 0.07  # stated band around the nominal 5%
    assert 0.003 <= (null["p_value"] < 0.01).mean() <= 0.02


def test_real_role_changes_are_found(simulated):
    real = simulated[simulated["real_change"]]
    found = (real["p_value"] < 0.05).mean()
    at_default = real["beyond_noise"].mean()  # the default level, 0.01
    print(f"simulation: {found:.1%} of {len(real)} real role changes beyond noise at 5%, "
          f"{at_default:.1%} at the default 1%")
    assert found >= 0.85 and at_default >= 0.85


def _scores(frame, flag):
    tp = (flag & frame["real_change"]).sum()
    return tp / max(flag.sum(), 1), tp / max(frame["real_change"].sum(), 1)


def test_role_changed_precision_recall_auc_on_demo(demo_analysis, demo_truth):
    moves = demo_analysis.moves[demo_analysis.moves["kind"] == "consecutive"]
    a = _with_truth(moves, demo_truth)
    precision, recall = _scores(a, a["role_changed"])
    naive_p, naive_r = _scores(a, a["role_from"] != a["role_to"])
    auc = roc_auc_score(a["real_change"], a["distance"])
    print(f"demo league: role_changed precision {precision:.3f} recall {recall:.3f}; "
          f"naive label comparison precision {naive_p:.3f} recall {naive_r:.3f}; ROC AUC of distance {auc:.3f}")
    assert precision >= 0.95 and recall >= 0.85
    assert naive_p < precision - 0.2  # labels alone flip for boundary players
    assert auc >= 0.95


def test_statuses_are_consistent(demo_analysis):
    m = demo_analysis.moves
    differs = m["role_from"] != m["role_to"]
    assert (m.loc[m["status"] == "changed"].pipe(lambda d: d["beyond_noise"] & (d["role_from"] != d["role_to"]))).all()
    assert (~m.loc[m["status"] == "unsettled", "beyond_noise"]).all()
    assert (m["role_changed"] == (differs & m["beyond_noise"])).all()
    assert m["percentile"].between(0, 100).all()
    assert (m["distance"] > 0).all()


def test_drivers_are_signed_features_in_units_and_sd(demo_model, demo_prepared):
    kept = demo_prepared.kept.iloc[[0, 0]].copy()
    kept["player_id"] = "X"
    kept["season"] = ["2020", "2021"]
    kept.iloc[1, kept.columns.get_loc("three_pa_rate")] = kept["three_pa_rate"].iloc[0] + 0.3
    placed = demo_model.place(kept)
    moves = pair_moves(demo_model, kept, placed, np.array([0]), np.array([1]), alpha=0.01)
    drivers = [moves[f"driver_{i}"].iloc[0] for i in (1, 2, 3)]
    assert "three_pa_rate" in drivers
    i = drivers.index("three_pa_rate") + 1
    # the change is in shrunk values: the raw 0.3 times the value's shrinkage factor (same sample both seasons)
    factor = demo_model.processed(kept)[1].factor[0, list(demo_model.features_).index("three_pa_rate")]
    assert 0.8 < factor < 1
    assert moves[f"driver_{i}_change"].iloc[0] == pytest.approx(0.3 * factor, abs=1e-6)
    assert moves[f"driver_{i}_change_sd"].iloc[0] > 1


def test_compare_any_two_seasons(demo_prepared, demo_model):
    kept = demo_prepared.kept
    i, j = requested_pairs(kept, "2019-20", "2024-25")
    assert len(i) > 50
    assert (kept["season"].to_numpy()[i] == "2019-20").all() and (kept["season"].to_numpy()[j] == "2024-25").all()
    assert (kept["player_id"].to_numpy()[i] == kept["player_id"].to_numpy()[j]).all()


def test_stint_moves_before_and_after_trade(demo_analysis, demo_truth):
    st = demo_analysis.stints
    assert len(st) > 20 and (st["kind"] == "stint").all() and st["traded"].all()
    assert (st["stint_to"] == st["stint_from"] + 1).all()
    assert (st["team_from"] != st["team_to"]).all()


def test_consecutive_pairs_allow_gaps(demo_prepared):
    kept = demo_prepared.kept
    i, j = consecutive_pairs(kept)
    assert (kept["player_id"].to_numpy()[i] == kept["player_id"].to_numpy()[j]).all()
    assert (kept["season"].to_numpy()[i] < kept["season"].to_numpy()[j]).all()


def test_comparables_are_five_nearest_other_players(demo_analysis):
    comps = demo_analysis.comparables
    counts = comps.groupby(["player_id", "season"]).size()
    assert (counts == 5).all()
    assert (comps["player_id"] != comps["comp_player_id"]).all()
    assert comps.groupby(["player_id", "season"])["distance"].apply(lambda d: d.is_monotonic_increasing).all()


def test_stint_moves_against_truth(demo_analysis, demo_truth):
    """Mid-season trades in the demo: 30% change role at the trade (known truth)."""
    t = demo_truth[demo_truth["stint"] > 0][["player_id", "season", "stint", "true_role"]]
    st = demo_analysis.stints.rename(columns={"season_from": "season"})
    x = st.merge(t.rename(columns={"stint": "stint_from", "true_role": "a"}), on=["player_id", "season", "stint_from"])
    x = x.merge(t.rename(columns={"stint": "stint_to", "true_role": "b"}), on=["player_id", "season", "stint_to"])
    real = x["a"] != x["b"]
    tp = (real & x["role_changed"]).sum()
    print(f"demo stints: {len(x)} trade pairs, {real.sum()} real role changes, flagged {x['role_changed'].sum()}, "
          f"correct {tp}")
    assert real.sum() >= 10
    assert tp / real.sum() >= 0.85 and tp / max(x["role_changed"].sum(), 1) >= 0.9


def test_null_in_blocks_matches_one_block(demo_model, demo_prepared, monkeypatch):
    # memory stays bounded by building the null per block; the figures must not change
    import drift.model.movenoise as movenoise

    kept = demo_prepared.kept
    i, j = consecutive_pairs(kept)
    placed = demo_model.place(kept)
    whole = pair_moves(demo_model, kept, placed, i, j, alpha=0.01)
    monkeypatch.setattr(movenoise, "BLOCK", 37)
    blocked = pair_moves(demo_model, kept, placed, i, j, alpha=0.01)
    assert len(i) > 37 * 3
    np.testing.assert_array_equal(whole["p_value"], blocked["p_value"])
    np.testing.assert_array_equal(whole["noise_distance"], blocked["noise_distance"])


def test_a_zero_move_has_a_finite_z(demo_model, demo_prepared):
    kept = demo_prepared.kept.iloc[[0, 0]].copy()
    kept["player_id"] = "X"
    kept["season"] = ["2020", "2021"]
    moves = pair_moves(demo_model, kept, demo_model.place(kept), np.array([0]), np.array([1]), alpha=0.01)
    assert moves["distance"].iloc[0] == 0 and moves["p_value"].iloc[0] == pytest.approx(1.0)
    assert np.isfinite(moves["z"]).all() and moves["z"].iloc[0] < -8
