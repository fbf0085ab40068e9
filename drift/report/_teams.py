"""Team pages: minutes-weighted role mix by season, players by season, arrivals and departures,
trades, role changes (page documents, see :mod:`drift.report._bundle`), and the front page's team index.

A team-season counts the placed seasons of its players. A traded player's minutes go to each team
by his qualifying stints (with each stint's own role); minutes of stints too short to place go to
his other teams of that season with his season role, split evenly.
"""

from __future__ import annotations

__all__ = ["build_teams", "build_team_pages", "team_minutes"]


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


def _mixes(minutes, names) -> dict:
    """Team -> [[season, players, [[role, width %, "31%"], ...]], ...] in season order (roles in model order)."""
    by_role = minutes.groupby(["team", "season", "role"], sort=True)["minutes"].sum()
    players = minutes.groupby(["team", "season"], sort=True)["player_id"].nunique()
    order = {rid: i for i, rid in enumerate(names)}
    shares = {}
    for (team, season, role), value in zip(by_role.index.tolist(), by_role.tolist()):
        shares.setdefault((team, season), []).append((order.get(role, len(order)), role, value))
    out = {}
    for (team, season), n in zip(players.index.tolist(), players.tolist()):
        parts = sorted(shares.get((team, season), []))
        total = sum(v for _, _, v in parts)
        roles = [[rid, round(100 * v / total, 1), f"{100 * v / total:.0f}%"] for _, rid, v in parts
                 if total > 0 and v > 0]
        out.setdefault(team, []).append([str(season), int(n), roles])
    return out


def _roster(analysis, pl, config):
    """Season -> player id -> (first team, last team, why not placed or "") from every combined
    season row, placed or not: a player below the filters is still on his team's roster."""
    from drift.report._fmt import filter_words

    prepared = getattr(analysis, "prepared", None)
    raw = prepared.seasons if prepared is not None and prepared.seasons is not None else pl
    why = {}
    if prepared is not None and prepared.excluded is not None and len(prepared.excluded):
        ex = prepared.excluded
        for pid, season, code, games, mpg in zip(*(ex[c].tolist() for c in (
                "player_id", "season", "reason_code", "games", "minutes_per_game"))):
            why[(pid, season)] = filter_words({"reason_code": code, "games": games, "minutes_per_game": mpg}, config)
    out = {}
    for pid, season, team in zip(raw["player_id"].tolist(), raw["season"].tolist(), raw["team"].astype(str).tolist()):
        teams = team.split("/")
        out.setdefault(season, {})[pid] = (teams[0], teams[-1], why.get((pid, season), ""))
    return out


def _movement(by_season, roster, s0, s1, b, moves_by):
    """Team -> (arrivals, departures, stayed) cell rows for the pair ``s0 → s1``, every team at once.

    Judged on every season row (placed or not): an arrival is placed with the team in ``s1`` and was
    not with it at the end of ``s0``; a departure the reverse. Players on the roster in both seasons
    but placed in only one are listed apart ("stayed"), never counted as arrivals or departures."""
    prev, now = by_season.get(s0, {}), by_season.get(s1, {})
    raw0, raw1 = roster.get(s0, {}), roster.get(s1, {})
    out = {}

    def add(team, which, pid, r, moved, where, missing):
        move = moves_by.get((pid, s0, s1))
        words = ["m", ["s", move[0]], ["n", " " + move[1]]] if move else ["n", missing]
        out.setdefault(team, ([], [], []))[which].append(
            [["a", r["player"], b.player_anchor.get(pid, "")], moved, where, ["r", r["role"]], words])

    def below(season, why):
        return f"on the roster in {season}, below the filters ({why})" if why else f"on the roster in {season}"

    for pid, r in now.items():
        team = r["team_first"]
        if pid in prev and prev[pid]["team_last"] == team:
            continue
        had, missing = raw0.get(pid), "no earlier placed season to compare"
        if had and had[1] == team:
            add(team, 2, pid, r, "stayed", below(s0, had[2]), missing)
        elif had:
            note = "" if pid in prev else f" (not placed in {s0}: {had[2]})" if had[2] else f" (not placed in {s0})"
            add(team, 0, pid, r, "arrived", f"from {had[1]}{note}", missing)
        else:
            add(team, 0, pid, r, "arrived", f"not in the {s0} data", missing)
    for pid, r in prev.items():
        team = r["team_last"]
        if pid in now and now[pid]["team_first"] == team:
            continue
        has, missing = raw1.get(pid), "no later placed season to compare"
        if has and has[0] == team:
            add(team, 2, pid, r, "stayed", below(s1, has[2]), missing)
        elif has:
            note = "" if pid in now else f" (not placed in {s1}: {has[2]})" if has[2] else f" (not placed in {s1})"
            add(team, 1, pid, r, "left", f"to {has[0]}{note}", missing)
        else:
            add(team, 1, pid, r, "left", f"not in the {s1} data", missing)
    return out


class _Teams:
    """What the team pages and the team index share: minutes, seasons' players, rosters, moves."""

    def __init__(self, analysis, b):
        from drift.report._fmt import strength

        pl = analysis.placements.copy()
        for col in ("team_first", "team_last"):
            if col not in pl:
                pl[col] = pl["team"].astype(str)
        self.pl = pl
        self.minutes = team_minutes(pl, analysis.stints)
        self.by_season = {}
        cols = ("player_id", "player", "season", "role", "team_first", "team_last")
        for values in zip(pl["player_id"].tolist(), pl["player"].astype(str).tolist(), pl["season"].tolist(),
                          pl["role"].tolist(), pl["team_first"].astype(str).tolist(), pl["team_last"].astype(str).tolist()):
            self.by_season.setdefault(values[2], {})[values[0]] = dict(zip(cols, values))
        self.roster = _roster(analysis, pl, analysis.config)
        cons = b.consecutive
        self.moves_by = {(pid, s0, s1): (status, strength(p, z, b.alpha)) for pid, s0, s1, status, p, z in zip(
            *(cons[c].tolist() for c in ("player_id", "season_from", "season_to", "status", "p_value", "z")))} \
            if len(cons) else {}
        changed = cons[cons["status"] == "changed"] if len(cons) else cons
        self.changed = changed
        self.changed_teams = [set(f"{a}/{z}".split("/")) for a, z in zip(
            changed["team_from"].astype(str).tolist(), changed["team_to"].astype(str).tolist())] if len(changed) else []

    def movement(self, s0, s1, b):
        return _movement(self.by_season, self.roster, s0, s1, b, self.moves_by)


def _shared(analysis, b) -> _Teams:
    """The :class:`_Teams` of this report, made once (the index and the pages both need it)."""
    if "teams" not in b.memo:
        b.memo["teams"] = _Teams(analysis, b)
    return b.memo["teams"]


def build_teams(analysis, b) -> dict:
    """The front page's team index: players placed in the latest season, arrivals and role changes
    into it (every one counted, uncut)."""
    t = _shared(analysis, b)
    latest = b.seasons[-1]
    players = t.minutes[t.minutes["season"] == latest].groupby("team")["player_id"].nunique()
    moved = t.movement(*b.latest_pair, b) if b.latest_pair else {}
    latest_changed = [ts for ts, s in zip(t.changed_teams, t.changed["season_to"].tolist() if len(t.changed) else [])
                      if s == latest]
    index = [{"anchor": anchor, "team": team, "players": int(players.get(team, 0)),
              "changed": sum(1 for ts in latest_changed if team in ts),
              "arrivals": len(moved.get(team, ([], [], []))[0])} for team, anchor in b.team_anchor.items()]
    return {"team_index": index}


def _rosters(t, b):
    """Team -> season -> rows [player, role (membership), games, minutes, move into the season]."""
    from drift.report._cells import membership_texts, minutes_texts

    pl = t.pl
    into = {(pid, s1): ["m", ["s", m[0]], ["n", " " + m[1]]] for (pid, s0, s1), m in t.moves_by.items()}
    out = {}
    for pid, name, season, team, role, prob, games, minutes in zip(
            pl["player_id"].tolist(), pl["player"].astype(str).tolist(), pl["season"].tolist(),
            pl["team"].astype(str).tolist(), pl["role"].tolist(), membership_texts(pl["role_prob"]),
            pl["games"].astype(int).tolist(), minutes_texts(pl["minutes"])):
        row = [["a", name, b.player_anchor.get(pid, "")], ["r", role, prob], games, minutes,
               into.get((pid, season), ["n", "first placed season"])]
        for code in dict.fromkeys(team.split("/")):
            out.setdefault(code, {}).setdefault(season, []).append(row)
    return out


def build_team_pages(analysis, b) -> dict:
    """Anchor -> page document of every team (see :mod:`drift.report._bundle`)."""
    from drift.report._cells import move_cells

    t = _shared(analysis, b)
    mix = _mixes(t.minutes, b.names)
    pairs = list(zip(b.seasons[:-1], b.seasons[1:]))
    movement = {pair: t.movement(*pair, b) for pair in pairs}
    rosters = _rosters(t, b)
    stints = analysis.stints
    trades = {}
    if len(stints):
        for row, a, z in zip(move_cells(stints, b), stints["team_from"].astype(str).tolist(),
                             stints["team_to"].astype(str).tolist()):
            for team in dict.fromkeys((a, z)):
                trades.setdefault(team, []).append(row)
    changed = {}
    ordered = t.changed.sort_values("season_to", ascending=False, kind="stable") if len(t.changed) else t.changed
    if len(ordered):
        for row, a, z in zip(move_cells(ordered, b), ordered["team_from"].astype(str).tolist(),
                             ordered["team_to"].astype(str).tolist()):
            for team in dict.fromkeys(f"{a}/{z}".split("/")):
                changed.setdefault(team, []).append(row)
    pages = {}
    for team, anchor in b.team_anchor.items():
        seasons = {m[0] for m in mix.get(team, [])}  # pairs where the team played in either season
        moved = [(f"{s0} → {s1}", movement[(s0, s1)].get(team)) for s0, s1 in reversed(pairs)
                 if s0 in seasons or s1 in seasons]
        pages[anchor] = _team_doc(team, mix.get(team, []), moved, rosters.get(team, {}), trades.get(team, []),
                                  changed.get(team, []))
    return pages


def _team_doc(team, mix, movement, rosters, trades, changed) -> dict:
    """One team's page document: role mix, players by season (latest open), arrivals and departures
    by season pair (latest open), mid-season trades and role changes."""
    blocks = [["h3", "Role mix by season (share of minutes)"], ["mix", mix[::-1]]]
    seasons = sorted(rosters, reverse=True)
    blocks.append(["h3", "Players by season"])
    for i, season in enumerate(seasons):
        table = [["table", "roster", rosters[season]]]
        blocks += [["h4", f"{season}: {len(rosters[season])} placed players"], *table] if i == 0 else [
            ["details", f"{season}: {len(rosters[season])} placed players", table]]
    blocks.append(["h3", "Arrivals and departures"])
    for shown, (pair, moved) in enumerate(movement):
        arrivals, departures, stayed = moved or ([], [], [])
        rows = arrivals + departures + stayed
        part = [["table", "movement", rows]] if rows else [["note", "No placed player arrived or left."]]
        title = f"{pair}: {len(arrivals)} arrived, {len(departures)} left"
        blocks += [["h4", title], *part] if shown == 0 else [["details", title, part]]
    blocks.append(["note", "#movement"])
    blocks += [["h3", "Mid-season trades: before and after"],
               ["table", "tmoves", trades] if trades else ["note", "No mid-season trade with two qualifying stints."],
               ["h3", "Players whose role changed"],
               ["table", "tmoves", changed] if changed else ["note", "No role change beyond noise among this team's players."]]
    return {"kind": "team", "title": f"Team {team}", "sub": "", "blocks": blocks}
