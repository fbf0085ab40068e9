"""Move rows for every table (front page, player and team pages) and the method section's noise chart.

A row carries what the tables print (words, percentages, role chips, status) and the data
attributes the page's filters read (team, role, season pair, status, traded).
"""

from __future__ import annotations

from drift.report._fmt import _KINDS, _value_kind, sig  # plain functions, no heavy import

__all__ = ["MAX_ROWS", "pair_label", "move_rows", "capped", "build_method_moves", "STATUS_ORDER"]

#: Longest table printed in full; longer ones show their strongest rows and point to the CSV.
MAX_ROWS = 250
STATUS_ORDER = {"changed": 0, "unsettled": 1, "shifted": 2, "steady": 3}


def _stint(n):
    """Stint numbers arrive as floats from a table with gaps: print 2, not 2.0."""
    try:
        return str(int(n))
    except (TypeError, ValueError):
        return str(n or "")


def pair_label(row, season_index) -> tuple[str, str]:
    """(pair text, kind note): "2023-24 → 2024-25" and "" / "skips a season" / "requested" / "trade"."""
    a, b = str(row["season_from"]), str(row["season_to"])
    kind = row.get("kind", "consecutive")
    if kind == "stint":
        return f"{a} stint {_stint(row.get('stint_from'))} → {_stint(row.get('stint_to'))}", "mid-season trade"
    if kind == "requested":
        return f"{a} → {b}", "requested comparison"
    gap = season_index.get(b, 0) - season_index.get(a, 0)
    return f"{a} → {b}", ("skips a season" if gap == 2 else f"skips {gap - 1} seasons" if gap > 2 else "")


def _change_text(name, change):
    kind = _KINDS.get(name) or _KINDS.setdefault(name, _value_kind(name))
    if kind == "ppp":
        return f"{change:+.2f} points per possession"
    if kind == "share":
        return f"{100 * change:+.1f} pp"  # percentage points ("pts" read as points scored)
    if kind == "pct":
        return f"{change:+.1f} pp"
    return f"{'+' if change >= 0 else ''}{sig(change, 2)}"


def _drivers(row, n=3):
    from drift.model.describe import feature_label

    parts = []
    for i in range(1, n + 1):
        name = row.get(f"driver_{i}")
        if isinstance(name, str):
            parts.append(f"{feature_label(name)} {_change_text(name, row[f'driver_{i}_change'])}")
    return ", ".join(parts)


def move_rows(moves, b, *, comps=True):
    """Moves formatted for a table, in the order given (see the ``ReportContext`` docs for the keys)."""
    from drift.report._fmt import figures_title, membership, strength

    rows = []
    for row in moves.to_dict(orient="records"):
        pair, note = pair_label(row, b.season_index)
        rows.append({
            "player": row["player"], "anchor": b.player_anchor.get(row["player_id"], ""),
            "pair": pair, "note": note, "team_from": str(row["team_from"]), "team_to": str(row["team_to"]),
            "teams": f"{row['team_from']} → {row['team_to']}" if row["team_from"] != row["team_to"] else str(row["team_to"]),
            "traded": bool(row["traded"]),
            "role_from": b.role(row["role_from"]), "role_to": b.role(row["role_to"]),
            "prob_from": membership(row["prob_from"]), "prob_to": membership(row["prob_to"]),
            "status": row["status"], "status_key": STATUS_ORDER.get(row["status"], 9), "words": strength(row["p_value"], row["z"], b.alpha),
            "figures": figures_title(row["distance"], row["noise_distance"], row["z"], row["p_value"]),
            "z": float(row["z"]), "z_key": f"{row['z']:.4f}", "minutes": f"{row['minutes_from']:,.0f} / {row['minutes_to']:,.0f}",
            "drivers": _drivers(row),
            "comparables": b.comparables.get((row["player_id"], row["season_to"]), "") if comps else "",
            "filter_team": "|".join(dict.fromkeys([str(row["team_from"]), str(row["team_to"])])),
            "filter_role": "|".join(dict.fromkeys([row["role_from"], row["role_to"]])),
        })
    return rows


def strongest_first(moves):
    """Status order (changed, unsettled, shifted, steady), then strongest evidence first."""
    if not len(moves):
        return moves
    order = moves["status"].map(STATUS_ORDER).fillna(9)
    return moves.assign(_o=order).sort_values(["_o", "p_value"], kind="stable").drop(columns="_o")


def capped(moves, b, *, limit=None, csv="moves", comps=True, order=True):
    """(rows, note): at most ``limit`` (default :data:`MAX_ROWS`) rows, strongest first unless
    ``order`` is False, and a sentence naming the table (``csv`` in the run's format) when it was cut."""
    limit = MAX_ROWS if limit is None else limit
    ordered = strongest_first(moves) if order else moves
    note = ""
    if len(ordered) > limit:
        note = (f"Listing the {limit:,} strongest of {len(ordered):,} moves; every one is in {csv}.{b.ext}.")
        ordered = ordered.head(limit)
    return move_rows(ordered, b, comps=comps), note


def build_method_moves(analysis, b) -> dict:
    """The evidence chart (z against sample, with the real decision line) and the calibration note."""
    from markupsafe import Markup

    from drift.report import _charts as charts

    a, slope = analysis.model.noise_calibration_
    noise_note = (f"The noise model was calibrated on {int(len(b.consecutive)):,} returning player pairs: "
                  f"its covariance is scaled by {a:.2f} + {slope:.2f} x (sample-size term at the pool median = 1), "
                  "so that the median returning player sits at the median of the no-change distribution.")
    return {"moves_chart": Markup(charts.moves_chart(b.consecutive, alpha=b.alpha)),
            "noise_note": noise_note, "alpha": b.alpha}
