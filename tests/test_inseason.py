"""In-season check: partial seasons against the last full season, on the demo league's truth."""

from __future__ import annotations

import re

import numpy as np
import pandas as pd
import pytest
from scipy.stats import chi2

from drift.measure.inseason import INSEASON_STATUSES, _scaled_statistic, baseline_pairs, check_partial, null_scale


@pytest.fixture(scope="module")
def partial_league(tmp_path_factory):
    """The demo league's next season after 20 games (same players), its truth, and its prepared rows."""
    from drift.api import prepare
    from drift.config import Config
    from drift.sim.demo import generate_league, write_league

    folder = tmp_path_factory.mktemp("partial")
    league = generate_league(2024, partial_games=20)
    write_league(folder, league)
    part = prepare(folder / "partial", Config(min_games=5))
    return folder, league, part


@pytest.fixture(scope="module")
def checked(partial_league, demo_model, demo_prepared):
    _, _, part = partial_league
    return check_partial(demo_model, part.kept, demo_prepared.kept, alpha=0.01, season_games=82)


def true_change(checks, truth):
    """Whether the true role at the compared seasons differs (last stint of a season)."""
    last = (truth.sort_values(["player_id", "season", "stint"])
            .groupby(["player_id", "season"])["true_role"].last().reset_index())
    x = checks.merge(last.rename(columns={"season": "season_from", "true_role": "r0"}),
                     on=["player_id", "season_from"])
    x = x.merge(last.rename(columns={"season": "season_to", "true_role": "r1"}), on=["player_id", "season_to"])
    return x.assign(real=x["r0"] != x["r1"])


def test_false_flags_near_nominal_and_real_changes_found(partial_league, checked):
    _, league, part = partial_league
    checks, unmatched = checked
    assert set(checks["status"]) <= set(INSEASON_STATUSES)
    x = true_change(checks, league.truth)
    still, moved = x[~x["real"]], x[x["real"]]
    flags = (still["p_value"] < 0.01).mean()
    recall = (moved["status"] == "changed").mean()
    print(f"\nin-season at 20 games: false flags {flags:.3f} of {len(still)}, recall {recall:.3f} of {len(moved)}")
    assert flags <= 0.03  # nominal 0.01; binomial noise on ~270 players
    assert recall >= 0.85
    assert len(unmatched) == len(part.kept) - len(checks)


def test_games_to_conclusive_is_the_first_game_count_beyond_noise(partial_league, checked, demo_model,
                                                                 demo_prepared):
    _, _, part = partial_league
    checks, _ = checked
    table, first, second, _ = baseline_pairs(part.kept, demo_prepared.kept)
    ids = table["player_id"].to_numpy()[second]
    scale = checks["null_scale"].iloc[0]
    crit = chi2.isf(0.01, demo_model.components_.shape[0]) * scale
    pending = checks[checks["games_to_conclusive"] > 1].head(5)
    assert len(pending)
    for _, row in pending.iterrows():
        i = np.flatnonzero(ids == row["player_id"])
        g = row["games_to"]
        at = _scaled_statistic(demo_model, table, first[i], second[i], (g + row["games_to_conclusive"]) / g)
        before = _scaled_statistic(demo_model, table, first[i], second[i],
                                   (g + row["games_to_conclusive"] - 1) / g)
        assert at[0] >= crit > before[0]
    # the statistic at the sample observed is the one reported
    same = _scaled_statistic(demo_model, table, first, second, 1.0)
    p = pd.Series(chi2.sf(same / scale, demo_model.components_.shape[0]), index=ids)
    assert np.allclose(p[checks["player_id"]].to_numpy(), checks["p_value"].to_numpy())


def test_null_scale_recovers_a_known_inflation():
    rng = np.random.default_rng(0)
    # source: scipy.stats.chi2 draws; 10% of players are real movers far out in the tail
    d2 = chi2.rvs(4, size=2000, random_state=rng)
    d2[:200] += 60
    assert null_scale(d2, 4) == pytest.approx(1.0, abs=0.08)
    assert null_scale(2.5 * d2, 4) == pytest.approx(2.5, rel=0.08)
    assert null_scale(0.5 * d2, 4) == 1.0  # never looser than the model
    assert null_scale(d2[:10] * 3, 4) == 1.0  # too few players to measure


def test_cli_check_writes_csv_and_page(partial_league, demo_model, tmp_path):
    from drift.cli import main

    folder, _, _ = partial_league
    model = tmp_path / "model.json"
    demo_model.save(model)
    out = tmp_path / "early"
    assert main(["place", str(model), str(folder / "partial"), "--against", str(folder), "--out", str(out),
                 "--min-games", "10", "--season-games", "82"]) == 0
    checks = pd.read_csv(out / "inseason.csv")
    assert {"distance", "z", "p_value", "status", "driver_1", "games_to_conclusive"} <= set(checks.columns)
    page = (out / "inseason.html").read_text(encoding="utf-8")
    assert "<script" not in page and "http" not in page.replace("http-equiv", "")
    assert "Too early" in page and "Changed" in page
    assert (out / "inseason_excluded.csv").exists()
    # the same words and units as the report: role names beside ids, "traded", shares' changes in pp
    names = dict(zip(demo_model.role_ids_, demo_model.role_names_))
    assert (checks["role_from"].map(names) == checks["role_from_name"]).all()
    assert (checks["role_to"].map(names) == checks["role_to_name"]).all()
    assert ">moved<" not in page and ("traded</span>" in page) == bool(checks["traded"].any())
    assert " pp" in page and not re.search(r"share [-+]0\.\d\d\d", page)  # not "spot-up share -0.475"
