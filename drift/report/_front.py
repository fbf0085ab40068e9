"""The front page: the latest season pair first, earlier pairs and the requested comparison after."""

from __future__ import annotations

__all__ = ["build_front"]


def build_front(analysis, b) -> dict:
    """Review of the latest pair (figures, every move with its status, trades), earlier pairs, requested."""
    from drift.report._moves import capped

    cons, stints = b.consecutive, analysis.stints
    latest = b.latest_pair
    # a player who sat out a season and returned in the latest one belongs to this review too
    # (labelled "skips a season")
    latest_moves = cons[cons["season_to"] == latest[1]] if latest and len(cons) else cons.iloc[0:0]
    earlier = (cons[(cons["season_to"] != latest[1]) & (cons["status"] != "steady")]
               if latest and len(cons) else cons.iloc[0:0])
    trades = stints[stints["season_from"] == latest[1]] if latest and len(stints) else stints.iloc[0:0]
    status = latest_moves["status"] if len(latest_moves) else None

    def count(name):
        return int((status == name).sum()) if status is not None else 0

    figures = [
        ("players compared", f"{len(latest_moves):,}"),
        ("role changes beyond noise", f"{count('changed'):,}"),
        ("unsettled (between two roles)", f"{count('unsettled'):,}"),
        ("shifted within their role (beyond noise)", f"{count('shifted'):,}"),
        ("steady", f"{count('steady'):,}"),
        ("changed teams over the summer", f"{int(latest_moves['traded'].sum()) if len(latest_moves) else 0:,}"),
        ("mid-season trades (qualifying stints)", f"{len(trades):,}"),
    ]
    latest_rows, latest_note = capped(latest_moves, b)
    earlier_rows, earlier_note = capped(earlier, b)
    trade_rows, trade_note = capped(trades, b, csv="stints", comps=False)
    requested_rows, requested_note = capped(b.requested, b)
    compare = analysis.config.compare
    n_skip = int(sum(1 for r in latest_rows if r["note"]))
    return {
        "latest_label": f"{latest[0]} → {latest[1]}" if latest else "",
        "latest_figures": figures, "latest_moves": latest_rows, "latest_note": latest_note,
        "latest_skips": n_skip, "latest_trades": trade_rows, "latest_trades_note": trade_note,
        "earlier_moves": earlier_rows, "earlier_note": earlier_note,
        "requested": requested_rows, "requested_note": requested_note,
        "requested_label": f"{compare[0]} → {compare[1]}" if compare else "",
        "totals": {"tbl-latest": len(latest_moves), "tbl-latest-trades": len(trades), "tbl-earlier": len(earlier),
                   "tbl-requested": len(b.requested)},
    }
