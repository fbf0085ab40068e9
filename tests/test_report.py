"""The HTML report: structure parsed, self-contained, cautions present, context documented."""

from __future__ import annotations

import dataclasses
import re
import subprocess
import sys
from html.parser import HTMLParser

import pytest

from drift.report import CAUTIONS, ReportContext, build_context, render_report
from drift.report.players import PROFILE_ROWS


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
def context(demo_analysis):
    return build_context(demo_analysis)


@pytest.fixture(scope="module")
def page(context):
    html = render_report(context)
    parser = _Page()
    parser.feed(html)
    parser.html = html
    parser.body = " ".join(" ".join(parser.text).split())
    return parser


def test_sections_present(page):
    assert {"limits", "review", "earlier", "summary", "players", "teams", "roles", "method", "drift", "model",
            "features", "data"} <= page.ids


def test_self_contained(page):
    assert page.external == []  # no src or href leaves the file (data: URIs and #anchors only)
    assert "<script src" not in page.html and "url(" not in page.html.replace("url(#", "")
    assert not re.search(r'(src|href)="(https?:)?//', page.html)  # xmlns names are identifiers, not requests
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
    moves.loc[idx, "player"] = "<b>Bold</b></script>"
    html = render_report(build_context(dataclasses.replace(demo_analysis, moves=moves)))
    assert "&lt;b&gt;Bold&lt;/b&gt;" in html and "<b>Bold</b>" not in html
    assert html.count("</script>") == 2  # the search index cannot be closed early by a name


def test_context_fields_are_documented():
    doc = ReportContext.__doc__
    for f in dataclasses.fields(ReportContext):
        assert f.name in doc, f"ReportContext.{f.name} is not documented"


def test_report_is_deterministic(demo_analysis, page):
    assert render_report(build_context(demo_analysis)) == page.html


def test_templates_found_from_any_folder(tmp_path):
    """Templates are package data: found without the source tree on the path."""
    code = "from drift.report import template_environment as t; t().get_template('report.html'); print('ok')"
    out = subprocess.run([sys.executable, "-c", code], cwd=tmp_path, capture_output=True, text=True)
    assert out.returncode == 0, out.stderr


def test_requested_comparison_and_comparables_shown(demo_analysis):
    context = build_context(demo_analysis)  # the shared analysis compares 2019-20 with 2024-25
    assert context.requested_label == "2019-20 → 2024-25" and len(context.requested) > 50
    assert {r["note"] for r in context.requested} == {"requested comparison"}
    page = _Page()
    page.feed(render_report(context))
    assert "requested" in page.ids
    row = context.latest_moves[0]
    assert row["status"] == "changed" and row["comparables"].count("(") == 3  # three nearest reference seasons
    # the players' index shows each player's latest move between seasons, never the requested one
    cons = demo_analysis.moves[demo_analysis.moves["kind"] == "consecutive"].sort_values("season_to", kind="stable")
    shown = {r["anchor"]: r["status"] for r in context.player_index}
    for pid, status in cons.groupby("player_id")["status"].last().items():
        assert shown["p-" + str(pid)] == status


def test_every_player_and_team_has_a_page_and_links_resolve(page, demo_analysis):
    placements = demo_analysis.placements
    players = [a for a in page.ids if a.startswith("p-") and not a.endswith(("-moves", "-trades"))]
    assert len(players) == placements["player_id"].nunique()
    teams = {t for value in placements["team"].astype(str) for t in value.split("/")}
    assert {f"t-{t}" for t in teams} <= page.ids
    targets = set(re.findall(r'href="#([^"]+)"', page.html))
    assert targets <= page.ids, sorted(targets - page.ids)[:5]


def test_latest_pair_leads_and_labels_are_honest(context, demo_analysis):
    seasons = context.seasons
    assert context.latest_label == f"{seasons[-2]} → {seasons[-1]}"
    assert all(r["pair"].endswith(seasons[-1]) for r in context.latest_moves)
    order = {s: i for i, s in enumerate(seasons)}
    for r in context.latest_moves + context.earlier_moves:
        a, b = r["pair"].split(" → ")
        assert (r["note"] == "") == (order[b] - order[a] == 1), r  # only true neighbours are unlabelled
    assert {r["status"] for r in context.latest_moves} == {"changed", "unsettled", "shifted", "steady"}
    assert all(r["status"] in {"changed", "unsettled", "shifted", "steady"} for r in context.latest_trades)
    n_changed = int((demo_analysis.moves["status"] == "changed").sum())  # the terminal's count
    assert dict(context.summary)["role changes beyond noise"].startswith(f"{n_changed:,}")


def test_membership_never_reads_a_flat_hundred(context, page):
    shown = [r[k] for r in context.latest_moves for k in ("prob_from", "prob_to")]
    shown += [t["membership"] for p in context.players for t in p["timeline"] if t["placed"]]
    assert "100%" not in shown and ">99%" in shown
    assert "&gt;99%" in page.html


def test_missing_counts_agree_between_sections(context, demo_analysis):
    by_table = {m["feature"]: m["missing"] for m in context.missing}
    from drift.model.describe import feature_label

    labels = {feature_label(f): f for f in demo_analysis.model.features_}
    for row in context.reliability:
        assert int(row["missing"].replace(",", "")) == by_table.get(labels[row["label"]], 0)


def test_player_page_has_the_answers(context, demo_analysis):
    traded = demo_analysis.stints["player_id"].iloc[0]
    page = next(p for p in context.players if p["id"] == str(traded))
    placed = demo_analysis.placements[demo_analysis.placements["player_id"] == traded]
    assert [t["season"] for t in page["timeline"] if t["placed"]] == sorted(placed["season"])
    assert page["trades"] and all(m["status"] for m in page["trades"])
    assert len(page["profile"]) == sum(PROFILE_ROWS)
    assert all(0 <= float(f["percentile"]) <= 100 for f in page["profile"])
    assert len(page["comparables"]) == 5 and "<svg" in page["path"]
    if demo_analysis.outlook is not None and (demo_analysis.outlook["player_id"] == traded).any():
        assert page["outlook"]["rows"]


def test_large_leagues_page_the_players_the_review_needs(demo_analysis):
    from drift.report.context import paged_players

    latest = ("2023-24", "2024-25")
    chosen = paged_players(demo_analysis, None, latest, limit=40)
    assert len(chosen) == 40
    moves = demo_analysis.moves
    beyond = moves[(moves["season_to"] == "2024-25") & (moves["status"] != "steady")]["player_id"]
    assert set(chosen[:10]) <= set(beyond)  # strongest evidence first


def test_demo_report_is_bounded(page):
    assert len(page.html.encode("utf-8")) < 8_000_000


@pytest.mark.parametrize("value, text", [(0.339, "34%"), (0.0, "0%"), (0.9991, "100%")])
def test_percent(value, text):
    from drift.report.fmt import percent

    assert percent(value) == text


def test_membership_and_strength_words():
    from drift.report.fmt import membership, strength

    assert membership(0.9996) == ">99%" and membership(0.5) == "50%" and membership(0.004) == "<1%"
    assert strength(0.2, 0.8, 0.01) == "within noise"
    assert strength(0.001, 3.1, 0.01) == "beyond noise"
    assert strength(1e-6, 4.8, 0.01) == "well beyond noise"
    assert strength(1e-12, 7.0, 0.01) == "far beyond noise"


def test_data_section_says_how_each_column_was_read(page):
    assert "How the columns were read" in page.body
    assert "share_isolation share isolation fraction 6 name pattern 'share_<type>'" in page.body
    assert "usage_pct rate percent 6" in page.body


def test_caps_keep_a_large_league_bounded(demo_analysis, monkeypatch):
    """With the limits lowered, the demo league behaves as a large one: pages, rows and links stay bounded."""
    from drift.report import context as ctx
    from drift.report import moves as mv
    from drift.report import outlook as ol

    monkeypatch.setattr(ctx, "MAX_PLAYER_PAGES", 40)
    monkeypatch.setattr(ol, "OUTLOOK_MAX", 30)
    monkeypatch.setattr(mv, "MAX_ROWS", 30)
    monkeypatch.setattr(mv, "TEAM_ROWS", 5)
    small = build_context(demo_analysis)
    assert len(small.players) == len(small.player_index) == 40 and "40" in small.player_pages_note
    assert len(small.latest_moves) == 30 and "moves.csv" in small.latest_note
    assert len(small.outlook) <= 30
    assert all(len(t["changed"]) <= 5 and len(t["trades"]) <= 5 for t in small.teams)
    html = render_report(small)
    page = _Page()
    page.feed(html)
    assert set(re.findall(r'href="#([^"]+)"', html)) <= page.ids  # names without a page are plain text
    # the capping note stands beside the row counter (above the table), not below its rows
    at = html.index('id="tbl-latest"')
    assert html.rfind(small.latest_note, 0, at) > html.rfind('data-table="tbl-latest"', 0, at) > 0



def test_arrivals_are_judged_on_every_season_row(context, demo_analysis):
    # a bench player on the team's roster in the earlier season (below the filters there) is no
    # arrival: judged on every combined season row, placed or not, not on placements
    raw = demo_analysis.prepared.seasons.astype({"team": str})
    last_team = {(r.player_id, r.season): r.team.split("/")[-1] for r in raw.itertuples(index=False)}
    pl = demo_analysis.placements.astype({"team_first": str})
    s0, s1 = context.seasons[-2], context.seasons[-1]
    names = {}
    stayed_seen = 0
    for page, row in zip(context.teams, context.team_index):
        team = page["team"]
        now = pl[(pl["season"] == s1) & (pl["team_first"] == team)]
        truth = {p for p in now["player_id"] if last_team.get((p, s0)) != team}
        names[team] = truth
        assert row["arrivals"] == len(truth), team
        for mv in page["movement"]:
            for a in mv["stayed"]:
                stayed_seen += 1
                assert "on the roster in" in a["other"]
                assert a["moved"] == "stayed"
            for a in mv["arrivals"]:
                assert "not placed in both seasons" not in a["words"]
    excluded = demo_analysis.prepared.excluded
    assert stayed_seen > 0 and len(excluded)  # the demo has returning bench players
    below = [a["other"] for page in context.teams for mv in page["movement"] for a in mv["stayed"]]
    assert any(re.search(r"below the filters \(\d+\.\d minutes per game < 10\)", w) for w in below), below[:3]


def test_player_page_says_why_a_season_is_missing_and_shows_stints(context, demo_analysis):
    ex = demo_analysis.prepared.excluded
    ex = ex[ex["reason_code"] == "few_minutes"]
    pages = {p["id"]: p for p in context.players}
    r = next(r for r in ex.itertuples(index=False) if str(r.player_id) in pages)
    timeline = pages[str(r.player_id)]["timeline"]
    assert [t["season"] for t in timeline] == sorted(t["season"] for t in timeline)
    row = next(t for t in timeline if t["season"] == r.season)
    assert not row["placed"] and row["why"] == f"{r.minutes_per_game:.1f} minutes per game < 10"
    # a traded season's row names each qualifying stint's team and role, in stint order
    s = demo_analysis.stints.iloc[0]
    row = next(t for t in pages[str(s.player_id)]["timeline"] if t["season"] == s.season_from)
    assert row["stints"].startswith(f"stints: {s.team_from} {s.role_from} → ")
    assert f"{s.team_to} {s.role_to}" in row["stints"]
    html = render_report(context)
    assert "— not placed: " in html and "stints: " in html


def test_percentage_point_changes_read_pp(context, page):
    # "pts" read as points scored; a share's change is in percentage points, said on hover and in a legend
    from drift.report.moves import _change_text

    assert _change_text("three_pa_rate", -0.591) == "-59.1 pp"
    assert _change_text("share_spot_up", 0.03) == "+3.0 pp" and _change_text("usage_pct", 2.5) == "+2.5 pp"
    drivers = " ".join(r["drivers"] for r in context.latest_moves)
    assert " pp" in drivers and " pts" not in drivers
    assert 'title="pp = percentage points"' in page.html and "pp = percentage points (a share" in page.body


def test_p_values_read_at_any_size():
    from drift.report.fmt import figures_title, p_text

    assert p_text(0.0342) == "0.034" and p_text(2.3e-5) == "2.3e-05" and p_text(1.2e-17) == "< 1e-10"
    assert figures_title(1.0, 0.5, 9.0, 1.2e-17).endswith("p < 1e-10")
    assert "0.0000" not in figures_title(1.0, 0.5, 4.0, 3.2e-5)


def test_a_season_below_the_level_reads_between_its_two_likeliest_roles(context, demo_analysis):
    from drift.report.fmt import BETWEEN_BELOW, membership_between

    assert membership_between(0.52, "slasher", 0.41, "spot-up wing") == "between slasher and spot-up wing (52% / 41%)"
    assert membership_between(0.75, "slasher", 0.2, "spot-up wing") == "75%"
    # on the demo's player pages: every placed season below the level reads "between", none above it
    low = (demo_analysis.placements["role_prob"] < BETWEEN_BELOW).sum()
    shown = [t["membership"] for p in context.players for t in p["timeline"] if t["placed"]]
    between = [m for m in shown if m.startswith("between ")]
    assert len(between) <= low and all("%" in m for m in shown)
    assert (demo_analysis.placements["role_prob"] >= 1 / len(demo_analysis.model.role_ids_)).all()


def test_features_of_near_zero_reliability_are_named_in_the_data_section(context, page, demo_analysis):
    from drift.model.noise import low_signal_features

    named = low_signal_features(demo_analysis.model.noise_)
    assert named and [r["column"] for r in context.unreliable] == named  # the demo's columns keep drift's names
    assert "Features with near-zero reliability" in page.body
