"""Player pages: one page document per placed player, built column by column.

Every placed player gets a page (see :mod:`drift.report._bundle` for the document format and how
pages travel in chunks). The work is done on whole columns (formatting, percentiles within the
role, moves) and only the final assembly loops over players, so a pool of 10^5 player-seasons
builds in seconds.
"""

from __future__ import annotations

__all__ = ["build_player_pages", "PROFILE_ROWS"]

#: Features on a player's profile: his role's most distinctive ones, then his own largest departures.
PROFILE_ROWS = (5, 3)


class _Profiles:
    """Each role's pool members, sorted per feature, for averages and percentiles within the role."""

    def __init__(self, model, values, roles, pool_mask):
        import numpy as np

        from drift.report._fmt import feature_value

        self.features = list(model.features_)
        raw_sd = model.noise_["sd"].to_numpy(float)
        self.sd = np.where(raw_sd > 0, raw_sd, 1.0)
        mean = model.noise_["mean"].to_numpy(float)
        self.sorted, self.mean, self.defining, self.avg_text = {}, {}, {}, {}
        for r, rid in enumerate(model.role_ids_):
            members = values[pool_mask & (roles == rid)]
            members = members if len(members) else values[roles == rid]
            self.sorted[rid] = np.sort(members, axis=0)
            with np.errstate(all="ignore"):
                self.mean[rid] = np.nanmean(members, axis=0) if len(members) else np.full(len(self.features), np.nan)
            diff = (np.asarray(model.centroids_features_[r]) - mean) / self.sd
            self.defining[rid] = list(np.argsort(-np.abs(diff), kind="stable")[:PROFILE_ROWS[0]])
            self.avg_text[rid] = [feature_value(f, v) for f, v in zip(self.features, self.mean[rid])]

    def table(self, rid, x):
        """Rows of the profile table for season values ``x`` (2-d: one row per player) in role ``rid``."""
        import numpy as np

        from drift.report._cells import label
        from drift.report._fmt import feature_value

        if not len(x):
            return []
        own = np.argsort(-np.abs((x - self.mean[rid]) / self.sd), axis=1, kind="stable")
        ranked = self.sorted[rid]
        n = np.sum(~np.isnan(ranked), axis=0)
        pct = np.full(x.shape, np.nan)
        for j in range(x.shape[1]):  # percentile within the role: half the ties below
            col = ranked[: n[j], j]
            if n[j]:
                lo, hi = np.searchsorted(col, x[:, j], "left"), np.searchsorted(col, x[:, j], "right")
                pct[:, j] = 100.0 * (lo + hi) / 2 / n[j]
        defining = [int(j) for j in self.defining[rid]]
        first = set(defining)
        own, pct, x = own[:, : sum(PROFILE_ROWS)].tolist(), pct.tolist(), x.tolist()
        avg, features = self.avg_text[rid], self.features
        labels = [label(f) for f in features]
        tables = []
        for i in range(len(x)):
            extra = [j for j in own[i] if j not in first][: PROFILE_ROWS[1]]
            rows = []
            for j in defining + extra:
                p = pct[i][j]
                rows.append([["b", labels[j]] if j in first else labels[j], feature_value(features[j], x[i][j]),
                             avg[j], ["bar", 0 if p != p else int(round(p)), "" if p != p else f"{p:.0f}"]])
            tables.append(rows)
        return tables


def _outlooks(outlook, model):
    """Player id -> rows of his outlook table (season, likeliest role, keeps, changes, chances, miss, seasons)."""
    from drift.report._fmt import percent, sig

    if outlook is None or not len(outlook) or "player_id" not in outlook:
        return {}
    names = dict(zip(model.role_ids_, model.role_names_))
    probs = outlook[[f"prob_{r}" for r in model.role_ids_]].to_numpy(float).tolist()
    out = {}
    for pid, season, role, stay, change, spread, seasons, p in zip(
            outlook["player_id"].tolist(), outlook["season"].astype(str).tolist(),
            outlook["projected_role"].tolist(), outlook["stay_prob"].tolist(), outlook["change_prob"].tolist(),
            outlook["position_spread"].tolist(), outlook["history_seasons"].tolist(), probs):
        top = sorted(zip(p, model.role_ids_), reverse=True)[:3]
        out.setdefault(pid, []).append([
            season, ["r", role], percent(stay, 2), percent(change, 2),
            ", ".join(f"{r} {names[r]} {100 * q:.0f}%" for q, r in top), sig(spread, 3), int(seasons)])
    return out


def _comparables(comps, b, wanted, n=5):
    """(player id, season) -> cells naming his ``n`` nearest reference player-seasons of other players."""
    if comps is None or not len(comps):
        return {}
    import pandas as pd

    keys = pd.DataFrame(list(wanted), columns=["player_id", "season"])
    top = comps[comps["rank"] <= n].merge(keys, on=["player_id", "season"], how="inner", sort=False) \
        .sort_values("rank", kind="stable")
    out = {}
    for pid, season, name, cid, cseason, cteam, crole in zip(
            top["player_id"].tolist(), top["season"].tolist(), top["comp_player"].tolist(),
            top["comp_player_id"].tolist(), top["comp_season"].tolist(), top["comp_team"].astype(str).tolist(),
            top["comp_role"].tolist()):
        part = out.setdefault((pid, season), [])
        part += ([" · "] if part else []) + [["a", str(name), b.player_anchor.get(cid, "")],
                                             ["n", f" {cseason}, {cteam} "], ["r", crole]]
    return out


def _stint_words(stints):
    """(player id, season) -> "stints: ELM R4 → BRN R5", the roles of a traded season's qualifying stints."""
    if stints is None or not len(stints):
        return {}
    chains = {}
    for pid, season, i, j, a, z, ra, rz in zip(*(stints[c].tolist() for c in (
            "player_id", "season_from", "stint_from", "stint_to", "team_from", "team_to", "role_from", "role_to"))):
        chain = chains.setdefault((pid, season), {})
        chain[int(i)] = f"{a} {ra}"
        chain[int(j)] = f"{z} {rz}"
    return {key: "stints: " + " → ".join(chain[k] for k in sorted(chain)) for key, chain in chains.items()}


def _left_out(analysis):
    """Player id -> timeline rows of his seasons the filters left out (season first, the reason in numbers)."""
    from drift.report._fmt import filter_words

    prepared = getattr(analysis, "prepared", None)
    if prepared is None or prepared.excluded is None or not len(prepared.excluded):
        return {}
    ex = prepared.excluded
    why = [filter_words({"reason_code": c, "games": g, "minutes_per_game": m}, analysis.config)
           for c, g, m in zip(ex["reason_code"].tolist(), ex["games"].tolist(), ex["minutes_per_game"].tolist())]
    out = {}
    for pid, season, team, games, minutes, words in zip(
            ex["player_id"].tolist(), ex["season"].tolist(), ex["team"].astype(str).tolist(),
            ex["games"].tolist(), ex["minutes"].tolist(), why):
        out.setdefault(pid, []).append([season, ["n", "not placed"], team, int(games), f"{minutes:,.0f}",
                                        ["n", "below the filters: " + words]])
    return out


def _moves_by_player(analysis, b):
    """Player id -> (his moves between seasons, his mid-season trades) as cell rows, and the
    (player id, season) -> [status, words] of the consecutive move into each season."""
    import pandas as pd

    from drift.report._cells import move_cells
    from drift.report._fmt import strength

    parts = [m for m in (analysis.moves, analysis.stints) if len(m)]
    if not parts:
        return {}, {}, {}
    moves = pd.concat(parts, ignore_index=True).sort_values(["season_to", "kind"], kind="stable")
    rows = move_cells(moves, b, player=False)
    seasonal, trades, into = {}, {}, {}
    for row, pid, kind, season, status, p, z in zip(rows, moves["player_id"].tolist(), moves["kind"].tolist(),
                                                     moves["season_to"].tolist(), moves["status"].tolist(),
                                                     moves["p_value"].tolist(), moves["z"].tolist()):
        (trades if kind == "stint" else seasonal).setdefault(pid, []).append(row)
        if kind == "consecutive":
            into[(pid, season)] = ["m", ["s", status], ["n", " " + strength(p, z, b.alpha)]]
    return seasonal, trades, into


def build_player_pages(analysis, b, frame) -> dict:
    """Anchor -> page document of every placed player (``frame``: the small role map's frame)."""
    import numpy as np

    from drift.report import _sketch as sketch
    from drift.report._cells import membership_texts, minutes_texts

    model, pl = analysis.model, analysis.placements.reset_index(drop=True)
    values = analysis.prepared.kept[list(model.features_)].to_numpy(float)
    roles = pl["role"].to_numpy()
    order = np.lexsort((pl["season"].astype(str).to_numpy(), pl["player_id"].astype(str).to_numpy()))
    pids = pl["player_id"].to_numpy()[order]
    starts = np.flatnonzero(np.r_[True, pids[1:] != pids[:-1]])
    ends = np.r_[starts[1:], len(order)]
    last = order[ends - 1]
    profiles = _Profiles(model, values, roles, b.pool_mask)
    profile_of = {}
    for rid in model.role_ids_:
        rows = last[roles[last] == rid]
        profile_of.update(zip(rows.tolist(), profiles.table(rid, values[rows])))
    seasonal, trades, into = _moves_by_player(analysis, b)
    outlooks = _outlooks(getattr(analysis, "outlook", None), model)
    seasons = pl["season"].astype(str).tolist()
    comps = _comparables(analysis.comparables, b, zip(pl["player_id"].to_numpy()[last].tolist(),
                                                      [seasons[i] for i in last]))
    stint_words, left_out = _stint_words(analysis.stints), _left_out(analysis)
    teams, names, ids = pl["team"].astype(str).tolist(), pl["player"].astype(str).tolist(), pl["player_id"].tolist()
    member, minutes = _memberships(pl, b), minutes_texts(pl["minutes"])
    games, outside = pl["games"].astype(int).tolist(), pl["out_of_reference"].astype(bool).tolist()
    xs, ys = frame.xy_many(pl["pc1"], pl["pc2"] if "pc2" in pl else np.zeros(len(pl)))
    roles = roles.tolist()
    pages = {}
    for s, e in zip(starts.tolist(), ends.tolist()):
        pos = order[s:e].tolist()
        i, pid = pos[-1], ids[pos[-1]]
        timeline = left_out.get(pid, []) + [
            [seasons[k], ["r", roles[k], member[k]] if not outside[k] else ["m", ["r", roles[k], member[k]],
                                                                              ["t", "", "outside every role"]],
             ["m", teams[k], ["n", " " + stint_words[(pid, seasons[k])]]] if (pid, seasons[k]) in stint_words
             else teams[k], games[k], minutes[k], into.get((pid, seasons[k]), ["n", "first placed season"])]
            for k in pos]
        timeline.sort(key=lambda row: str(row[0]))
        path = sketch.path_points([xs[k] for k in pos], [ys[k] for k in pos], [seasons[k] for k in pos],
                                  [roles[k] for k in pos], b.names)
        pages[b.player_anchor[pid]] = _player_doc(
            name=names[i], sub=f"{pid} · {teams[i]} · latest season {seasons[i]}", role=roles[i],
            member=member[i], season=seasons[i], role_name=b.names.get(roles[i], ""), timeline=timeline, path=path,
            profile=profile_of.get(i, []), moves=seasonal.get(pid, []), trades=trades.get(pid, []),
            outlook=outlooks.get(pid), comparables=comps.get((pid, seasons[i]), []))
    return pages


def _player_doc(*, name, sub, role, member, season, role_name, timeline, path, profile, moves, trades, outlook,
                comparables) -> dict:
    """One player's page document (see :mod:`drift.report._bundle`)."""
    blocks = [["p", ["Now ", ["r", role, member]]],
              ["grid", [["h3", "Role by season"], ["table", "timeline", timeline], ["note", "#timeline"]],
               [["h3", "Path on the role map"], ["map", path, f"{name}'s seasons on the role map"]]],
              ["h3", f"{season} profile against {role} {role_name}: the role's average"],
              ["table", "profile", profile], ["note", "#profile"],
              ["h3", "Moves between seasons"]]
    blocks += [["table", "pmoves", moves], ["note", "#pp"]] if moves else [
        ["note", "No other qualifying season to compare with."]]
    if trades:
        blocks += [["h3", "Mid-season trades: stint before and after"], ["table", "pmoves", trades]]
    if outlook:
        blocks += [["h3", "Outlook for next season"], ["note", "#outlook"], ["table", "poutlook", outlook]]
    blocks += [["h3", f"Plays most like ({season}, reference seasons)"],
               ["p", comparables] if comparables else ["note", "No comparable seasons."], ["note", "#caution"]]
    return {"kind": "player", "title": name, "sub": sub, "blocks": blocks}


def build_index(analysis, b) -> dict:
    """The front page's list of players (every one, or the :data:`~drift.report.context.PLAYER_LIST`
    the review needs first), the role-map symbol the pages use, and the page script's data."""
    import pandas as pd
    from markupsafe import Markup

    from drift.report import _sketch as sketch
    from drift.report._bundle import DATA_DIR, shared
    from drift.report.context import PLAYER_LIST
    from drift.report._moves import STATUS_ORDER

    model, pl = analysis.model, analysis.placements
    ordered = pl.sort_values("season", kind="stable")
    last = ordered.drop_duplicates("player_id", keep="last").set_index("player_id")
    seasons = ordered.groupby("player_id", sort=False).size()
    cons = b.consecutive
    latest = cons.sort_values("season_to", kind="stable").drop_duplicates("player_id", keep="last") \
        .set_index("player_id")["status"] if len(cons) else pd.Series(dtype=object)
    traded = set()
    for moves in (analysis.moves, analysis.stints):
        if len(moves):
            traded |= set(moves.loc[moves["traded"].astype(bool), "player_id"])
    frame = pd.DataFrame({"player": last["player"].astype(str), "season": last["season"].astype(str),
                          "team": last["team"].astype(str), "role": last["role"],
                          "status": latest.reindex(last.index).fillna("")})
    frame["seasons"] = seasons.reindex(frame.index).to_numpy()
    frame["_o"] = frame["status"].map(STATUS_ORDER).fillna(9)
    n = len(frame)
    if n > PLAYER_LIST:  # the latest season's role changes, unsettled and shifted players first
        frame = frame.sort_values(["_o", "player"], kind="stable").head(PLAYER_LIST)
    frame = frame.sort_values(["player"], kind="stable")
    index = [{"anchor": b.player_anchor[pid], "player": r.player, "season": r.season, "team": r.team,
              "role": b.role(r.role), "seasons": int(r.seasons), "status": r.status, "traded": pid in traded}
             for pid, r in zip(frame.index, frame.itertuples(index=False))]
    note = "" if n <= PLAYER_LIST else (
        f"Listing {len(index):,} of the {n:,} placed players: those whose role changed, who are unsettled or who "
        "shifted into the latest season first, then by name. Every player has a page: the search box finds "
        "each one, and every team page lists its players season by season.")
    cents = model.centroids_
    cents = [(c[0], c[1] if len(c) > 1 else 0.0) for c in cents]
    return {"player_index": index, "player_list_note": note, "players_total": n,
            "map_symbol": Markup(sketch.map_symbol(b.frame, cents, model.role_ids_, b.colours)),
            "pages_data": Markup(shared(b)), "data_dir": DATA_DIR, "ext": b.ext}


def _memberships(pl, b) -> list:
    """Each season's membership; below :data:`BETWEEN_BELOW` "between" its two likeliest roles, with both numbers."""
    from drift.report._cells import membership_texts
    from drift.report._fmt import BETWEEN_BELOW, membership_between

    texts = membership_texts(pl["role_prob"])
    if "second_role" not in pl:
        return texts
    low = (pl["role_prob"].to_numpy() < BETWEEN_BELOW).nonzero()[0]
    for i in low.tolist():
        role, second = pl["role"].iat[i], pl["second_role"].iat[i]
        second_p = pl[f"prob_{second}"].iat[i] if f"prob_{second}" in pl else None
        texts[i] = membership_between(pl["role_prob"].iat[i], b.names.get(role, role), second_p,
                                      b.names.get(second, second))
    return texts
