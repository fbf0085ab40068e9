"""Move tables: role changes, unsettled, shifted, mid-season trades, the requested comparison."""

from __future__ import annotations

__all__ = ["build_moves", "move_rows"]


def _drivers(row, n=3):
    from ..describe import feature_label

    parts = []
    for i in range(1, n + 1):
        name = row.get(f"driver_{i}")
        if not isinstance(name, str):
            continue
        parts.append(f"{feature_label(name)} {row[f'driver_{i}_change']:+.3g} "
                     f"({row[f'driver_{i}_change_sd']:+.1f} SD, {row[f'driver_{i}_share']:.0%} of the move)")
    return "; ".join(parts)


def move_rows(moves, names, comps=None):
    """Moves formatted for a table, in the order given."""
    comps = comps or {}
    rows = []
    for row in moves.to_dict(orient="records"):
        rows.append({
            "player": row["player"], "player_id": row["player_id"],
            "seasons": (f"{row['season_from']} → {row['season_to']}" if row["season_from"] != row["season_to"]
                        else f"{row['season_from']} stint {row.get('stint_from', '')} → {row.get('stint_to', '')}"),
            "teams": f"{row['team_from']} → {row['team_to']}", "traded": bool(row["traded"]),
            "role_from": f"{row['role_from']} {names.get(row['role_from'], '')}",
            "role_to": f"{row['role_to']} {names.get(row['role_to'], '')}",
            "prob_from": row["prob_from"], "prob_to": row["prob_to"],
            "distance": row["distance"], "noise": row["noise_distance"], "z": row["z"],
            "percentile": row["percentile"], "minutes": f"{row['minutes_from']:.0f} / {row['minutes_to']:.0f}",
            "drivers": _drivers(row),
            "comparables": comps.get((row["player_id"], row["season_to"]), ""),
        })
    return rows


def _strongest_first(moves):
    return moves.sort_values("p_value", kind="stable") if len(moves) else moves


def build_moves(analysis, b) -> dict:
    """The move tables and the distance-against-noise chart."""
    from markupsafe import Markup

    from .. import charts

    config, model = analysis.config, analysis.model
    consecutive = b.consecutive

    def status(name):
        sel = consecutive[consecutive["status"] == name] if len(consecutive) else consecutive
        return move_rows(_strongest_first(sel), b.names, b.comparables)

    a, slope = model.noise_calibration_
    noise_note = (f"The noise model was calibrated on {int(len(consecutive))} returning player pairs: "
                  f"its covariance is scaled by {a:.2f} + {slope:.2f} x (sample-size term at the pool median = 1), "
                  "so that the median returning player sits at the median of the no-change distribution.")
    stints = analysis.stints
    return {
        "changed": status("changed"), "unsettled": status("unsettled"), "shifted": status("shifted"),
        "stint_moves": move_rows(_strongest_first(stints), b.names) if len(stints) else [],
        "requested": move_rows(_strongest_first(b.requested), b.names, b.comparables) if len(b.requested) else [],
        "requested_label": f"{config.compare[0]} → {config.compare[1]}" if config.compare else "",
        "moves_chart": Markup(charts.moves_chart(consecutive)),
        "noise_note": noise_note, "alpha": config.alpha,
    }
