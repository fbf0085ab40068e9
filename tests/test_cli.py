"""The command line end to end through main(argv)."""

from __future__ import annotations

import json
import subprocess
import sys

import pandas as pd
import pytest
from conftest import DEMO, small_table

from drift.cli import main

OUTPUTS = {"report.html", "report-data", "model.json", "placements.csv", "moves.csv", "excluded.csv", "stints.csv",
           "role_drift.csv", "comparables.csv", "features.csv"}


def _files(folder):
    """Every file of an output folder (the report's chunks too), relative, without the marker."""
    return sorted(str(p.relative_to(folder)) for p in folder.rglob("*") if p.is_file() and p.name != ".drift-output.json")


def test_run_writes_every_output(demo_run, capsys):
    code, out = demo_run
    assert code == 0
    assert OUTPUTS <= {p.name for p in out.iterdir()}
    placements = pd.read_csv(out / "placements.csv")
    assert {"player_id", "player", "season", "team", "games", "minutes", "role", "role_prob",
            "margin", "out_of_reference"} <= set(placements.columns)
    moves = pd.read_csv(out / "moves.csv")
    assert {"player_id", "player", "season_from", "season_to", "team_from", "team_to", "role_from",
            "role_to", "distance", "role_changed", "z", "p_value", "percentile", "status", "traded",
            "driver_1", "driver_1_change", "driver_1_change_sd"} <= set(moves.columns)
    assert set(moves["kind"]) == {"consecutive", "requested"}
    excluded = pd.read_csv(out / "excluded.csv")
    assert len(excluded) > 0 and excluded["reason"].notna().all()
    assert json.loads((out / "model.json").read_text())["schema"] == "drift-role-model"


def test_in_process_outputs_match_the_cli_run(demo_run, demo_analysis, tmp_path):
    """The CLI run and the session's in-process analysis of the same settings write the same bytes."""
    from drift.api import write_outputs

    _, out = demo_run
    again = tmp_path / "again"
    again.mkdir()
    write_outputs(demo_analysis, again)
    assert _files(again) == _files(out)
    for name in _files(out):
        assert (again / name).read_bytes() == (out / name).read_bytes(), name


@pytest.mark.slow
@pytest.mark.refit
def test_outputs_are_byte_identical_on_rerun(demo_run, tmp_path):
    """A second, real fit of the same data and settings writes every file byte for byte the same."""
    from conftest import DEMO_COMPARE

    _, out = demo_run
    again = tmp_path / "again"
    assert main(["run", str(DEMO), "--out", str(again), "--compare", *DEMO_COMPARE, "--quiet"]) == 0
    assert _files(again) == _files(out)
    for name in _files(out):
        assert (again / name).read_bytes() == (out / name).read_bytes(), name


def test_previous_model_carries_ids_and_writes_alignment(small_run, demo_run):
    code, new = small_run
    assert code == 0
    al = pd.read_csv(new / "alignment.csv", keep_default_na=False)
    assert {"previous_id", "new_id", "cost", "status"} <= set(al.columns)
    previous = {r["id"] for r in json.loads((demo_run[1] / "model.json").read_text())["roles"]}
    carried = {r["id"] for r in json.loads((new / "model.json").read_text())["roles"]}
    kept = al[al["status"] == "kept"]
    assert len(kept) >= 3 and set(kept["carried_id"]) <= previous & carried
    # a role with no match gets a fresh id, never one the previous model used for another role
    assert not set(al.loc[al["status"] == "new", "carried_id"]) & previous


def test_place_command(demo_run, tmp_path, capsys):
    _, out = demo_run
    target = tmp_path / "placed.csv"
    code = main(["place", str(out / "model.json"), str(DEMO / "2024-25.csv"), "--out", str(target),
                 "--min-games", "5"])
    assert code == 0
    placed = pd.read_csv(target)
    assert set(placed["season"]) == {"2024-25"} and "role" in placed
    assert "placed" in capsys.readouterr().out
    # with the model's own filters (20 games), short seasons are listed beside the output
    assert main(["place", str(out / "model.json"), str(DEMO / "2024-25.csv"), "--out", str(target)]) == 0
    excluded = pd.read_csv(tmp_path / "placed_excluded.csv")
    assert len(excluded) > 0 and excluded["reason"].str.contains("min_games 20").any()
    assert "excluded by the filters" in capsys.readouterr().out


def test_fixed_roles_and_components(small_run):
    code, out = small_run
    assert code == 0
    model = json.loads((out / "model.json").read_text())
    assert len(model["roles"]) == 4 and len(model["components"]) == 3
    assert model["reference_seasons"] == ["2023-24", "2024-25"]


def _fails(argv, capsys):
    code = main(argv)
    err = capsys.readouterr().err
    assert code == 2
    assert err.startswith("drift: error: ") and len(err.strip().splitlines()) <= 2
    assert "Traceback" not in err
    return err


def test_errors_are_one_line_exit_two(tmp_path, capsys):
    err = _fails(["run", str(tmp_path / "missing"), "--out", str(tmp_path / "o")], capsys)
    assert "path not found" in err
    bad = tmp_path / "bad"
    bad.mkdir()
    t = small_table().astype({"games": object})
    t.loc[0, "games"] = "many"
    t.to_csv(bad / "2021-22.csv", index=False)
    err = _fails(["run", str(bad), "--out", str(tmp_path / "o")], capsys)
    assert "row 2" in err and "'games'" in err and "'many'" in err
    assert not (tmp_path / "o").exists()  # nothing written on failure


def test_broken_model_file(tmp_path, capsys):
    model = tmp_path / "model.json"
    model.write_text("{ nope")
    err = _fails(["place", str(model), str(DEMO / "2024-25.csv"), "--out", str(tmp_path / "p.csv")], capsys)
    assert "not valid JSON" in err


def test_failed_run_leaves_previous_output_untouched(demo_run, tmp_path, capsys):
    _, out = demo_run
    before = (out / "model.json").read_bytes()
    _fails(["run", str(DEMO), "--out", str(out), "--reference", "1999-00"], capsys)
    assert (out / "model.json").read_bytes() == before
    assert not [p for p in out.parent.iterdir() if p.name.startswith(".")]


def test_refuses_to_replace_a_foreign_folder(tmp_path, capsys):
    foreign = tmp_path / "mine"
    foreign.mkdir()
    (foreign / "thesis.docx").write_text("precious")
    err = _fails(["run", str(DEMO), "--out", str(foreign), "--roles", "3", "--components", "2"], capsys)
    assert "not a drift output" in err and (foreign / "thesis.docx").exists()


def test_another_commands_output_is_never_replaced(demo_run, tmp_path, capsys):
    """The new-user trial: an in-season check or a placement aimed at a run folder deleted it."""
    import shutil

    report = tmp_path / "drift-report"
    shutil.copytree(demo_run[1], report)
    before = {str(p): p.read_bytes() for p in report.rglob("*") if p.is_file()}
    model = str(demo_run[1] / "model.json")  # the model of another run: this folder is no input
    partial = tmp_path / "2025-26.csv"
    shutil.copy(DEMO / "2024-25.csv", partial)
    err = _fails(["place", model, str(partial), "--against", str(DEMO), "--out", str(report)], capsys)
    assert "output folder of `drift run`" in err and "choose another folder" in err
    err = _fails(["place", model, str(DEMO / "2024-25.csv"), "--out", str(report / "placements.csv")], capsys)
    assert "placements.csv of the `drift run` output" in err
    _fails(["demo", "--out", str(report)], capsys)
    assert {str(p): p.read_bytes() for p in report.rglob("*") if p.is_file()} == before


def test_bad_config(tmp_path, capsys):
    cfg = tmp_path / "c.toml"
    cfg.write_text("[model]\nroles = 'many'\n")
    err = _fails(["run", str(DEMO), "--out", str(tmp_path / "o"), "--config", str(cfg)], capsys)
    assert "roles" in err


def test_help_is_instant_and_imports_nothing_heavy():
    code = ("import sys, drift.cli\n"
            "try:\n    drift.cli.main(['--help'])\nexcept SystemExit:\n    pass\n"
            "heavy = [m for m in ('pandas', 'numpy', 'sklearn', 'matplotlib', 'scipy') if m in sys.modules]\n"
            "print(heavy)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip().splitlines()[-1] == "[]"


def test_python_dash_m_works():
    import drift
    from drift.constants import DISTRIBUTION

    out = subprocess.run([sys.executable, "-m", "drift", "--version"], capture_output=True, text=True)
    assert out.returncode == 0 and out.stdout.strip() == f"drift {drift.__version__} (package {DISTRIBUTION})"


def test_demo_command_writes_a_league(tmp_path):
    assert main(["demo", "--out", str(tmp_path / "league"), "--seed", "3"]) == 0
    assert len(list((tmp_path / "league").glob("*.csv"))) == 6
    assert (tmp_path / "league" / "truth" / "truth.csv").exists()


def test_data_quality_warning_is_one_line(tmp_path, capsys):
    import numpy as np

    t = small_table(n_players=30, seasons=("2021-22", "2022-23", "2023-24"))
    t.loc[3, "usage_pct"] = np.nan
    t.to_csv(tmp_path / "all.csv", index=False)
    assert main(["run", str(tmp_path / "all.csv"), "--out", str(tmp_path / "o"), "--roles", "2",
                 "--components", "2"]) == 0
    err = capsys.readouterr().err
    assert "drift: warning: missing values set to the pool mean: usage_pct (1)" in err


def test_no_parser_takes_abbreviations_and_unknown_options_come_first(capsys):
    import argparse

    from drift.cli import build_parser

    parser = build_parser()
    subs = next(a for a in parser._actions if isinstance(a, argparse._SubParsersAction))
    assert not parser.allow_abbrev and not any(p.allow_abbrev for p in subs.choices.values())
    with pytest.raises(SystemExit) as stop:  # a required positional (FILE) is missing too
        main(["place", "m.json", "--out=x", "--against", "d", "--seasons-games=9"])
    err = capsys.readouterr().err
    assert stop.value.code == 2 and len(err.splitlines()) == 1
    assert "unknown option --seasons-games (did you mean --season-games?)" in err
