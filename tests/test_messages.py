"""The command line's last line: one per failure or warning, exit codes, escaping, pipes."""

from __future__ import annotations

import os
import subprocess
import sys
import textwrap
import warnings

import pytest
from conftest import ROOT

from drift.errors import DataQualityWarning, InputError
from drift.messages import printable, run_guarded


def test_third_party_warnings_are_counted_once_each_and_never_loop(capsys):
    def job(args):
        import numpy as np

        for _ in range(50):
            np.log(np.zeros(3))  # numpy's "divide by zero" RuntimeWarning, 50 times
        warnings.warn("a look is needed", DataQualityWarning, stacklevel=1)
        warnings.warn("deprecated thing", DeprecationWarning, stacklevel=1)
        return "drift: done"

    assert run_guarded(job, None) == 0
    captured = capsys.readouterr()
    lines = captured.err.strip().splitlines()
    assert lines[0] == "drift: warning: RuntimeWarning: divide by zero encountered in log (50 times)"
    assert lines[1] == "drift: warning: a look is needed"
    assert lines[2] == ("drift: warning: DeprecationWarning: deprecated thing") and len(lines) == 3
    assert captured.out == "drift: done\n"


def test_warnings_print_before_the_error_line(capsys):
    def job(args):
        warnings.warn("first", DataQualityWarning, stacklevel=1)
        raise InputError("bad value", file="x.csv", row=3, column="games")

    assert run_guarded(job, None) == 2
    assert capsys.readouterr().err.splitlines() == [
        "drift: warning: first", "drift: error: x.csv, row 3, column 'games': bad value"]


def test_internal_error_is_one_line_with_a_pointer_to_debug(capsys):
    def job(args):
        return {}["missing"]

    assert run_guarded(job, None) == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and "Traceback" not in err
    assert err.startswith("drift: error: internal error (KeyError: 'missing')") and "--debug" in err
    assert run_guarded(job, None, debug=True) == 2
    err = capsys.readouterr().err
    assert "Traceback" in err and err.strip().splitlines()[-1].startswith("drift: error: internal error")


@pytest.mark.parametrize("exc", [RecursionError("deep"), MemoryError()])
def test_even_system_failures_are_one_line(capsys, exc):
    def job(args):
        raise exc

    assert run_guarded(job, None) == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and err.startswith("drift: error: internal error")


def test_a_file_system_refusal_is_one_line_naming_the_file(capsys):
    def job(args):
        raise OSError(28, "No space left on device", "out/report.html")

    assert run_guarded(job, None) == 2
    assert capsys.readouterr().err == ("drift: error: out/report.html: No space left on device; check the "
                                       "path, free space and permissions\n")


def test_ctrl_c_is_one_line_exit_130(capsys):
    def job(args):
        raise KeyboardInterrupt

    assert run_guarded(job, None) == 130
    assert capsys.readouterr().err == "drift: interrupted\n"


def test_control_characters_are_escaped():
    assert printable("a\x1b[31mred\x07\u202eb") == "a\\x1b[31mred\\x07\\u202eb"
    assert printable("Zoë Ångström") == "Zoë Ångström"


def test_error_message_with_a_terminal_escape_in_a_file_name(tmp_path, capsys):
    from drift.cli import main

    bad = tmp_path / "evil\x1b[2Jname.csv"
    bad.write_text("nothing,here\n1,2\n")
    code = main(["run", str(bad), "--out", str(tmp_path / "o")])
    err = capsys.readouterr().err
    assert code == 2 and "\x1b" not in err and "\\x1b[2J" in err and err.count("\n") == 1


def test_a_closed_pipe_exits_quietly(tmp_path):
    code = textwrap.dedent(f"""
        import sys
        sys.path.insert(0, {str(ROOT)!r})
        from drift.messages import run_guarded
        def job(args):
            sys.stdin.readline()  # wait until the reader is gone
            for _ in range(1000):
                print("x" * 1000)
            return "drift: done"
        sys.exit(run_guarded(job, None))
    """)
    r, w = os.pipe()
    proc = subprocess.Popen([sys.executable, "-c", code], stdin=subprocess.PIPE, stdout=w,
                            stderr=subprocess.PIPE)
    os.close(w)
    os.close(r)  # the reader goes away before anything is written
    _, err = proc.communicate(b"go\n", timeout=30)
    assert proc.returncode == 141
    assert err == b""


def test_argument_errors_are_one_line(capsys):
    from drift.cli import main

    with pytest.raises(SystemExit) as stop:
        main(["run", "data", "--out", "o", "--roles", "1"])
    assert stop.value.code == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and err.startswith("drift: error: ") and "roles=1 must be 'auto' or a whole number >= 2" in err


def test_debug_flag_is_accepted_before_and_after_the_command():
    from drift.cli import build_parser

    parser = build_parser()
    assert parser.parse_args(["--debug", "demo", "--out", "x"]).debug is True
    assert parser.parse_args(["demo", "--out", "x", "--debug"]).debug is True
    assert parser.parse_args(["demo", "--out", "x"]).debug is False


def test_warnings_differing_only_in_numbers_are_one_line(capsys):
    def job(args):
        for k in range(3, 9):
            warnings.warn(f"found {k - 1} distinct clusters, fewer than {k}", UserWarning, stacklevel=1)
        return "drift: done"

    assert run_guarded(job, None) == 0
    assert capsys.readouterr().err == "drift: warning: UserWarning: found 2 distinct clusters, fewer than 3 (6 times)\n"


def test_summaries_escape_the_users_text():
    from drift.messages import html_summary, text_summary

    page = html_summary("<b>t</b>", "a & b", tables=[("c<", ("h>",), [("<i>x</i>", 1234, None)])],
                        lists=[("Warnings", ["<script>"]), ("Problems", [])])
    assert page == ('<div class="drift-summary"><strong>&lt;b&gt;t&lt;/b&gt;</strong><p>a &amp; b</p>'
                    '<p>c&lt;</p><table><thead><tr><th style="text-align:left">h&gt;</th></tr></thead><tbody><tr>'
                    '<td style="text-align:left">&lt;i&gt;x&lt;/i&gt;</td><td style="text-align:left">1,234</td>'
                    '<td style="text-align:left"></td></tr></tbody></table>'
                    '<p>Warnings:</p><ul><li>&lt;script&gt;</li></ul><p>Problems: none</p></div>')
    assert text_summary("T", "line\x1b[2J", parts=[("roles", "R1 a\x07"), ("skipped", None)]) == \
        "T: line\\x1b[2J\n  roles: R1 a\\x07"
