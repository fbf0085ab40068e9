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


#: a name that would run script if a notebook's HTML did not escape it
HOSTILE = "<img src=x onerror=alert(1)>"


def test_placed_shows_roles_and_exclusions_short_and_escaped(demo_model, demo_prepared, tmp_path):
    placements = demo_model.place(demo_prepared.kept.head(60))
    excluded = demo_prepared.excluded.head(4).assign(reason=HOSTILE)
    placed = Placed(placements, excluded, tmp_path / "p.csv", tmp_path / "p_excluded.csv")
    text = repr(placed)
    assert text.startswith(f"Placed: placed 60 player-seasons; wrote {tmp_path / 'p.csv'}")
    assert len(text.splitlines()) == 2 and "DataFrame" not in text  # no dataclass dump
    counts = placements["role"].value_counts()
    for role, name in zip(demo_model.role_ids_, demo_model.role_names_):
        if role in counts:
            assert f"{role} {name} ({counts[role]})" in text
    page = placed._repr_html_()
    assert "&lt;img src=x onerror=alert(1)&gt;" in page and HOSTILE not in page
    assert ">&lt;img src=x onerror=alert(1)&gt;</td><td style=\"text-align:left\">4</td>" in page  # reason, count


def test_checked_lists_the_strongest_moves_first_escaped():
    from drift.measure.inseason import INSEASON_COLUMNS
    from drift.placing import Checked

    rows = []
    for i, status in enumerate(["changed", "steady", "shifted", "too early", "changed"]):
        row = {c: None for c in INSEASON_COLUMNS}
        row.update(player_id=f"P{i}", player=HOSTILE if i == 0 else f"Player {i}", team_to="AAA",
                   role_from="R1", role_to="R2", games_to=12, status=status, z=5.0 - i)
        rows.append(row)
    checked = Checked(pd.DataFrame(rows), pd.DataFrame({"player_id": ["Q"], "reason": ["no earlier season"]}))
    assert repr(checked).splitlines() == [
        "Checked: checked 5 players against their last season (2 changed, 1 shifted, 1 too early)",
        "  not checked: 1 rows"]
    page = checked._repr_html_()
    assert HOSTILE not in page and "&lt;img" in page
    assert "Moves beyond noise so far (the 3 strongest)" in page  # changed and shifted only
    assert page.index("&lt;img") < page.index("Player 2") < page.index("Player 4")  # strongest evidence first
