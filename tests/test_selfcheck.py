"""Self-check: simulations like the user's data, with the truth known."""

from __future__ import annotations

import warnings

import numpy as np
import pytest

from drift.sim.family import LeagueSpec, simulate_league


@pytest.fixture(scope="module")
def small_run(tmp_path_factory):
    from drift.api import fit_model, prepare
    from drift.config import Config

    league = simulate_league(LeagueSpec(n_roles=4, n_teams=8, roster=14, n_seasons=3, blend=0.1,
                                        change_rate=0.08, seed=11))
    folder = tmp_path_factory.mktemp("league")
    league.write(folder)
    config = Config(columns=league.columns, roles=4, components=0.9)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        prepared = prepare(folder, config)
        model = fit_model(prepared, config)
    return prepared, model, config


def test_simulated_league_keeps_players_seasons_and_samples(small_run):
    from drift.sim.selfcheck import simulate_like

    prepared, model, _ = small_run
    kept = prepared.kept.reset_index(drop=True)
    table, truth = simulate_like(model, kept, change_rate=0.0, seed=3)
    assert list(table["player_id"]) == list(kept["player_id"])
    assert (table["minutes"].to_numpy() == kept["minutes"].to_numpy()).all()
    assert not truth["changed"].any()
    assert (truth.groupby("player_id")["true_role"].nunique() == 1).all()
    assert set(truth["true_role"]) <= set(range(len(model.role_ids_)))
    shares = [f for f in model.features_ if f.startswith("share_")]
    assert table[shares].min().min() >= 0 and table[shares].max().max() <= 1
    # noise grows as samples shrink: short seasons sit farther from their true style
    _, again = simulate_like(model, kept, change_rate=0.3, seed=3)
    assert 0.15 < again["changed"].sum() / (len(kept) - kept["player_id"].nunique()) < 0.45


def test_self_check_recovers_a_clear_league(small_run):
    from drift.sim.selfcheck import self_check

    prepared, model, config = small_run
    check = self_check(prepared, model, config, n_sims=2, seed=1)
    assert len(check.runs) == 2 and check.roles == 4
    assert (check.runs["roles_true"] == 4).all()
    # four well separated roles, fixed count: every simulation finds them and the changes
    assert check.exact == 2 and check.ari > 0.8
    assert check.recall > 0.7 and check.false_flag < 0.02
    assert check.sentence.startswith("On data like yours, drift recovers 4 roles in 2 of 2 simulations")
    assert np.isfinite(check.change_rate) and check.change_rate >= 0.02


def test_cli_run_with_self_check_writes_and_reports_it(tmp_path, capsys):
    import pandas as pd

    from drift.cli import main

    league = simulate_league(LeagueSpec(n_roles=4, n_teams=6, roster=12, n_seasons=3, seed=12))
    league.write(tmp_path / "data")
    columns = "".join(f'{k} = "{v}"\n' for k, v in league.columns.items())
    (tmp_path / "drift.toml").write_text("[columns]\n" + columns)
    code = main(["run", str(tmp_path / "data"), "--out", str(tmp_path / "out"), "--config",
                 str(tmp_path / "drift.toml"), "--roles", "4", "--self-check", "1", "--quiet"])
    assert code == 0
    assert "On data like yours, drift recovers 4 roles in" in capsys.readouterr().out
    runs = pd.read_csv(tmp_path / "out" / "self_check.csv")
    assert list(runs["simulation"]) == [1] and runs["roles_true"].iloc[0] == 4
    html = (tmp_path / "out" / "report.html").read_text(encoding="utf-8")
    assert "would drift find these roles again" in html and "On data like yours" in html
