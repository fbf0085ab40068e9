"""Stage progress: events to a callback, terminal lines only for runs that last."""

from __future__ import annotations

import io

from conftest import DEMO

from drift.cli import _progress, build_parser
from drift.progress import StageEvent, Stages, TerminalProgress


class _Clock:
    def __init__(self):
        self.now = 100.0

    def __call__(self):
        return self.now


def test_stages_time_each_block_and_report_start_and_end():
    clock, events = _Clock(), []
    st = Stages(events.append, clock=clock)
    with st.stage("read", 10):
        clock.now += 1.5
    with st.stage("fit", 8):
        clock.now += 3.0
    assert st.times == [("read", 10, 1.5), ("fit", 8, 3.0)]
    assert [(e.stage, e.done) for e in events] == [("read", False), ("read", True), ("fit", False), ("fit", True)]
    assert events[-1].total == 4.5 and events[-1].elapsed == 3.0 and events[2].total == 1.5


def test_terminal_lines_only_for_long_stages_or_after_the_first_seconds():
    out = io.StringIO()
    show = TerminalProgress(out, after=2.0)
    show(StageEvent("read", 1000, 0.0, 0.0, False))     # run just began: silent
    show(StageEvent("read", 1000, 0.4, 0.4, True))      # quick stage: silent
    show(StageEvent("fit", 900, 0.0, 2.5, False))       # run has lasted: start shown
    show(StageEvent("fit", 900, 6.0, 8.5, True))        # long stage: end shown with its time
    show(StageEvent("moves", 800, 0.5, 9.0, True))      # quick stage end: silent
    lines = out.getvalue().splitlines()
    assert lines == ["drift: fit (900 rows) ... [2.5 s]", "drift: fit (900 rows) done in 6.0 s [8.5 s]"]


def test_prepare_reports_its_stages_with_row_counts():
    from drift.api import prepare

    events = []
    prepared = prepare(DEMO, progress=events.append)
    done = {e.stage: e for e in events if e.done}
    assert set(done) == {"read", "combine stints"}
    assert done["combine stints"].rows >= len(prepared.kept)


def test_cli_progress_is_off_when_stderr_is_not_a_terminal_unless_asked(capsys):
    parser = build_parser()
    base = ["place", "m.json", "x.csv", "--out", "o.csv"]
    assert _progress(parser.parse_args(base)) is None  # pytest's stderr is not a terminal
    assert isinstance(_progress(parser.parse_args(base + ["--progress"])), TerminalProgress)
    assert _progress(parser.parse_args(base + ["--quiet"])) is None
