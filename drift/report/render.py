"""Build the context from the section builders, render the front page, write the report folder."""

from __future__ import annotations

import functools
from dataclasses import fields

__all__ = ["build_context", "template_environment", "render_report", "write_report"]


def _sections():
    """The section builders, in page order."""
    from drift.report import _data, _front, _moves, _outlook, _players, _roles, _teams

    return (_data.build_summary, _front.build_front, _players.build_index, _teams.build_teams,
            _roles.build_roles, _moves.build_method_moves, _data.build_drift, _outlook.build_outlook,
            _roles.build_choice, _data.build_features, _data.build_data)


def build_context(analysis, shared=None):
    """Shape an :class:`~drift.api.Analysis` into a :class:`ReportContext` (the front page).

    Every builder returns a dict of context fields; a field set twice is a bug. ``shared`` is the
    :class:`~drift.report.context.Basis` when the caller has one already.
    """
    from drift.report.context import CAUTIONS, ReportContext, basis

    shared = shared or basis(analysis)
    values = {"cautions": CAUTIONS}
    for build in _sections():
        part = build(analysis, shared)
        clash = set(part) & set(values)
        if clash:  # pragma: no cover - a programming error caught by every test
            raise RuntimeError(f"report fields {sorted(clash)} set twice (by {build.__name__})")
        values.update(part)
    return ReportContext(**values)


def build_pages(analysis, shared=None):
    """(player pages, team pages): anchor -> page document (see :mod:`drift.report._bundle`)."""
    from drift.report.context import basis
    from drift.report._players import build_player_pages
    from drift.report._teams import build_team_pages

    shared = shared or basis(analysis)
    return build_player_pages(analysis, shared, shared.frame), build_team_pages(analysis, shared)


@functools.cache
def template_environment():
    """The one jinja2 Environment, built once: templates from the package data, autoescape on."""
    import jinja2

    env = jinja2.Environment(loader=jinja2.PackageLoader("drift.report", "templates"), autoescape=True,
                             undefined=jinja2.StrictUndefined, trim_blocks=True, lstrip_blocks=True)
    env.filters["num"] = lambda v, d=2: "" if v is None or v != v else f"{v:,.{d}f}"
    env.filters["pct"] = lambda v, d=0: "" if v is None or v != v else f"{100 * v:.{d}f}%"
    env.filters["width"] = lambda v: f"{100 * v:.1f}%"
    env.filters["signed"] = lambda v, d=2: "" if v is None or v != v else f"{v:+.{d}f}"
    return env


def render_report(context) -> str:
    """Render the front page (``report.html``) from its context."""
    values = {f.name: getattr(context, f.name) for f in fields(context)}
    return template_environment().get_template("report.html").render(**values)


def write_report(analysis, folder, *, ext="csv") -> list:
    """Write the report into ``folder``: ``report.html`` and ``report-data/`` (see :mod:`drift.report._bundle`).

    ``ext`` is the format of the run's tables ("csv" or "parquet"), named where the report points to
    them. Returns the files written, relative to ``folder``.
    """
    import gc
    from pathlib import Path

    from drift.report._bundle import write_pages
    from drift.report.context import basis

    folder = Path(folder)
    # pages are millions of small lists that form no cycles: the cyclic collector would only rescan them
    # again and again (a third of the build on a large pool), so it rests while they are made
    collecting = gc.isenabled()
    gc.disable()
    try:
        shared = basis(analysis, ext=ext)
        players, teams = build_pages(analysis, shared)
        written = write_pages(folder, players=players, teams=teams, b=shared, analysis=analysis)
        del players, teams
        (folder / "report.html").write_text(render_report(build_context(analysis, shared)), encoding="utf-8")
    finally:
        if collecting:
            gc.enable()
    return ["report.html", *written]
