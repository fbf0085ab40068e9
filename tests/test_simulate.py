"""The simulated-league family: deterministic, varied, truth consistent with the data."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from conftest import borrowed_labels

from drift.sim.demo import PLAY_TYPES
from drift.sim.family import (
    HELD_OUT_START,
    NAMINGS,
    PROFILES,
    LeagueSpec,
    family,
    recovery,
    season_truth,
    simulate_league,
)

SMALL = dict(n_teams=6, roster=12, n_seasons=3)


def test_family_is_deterministic_and_varied():
    a, b = family(60), family(60)
    assert a == b
    roles = {s.n_roles for s in a}
    assert roles == set(range(4, 13))  # every count from 4 to 12 appears in the 60
    assert any(s.change_rate == 0 for s in a) and any(s.change_rate > 0.05 for s in a)
    assert {s.naming for s in a} == set(NAMINGS)
    assert any(not s.possessions for s in a)
    held = family(5, start=HELD_OUT_START)
    assert not set(s.seed for s in held) & set(s.seed for s in a)


def test_profiles_reuse_no_published_role_label():
    assert {key: borrowed_labels(key) for key in PROFILES if borrowed_labels(key)} == {}


def test_league_rows_and_truth_agree():
    league = simulate_league(LeagueSpec(n_roles=6, seed=3, **SMALL))
    rows, truth = league.rows, league.truth
    assert len(rows) == len(truth)
    assert (rows["player_id"].to_numpy() == truth["player_id"].to_numpy()).all()
    assert set(truth["true_role"]) <= set(PROFILES) and truth["true_role"].nunique() == 6
    shares = rows[[f"share_{t}" for t in PLAY_TYPES]].sum(axis=1)
    np.testing.assert_allclose(shares, 1.0, atol=2e-3)
    # a change is only ever flagged for a player seen the season before, with a new role
    t = season_truth(league).sort_values(["player_id", "season"])
    prev = t.groupby("player_id")["true_role"].shift()
    changed = t["changed"].to_numpy(bool)
    assert changed.sum() > 0
    assert (prev[changed].notna()).all() and (prev[changed] != t["true_role"][changed]).all()
    assert (prev[~changed].isna() | (prev[~changed] == t["true_role"][~changed])).all()
    assert league.rows.drop_duplicates("player_id")["player"].is_unique


def test_no_change_league_has_no_changes():
    league = simulate_league(LeagueSpec(change_rate=0.0, seed=1, **SMALL))
    assert not league.truth["changed"].any()
    t = season_truth(league)
    assert (t.groupby("player_id")["true_role"].nunique() == 1).all()


def test_blending_moves_players_toward_their_partner_role():
    spec = LeagueSpec(n_roles=5, blend=0.45, blend_share=0.5, change_rate=0.0, seed=4,
                      possessions=True, **SMALL)
    league = simulate_league(spec)
    rows = league.rows.assign(role=league.truth["true_role"].to_numpy(),
                              w=league.truth["blend_weight"].to_numpy(),
                              partner=league.truth["blend_role"].to_numpy())
    assert 0 < (rows["w"] > 0).mean() < 1 and rows["w"].max() < 0.45
    prof = league.profiles.set_index("role")
    # the blended players' spot-up share sits between their role's and the partner's
    col = "share_spot_up"
    heavy = rows[rows["w"] > 0.3]
    own, other = prof.loc[heavy["role"], col].to_numpy(), prof.loc[heavy["partner"], col].to_numpy()
    toward = np.sign(other - own) * (heavy[col].to_numpy() - own)
    assert np.median(toward) > 0


@pytest.mark.parametrize("naming", sorted(NAMINGS))
def test_every_naming_reads_back_through_intake(tmp_path, naming):
    from drift.api import prepare
    from drift.config import Config

    league = simulate_league(LeagueSpec(naming=naming, possessions=naming != "short", seed=2, **SMALL))
    league.write(tmp_path)
    prepared = prepare(tmp_path, Config(columns=league.columns))
    assert len(prepared.features) == 30
    assert ("possessions" in prepared.kept.columns) == (naming != "short")
    assert (tmp_path / "truth" / "truth.csv").exists()
    assert set(prepared.kept["player_id"]) <= set(league.truth["player_id"])


def test_shorter_seasons_mean_smaller_samples():
    long = simulate_league(LeagueSpec(sample=1.0, seed=5, **SMALL)).rows["minutes"].median()
    short = simulate_league(LeagueSpec(sample=0.5, seed=5, **SMALL)).rows["minutes"].median()
    assert short < 0.6 * long


def test_recovery_scores_a_perfect_and_a_blind_run():
    league = simulate_league(LeagueSpec(n_roles=5, change_rate=0.1, seed=6, **SMALL))
    truth = season_truth(league)
    placements = truth.rename(columns={"true_role": "role"})
    t = truth.sort_values(["player_id", "season"])
    nxt = t.groupby("player_id").shift(-1)
    pairs = t[nxt["season"].notna()].assign(season_from=t["season"], season_to=nxt["season"],
                                            real=t["true_role"] != nxt["true_role"])
    moves = pd.DataFrame({"kind": "consecutive", "player_id": pairs["player_id"],
                          "season_from": pairs["season_from"], "season_to": pairs["season_to"],
                          "role_changed": pairs["real"], "p_value": np.where(pairs["real"], 0.0, 0.5)})
    perfect = recovery(placements, moves, truth)
    assert perfect["ari"] == 1.0 and perfect["f1"] == 1.0 and perfect["false_flag"] == 0.0
    assert perfect["n_roles"] == perfect["true_roles"] == 5 and perfect["beyond_0.05"] == 0.0
    blind = recovery(placements.assign(role="R1"), moves.assign(role_changed=False), truth)
    assert blind["ari"] == 0.0 and blind["recall"] == 0.0 and np.isnan(blind["precision"])


def test_spec_refuses_impossible_settings():
    with pytest.raises(ValueError, match="n_roles"):
        LeagueSpec(n_roles=13)
    with pytest.raises(ValueError, match="blend"):
        LeagueSpec(blend=0.6)


def test_default_rules_recover_small_leagues_of_the_family(tmp_path):
    """A fast subset of benchmarks/role_count.py: defaults, no options, known truth."""
    import warnings

    from drift.api import fit_model, prepare
    from drift.config import Config
    from drift.measure.moves import pair_moves
    from drift.model.noise import consecutive_pairs as consecutive_season_pairs

    found = []
    for n_roles, seed in ((5, 21), (9, 22)):
        league = simulate_league(LeagueSpec(n_roles=n_roles, n_teams=12, roster=16, n_seasons=3,
                                            blend=0.3, change_rate=0.08, seed=seed))
        league.write(tmp_path / str(seed))
        config = Config(columns=league.columns)
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            prepared = prepare(tmp_path / str(seed), config)
            model = fit_model(prepared, config)
        kept = prepared.kept
        placements = model.place(kept)
        i1, i2 = consecutive_season_pairs(kept)
        score = recovery(placements, pair_moves(model, kept, placements, i1, i2, alpha=0.01), season_truth(league))
        print(f"\n{n_roles} true roles: found {score['n_roles']}, ARI {score['ari']:.3f}, "
              f"F1 {score['f1']:.3f}, false flags {score['false_flag']:.4f}")
        found.append(score["n_roles"])
        assert abs(score["n_roles"] - n_roles) <= 1
        assert score["ari"] > 0.8 and score["f1"] > 0.85 and score["false_flag"] <= 0.01
    assert found.count(5) + found.count(9) >= 1


def test_club_spellings_read_exactly_as_drifts_names_and_unlisted_codes_read_as_rates(tmp_path):
    import warnings

    from drift.api import prepare
    from drift.config import Config
    from drift.errors import DataQualityWarning

    tables = {}
    for naming in ("drift", "club", "unlisted"):
        league = simulate_league(LeagueSpec(feature_naming=naming, seed=2, **SMALL))
        league.write(tmp_path / naming)
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", DataQualityWarning)  # the unlisted codes are read by default
            tables[naming] = prepare(tmp_path / naming, Config(columns=league.columns))
    drift_names, club = tables["drift"], tables["club"]
    assert sorted(club.features) == sorted(drift_names.features)
    cols = ["player_id", "season", *sorted(drift_names.features)]
    assert club.kept[cols].equals(drift_names.kept[cols])
    unlisted = tables["unlisted"].reading.columns
    codes = unlisted[unlisted["column"].str.startswith("PlayType")].drop_duplicates("column")
    assert len(codes) == 4 and set(codes["family"]) == {"rate"}  # no spelling table knows them


def test_rare_roles_and_their_defaults():
    plain = simulate_league(LeagueSpec(n_roles=6, seed=8, n_teams=12, roster=15, n_seasons=4))
    rare = simulate_league(LeagueSpec(n_roles=6, rare_roles=1, seed=8, n_teams=12, roster=15, n_seasons=4))
    share = rare.truth["true_role"].value_counts(normalize=True)
    before = plain.truth["true_role"].value_counts(normalize=True)
    assert share.min() < 0.05 and before[share.idxmin()] > 2 * share.min()  # the rare role: about 3%
    # the defaults draw the same league as a spec that never heard of the new fields
    assert LeagueSpec(seed=8).rare_roles == 0 and LeagueSpec(seed=8).feature_naming == "drift"
    with pytest.raises(ValueError, match="rare_roles"):
        LeagueSpec(n_roles=4, rare_roles=4)
