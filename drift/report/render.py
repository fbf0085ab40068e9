"""Build the context from the section builders, and render it with jinja2."""

from __future__ import annotations

import functools
from dataclasses import fields

__all__ = ["build_context", "template_environment", "render_report", "write_report"]


def _sections():
    """The section builders, in page order."""
    from drift.report import _data, _front, _moves, _outlook, _players, _roles, _teams

    return (_data.build_summary, _front.build_front, _players.build_players, _players.build_search,
            _teams.build_teams, _roles.build_roles, _moves.build_method_moves, _data.build_drift,
            _outlook.build_outlook, _roles.build_choice, _data.build_features, _data.build_data)


def build_context(analysis):
    """Shape an :class:`~drift.api.Analysis` into a :class:`ReportContext`.

    Every builder returns a dict of context fields; a field set twice is a bug.
    """
    from drift.report.context import CAUTIONS, ReportContext, basis

    shared = basis(analysis)
    values = {"cautions": CAUTIONS}
    for build in _sections():
        part = build(analysis, shared)
        clash = set(part) & set(values)
        if clash:  # pragma: no cover - a programming error caught by every test
            raise RuntimeError(f"report fields {sorted(clash)} set twice (by {build.__name__})")
        values.update(part)
    return ReportContext(**values)


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
    """Render the report page from its context."""
    values = {f.name: getattr(context, f.name) for f in fields(context)}
    return template_environment().get_template("report.html").render(**values)


def write_report(analysis, path):
    """Build the context, render it and write ``path``."""
    from pathlib import Path

    Path(path).write_text(render_report(build_context(analysis)), encoding="utf-8")
