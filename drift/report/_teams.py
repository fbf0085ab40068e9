"""Team pages: minutes-weighted role mix by season, arrivals and departures, trades, role changes.

A team-season counts the placed seasons of its players. A traded player's minutes go to each team
by his qualifying stints (with each stint's own role); minutes of stints too short to place go to
his other teams of that season with his season role, split evenly.
"""

from __future__ import annotations

__all__ = ["build_teams", "team_minutes"]


def team_minutes(placements, stint_moves):
    """Long table: team, season, player_id, role, minutes (one row per player, team and role)."""
    import pandas as pd

    pl = placements[["player_id", "season", "team", "role", "minutes"]].copy()
    pl["team"] = pl["team"].astype(str)
    single = pl[~pl["team"].str.contains("/", regex=False)]
    parts = [single]
    traded = pl[pl["team"].str.contains("/", regex=False)]
    if len(traded):
        stints = pd.DataFrame()
        if len(stint_moves):
            a = stint_moves[["player_id", "season_from", "stint_from", "team_from", "role_from", "minutes_from"]]
            z = stint_moves[["player_id", "season_from", "stint_to", "team_to", "role_to", "minutes_to"]]
            cols = ["player_id", "season", "stint", "team", "role", "minutes"]
            stints = pd.concat([a.set_axis(cols, axis=1), z.set_axis(cols, axis=1)]).drop_duplicates(
                ["player_id", "season", "stint"])
        by_season = {}
        for rec in (stints.to_dict(orient="records") if len(stints) else []):
            by_season.setdefault((rec["player_id"], rec["season"]), []).append(rec)
        rows = []
        for r in traded.itertuples(index=False):
            known = [{"player_id": r.player_id, "season": r.season, "team": str(k["team"]), "role": k["role"],
                      "minutes": float(k["minutes"])} for k in by_season.get((r.player_id, r.season), [])]
            rest = [t for t in r.team.split("/") if t not in {k["team"] for k in known}]
            left = max(float(r.minutes) - sum(k["minutes"] for k in known), 0.0)
            rows += known + [{"player_id": r.player_id, "season": r.season, "team": t, "role": r.role,
                              "minutes": left / len(rest)} for t in rest]
        parts.append(pd.DataFrame(rows))
    out = pd.concat(parts, ignore_index=True)
    return out.groupby(["team", "season", "player_id", "role"], as_index=False, sort=True)["minutes"].sum()


def _mix(block, b):
    total = block["minutes"].sum()
    by_role = block.groupby("role")["minutes"].sum()
    return [{**b.role(rid), "share": float(by_role.get(rid, 0.0) / total),
             "text": f"{100 * by_role.get(rid, 0.0) / total:.0f}%"} for rid in b.names if total > 0]


def _roster(analysis, pl, config):
    """Season -> player id -> (first team, last team, why not placed or "") from every combined
    season row, placed or not: a player below the filters is still on his team's roster."""
    from drift.report._fmt import filter_words

    prepared = getattr(analysis, "prepared", None)
    raw = prepared.seasons if prepared is not None and prepared.seasons is not None else pl
    why = {}
    if prepared is not None and prepared.excluded is not None and len(prepared.excluded):
        for r in prepared.excluded.to_dict(orient="records"):
            why[(r["player_id"], r["season"])] = filter_words(r, config)
    out = {}
    for pid, season, team in raw[["player_id", "season", "team"]].astype({"team": str}).itertuples(index=False):
        teams = team.split("/")
        out.setdefault(season, {})[pid] = (teams[0], teams[-1], why.get((pid, season), ""))
    return out


def _movement(by_season, roster, team, s0, s1, b, moves_by):
    """Arrivals and departures of placed players, judged on every season row (placed or not):
    an arrival is placed with the team in ``s1`` and was not with it at the end of ``s0``; a
    departure the reverse. Players on the roster in both seasons but placed in only one are
    listed apart ("stayed"), never counted as arrivals or departures."""
    prev, now = by_season.get(s0, {}), by_season.get(s1, {})
    raw0, raw1 = roster.get(s0, {}), roster.get(s1, {})

    def row(pid, r, moved, where, missing):
        move = moves_by.get((pid, s0, s1))
        return {"player": r["player"], "anchor": b.player_anchor.get(pid, ""), "moved": moved, "other": where,
                "role": b.role(r["role"]), "status": move["status"] if move else "",
                "words": move["words"] if move else missing}

    def below(season, why):
        return f"on the roster in {season}, below the filters ({why})" if why else f"on the roster in {season}"

    arrivals, departures, stayed = [], [], []
    for pid, r in now.items():
        if r["team_first"] != team or (pid in prev and prev[pid]["team_last"] == team):
            continue
        had = raw0.get(pid)
        if had and had[1] == team:
            stayed.append(row(pid, r, "stayed", below(s0, had[2]), "no earlier placed season to compare"))
        elif had:
            note = "" if pid in prev else f" (not placed in {s0}: {had[2]})" if had[2] else f" (not placed in {s0})"
            arrivals.append(row(pid, r, "arrived", f"from {had[1]}{note}", "no earlier placed season to compare"))
        else:
            arrivals.append(row(pid, r, "arrived", f"not in the {s0} data", "no earlier placed season to compare"))
    for pid, r in prev.items():
        if r["team_last"] != team or (pid in now and now[pid]["team_first"] == team):
            continue
        has = raw1.get(pid)
        if has and has[0] == team:
            stayed.append(row(pid, r, "stayed", below(s1, has[2]), "no later placed season to compare"))
        elif has:
            note = "" if pid in now else f" (not placed in {s1}: {has[2]})" if has[2] else f" (not placed in {s1})"
            departures.append(row(pid, r, "left", f"to {has[0]}{note}", "no later placed season to compare"))
        else:
            departures.append(row(pid, r, "left", f"not in the {s1} data", "no later placed season to compare"))
    return arrivals, departures, stayed


def build_teams(analysis, b) -> dict:
    """The team pages and the teams' index."""
    from drift.report import _moves as mv
    from drift.report._fmt import strength
    from drift.report._moves import capped

    pl = analysis.placements.copy()
    for col in ("team_first", "team_last"):
        if col not in pl:
            pl[col] = pl["team"].astype(str)
    minutes = team_minutes(pl, analysis.stints)
    by_season = {}
    for rec in pl[["player_id", "player", "season", "role", "team_first", "team_last"]].astype(
            {"team_first": str, "team_last": str}).to_dict(orient="records"):
        by_season.setdefault(rec["season"], {})[rec["player_id"]] = rec
    roster = _roster(analysis, pl, analysis.config)
    cons = b.consecutive
    changed_all = cons[cons["status"] == "changed"] if len(cons) else cons
    changed_teams = [set(f"{a}/{z}".split("/")) for a, z in zip(changed_all.get("team_from", []),
                                                                 changed_all.get("team_to", []))]
    mix_by = {t: block for t, block in minutes.groupby("team", sort=False)}
    cons = b.consecutive
    # status and words only (formatting every move of a large league would cost more than the page)
    moves_by = {(r.player_id, r.season_from, r.season_to): {"status": r.status,
                                                            "words": strength(r.p_value, r.z, b.alpha)}
                for r in cons[["player_id", "season_from", "season_to", "status", "p_value", "z"]].itertuples(index=False)} \
        if len(cons) else {}
    stints = analysis.stints
    pages, index = [], []
    for team, anchor in b.team_anchor.items():
        mix = [{"season": s, "roles": _mix(block, b), "players": int(block["player_id"].nunique())}
               for s, block in mix_by.get(team, minutes.iloc[0:0]).groupby("season", sort=True)]
        seasons = [m["season"] for m in mix]
        movement = []
        for s0, s1 in zip(b.seasons[:-1], b.seasons[1:]):
            if s0 in seasons or s1 in seasons:
                arrivals, departures, stayed = _movement(by_season, roster, team, s0, s1, b, moves_by)
                cut = max(len(arrivals), len(departures), len(stayed)) > mv.TEAM_ROWS
                movement.append({"pair": f"{s0} → {s1}", "arrivals": arrivals[:mv.TEAM_ROWS],
                                  "departures": departures[:mv.TEAM_ROWS], "stayed": stayed[:mv.TEAM_ROWS],
                                  "n_arrivals": len(arrivals),
                                  "note": (f"{len(arrivals):,} arrivals and {len(departures):,} departures; the first "
                                           f"{mv.TEAM_ROWS} of each are listed (placements.csv has them all).")
                                  if cut else ""})
        movement.reverse()  # latest first
        trades = stints[(stints["team_from"].astype(str) == team) | (stints["team_to"].astype(str) == team)] \
            if len(stints) else stints
        changed = changed_all[[team in ts for ts in changed_teams]] if len(changed_all) else changed_all
        trade_rows, trade_note = capped(trades, b, limit=mv.TEAM_ROWS, csv="stints.csv", comps=False)
        changed_rows, changed_note = capped(changed.sort_values("season_to", ascending=False, kind="stable")
                                            if len(changed) else changed, b, limit=mv.TEAM_ROWS, comps=False,
                                            order=False)
        pages.append({"anchor": anchor, "team": team, "mix": mix[::-1], "movement": movement,
                      "trades": trade_rows, "trades_note": trade_note,
                      "changed": changed_rows, "changed_note": changed_note})
        latest = mix[-1] if mix and mix[-1]["season"] == b.seasons[-1] else None
        index.append({"anchor": anchor, "team": team, "players": latest["players"] if latest else 0,
                      "changed": sum(1 for m in pages[-1]["changed"] if m["pair"].endswith(b.seasons[-1])),
                      "arrivals": movement[0]["n_arrivals"] if movement else 0})
    return {"teams": pages, "team_index": index}
