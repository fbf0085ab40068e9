"""The report in a real browser: headless Chromium (Debian's package) driven by Playwright.

One rendered demo report (with one hostile player name planted) and one page are shared by every
test; the views are reached by changing the URL's #fragment, so there is a single file load.
"""

from __future__ import annotations

import dataclasses
import shutil

import pytest

CHROMIUM = shutil.which("chromium") or "/usr/bin/chromium"
ARGS = ["--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking",
        "--disable-component-update", "--disable-sync"]
HOSTILE = '<img src=x onerror="window.__owned=1">Zed'

sync_api = pytest.importorskip("playwright.sync_api", reason="Playwright for Python is not installed "
                               "(pip install '.[test]')")
if not shutil.which(CHROMIUM):
    pytest.skip("Debian's chromium is not installed (apt-get install chromium)", allow_module_level=True)


@pytest.fixture(scope="module")
def report_file(demo_analysis, tmp_path_factory):
    """The demo report with one player renamed to a string that would run script if it were markup."""
    from drift.report import write_report

    a = demo_analysis
    victim = a.moves.loc[a.moves["status"] == "changed", "player_id"].iloc[0]
    rename = {"placements": a.placements, "moves": a.moves}
    renamed = {k: v.assign(player=v["player"].where(v["player_id"] != victim, HOSTILE)) for k, v in rename.items()}
    path = tmp_path_factory.mktemp("browser") / "report.html"
    write_report(dataclasses.replace(a, **renamed), path)
    return path


@pytest.fixture(scope="module")
def browser():
    with sync_api.sync_playwright() as p:
        b = p.chromium.launch(executable_path=CHROMIUM, args=ARGS)
        yield b
        b.close()


@pytest.fixture(scope="module")
def loaded(browser, report_file):
    """(page, console errors, requests that left the file) after one load."""
    page = browser.new_page(viewport={"width": 1280, "height": 900})
    errors, requests = [], []
    page.on("console", lambda m: errors.append(m.text) if m.type == "error" else None)
    page.on("pageerror", lambda e: errors.append(str(e)))
    page.on("request", lambda r: requests.append(r.url) if not r.url.startswith(("file:", "data:")) else None)
    page.goto(report_file.as_uri())
    yield page, errors, requests
    page.close()


def test_loads_without_errors_or_network(loaded):
    page, errors, requests = loaded
    assert errors == [] and requests == []
    assert page.title().startswith("drift")


def test_every_chart_renders(loaded):
    page, _, _ = loaded
    sizes = page.eval_on_selector_all(".chart svg", "els => els.map(e => e.getBoundingClientRect().width)")
    assert len(sizes) >= 5 and min(sizes) > 100
    broken = page.eval_on_selector_all("img", "els => els.filter(e => !e.complete || !e.naturalWidth).length")
    assert broken == 0
    labelled = page.eval_on_selector_all(".chart", "els => els.every(e => e.getAttribute('aria-label'))")
    assert labelled  # alt text on every chart


def test_search_opens_a_player_page(loaded, demo_analysis):
    page, errors, _ = loaded
    name = demo_analysis.stints["player"].iloc[0]
    page.fill("#q", name[:6].lower())
    assert page.locator("#q-results a", has_text=name).count() >= 1
    page.fill("#q", name)
    page.press("#q", "Enter")
    article = page.locator("article.player:target")
    article.wait_for()
    assert name in article.locator("h2").inner_text()
    assert not page.locator("#report").is_visible()  # the page replaces the review
    assert article.locator("svg.path").bounding_box()["width"] > 100
    assert "Mid-season trades" in article.inner_text()
    page.goto(page.url.split("#")[0] + "#review")
    assert page.locator("#report").is_visible() and errors == []


def test_search_ranks_the_team_page_first(loaded, demo_analysis):
    # a team code is part of a dozen players' labels; the team page must still be the first hit
    page, errors, _ = loaded
    team = str(demo_analysis.placements["team"].iloc[-1]).split("/")[0]
    page.fill("#q", team)
    first = page.locator("#q-results a").first
    assert "team page" in first.inner_text() and first.get_attribute("href") == f"#t-{team}"
    page.press("#q", "Enter")
    page.locator("article.team:target").wait_for()
    page.goto(page.url.split("#")[0] + "#teams")
    link = page.locator("#teams table.data a", has_text=team).first  # team codes in the table are links
    assert link.get_attribute("href") == f"#t-{team}"
    page.goto(page.url.split("#")[0] + "#review")
    assert errors == []


def test_sorting_and_filtering_change_rows(loaded):
    page, errors, _ = loaded
    page.goto(page.url.split("#")[0] + "#review")
    rows = page.locator("#tbl-latest tbody tr")
    first = rows.first.inner_text()
    page.click("#tbl-latest thead th:has-text('player')")
    assert rows.first.inner_text() != first  # sorted by name, no longer by evidence
    total = rows.count()
    page.select_option(".filters[data-table='tbl-latest'] select[data-key='status']", "changed")
    visible = page.locator("#tbl-latest tbody tr:not([hidden])")
    assert 0 < visible.count() < total
    assert all(t == "changed" for t in visible.locator("td .status").all_inner_texts())
    page.select_option(".filters[data-table='tbl-latest'] select[data-key='status']", "")
    assert page.locator("#tbl-latest tbody tr:not([hidden])").count() == total and errors == []


def test_a_hostile_name_stays_text(loaded):
    page, errors, _ = loaded
    page.fill("#q", "onerror")
    link = page.locator("#q-results a").first
    assert HOSTILE in link.inner_text()
    link.click()
    assert HOSTILE in page.locator("article.player:target h2").inner_text()
    assert page.evaluate("window.__owned") is None and errors == []


def test_team_page_and_reading_without_javascript(browser, report_file, demo_analysis):
    team = str(demo_analysis.placements["team"].iloc[0]).split("/")[0]
    page = browser.new_page(java_script_enabled=False)
    page.goto(report_file.as_uri() + f"#t-{team}")
    article = page.locator("article.team:target")
    assert article.is_visible() and "Role mix by season" in article.inner_text()
    assert article.locator(".mix").count() >= 1
    page.close()
