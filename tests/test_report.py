"""The HTML report: the front page parsed, the page documents and their chunks, cautions present,
context documented."""

from __future__ import annotations

import dataclasses
import re
import subprocess
import sys
from html.parser import HTMLParser

import pytest

from drift.report import CAUTIONS, ReportContext, build_context, render_report
from drift.report._players import PROFILE_ROWS
from drift.report.render import build_pages


def text(cell) -> str:
    """The words a page-document cell shows (drift/report/_cells.py), without chips' names."""
    if isinstance(cell, list):
        kind = cell[0]
        if kind in ("r", "s", "n", "b"):
            return " ".join(str(c) for c in cell[1:] if c)
        if kind in ("a", "w"):
            return str(cell[1])
        if kind == "t":
            return f"{cell[1]} {cell[2]}".strip()
        if kind == "rr":
            return f"{cell[1]} {cell[2]} → {cell[3]} {cell[4]}"
        if kind == "bar":
            return str(cell[2])
        return " ".join(text(c) for c in cell[1:])
    return str(cell)


def blocks(doc, kind=None):
    """Every block of a page document, nested ones included (grids and collapsed blocks)."""
    out = []
    for b in doc["blocks"] if isinstance(doc, dict) else doc:
        if b[0] == "grid":
            out += blocks(b[1]) + blocks(b[2])
        elif b[0] == "details":
            out += [b] + blocks(b[2])
        else:
            out.append(b)
    return [b for b in out if kind is None or b[0] == kind]


def tables(doc, name):
    return [b[2] for b in blocks(doc, "table") if b[1] == name]


def links(doc):
    """Anchors of every link cell in a page document."""
    found = []

    def walk(x):
        if isinstance(x, list):
            if len(x) == 3 and x[0] == "a" and isinstance(x[2], str):
                found.append(x[2])
            for y in x:
                walk(y)
    walk(doc["blocks"])
    return found


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
def pages(demo_analysis):
    """(player pages, team pages): anchor -> page document."""
    return build_pages(demo_analysis)


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
    # nothing leaves the report folder: #anchors, data: URIs and the folder's own index script only
    assert page.external == [("script", "report-data/index.js")]
    assert "url(" not in page.html.replace("url(#", "")
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
    assert html.count("</script>") == 3  # the page data cannot be closed early by a name


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


def test_requested_comparison_and_comparables_shown(demo_analysis, context):
    assert context.requested_label == "2019-20 → 2024-25" and len(context.requested) > 50
    assert {r["note"] for r in context.requested} == {"requested comparison"}
    page = _Page()
    page.feed(render_report(context))
    assert "requested" in page.ids
    row = context.latest_moves[0]
    assert row["status"] == "changed" and row["comparables"].count("(") == 3  # three nearest reference seasons
    # the players' list shows each player's latest move between seasons, never the requested one
    cons = demo_analysis.moves[demo_analysis.moves["kind"] == "consecutive"].sort_values("season_to", kind="stable")
    shown = {r["anchor"]: r["status"] for r in context.player_index}
    for pid, status in cons.groupby("player_id")["status"].last().items():
        assert shown["p-" + str(pid)] == status


def test_every_player_and_team_has_a_page_and_links_resolve(page, pages, demo_analysis):
    players, teams = pages
    placements = demo_analysis.placements
    assert set(players) == {f"p-{p}" for p in placements["player_id"].unique()}
    codes = {t for value in placements["team"].astype(str) for t in value.split("/")}
    assert set(teams) == {f"t-{t}" for t in codes}
    known = page.ids | set(players) | set(teams)
    targets = set(re.findall(r'href="#([^"]+)"', page.html))
    assert targets <= known, sorted(targets - known)[:5]
    inside = {a for doc in (*players.values(), *teams.values()) for a in links(doc) if a}
    assert inside <= set(players), sorted(inside - set(players))[:5]


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


def test_membership_never_reads_a_flat_hundred(context, page, pages):
    shown = [r[k] for r in context.latest_moves for k in ("prob_from", "prob_to")]
    shown += [row[1][2] for doc in pages[0].values() for row in tables(doc, "timeline")[0] if row[1][0] == "r"]
    assert "100%" not in shown and ">99%" in shown
    assert "&gt;99%" in page.html


def test_missing_counts_agree_between_sections(context):
    by_table = {m["feature"]: m["missing"] for m in context.missing}  # both name features in words
    for row in context.reliability:
        assert int(row["missing"].replace(",", "")) == by_table.get(row["label"], 0)
    assert not any("_" in m["feature"] for m in context.missing)  # no raw ids such as ppp_isolation


def test_player_page_has_the_answers(pages, demo_analysis):
    traded = demo_analysis.stints["player_id"].iloc[0]
    doc = pages[0][f"p-{traded}"]
    placed = demo_analysis.placements[demo_analysis.placements["player_id"] == traded]
    timeline = tables(doc, "timeline")[0]
    assert [row[0] for row in timeline if row[1][0] == "r"] == sorted(placed["season"])
    moves, trades = tables(doc, "pmoves")
    assert trades and all(row[3][0] == "s" for row in trades)
    # every move says its roles from -> to, each with its name on the page (chips)
    assert all(row[2][0] == "rr" for row in moves + trades)
    profile = tables(doc, "profile")[0]
    assert len(profile) == sum(PROFILE_ROWS)
    assert all(0 <= float(row[3][2]) <= 100 for row in profile)
    comparables = [c for c in blocks(doc, "p")[-1][1] if isinstance(c, list) and c[0] == "a"]
    assert len(comparables) == 5 and blocks(doc, "map")
    if demo_analysis.outlook is not None and (demo_analysis.outlook["player_id"] == traded).any():
        assert tables(doc, "poutlook")[0]


def test_path_labels_stay_apart():
    # six seasons on one spot: every label gets its own place, none on another or on a marker
    from drift.report._sketch import _LABEL_H, _LABEL_W, path_points

    pts = path_points([100.0] * 6 + [104.0], [80.0] * 6 + [82.0], [f"20{i}" for i in range(10, 17)], ["R1"] * 7,
                      {"R1": "one"})
    boxes = [(p[2], p[3] - _LABEL_H, p[2] + _LABEL_W, p[3]) for p in pts]
    for i, a in enumerate(boxes):
        for b in boxes[i + 1:]:
            assert not (a[0] < b[2] and b[0] < a[2] and a[1] < b[3] and b[1] < a[3]), (a, b)
    assert [p[4] for p in pts] == [str(y)[-2:] for y in range(2010, 2017)] and pts[0][5] == "2010: R1 one"


def test_demo_report_is_bounded(page, demo_run):
    # the front page is a fraction of the old single file, and the folder is smaller than its CSVs
    assert len(page.html.encode("utf-8")) < 2_500_000
    out = demo_run[1]
    report = sum(p.stat().st_size for p in [out / "report.html", *(out / "report-data").iterdir()])
    tables = sum(p.stat().st_size for p in out.glob("*.csv"))
    assert report < tables


@pytest.mark.parametrize("value, text", [(0.339, "34%"), (0.0, "0%"), (0.9991, "100%")])
def test_percent(value, text):
    from drift.report._fmt import percent

    assert percent(value) == text


def test_membership_and_strength_words():
    from drift.report._fmt import membership, strength

    assert membership(0.9996) == ">99%" and membership(0.5) == "50%" and membership(0.004) == "<1%"
    assert strength(0.2, 0.8, 0.01) == "within noise"
    assert strength(0.001, 3.1, 0.01) == "beyond noise"
    assert strength(1e-6, 4.8, 0.01) == "well beyond noise"
    assert strength(1e-12, 7.0, 0.01) == "far beyond noise"


def test_data_section_says_how_each_column_was_read(page):
    assert "How the columns were read" in page.body
    # the export's column, then drift's reading of it in words (no raw feature ids in the words)
    assert "share_isolation isolation share share isolation fraction 6 name pattern 'share_<type>'" in page.body
    assert "usage_pct usage rate percent 6" in page.body


def test_plain_words_come_before_method_names(page, context):
    roles = page.html[page.html.index('<section id="roles">'):page.html.index('<div class="cards">')]
    first = roles[:roles.index("<details>")]
    assert "Calinski" not in first and "gap statistic" not in first and context.role_rule_plain in first
    assert "Calinski-Harabasz" in roles[roles.index("<details>"):]  # one click away
    assert "position spread" not in page.body and "typical miss" in page.body


def test_caps_keep_the_front_page_bounded(demo_analysis, monkeypatch):
    """With the limits lowered, the demo league behaves as a large one: the front page stays bounded,
    counters know the uncut totals, and every player still has a page."""
    from drift.report import context as ctx
    from drift.report import _moves as mv
    from drift.report import _outlook as ol

    monkeypatch.setattr(ctx, "PLAYER_LIST", 40)
    monkeypatch.setattr(ol, "OUTLOOK_MAX", 30)
    monkeypatch.setattr(mv, "MAX_ROWS", 30)
    small = build_context(demo_analysis)
    n = demo_analysis.placements["player_id"].nunique()
    assert len(small.player_index) == 40 and small.players_total == n and f"{n:,}" in small.player_list_note
    assert len(small.latest_moves) == 30 and "moves.csv" in small.latest_note
    assert small.totals["tbl-latest"] > 30 and len(small.outlook) <= 30 < small.outlook_total
    html = render_report(small)
    assert f'id="tbl-latest" data-total="{small.totals["tbl-latest"]}"' in html
    # the capping note stands beside the row counter (above the table), not below its rows
    at = html.index('id="tbl-latest"')
    assert html.rfind(small.latest_note, 0, at) > html.rfind('data-table="tbl-latest"', 0, at) > 0


def test_arrivals_are_judged_on_every_season_row(context, pages, demo_analysis):
    # a bench player on the team's roster in the earlier season (below the filters there) is no
    # arrival: judged on every combined season row, placed or not, not on placements
    raw = demo_analysis.prepared.seasons.astype({"team": str})
    last_team = {(r.player_id, r.season): r.team.split("/")[-1] for r in raw.itertuples(index=False)}
    pl = demo_analysis.placements.astype({"team_first": str})
    s0, s1 = context.seasons[-2], context.seasons[-1]
    stayed = []
    for row in context.team_index:
        team = row["team"]
        now = pl[(pl["season"] == s1) & (pl["team_first"] == team)]
        truth = {p for p in now["player_id"] if last_team.get((p, s0)) != team}
        assert row["arrivals"] == len(truth), team
        doc = pages[1][row["anchor"]]
        latest = tables(doc, "movement")[0]
        assert sum(1 for r in latest if r[1] == "arrived") == len(truth)
        for movement in tables(doc, "movement"):
            stayed += [r[2] for r in movement if r[1] == "stayed"]
            assert all("not placed in both seasons" not in text(r[4]) for r in movement if r[1] == "arrived")
    assert stayed and all("on the roster in" in w for w in stayed)
    assert any(re.search(r"below the filters \(\d+\.\d minutes per game < 10\)", w) for w in stayed), stayed[:3]


def test_team_page_lists_its_players_and_names_roles(pages, demo_analysis):
    team = str(demo_analysis.placements["team"].iloc[0]).split("/")[0]
    doc = pages[1][f"t-{team}"]
    pl = demo_analysis.placements
    for season in pl["season"].unique():
        here = pl[(pl["season"] == season) & pl["team"].astype(str).str.split("/").map(lambda ts: team in ts)]
        rows = [b for b in blocks(doc) if b[0] == "table" and b[1] == "roster"]
        assert any(len(r[2]) == len(here) for r in rows)
    mix = blocks(doc, "mix")[0][1]
    assert mix[0][0] == max(pl["season"]) and abs(sum(r[1] for r in mix[0][2]) - 100) < 1  # shares of minutes


def test_player_page_says_why_a_season_is_missing_and_shows_stints(pages, demo_analysis):
    ex = demo_analysis.prepared.excluded
    ex = ex[ex["reason_code"] == "few_minutes"]
    r = next(r for r in ex.itertuples(index=False) if f"p-{r.player_id}" in pages[0])
    timeline = tables(pages[0][f"p-{r.player_id}"], "timeline")[0]
    assert [t[0] for t in timeline] == sorted(t[0] for t in timeline)
    row = next(t for t in timeline if t[0] == r.season)
    assert text(row[1]) == "not placed" and text(row[5]) == f"below the filters: {r.minutes_per_game:.1f} minutes per game < 10"
    # a traded season's row names each qualifying stint's team and role, in stint order
    s = demo_analysis.stints.iloc[0]
    row = next(t for t in tables(pages[0][f"p-{s.player_id}"], "timeline")[0] if t[0] == s.season_from)
    words = text(row[2])
    assert f"stints: {s.team_from} {s.role_from} → " in words and f"{s.team_to} {s.role_to}" in words


def test_percentage_point_changes_read_pp(context, page, pages):
    # "pts" read as points scored; a share's change is in percentage points, said on hover and in a legend
    from drift.report._moves import _change_text

    assert _change_text("three_pa_rate", -0.591) == "-59.1 pp"
    assert _change_text("share_spot_up", 0.03) == "+3.0 pp" and _change_text("usage_pct", 2.5) == "+2.5 pp"
    drivers = " ".join(r["drivers"] for r in context.latest_moves)
    assert " pp" in drivers and " pts" not in drivers
    assert 'title="pp = percentage points"' in page.html and "pp = percentage points (a share" in page.body
    on_pages = " ".join(row[5] for doc in pages[0].values() for t in tables(doc, "pmoves") for row in t)
    assert " pp" in on_pages and " pts" not in on_pages


def test_p_values_read_at_any_size():
    from drift.report._fmt import figures_title, p_text

    assert p_text(0.0342) == "0.034" and p_text(2.3e-5) == "2.3e-05" and p_text(1.2e-17) == "< 1e-10"
    assert figures_title(1.0, 0.5, 9.0, 1.2e-17).endswith("p < 1e-10")
    assert "0.0000" not in figures_title(1.0, 0.5, 4.0, 3.2e-5)


def test_report_folder_chunks_hold_every_page_once(demo_analysis, pages, tmp_path, monkeypatch):
    """report-data/: the index lists every player (name order) and team, and its chunk starts point
    at the chunk file that holds each page, once."""
    import json

    from drift.report import _bundle as bundle
    from drift.report import write_report

    monkeypatch.setattr(bundle, "CHUNK_BYTES", 50_000)  # several chunks from the demo
    files = write_report(demo_analysis, tmp_path)
    assert files[0] == "report.html" and (tmp_path / "report-data" / "index.js").exists()

    def payload(name, call):
        body = (tmp_path / "report-data" / name).read_text(encoding="utf-8")
        assert body.startswith(call) and body.endswith(");\n")
        return body[len(call):-3]

    index = json.loads(payload("index.js", "DRIFT.index("))
    players, teams = pages
    assert len(index["players"]) == len(players) and len(index["teams"]) == len(teams)
    names = [p[0] for p in index["players"]]
    assert names == sorted(names) and len(index["pstarts"]) > 3
    seen = {}
    for kind, rows, starts in (("p", index["players"], index["pstarts"]), ("t", index["teams"], index["tstarts"])):
        for n, start in enumerate(starts):
            end = starts[n + 1] if n + 1 < len(starts) else len(rows)
            head = f'DRIFT.pages("{kind}",{n},'
            docs = json.loads(payload(f"{kind}{n}.js", head))
            anchors = [(r[3] if kind == "p" and len(r) > 3 else r[1] if kind == "t" and len(r) > 1
                        else f"{kind}-{r[1] if kind == 'p' else r[0]}") for r in rows[start:end]]
            assert list(docs) == anchors
            for a in anchors:
                assert a not in seen
                seen[a] = docs[a]
    assert seen == {**players, **teams}
    assert sorted(files[1:]) == sorted(f"report-data/{p.name}" for p in (tmp_path / "report-data").iterdir())


@pytest.mark.slow
def test_report_folder_is_deterministic(demo_analysis, tmp_path):
    from drift.report import write_report

    first, second = tmp_path / "a", tmp_path / "b"
    first.mkdir()
    second.mkdir()
    assert write_report(demo_analysis, first) == write_report(demo_analysis, second)
    for p in first.rglob("*"):
        if p.is_file():
            assert p.read_bytes() == (second / p.relative_to(first)).read_bytes(), p


def test_a_season_below_the_level_reads_between_its_two_likeliest_roles(context, demo_analysis):
    from drift.report._fmt import BETWEEN_BELOW, membership_between

    assert membership_between(0.52, "slasher", 0.41, "spot-up wing") == "between slasher and spot-up wing (52% / 41%)"
    assert membership_between(0.75, "slasher", 0.2, "spot-up wing") == "75%"
    # on the demo's player pages: a season below the level reads "between" its two likeliest roles
    from drift.report._players import _memberships

    placements = demo_analysis.placements
    texts = _memberships(placements, context_basis(demo_analysis))
    low = (placements["role_prob"] < BETWEEN_BELOW).to_numpy()
    assert all(t.startswith("between ") for t, is_low in zip(texts, low) if is_low)
    assert not any(t.startswith("between ") for t, is_low in zip(texts, low) if not is_low)
    assert (demo_analysis.placements["role_prob"] >= 1 / len(demo_analysis.model.role_ids_)).all()


def test_features_of_near_zero_reliability_are_named_in_the_data_section(context, page, demo_analysis):
    from drift.model.noise import low_signal_features

    named = low_signal_features(demo_analysis.model.noise_)
    assert named and [r["column"] for r in context.unreliable] == named  # the demo's columns keep drift's names
    assert "Features with near-zero reliability" in page.body


def context_basis(analysis):
    from drift.report.context import basis

    return basis(analysis)
