"""The report at scale: build time, size of the first page and of the folder, open time in Chromium.

The demo league is fitted once and its analysis copied K times (:func:`drift.sim.copies.copies`:
new player ids and names, teams in 20 groups so K >= 20 gives 400 teams); nothing is refitted, so
the figures are the report's own. For each K it prints

* build: CPU and wall seconds of ``drift.report.write_report`` (context, pages, chunks, front page);
* first page: ``report.html`` + ``report-data/index.js`` (what a browser reads on opening);
* folder: the whole report, against the CSV tables of the same rows (placements, moves, stints,
  comparables, excluded, outlook, written as a run writes them), per placed player-season;
* open: seconds until the front page's first table is in the DOM in headless Chromium
  (``/usr/bin/chromium``; skipped without Playwright), the median of three loads;
* page: seconds from a search's Enter to the player's page on screen.

Run: ``python benchmarks/report_scale.py 5 52`` (K = 52: 100,828 placed player-seasons, 400 teams).
Targets (docs/performance.md): at 10^5 player-seasons the first page under 5 MB and open in under 2 s,
the build under 10 s on a quiet 2-core machine, the folder no larger per row than the CSVs.
"""

from __future__ import annotations

import statistics
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
TABLES = ("placements", "moves", "stints", "comparables", "outlook")


def _size(paths) -> int:
    return sum(p.stat().st_size for p in paths)


def _open_times(report, name, loads=3):
    """(median seconds to the first table, seconds from search to a player's page), or None."""
    try:
        from playwright.sync_api import sync_playwright
    except ImportError:
        return None
    with sync_playwright() as p:
        browser = p.chromium.launch(executable_path="/usr/bin/chromium", args=["--no-sandbox", "--disable-gpu"])
        times = []
        for _ in range(loads):
            page = browser.new_page(viewport={"width": 1280, "height": 900})
            start = time.perf_counter()
            page.goto(report.as_uri())
            page.wait_for_function("document.querySelectorAll('#tbl-latest tbody tr').length > 0")
            times.append(time.perf_counter() - start)
            page.close()
        page = browser.new_page(viewport={"width": 1280, "height": 900})
        page.goto(report.as_uri())
        page.fill("#q", name)
        start = time.perf_counter()
        page.press("#q", "Enter")
        page.locator("#page-view article.player").wait_for(timeout=60_000)
        found = time.perf_counter() - start
        browser.close()
    return statistics.median(times), found


def measure(analysis, k, folder):
    from drift.output.tables import with_role_names, write_table
    from drift.report import write_report
    from drift.sim.copies import copies

    big = copies(analysis, k, teams=20)
    out = Path(folder) / f"k{k}"
    out.mkdir()
    cpu, wall = time.process_time(), time.perf_counter()
    write_report(big, out)
    cpu, wall = time.process_time() - cpu, time.perf_counter() - wall
    names = dict(zip(big.model.role_ids_, big.model.role_names_))
    for name in TABLES:
        write_table(with_role_names(getattr(big, name), names), out / name)
    write_table(big.prepared.excluded, out / "excluded")
    rows = len(big.placements)
    first = _size([out / "report.html", out / "report-data" / "index.js"])
    report = _size([out / "report.html", *(out / "report-data").iterdir()])
    csv = _size(out.glob("*.csv"))
    last = sorted(big.placements["player"].astype(str).unique())
    opened = _open_times(out / "report.html", last[len(last) * 5 // 6])
    teams = len({t for v in big.placements["team"].astype(str).unique() for t in v.split("/")})
    return {"k": k, "rows": rows, "teams": teams, "cpu": cpu, "wall": wall, "first_mb": first / 1e6,
            "report_mb": report / 1e6, "csv_mb": csv / 1e6, "report_per_row": report / rows,
            "csv_per_row": csv / rows, "open": opened}


def main(ks):
    import os

    from threadpoolctl import threadpool_limits

    from drift.api import analyse, fit_model, prepare

    with threadpool_limits(limits=1):
        prepared = prepare(ROOT / "demo_seasons")
        analysis = analyse(prepared, fit_model(prepared))
        load = os.getloadavg()[0]
        print(f"machine load (1 min) at start: {load:.1f} on {os.cpu_count()} cores; times on a loaded machine "
              "are upper bounds")
        print("| K | placed rows | teams | build CPU s | build wall s | first page MB | report MB | CSV MB | "
              "report B/row | CSV B/row | open s | search to page s |")
        print("|---|---|---|---|---|---|---|---|---|---|---|---|")
        with tempfile.TemporaryDirectory() as folder:
            for k in ks:
                r = measure(analysis, k, folder)
                opened = r["open"] or ("-", "-")
                print(f"| {k} | {r['rows']:,} | {r['teams']} | {r['cpu']:.1f} | {r['wall']:.1f} | {r['first_mb']:.2f} "
                      f"| {r['report_mb']:.1f} | {r['csv_mb']:.1f} | {r['report_per_row']:,.0f} | "
                      f"{r['csv_per_row']:,.0f} | {opened[0] if isinstance(opened[0], str) else f'{opened[0]:.2f}'} "
                      f"| {opened[1] if isinstance(opened[1], str) else f'{opened[1]:.2f}'} |", flush=True)
        print(f"machine load (1 min) at the end: {os.getloadavg()[0]:.1f}")


if __name__ == "__main__":
    main([int(a) for a in sys.argv[1:]] or [5, 52])
