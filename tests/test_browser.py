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
    """The demo report (report.html and report-data/) with one player renamed to a string that would run
    script if it were markup."""
    from drift.report import write_report

    a = demo_analysis
    victim = a.moves.loc[a.moves["status"] == "changed", "player_id"].iloc[0]
    rename = {"placements": a.placements, "moves": a.moves}
    renamed = {k: v.assign(player=v["player"].where(v["player_id"] != victim, HOSTILE)) for k, v in rename.items()}
    folder = tmp_path_factory.mktemp("browser")
    write_report(dataclasses.replace(a, **renamed), folder)
    return folder / "report.html"


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
    page.wait_for_function("document.querySelector('#q') && window.DRIFT")
    yield page, errors, requests
    page.close()


def _open(page, anchor):
    """Go to a page of the report (its chunk loads on demand) and return its article."""
    page.goto(page.url.split("#")[0] + "#" + anchor)
    article = page.locator(f"#page-view article[id='{anchor}']")
    article.wait_for()
    return article


def _overflow(page) -> int:
    """How far the page is wider than the screen (0: nothing sticks out)."""
    return page.evaluate("document.documentElement.scrollWidth - window.innerWidth")


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
    article = page.locator("#page-view article.player")
    article.wait_for()
    assert name in article.locator("h2").inner_text()
    assert not page.locator("#report").is_visible()  # the page replaces the review
    assert article.locator("svg.path").bounding_box()["width"] > 100
    assert "Mid-season trades" in article.inner_text()
    # the map's legend names every role beside its id
    legend = article.locator(".pathbox .legend").inner_text()
    assert all(f"{rid} {name}" in legend for rid, name in zip(demo_analysis.model.role_ids_,
                                                                demo_analysis.model.role_names_))
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
    page.locator("#page-view article.team").wait_for()
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
    page.locator("#page-view article.player h2").wait_for()
    assert HOSTILE in page.locator("#page-view article.player h2").inner_text()
    assert page.evaluate("window.__owned") is None and errors == []


def test_reading_without_javascript(browser, report_file):
    # the front page reads without JavaScript and says what needs it (the pages, search, sorting)
    page = browser.new_page(java_script_enabled=False)
    page.goto(report_file.as_uri())
    assert page.locator("#review").is_visible() and page.locator("#tbl-latest tbody tr").count() > 10
    assert "need JavaScript" in page.locator("noscript").first.inner_text() or "need JavaScript" in page.content()
    page.close()


def test_search_says_how_many_more_match(loaded, demo_analysis):
    page, errors, _ = loaded
    page.fill("#q", "e")  # most names hold an e
    items = page.locator("#q-results li")
    assert page.locator("#q-results a").count() == 12
    more = items.last.inner_text()
    n = demo_analysis.placements["player"].str.lower().str.contains("e").groupby(
        demo_analysis.placements["player_id"]).any().sum()
    assert "more match" in more and int(more.split()[0].replace(",", "")) >= n - 12 - 1
    page.fill("#q", "")
    assert errors == []


def test_counters_count_what_they_say(loaded, demo_analysis):
    page, errors, _ = loaded
    page.goto(page.url.split("#")[0] + "#review")
    moves = demo_analysis.moves
    latest = moves[(moves["kind"] == "consecutive") & (moves["season_to"] == moves["season_to"].max())]
    counter = page.locator(".filters[data-table='tbl-latest'] .count").inner_text()
    listed = page.locator("#tbl-latest tbody tr").count()
    if len(latest) > listed:  # a cut table says how many it lists and how many there are
        assert counter == f"{listed:,} shown of the {listed:,} moves listed here ({len(latest):,} in all)"
    else:
        assert counter == f"{listed:,} of {listed:,} moves"
    assert errors == []


def test_team_page_names_every_role(loaded, demo_analysis):
    page, errors, _ = loaded
    team = str(demo_analysis.placements["team"].iloc[0]).split("/")[0]
    article = _open(page, f"t-{team}")
    assert "Role mix by season" in article.inner_text() and article.locator(".mix").count() >= 1
    legend = article.locator(".legend").first.inner_text()
    assert all(f"{rid} {name}" in legend for rid, name in zip(demo_analysis.model.role_ids_,
                                                                demo_analysis.model.role_names_))
    assert "players by season" in article.inner_text().lower()
    page.goto(page.url.split("#")[0] + "#review")
    assert errors == []


def test_phone_width_front_player_and_team(browser, report_file, demo_analysis):
    """At 390 px nothing is wider than the screen: tables scroll inside their box."""
    page = browser.new_page(viewport={"width": 390, "height": 844})
    errors = []
    page.on("pageerror", lambda e: errors.append(str(e)))
    page.goto(report_file.as_uri())
    assert _overflow(page) <= 0
    assert page.locator("#tbl-latest").bounding_box()["width"] > 390  # the table itself is wider ...
    player = demo_analysis.stints["player_id"].iloc[0]
    team = str(demo_analysis.placements["team"].iloc[0]).split("/")[0]
    for anchor in (f"p-{player}", f"t-{team}"):
        _open(page, anchor)
        assert _overflow(page) <= 0, anchor  # ... and scrolls in its box, not the page
    page.goto(report_file.as_uri() + "#roles")
    assert _overflow(page) <= 0
    page.close()
    assert errors == []


def test_print_opens_collapsed_blocks_and_restores_them(loaded, demo_analysis):
    page, errors, _ = loaded
    team = str(demo_analysis.placements["team"].iloc[0]).split("/")[0]
    article = _open(page, f"t-{team}")
    state = "() => Array.from(document.querySelectorAll('details')).map(d => d.open)"
    page.evaluate("document.querySelector('#page-view details').open = true")  # one the user opened
    before = page.evaluate(state)
    assert not all(before) and any(before)
    page.evaluate("window.dispatchEvent(new Event('beforeprint'))")
    assert all(page.evaluate(state))  # the paper shows every row
    page.evaluate("window.dispatchEvent(new Event('afterprint'))")
    assert page.evaluate(state) == before  # and the screen is as the user left it
    assert article.is_visible() and errors == []
    page.goto(page.url.split("#")[0] + "#review")


@pytest.mark.slow
def test_a_league_of_a_hundred_thousand_player_seasons(browser, demo_analysis, tmp_path):
    """10^5 placed player-seasons and 400 teams (the demo copied, not refitted): the first page stays
    small, and a player drawn from the last third of the alphabet is reached by search."""
    import random
    import time

    from drift.report import write_report
    from drift.sim.copies import copies

    big = copies(demo_analysis, 52, teams=20)
    assert len(big.placements) >= 100_000
    write_report(big, tmp_path)
    first = (tmp_path / "report.html").stat().st_size + (tmp_path / "report-data" / "index.js").stat().st_size
    assert first < 5_000_000  # the bound for the page a user opens first
    page = browser.new_page(viewport={"width": 1280, "height": 900})
    errors = []
    page.on("console", lambda m: errors.append(m.text) if m.type == "error" else None)
    page.on("pageerror", lambda e: errors.append(str(e)))
    start = time.perf_counter()
    page.goto((tmp_path / "report.html").as_uri())
    page.wait_for_function("document.querySelectorAll('#tbl-latest tbody tr').length > 0")
    opened = time.perf_counter() - start
    print(f"\n10^5 league: first page {first / 1e6:.2f} MB (report.html + index.js), opened in {opened:.2f} s "
          "(a shared, loaded machine: not a speed measurement)")
    names = sorted(big.placements.drop_duplicates("player_id", keep="last")["player"])
    name = random.Random(19).choice(names[2 * len(names) // 3:])
    page.fill("#q", name)
    page.press("#q", "Enter")
    article = page.locator("#page-view article.player")
    article.wait_for(timeout=30_000)
    assert name in article.locator("h2").inner_text()
    team = str(big.placements["team"].iloc[-1]).split("/")[0]
    page.fill("#q", team)
    page.press("#q", "Enter")
    page.locator(f"#page-view article[id='t-{team}']").wait_for(timeout=30_000)
    assert _overflow(page) <= 0 and errors == []
    page.close()
