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
