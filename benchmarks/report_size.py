"""Report size and build time on a large league: the demo league's analysis copied K times.

Every copy gets new player ids and names (same teams and seasons), so the league has K times the
players, moves and trades. Run: ``python benchmarks/report_size.py 50`` (K = 50: about 100,000
placed player-seasons). Prints the build time and the size of report.html.
"""

from __future__ import annotations

import dataclasses
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent


def inflate(analysis, k):
    """The analysis with every player-keyed table repeated ``k`` times under new ids."""
    import pandas as pd

    def grow(frame, *id_cols):
        if frame is None or not len(frame):
            return frame
        parts = []
        for i in range(k):
            part = frame.copy()
            for col in id_cols:
                part[col] = part[col].astype(str) + f"-{i}"
            for col in ("player", "comp_player"):
                if col in part:
                    part[col] = part[col].astype(str) + f" {i}"
            parts.append(part)
        return pd.concat(parts, ignore_index=True)

    prepared = dataclasses.replace(analysis.prepared, kept=grow(analysis.prepared.kept, "player_id"),
                                   excluded=grow(analysis.prepared.excluded, "player_id"))
    return dataclasses.replace(
        analysis, prepared=prepared, placements=grow(analysis.placements, "player_id"),
        moves=grow(analysis.moves, "player_id"), stints=grow(analysis.stints, "player_id"),
        comparables=grow(analysis.comparables, "player_id", "comp_player_id"),
        outlook=grow(analysis.outlook, "player_id"))


def main(k=50):
    from threadpoolctl import threadpool_limits

    from drift.api import analyse, fit_model, prepare
    from drift.report import build_context, render_report

    with threadpool_limits(limits=1):
        prepared = prepare(ROOT / "demo_seasons")
        analysis = inflate(analyse(prepared, fit_model(prepared)), k)
        start = time.perf_counter()
        html = render_report(build_context(analysis))
        took = time.perf_counter() - start
    print(f"K={k}: {len(analysis.placements):,} placed player-seasons, {len(analysis.moves):,} moves; "
          f"report built in {took:.1f} s, {len(html.encode('utf-8')) / 1e6:.2f} MB")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 50)
