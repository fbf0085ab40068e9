"""The fictional demo league: reproducible, big enough, realistic ranges, truth beside it."""

from __future__ import annotations

import numpy as np
from conftest import DEMO, borrowed_labels

from drift.sim.demo import ARCHETYPES, PLAY_TYPES, generate_league, write_league


def test_committed_files_are_what_the_generator_writes(tmp_path):
    write_league(tmp_path)
    for committed in sorted(DEMO.glob("*.csv")) + [DEMO / "truth" / "truth.csv"]:
        fresh = tmp_path / committed.relative_to(DEMO)
        assert fresh.read_bytes() == committed.read_bytes(), f"{committed.name}: rerun python -m drift.sim.demo demo_seasons"


def test_size_of_the_league(demo_prepared):
    kept = demo_prepared.kept
    assert kept["season"].nunique() >= 6
    per_season = kept.groupby("season").size()
    assert (per_season >= 300).all(), per_season
    teams = set(t for ts in demo_prepared.seasons["team"] for t in ts.split("/"))
    assert len(teams) >= 20
    assert len(demo_prepared.features) >= 30


def test_values_in_realistic_ranges(demo_prepared):
    s = demo_prepared.seasons
    shares = s[[f"share_{t}" for t in PLAY_TYPES]]
    np.testing.assert_allclose(shares.sum(axis=1), 1.0, atol=2e-3)
    assert s["usage_pct"].between(0, 50).all() and s["ts_pct"].between(0.3, 0.9).all()
    assert s["three_pa_rate"].between(0, 1).all() and s["minutes"].max() < 3300
    ppp = s[[f"ppp_{t}" for t in PLAY_TYPES]]
    assert ppp.isna().any().any()  # unused play types have no efficiency
    assert ppp.stack().dropna().between(0, 3).all()


def test_noise_shrinks_with_minutes(demo_prepared, demo_truth):
    """Spread of usage around the player's own mean is larger for short seasons."""
    s = demo_prepared.seasons
    s = s[s.groupby("player_id")["season"].transform("size") >= 3].copy()
    s["dev"] = s["usage_pct"] - s.groupby("player_id")["usage_pct"].transform("mean")
    short = s.loc[s["minutes"] < 500, "dev"].std()
    long = s.loc[s["minutes"] > 2000, "dev"].std()
    assert short > 1.5 * long


def test_stories_are_present(demo_truth, demo_prepared):
    assert len(demo_prepared.stints) > 0  # mid-season trades
    assert demo_truth["changed"].sum() > 100  # real role changes
    assert demo_truth["between"].mean() > 0.05  # players between two roles
    seasons = sorted(demo_truth["season"].unique())
    first = set(demo_truth.loc[demo_truth["season"] == seasons[0], "player_id"])
    last = set(demo_truth.loc[demo_truth["season"] == seasons[-1], "player_id"])
    assert last - first and first - last  # rookies arrive, players depart
    assert set(demo_truth["true_role"]) == set(ARCHETYPES)


def test_archetypes_reuse_no_published_role_label():
    """The demo's true roles are our own fiction: no rating service's label, in code or in the truth files."""
    assert {key: borrowed_labels(key) for key in ARCHETYPES if borrowed_labels(key)} == {}
    for text in ((DEMO / "truth" / "archetypes.csv").read_text(), (DEMO / "README.md").read_text()):
        assert borrowed_labels(text) == []


def test_names_are_invented_and_unique():
    league = generate_league(seed=5)
    names = league.rows.drop_duplicates("player_id")["player"]
    assert names.is_unique


def test_seed_changes_the_league():
    a = generate_league(seed=1).rows
    b = generate_league(seed=2).rows
    assert not a["usage_pct"].head(50).equals(b["usage_pct"].head(50))
