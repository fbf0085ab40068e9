"""Progress of a run: each stage's start and end go to a callback the caller chooses.

The API takes ``progress``: ``None`` (silent), any callable receiving a
:class:`StageEvent`, or a :class:`Stages` already timing a larger job. Nothing is
global: each run builds its own :class:`Stages`. The command line passes a
:class:`TerminalProgress`, which writes a line to standard error only for runs
that last (a stage that takes ``after`` seconds, or any stage starting after the
run has taken that long), so short runs stay silent.
"""

from __future__ import annotations

import time
from contextlib import contextmanager
from dataclasses import dataclass

__all__ = ["StageEvent", "Stages", "TerminalProgress", "stages"]


@dataclass(frozen=True)
class StageEvent:
    """One stage starting (``done`` False, ``elapsed`` 0) or ending.

    ``rows`` is the number of rows the stage works on (None when it has no rows);
    ``elapsed`` the stage's seconds; ``total`` the seconds since the run began.
    """

    stage: str
    rows: int | None
    elapsed: float
    total: float
    done: bool


class Stages:
    """Times the stages of one run and reports their starts and ends to ``callback``.

    ``times`` lists ``(stage, rows, seconds)`` of every finished stage, in order.
    """

    def __init__(self, callback=None, *, clock=time.perf_counter):
        self._callback = callback
        self._clock = clock
        self._start = clock()
        self.times = []

    @contextmanager
    def stage(self, name: str, rows: int | None = None):
        """Time the block as stage ``name`` working on ``rows`` rows."""
        begin = self._clock()
        self._emit(StageEvent(name, rows, 0.0, begin - self._start, False))
        yield
        end = self._clock()
        self.times.append((name, rows, end - begin))
        self._emit(StageEvent(name, rows, end - begin, end - self._start, True))

    def _emit(self, event):
        if self._callback is not None:
            self._callback(event)


def stages(progress) -> Stages:
    """A :class:`Stages` for ``progress``: None, a callable, or a Stages (used as is)."""
    return progress if isinstance(progress, Stages) else Stages(progress)


class TerminalProgress:
    """Writes stage lines to ``stream`` for runs that last.

    A stage's start is written once the run has lasted ``after`` seconds; its end
    (with its own time) when the stage itself took ``after`` seconds or more.
    """

    def __init__(self, stream, *, after: float = 2.0):
        self.stream = stream
        self.after = after

    def __call__(self, event: StageEvent):
        rows = "" if event.rows is None else f" ({event.rows:,} rows)"
        if event.done and event.elapsed >= self.after:
            line = f"drift: {event.stage}{rows} done in {event.elapsed:.1f} s [{event.total:.1f} s]"
        elif not event.done and event.total >= self.after:
            line = f"drift: {event.stage}{rows} ... [{event.total:.1f} s]"
        else:
            return
        print(line, file=self.stream, flush=True)
