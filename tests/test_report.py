"""The HTML report: structure parsed, self-contained, cautions present, context documented."""

from __future__ import annotations

import dataclasses
import subprocess
import sys
from html.parser import HTMLParser

import pytest

from drift.report import CAUTIONS, ReportContext, build_context, render_report


class _Page(HTMLParser):
    def __init__(self):
        super().__init__()
        self.ids, self.tags, self.external, self.text = set(), [], [], []

    def handle_starttag(self, tag, attrs):
        attrs = dict(attrs)
        self.tags.append(tag)
        if "id" in attrs:
            self.ids.add(attrs["id"])
        for key in ("src", "href"):
            value = attrs.get(key) or ""
            if value and not value.startswith("#") and not value.startswith("data:"):
                self.external.append((tag, value))
        if tag == "link":
            self.external.append((tag, attrs.get("href")))

    def handle_data(self, data):
        self.text.append(data)


@pytest.fixture(scope="module")
def page(demo_analysis):
    html = render_report(build_context(demo_analysis))
    parser = _Page()
    parser.feed(html)
    parser.html = html
    parser.body = " ".join(" ".join(parser.text).split())
    return parser


def test_sections_present(page):
    assert {"limits", "summary", "roles", "changes", "unsettled", "trades", "drift", "model",
            "features", "data"} <= page.ids


def test_self_contained(page):
    assert page.external == []
    assert "<script" not in page.html
    assert page.tags.count("svg") >= 5  # charts are inline SVG


def test_cautions_are_stated(page):
    for caution in CAUTIONS:
        assert " ".join(caution.split()) in page.body
    assert "not measure a player's worth" in page.body
    assert "injuries" in page.body and "teammates" in page.body


def test_roles_and_moves_are_shown(page, demo_analysis):
    for rid, name in zip(demo_analysis.model.role_ids_, demo_analysis.model.role_names_):
        assert f"{rid} · {name}" in page.body
    changed = demo_analysis.moves[demo_analysis.moves["status"] == "changed"]
    assert all(name in page.body for name in changed["player"])  # every role change is listed


def test_player_names_are_escaped(demo_analysis):
    moves = demo_analysis.moves.copy()
    idx = moves.index[moves["status"] == "changed"][0]
    moves.loc[idx, "player"] = "<b>Bold</b>"
    html = render_report(build_context(dataclasses.replace(demo_analysis, moves=moves)))
    assert "&lt;b&gt;Bold&lt;/b&gt;" in html and "<b>Bold</b>" not in html


def test_context_fields_are_documented():
    doc = ReportContext.__doc__
    for f in dataclasses.fields(ReportContext):
        assert f.name in doc, f"ReportContext.{f.name} is not documented"


def test_report_is_deterministic(demo_analysis):
    assert render_report(build_context(demo_analysis)) == render_report(build_context(demo_analysis))


def test_templates_found_from_any_folder(tmp_path):
    """Templates are package data: found without the source tree on the path."""
    code = "from drift.report import template_environment as t; t().get_template('report.html'); print('ok')"
    out = subprocess.run([sys.executable, "-c", code], cwd=tmp_path, capture_output=True, text=True)
    assert out.returncode == 0, out.stderr


def test_requested_comparison_and_comparables_shown(demo_prepared, demo_model):
    from drift.api import analyse
    from drift.config import Config

    analysis = analyse(demo_prepared, demo_model, Config(compare=("2019-20", "2024-25")))
    context = build_context(analysis)
    assert context.requested_label == "2019-20 → 2024-25" and len(context.requested) > 50
    page = _Page()
    page.feed(render_report(context))
    assert "requested" in page.ids
    row = context.changed[0]
    assert row["comparables"].count("(") == 3  # three nearest reference player-seasons
