"""Report section: next season's outlook, and how it fared on the seasons already played."""

from __future__ import annotations

#: players listed open in the outlook table (most likely to change role first)
OUTLOOK_SHOWN = 25
#: most players the page lists (likeliest changes first); outlook.csv has every one
OUTLOOK_MAX = 400


def _probabilities(row, role_ids, names, n=3):
    """The ``n`` likeliest roles as "R3 name 62%" phrases."""
    probs = sorted(((row[f"prob_{r}"], r) for r in role_ids), reverse=True)[:n]
    return ", ".join(f"{r} {names[r]} {100 * p:.0f}%" for p, r in probs)


def outlook_rows(outlook, model):
    """Outlook rows formatted for the tables: player, team, season, role now, projected role,
    stay and change chances, the three likeliest roles, position spread and sample behind it."""
    names = dict(zip(model.role_ids_, model.role_names_))
    rows = []
    for r in outlook.to_dict(orient="records"):
        rows.append({"player_id": r["player_id"], "player": r["player"], "team": r.get("team", ""),
                     "season": r["season"], "role": f"{r['role']} {names[r['role']]}",
                     "projected": f"{r['projected_role']} {names[r['projected_role']]}",
                     "stay": r["stay_prob"], "change": r["change_prob"],
                     "likeliest": _probabilities(r, model.role_ids_, names),
                     "spread": r["position_spread"], "seasons": int(r["history_seasons"]),
                     "minutes": r["history_minutes"]})
    return rows


def build_outlook(analysis, b) -> dict:
    """Context fields ``outlook``, ``outlook_note``, ``backtest``, ``calibration``, ``backtest_note``."""

    if analysis.outlook is None:
        return {"outlook": [], "outlook_total": 0, "outlook_note": "Too few returning players to learn year-to-year "
                "role stability from (30 pairs of consecutive seasons are needed).",
                "backtest": [], "calibration": [], "backtest_note": ""}
    out = analysis.outlook
    latest = out["season"].iloc[0] if len(out) else ""
    seasons = analysis.backtest.seasons
    allrow = seasons[seasons["season"] == "all"]
    if len(allrow):
        a = allrow.iloc[0]
        verdict = "better" if a["log_loss"] < a["naive_log_loss"] else "not better"
        backtest_note = (
            f"Refitted on the seasons before each season and scored on what drift placed that season "
            f"({int(a['n_test'])} returning players in all), the outlook's log loss is {a['log_loss']:.3f} "
            f"against {a['naive_log_loss']:.3f} for \"same role as last season\" with the stay rate of "
            f"the same earlier seasons as its confidence ({verdict}; {a['oracle_log_loss']:.3f} with the "
            f"stay rate of the season scored, which no forecast knows in advance); Brier score "
            f"{a['brier']:.3f} against {a['naive_brier']:.3f}. Lower is better for both.")
    else:
        backtest_note = "No season has enough earlier returning players to be scored."
    return {
        # a bounded page: the likeliest changes first, the rest in outlook.csv
        "outlook": [{**r, "anchor": b.player_anchor.get(r["player_id"], "")}
                    for r in outlook_rows(out.head(OUTLOOK_MAX), analysis.model)],
        "outlook_total": int(len(out)),
        "outlook_note": (
            f"For the {len(out)} players placed in {latest}: the chance of each role next season, learned "
            "from how often this data's returning players kept or changed role (by role, by how close "
            "they sat to another role, and by the minutes behind their history). A 70% chance of staying "
            "means 3 players in 10 like him changed role. The typical miss is how far such forecasts of a "
            "player's place among the roles missed on past seasons. It knows nothing of trades, injuries or coaching "
            "changes to come."),
        "backtest": seasons.to_dict(orient="records"),
        "calibration": analysis.backtest.calibration.to_dict(orient="records"),
        "backtest_note": backtest_note,
    }
