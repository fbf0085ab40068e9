"""The static HTML report and the in-season page.

In
    An :class:`drift.api.Analysis` (placements, moves, outlook, ...).
Out
    HTML: the report page, built from a documented :class:`ReportContext`, and
    the in-season check's small page; inline-SVG charts (``charts``).

Layout
------
``context.py``
    :class:`ReportContext` (every value the templates receive, documented),
    :data:`CAUTIONS` and :class:`Basis` (facts several sections share, computed once).
``data``, ``front``, ``players``, ``teams``, ``roles``, ``moves``, ``outlook``
    One small builder per group of report sections; each takes the analysis and the basis
    and returns the context fields of its section.
``render.py``
    :func:`build_context` (runs the builders), the jinja2 environment,
    :func:`render_report` and :func:`write_report`.

Templates live in ``drift/report/templates/`` (package data, loaded with jinja's
package loader by one Environment built once); they only loop, branch and format.
"""

from __future__ import annotations

from drift.report.context import CAUTIONS, ReportContext
from drift.report.render import build_context, render_report, template_environment, write_report

__all__ = ["ReportContext", "build_context", "render_report", "write_report", "template_environment",
           "CAUTIONS"]
