"""Output ownership: drift replaces only what it wrote, never an input, and survives being killed."""

from __future__ import annotations

import json
import os
import signal
import subprocess
import sys
import textwrap

import pytest
from conftest import ROOT

from drift.errors import InputError
from drift.output.folders import MARKER, atomic_file, atomic_folder, check_output_file, check_output_folder


def _write(out, files, kind="run", **kw):
    with atomic_folder(out, kind=kind, **kw) as tmp:
        for name, text in files.items():
            (tmp / name).write_text(text)


def _hidden(folder):
    return sorted(p.name for p in folder.iterdir() if p.name.startswith("."))


def test_marker_names_the_files_drift_wrote(tmp_path):
    out = tmp_path / "out"
    _write(out, {"a.csv": "1", "report.html": "r"})
    marker = json.loads((out / MARKER).read_text())
    assert marker["written_by"] == "drift" and marker["files"] == ["a.csv", "report.html"]
    assert _hidden(tmp_path) == []


def test_rerun_keeps_the_users_files_and_removes_only_its_own(tmp_path):
    out = tmp_path / "out"
    _write(out, {"a.csv": "old", "gone.csv": "old"})
    (out / "notes.txt").write_text("mine")
    (out / "sub").mkdir()
    (out / "sub" / "deep.txt").write_text("mine too")
    os.symlink("notes.txt", out / "link")
    _write(out, {"a.csv": "new", "b.csv": "new"})
    assert (out / "a.csv").read_text() == "new" and (out / "b.csv").read_text() == "new"
    assert not (out / "gone.csv").exists()  # drift's own file from the last run
    assert (out / "notes.txt").read_text() == "mine"
    assert (out / "sub" / "deep.txt").read_text() == "mine too"
    assert os.readlink(out / "link") == "notes.txt"
    assert json.loads((out / MARKER).read_text())["files"] == ["a.csv", "b.csv"]
    assert _hidden(tmp_path) == []


def test_a_users_file_with_an_output_name_is_refused(tmp_path):
    out = tmp_path / "out"
    _write(out, {"a.csv": "old"})
    (out / "alignment.csv").write_text("mine")
    with pytest.raises(InputError, match="alignment.csv, which drift did not write"):
        check_output_folder(out, kind="run", names=("alignment.csv",))
    with pytest.raises(InputError, match="did not write"):
        _write(out, {"alignment.csv": "new"})
    assert (out / "alignment.csv").read_text() == "mine" and (out / "a.csv").read_text() == "old"


@pytest.mark.parametrize("content", [{"model.json": "{}"}, {"report.html": ""}, {"x.txt": ""},
                                     {MARKER: "{not json"}, {MARKER: '{"written_by": "me"}'}])
def test_a_folder_without_drifts_marker_is_never_replaced(tmp_path, content):
    out = tmp_path / "out"
    out.mkdir()
    for name, text in content.items():
        (out / name).write_text(text)
    with pytest.raises(InputError, match="not a drift output"):
        _write(out, {"model.json": "new"})
    assert {p.name: p.read_text() for p in out.iterdir()} == content


def test_an_empty_folder_is_used(tmp_path):
    out = tmp_path / "out"
    out.mkdir()
    _write(out, {"a.csv": "1"})
    assert (out / "a.csv").read_text() == "1"


@pytest.mark.parametrize("case, message", [
    ("same", "is the input"),
    ("contains", "contains the input"),
    ("inside", "lies inside the input folder"),
])
def test_an_output_never_touches_an_input(tmp_path, case, message):
    data = tmp_path / "data"
    data.mkdir()
    (data / "2021-22.csv").write_text("x")
    out = {"same": data, "contains": tmp_path, "inside": data / "report"}[case]
    with pytest.raises(InputError, match=message):
        check_output_folder(out, kind="run", inputs=[data])
    assert (data / "2021-22.csv").read_text() == "x"


def test_place_output_never_overwrites_its_model_or_input(tmp_path):
    model = tmp_path / "model.json"
    model.write_text("{}")
    data = tmp_path / "2024-25.csv"
    data.write_text("player_id,role\n")
    for target, message in ((model, "is the input"), (data, "is the input"),
                            (tmp_path / "sub" / ".." / "model.json", "is the input")):
        with pytest.raises(InputError, match=message):
            check_output_file(target, inputs=[model, data])
    folder = tmp_path / "seasons"
    folder.mkdir()
    with pytest.raises(InputError, match="lies inside the input folder"):
        check_output_file(folder / "placed.csv", inputs=[folder])


def test_place_output_replaces_only_a_file_drift_wrote(tmp_path):
    mine = tmp_path / "budget.csv"
    mine.write_text("item,cost\nball,3\n")
    with pytest.raises(InputError, match="not a file drift wrote"):
        with atomic_file(mine) as tmp:
            tmp.write_text("player_id,role\n")
    assert mine.read_text() == "item,cost\nball,3\n"
    ours = tmp_path / "placed.csv"
    for text in ("player_id,role\nP1,R1\n", "player_id,role\nP2,R2\n"):
        with atomic_file(ours) as tmp:
            tmp.write_text(text)
        assert ours.read_text() == text
    assert _hidden(tmp_path) == []


def test_unwritable_output_is_refused_before_any_work(tmp_path):
    blocker = tmp_path / "file"
    blocker.write_text("x")
    with pytest.raises(InputError, match="is a file, not a folder"):
        check_output_folder(blocker / "out", kind="run")
    with pytest.raises(InputError, match="exists and is a file"):
        check_output_folder(blocker, kind="run")


_CHILD = textwrap.dedent("""
    import sys, time
    sys.path.insert(0, {root!r})
    from drift.output.folders import atomic_folder
    with atomic_folder(sys.argv[1], kind="run") as tmp:
        for name in ("a.csv", "b.csv", "report.html"):
            (tmp / name).write_text(sys.argv[2])
""")


def _child(out, text, env_extra):
    env = {**os.environ, **env_extra}
    code = _CHILD.format(root=str(ROOT))
    return subprocess.run([sys.executable, "-c", code, str(out), text], env=env,
                          capture_output=True, text=True, timeout=60)


def _state(out):
    return {p.name: p.read_text() for p in out.iterdir() if p.is_file() and p.name != MARKER}


_STEPS = ["staging", "written", "carried", "swapped"]


# the exchange has no step between two renames; the fallback does ("moved-away")
@pytest.mark.parametrize("point, fallback", [(p, False) for p in _STEPS]
                         + [(p, True) for p in _STEPS + ["moved-away"]])
def test_sigkill_at_any_step_keeps_a_complete_output(tmp_path, point, fallback):
    out = tmp_path / "out"
    env = {"_DRIFT_TEST_NO_EXCHANGE": "1"} if fallback else {}
    assert _child(out, "old", env).returncode == 0
    (out / "notes.txt").write_text("mine")
    killed = _child(out, "new", {**env, "_DRIFT_TEST_KILL_AT": point})
    assert killed.returncode == -signal.SIGKILL
    old = {"a.csv": "old", "b.csv": "old", "report.html": "old", "notes.txt": "mine"}
    new = {**old, "a.csv": "new", "b.csv": "new", "report.html": "new"}
    if point != "moved-away":  # between two renames the old output waits beside; see below
        assert _state(out) == (new if point == "swapped" else old)
    # the next run restores or keeps the last complete output and cleans the litter it proves its own
    check_output_folder(out, kind="run")
    assert _state(out) == (new if point == "swapped" else old)
    assert _hidden(tmp_path) == []
    assert _child(out, "third", env).returncode == 0
    assert _state(out)["a.csv"] == "third" and _state(out)["notes.txt"] == "mine"
    assert _hidden(tmp_path) == []


def test_litter_of_a_live_run_or_of_unknown_origin_is_left_alone(tmp_path):
    out = tmp_path / "out"
    live = tmp_path / f".out.drift-new-{os.getppid()}-abcd1234"
    live.mkdir()
    (live / "x.csv").write_text("in progress")
    stranger = tmp_path / ".out.drift-new-999999999-abcd1234"
    stranger.mkdir()
    (stranger / "y.txt").write_text("no marker: not provably ours")
    _write(out, {"a.csv": "1"})
    assert (live / "x.csv").exists() and (stranger / "y.txt").exists()


_SLOW = textwrap.dedent("""
    import sys, time
    sys.path.insert(0, {root!r})
    from drift.messages import run_guarded
    from drift.output.folders import atomic_folder
    def job(args):
        with atomic_folder(sys.argv[1], kind="run") as tmp:
            (tmp / "a.csv").write_text("new")
            print("ready", flush=True)
            time.sleep(30)
        return "done"
    sys.exit(run_guarded(job, None))
""")


@pytest.mark.parametrize("sig, code", [(signal.SIGINT, 130), (signal.SIGTERM, 143)])
def test_interrupt_prints_one_line_and_leaves_no_litter(tmp_path, sig, code):
    out = tmp_path / "out"
    _write(out, {"a.csv": "old"})
    proc = subprocess.Popen([sys.executable, "-c", _SLOW.format(root=str(ROOT)), str(out)],
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    assert proc.stdout.readline().strip() == "ready"
    proc.send_signal(sig)
    _, err = proc.communicate(timeout=30)
    assert proc.returncode == code
    assert err.strip() == "drift: interrupted"
    assert _state(out) == {"a.csv": "old"} and _hidden(tmp_path) == []


def test_cli_run_never_replaces_its_own_data_folder(tmp_path, capsys):
    from conftest import small_table

    from drift.cli import main

    data = tmp_path / "seasons"
    data.mkdir()
    small_table().to_csv(data / "2021-22.csv", index=False)
    (data / "model.json").write_text("{}")  # last year's model kept beside the data
    before = {p.name: p.read_bytes() for p in data.iterdir()}
    assert main(["run", str(data), "--out", str(data)]) == 2
    assert "is the input" in capsys.readouterr().err
    assert main(["run", str(data), "--out", str(data / "report")]) == 2
    assert "lies inside the input folder" in capsys.readouterr().err
    assert main(["run", str(data / "2021-22.csv"), "--out", str(tmp_path)]) == 2
    assert "contains the input" in capsys.readouterr().err
    assert {p.name: p.read_bytes() for p in data.iterdir() if p.is_file()} == before


def test_cli_place_never_overwrites_its_model(tmp_path, capsys):
    from drift.cli import main

    model = tmp_path / "model.json"
    model.write_text('{"schema": "drift-role-model"}')
    data = tmp_path / "2024-25.csv"
    data.write_text("player_id\n")
    for target in (model, data):
        assert main(["place", str(model), str(data), "--out", str(target)]) == 2
        assert "is the input" in capsys.readouterr().err
    assert model.read_text() == '{"schema": "drift-role-model"}'


def test_owned_files_in_subfolders(tmp_path):
    out = tmp_path / "out"
    with atomic_folder(out, kind="run") as tmp:
        (tmp / "truth").mkdir()
        (tmp / "truth" / "old.csv").write_text("old")
        (tmp / "a.csv").write_text("old")
    assert json.loads((out / MARKER).read_text())["files"] == ["a.csv", "truth/old.csv"]
    (out / "truth" / "mine.txt").write_text("mine")
    with atomic_folder(out, kind="run") as tmp:
        (tmp / "truth").mkdir()
        (tmp / "truth" / "new.csv").write_text("new")
    assert sorted(p.name for p in (out / "truth").iterdir()) == ["mine.txt", "new.csv"]
    assert not (out / "a.csv").exists() and _hidden(tmp_path) == []


def test_demo_never_writes_over_a_folder_of_seasons(tmp_path, capsys):
    from drift.cli import main

    seasons = tmp_path / "seasons"
    seasons.mkdir()
    (seasons / "2021-22.csv").write_text("real data")
    assert main(["demo", "--out", str(seasons)]) == 2
    assert "not a drift output" in capsys.readouterr().err
    assert (seasons / "2021-22.csv").read_text() == "real data"


def test_marker_records_the_kind_and_another_kind_is_refused(tmp_path):
    out = tmp_path / "out"
    _write(out, {"report.html": "r", "placements.csv": "p"}, kind="run")
    assert json.loads((out / MARKER).read_text())["kind"] == "run"
    for kind, command in (("inseason", "drift place --against"), ("demo", "drift demo")):
        with pytest.raises(InputError, match=f"output folder of `drift run`; `{command}` never replaces"):
            _write(out, {"inseason.csv": "new"}, kind=kind)
    assert (out / "report.html").read_text() == "r" and (out / "placements.csv").read_text() == "p"
    _write(out, {"report.html": "r2"}, kind="run")  # the same command replaces its own output
    assert (out / "report.html").read_text() == "r2" and not (out / "placements.csv").exists()


@pytest.mark.parametrize("files, kind", [(["model.json", "report.html"], "run"),
                                         (["inseason.csv", "inseason.html"], "inseason"),
                                         (["2021-22.csv", "truth/roles.csv"], "demo")])
def test_a_marker_without_kind_is_read_by_its_files(tmp_path, files, kind):
    out = tmp_path / "out"
    out.mkdir()
    (out / MARKER).write_text(json.dumps({"written_by": "drift", "state": "complete", "files": files}))
    assert check_output_folder(out, kind=kind)["owned"] == set(files)
    other = "demo" if kind != "demo" else "run"
    with pytest.raises(InputError, match="never replaces another command's output"):
        check_output_folder(out, kind=other)


@pytest.mark.parametrize("kind", ["run", "inseason", "demo"])
def test_a_folder_named_like_a_csv_file_is_refused(tmp_path, kind):
    with pytest.raises(InputError, match=r"x.csv ends in .csv, .* writes a folder.*; give a folder name such as x"):
        check_output_folder(tmp_path / "x.csv", kind=kind)
    assert not (tmp_path / "x.csv").exists()


def test_a_file_listed_in_an_output_marker_is_not_overwritten(tmp_path):
    out = tmp_path / "out"
    _write(out, {"placements.csv": "player_id,role\n"}, kind="run")
    with pytest.raises(InputError, match="placements.csv of the `drift run` output"):
        check_output_file(out / "placements.csv")
    (out / "truth").mkdir()
    (out / "truth" / "roles.csv").write_text("player_id,role\n")
    (out / MARKER).write_text(json.dumps({"written_by": "drift", "state": "complete", "kind": "demo",
                                          "files": ["truth/roles.csv"]}))
    with pytest.raises(InputError, match="truth/roles.csv of the `drift demo` output"):
        check_output_file(out / "truth" / "roles.csv")
    assert check_output_file(out / "early.csv") == out / "early.csv"  # a new file beside them is fine


def test_role_names_stand_beside_role_ids():
    import pandas as pd

    from drift.output.tables import with_role_names

    frame = pd.DataFrame({"player": ["a", "b"], "role_from": ["R1", "R2"], "role_to": ["R2", None],
                          "role": ["R1", "R9"], "role_name": ["kept", "kept"]})
    named = with_role_names(frame, {"R1": "one", "R2": "two"})
    assert list(named.columns) == ["player", "role_from", "role_from_name", "role_to", "role_to_name", "role",
                                   "role_name"]
    assert named["role_from_name"].tolist() == ["one", "two"] and named["role_to_name"].tolist() == ["two", ""]
    assert named["role_name"].tolist() == ["kept", "kept"] and "role_from_name" not in frame  # never in place


@pytest.mark.slow
def test_parquet_tables_hold_what_the_csvs_hold(demo_run, demo_analysis, tmp_path):
    """--format parquet: the same tables, columns and values as the CSVs of the same run (read back)."""
    import io

    import pandas as pd

    from drift.api import write_outputs

    _, out = demo_run
    write_outputs(demo_analysis, tmp_path, table_format="parquet")
    names = sorted(p.stem for p in out.glob("*.csv"))
    assert sorted(p.stem for p in tmp_path.glob("*.parquet")) == names and not list(tmp_path.glob("*.csv"))
    for name in names:
        csv = pd.read_csv(out / f"{name}.csv", keep_default_na=False, na_values=[""])
        parquet = pd.read_parquet(tmp_path / f"{name}.parquet")
        assert list(parquet.columns) == list(csv.columns), name
        # CSV gives back text and numbers; the Parquet file keeps the types: compare as CSV would print them
        again = pd.read_csv(io.StringIO(parquet.to_csv(index=False)), keep_default_na=False,
                            na_values=[""])
        pd.testing.assert_frame_equal(again, csv, check_exact=True, obj=name)
    assert "outlook.parquet" in (tmp_path / "report.html").read_text(encoding="utf-8")


def test_parquet_without_pyarrow_is_refused_before_any_work(monkeypatch, tmp_path):
    import importlib.util

    from drift.api import run
    from drift.errors import ConfigError

    real = importlib.util.find_spec
    monkeypatch.setattr(importlib.util, "find_spec", lambda name, *a: None if name == "pyarrow" else real(name, *a))
    with pytest.raises(ConfigError, match=r"--format parquet needs pyarrow: pip install pyarrow \(or 'role-drift\[parquet\]'\)"):
        run(tmp_path / "nothing-here", tmp_path / "out", table_format="parquet")
    assert not (tmp_path / "out").exists()
