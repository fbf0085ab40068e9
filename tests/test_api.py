"""The public API: exported names resolve lazily, and run() does the whole job."""

from __future__ import annotations

import subprocess
import sys

import drift


def test_exported_names_resolve():
    for name in drift.__all__:
        assert getattr(drift, name) is not None, name


def test_import_is_light():
    code = "import sys, drift; print([m for m in ('pandas', 'numpy', 'sklearn') if m in sys.modules])"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "[]"


def test_errors_share_one_base():
    for name in ("InputError", "ConfigError", "ModelFileError", "NotFittedError"):
        assert issubclass(getattr(drift, name), drift.DriftError)
    for name in ("DataQualityWarning", "ModelQualityWarning"):
        assert issubclass(getattr(drift, name), drift.DriftWarning)


def test_run_returns_the_analysis_and_writes(tmp_path):
    from conftest import DEMO

    analysis = drift.run(DEMO, tmp_path / "out", drift.Config(roles=4, components=3,
                                                             reference=("2023-24", "2024-25")))
    assert (tmp_path / "out" / "report.html").exists()
    assert len(analysis.model.role_ids_) == 4 and len(analysis.placements) > 1500


def test_fitting_and_placing_run_the_math_libraries_on_one_thread(demo_prepared, monkeypatch):
    # the last digits of K-means and BLAS sums depend on the thread count; one thread makes
    # outputs byte-identical across machines (README, "Outputs")
    from threadpoolctl import threadpool_info, threadpool_limits

    from drift import api
    from drift.model import RoleModel

    seen = []
    real_fit = RoleModel.fit

    def spy(self, *args, **kwargs):
        seen.append({pool["num_threads"] for pool in threadpool_info()})
        return real_fit(self, *args, **kwargs)

    monkeypatch.setattr(RoleModel, "fit", spy)
    with threadpool_limits(limits=2):
        api.fit_model(demo_prepared, api.Config(roles=3, components=3, reference=("2024-25",)))
    assert seen == [{1}]


def test_an_analysis_shows_roles_changes_and_warnings_briefly(demo_analysis):
    import dataclasses

    analysis = demo_analysis
    lines = repr(analysis).splitlines()
    assert lines[0] == f"Analysis: {analysis.summary()}" and len(lines) == 3  # not a dump of its tables
    placed = analysis.placements["role"].value_counts()
    page = analysis._repr_html_()
    for rid, name in zip(analysis.model.role_ids_, analysis.model.role_names_):
        assert f"{rid} {name} ({placed[rid]:,})" in lines[1]
        assert f">{name}</td>" in page
    assert f"Role changes beyond noise: {analysis.n_changed:,} (the 8 largest by z)" in page
    changed = analysis.moves[analysis.moves["status"] == "changed"].sort_values("z", ascending=False)
    first = changed.iloc[0]
    assert page.index(f">{first['player']}</td>") < page.index(f">{changed.iloc[7]['player']}</td>")
    assert f"{first['z']:.1f}" in page
    # a hostile player name is shown as text, never as markup
    moves = analysis.moves.copy()
    moves.loc[changed.index[0], "player"] = "<img src=x onerror=alert(1)>"
    hostile = dataclasses.replace(analysis, moves=moves)._repr_html_()
    assert "<img" not in hostile and "&lt;img src=x onerror=alert(1)&gt;" in hostile


def test_analysis_warnings_gather_weak_roles_filled_values_and_intake_notes(demo_analysis):
    import dataclasses

    import pandas as pd

    prepared = demo_analysis.prepared
    missing = pd.DataFrame([{"feature": "usage_pct", "family": "rate", "missing": 3, "action": "pool mean"}])
    reading = dataclasses.replace(prepared.reading, notes=tuple(f"note {i}" for i in range(7)))
    changed = dataclasses.replace(demo_analysis, prepared=dataclasses.replace(prepared, missing=missing,
                                                                              reading=reading))
    assert changed.warnings == ("usage_pct: 3 missing value(s) set to the pool mean", "note 0", "note 1",
                                "note 2", "note 3", "note 4", "... and 2 more intake notes")
    assert repr(changed).splitlines()[2] == "  warnings: 7, the first: usage_pct: 3 missing value(s) set to the pool mean"
    assert "<li>note 4</li><li>... and 2 more intake notes</li>" in changed._repr_html_()
