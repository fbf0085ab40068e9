"""The installed package works on its own: the wheel carries the templates and renders the demo report."""

from __future__ import annotations

import subprocess
import sys
import sysconfig
import zipfile
from pathlib import Path

import pytest
from conftest import DEMO, ROOT


@pytest.fixture(scope="module")
def wheel(tmp_path_factory):
    dist = tmp_path_factory.mktemp("dist")
    done = subprocess.run([sys.executable, "-m", "pip", "wheel", "--no-deps", "-q", "-w", str(dist), str(ROOT)],
                          capture_output=True, text=True)
    if done.returncode != 0:  # pragma: no cover - building needs setuptools from the index or pip's cache
        pytest.skip(f"could not build the wheel here: {done.stderr.strip()[-300:]}")
    return next(dist.glob("*.whl"))


def test_wheel_holds_every_template_and_subpackage(wheel):
    names = set(zipfile.ZipFile(wheel).namelist())
    templates = {p.name for p in (ROOT / "drift" / "report" / "templates").iterdir()}
    assert templates and all(f"drift/report/templates/{name}" in names for name in templates)
    for stage in ("intake", "model", "measure", "outlook", "report", "output", "sim"):
        assert f"drift/{stage}/__init__.py" in names, stage


@pytest.mark.slow
def test_wheel_in_a_fresh_venv_renders_the_demo_report(wheel, tmp_path):
    """Installed from the wheel alone (no source tree on the path), drift runs and renders the report."""
    venv = tmp_path / "venv"
    subprocess.run([sys.executable, "-m", "venv", "--without-pip", str(venv)], check=True)
    python = venv / "bin" / "python"
    subprocess.run([sys.executable, "-m", "pip", "--python", str(python), "install", "-q", "--no-deps",
                    "--no-index", str(wheel)], check=True, capture_output=True)
    # the dependencies come from this environment, after the venv's own site-packages
    site = subprocess.run([str(python), "-c", "import sysconfig; print(sysconfig.get_paths()['purelib'])"],
                          check=True, capture_output=True, text=True).stdout.strip()
    (Path(site) / "zz_test_deps.pth").write_text(sysconfig.get_paths()["purelib"] + "\n")
    work = tmp_path / "elsewhere"
    work.mkdir()
    where = subprocess.run([str(python), "-c", "import drift; print(drift.__file__)"], cwd=work,
                           capture_output=True, text=True, check=True).stdout
    assert str(venv) in where and str(ROOT) not in where
    out = work / "report"
    done = subprocess.run([str(venv / "bin" / "drift"), "run", str(DEMO), "--out", str(out), "--roles", "4",
                           "--components", "3", "--reference", "2023-24", "2024-25", "--quiet"],
                          cwd=work, capture_output=True, text=True)
    assert done.returncode == 0, done.stderr
    page = (out / "report.html").read_text(encoding="utf-8")
    assert page.lower().startswith("<!doctype html>")
    assert "</html>" in page and "R1" in page
