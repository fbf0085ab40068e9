"""Charts: inline SVG on bare Figure objects, drift's style applied locally, never globally."""

from __future__ import annotations

import matplotlib
import pytest

import drift
from drift.report import _charts as charts


@pytest.fixture(scope="module")
def small_league(tmp_path_factory):
    """Three seasons of a small invented league (seeded), written as CSVs."""
    from drift.sim.demo import generate_league, write_league

    folder = tmp_path_factory.mktemp("small")
    write_league(folder, generate_league(11, seasons=("2021-22", "2022-23", "2023-24"), n_teams=6, roster=14))
    return folder


def test_run_leaves_the_callers_backend_and_rcparams_alone(small_league, tmp_path):
    """A notebook user who chose a backend and a style keeps both after drift.run."""
    before_backend = matplotlib.get_backend()
    saved = matplotlib.rcParams.copy()
    try:
        matplotlib.use("pdf")
        matplotlib.rcParams.update({"font.size": 13.0, "axes.spines.top": True, "svg.fonttype": "path",
                                    "svg.hashsalt": None})
        backend, params = matplotlib.get_backend(), dict(matplotlib.rcParams)
        drift.run(small_league, tmp_path / "out", drift.Config(roles=3, components=3))
        assert matplotlib.get_backend() == backend
        assert dict(matplotlib.rcParams) == params
        html = (tmp_path / "out" / "report.html").read_text(encoding="utf-8")
        assert html.count("<svg") >= 5 and "font-family" in html  # drift's style: text kept as text
    finally:
        matplotlib.rcParams.update(saved)
        matplotlib.use(before_backend)


def test_charts_are_deterministic_svg(demo_model):
    first = charts.components_chart(demo_model.component_diagnostics_)
    assert first.startswith("<svg") and first == charts.components_chart(demo_model.component_diagnostics_)
    assert "<text" in first  # svg.fonttype "none": labels stay searchable text, not paths


def test_palette_is_distinct():
    assert len(set(charts.ROLE_COLOURS)) == len(charts.ROLE_COLOURS)
