"""The static HTML report: a documented context built by small section builders.

Layout
------
``context.py``
    :class:`ReportContext` (every value the templates receive, documented),
    :data:`CAUTIONS` and :class:`Basis` (facts several sections share, computed once).
``sections/*``
    One small builder per report section; each takes the analysis and the basis
    and returns the context fields of its section.
``render.py``
    :func:`build_context` (runs the builders), the jinja2 environment,
    :func:`render_report` and :func:`write_report`.

Templates live in the top-level ``templates/`` folder (installed as the
``drift.templates`` package data); they only loop, branch and format.
"""

from __future__ import annotations

from .context import CAUTIONS, ReportContext
from .render import build_context, render_report, template_environment, write_report

__all__ = ["ReportContext", "build_context", "render_report", "write_report", "template_environment",
           "CAUTIONS"]
