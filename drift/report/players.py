"""Player pages: one per paged player (see :func:`drift.report.context.paged_players`)."""

from __future__ import annotations

__all__ = ["build_players", "build_search", "PROFILE_ROWS"]

#: Features on a player's profile: his role's most distinctive ones, then his own largest departures.
PROFILE_ROWS = (5, 3)


class _Profiles:
    """Each role's pool members, sorted per feature, for averages and percentiles within the role."""

    def __init__(self, model, values, roles, pool_mask):
        import numpy as np

        self.features = list(model.features_)
        raw_sd = model.noise_["sd"].to_numpy(float)
        self.sd = np.where(raw_sd > 0, raw_sd, 1.0)
        mean = model.noise_["mean"].to_numpy(float)
        self.sorted, self.mean, self.defining = {}, {}, {}
        for r, rid in enumerate(model.role_ids_):
            members = values[pool_mask & (roles == rid)]
            members = members if len(members) else values[roles == rid]
            self.sorted[rid] = np.sort(members, axis=0)
            self.mean[rid] = np.nanmean(members, axis=0) if len(members) else np.full(len(self.features), np.nan)
            diff = (np.asarray(model.centroids_features_[r]) - mean) / self.sd
            self.defining[rid] = list(np.argsort(-np.abs(diff), kind="stable")[:PROFILE_ROWS[0]])

    def rows(self, rid, x):
        import numpy as np

        from drift.model.describe import feature_label
        from drift.report.fmt import feature_value

        own = np.argsort(-np.abs((x - self.mean[rid]) / self.sd), kind="stable")
        chosen = self.defining[rid] + [j for j in own if j not in self.defining[rid]][:PROFILE_ROWS[1]]
        ranked = self.sorted[rid]
        out = []
        for j in chosen:
            col = ranked[:, j]
            n = int(np.sum(~np.isnan(col)))
            lo, hi = np.searchsorted(col[:n], x[j], "left"), np.searchsorted(col[:n], x[j], "right")
            pct = 100.0 * (lo + hi) / 2 / n if n else float("nan")
            name = self.features[j]
            out.append({"label": feature_label(name), "value": feature_value(name, x[j]),
                        "role_avg": feature_value(name, self.mean[rid][j]),
                        "percentile": "" if pct != pct else f"{pct:.0f}", "bar": 0 if pct != pct else round(pct),
                        "defining": bool(j in self.defining[rid])})
        return out


def _outlooks(outlook, model):
    """Player id -> his outlook table: likeliest role, chance of keeping his role, the three
    likeliest roles with their chances, and the position spread (the outlook's uncertainty)."""
    from drift.report.fmt import percent, sig
    from drift.report.outlook import _probabilities

    if outlook is None or not len(outlook) or "player_id" not in outlook:
        return {}
    names = dict(zip(model.role_ids_, model.role_names_))
    columns = ["after season", "likeliest role", "keeps his role", "changes role", "chances",
               "position spread", "seasons behind it"]
    out = {}
    for r in outlook.to_dict(orient="records"):
        row = [str(r["season"]), f"{r['projected_role']} {names.get(r['projected_role'], '')}",
               percent(r["stay_prob"], 2), percent(r["change_prob"], 2),
               _probabilities(r, model.role_ids_, names), sig(r["position_spread"], 3),
               str(int(r["history_seasons"]))]
        out.setdefault(r["player_id"], {"columns": columns, "rows": []})["rows"].append(row)
    return out


def _comparables(comps, b, n=5):
    """(player id, season) -> his ``n`` nearest reference player-seasons of other players."""
    if comps is None or not len(comps):
        return {}
    out = {}
    wanted = comps[(comps["rank"] <= n) & comps["player_id"].isin(b.player_anchor)]
    for r in wanted.to_dict(orient="records"):
        out.setdefault((r["player_id"], r["season"]), []).append({
            "player": r["comp_player"], "anchor": b.player_anchor.get(r["comp_player_id"], ""),
            "season": r["comp_season"], "team": r["comp_team"],
            "role": b.role(r["comp_role"])})
    return out


def _stint_words(stints):
    """(player id, season) -> "stints: ELM R4 → BRN R5", the roles of a traded season's qualifying stints."""
    if stints is None or not len(stints):
        return {}
    chains = {}
    for r in stints.to_dict(orient="records"):
        chain = chains.setdefault((r["player_id"], r["season_from"]), {})
        chain[int(r["stint_from"])] = f"{r['team_from']} {r['role_from']}"
        chain[int(r["stint_to"])] = f"{r['team_to']} {r['role_to']}"
    return {key: "stints: " + " → ".join(chain[k] for k in sorted(chain)) for key, chain in chains.items()}


def _left_out(analysis, wanted):
    """Player id -> his seasons the filters left out: season, team, why (in numbers)."""
    from drift.report.fmt import filter_words

    prepared = getattr(analysis, "prepared", None)
    if prepared is None or prepared.excluded is None or not len(prepared.excluded):
        return {}
    ex = prepared.excluded[prepared.excluded["player_id"].isin(wanted)]
    out = {}
    for r in ex.to_dict(orient="records"):
        out.setdefault(r["player_id"], []).append({"season": r["season"], "team": str(r["team"]),
                                                   "why": filter_words(r, analysis.config)})
    return out


def _timeline(rows, into, b, stint_words=None, left_out=()):
    """His placed seasons and, in season order among them, the seasons left out with the reason."""
    from drift.report.fmt import membership_between

    stint_words = stint_words or {}
    out = [{"season": x["season"], "team": x["team"], "placed": False, "why": x["why"]} for x in left_out]
    for r in rows:
        move = into.get((r["player_id"], r["season"]))
        out.append({"season": r["season"], "team": str(r["team"]), "placed": True,
                    "role": b.role(r["role"]),
                    "membership": membership_between(r["role_prob"], b.names.get(r["role"], r["role"]),
                                                     r.get(f"prob_{r.get('second_role', '')}"),
                                                     b.names.get(r.get("second_role"), "")),
                    "second": r.get("second_role", ""),
                    "games": int(r["games"]), "minutes": f"{r['minutes']:,.0f}",
                    "outside": bool(r["out_of_reference"]),
                    "stints": stint_words.get((r["player_id"], r["season"]), ""),
                    "status": move["status"] if move else "", "words": move["words"] if move else ""})
    return sorted(out, key=lambda t: t["season"])


def build_players(analysis, b) -> dict:
    """The player pages, the players' index and the shared role-map symbol."""
    import numpy as np
    import pandas as pd
    from markupsafe import Markup

    from drift.report import sketch
    from drift.report.roles import axis_label

    model, pl = analysis.model, analysis.placements.reset_index(drop=True)
    values = analysis.prepared.kept[list(model.features_)].to_numpy(float)
    profiles = _Profiles(model, values, pl["role"].to_numpy(), b.pool_mask)
    has_pc2 = "pc2" in pl
    scores = np.column_stack([pl["pc1"], pl["pc2"] if has_pc2 else np.zeros(len(pl))])
    cents = np.asarray(model.centroids_)[:, :2] if model.centroids_.shape[1] > 1 else np.column_stack(
        [model.centroids_[:, 0], np.zeros(len(model.role_ids_))])
    frame = sketch.map_frame(scores[b.pool_mask], cents, axis_label(model, 0, n=1, short=True),
                             axis_label(model, 1, n=1, short=True) if has_pc2 else "")
    all_moves = pd.concat([m for m in (analysis.moves, analysis.stints) if len(m)], ignore_index=True)
    paged = pl[pl["player_id"].isin(b.player_anchor)]
    moves = all_moves[all_moves["player_id"].isin(b.player_anchor)] if len(all_moves) else all_moves
    rows_by, into = _group(moves, b)
    outlooks = _outlooks(getattr(analysis, "outlook", None), model)
    comps = _comparables(analysis.comparables, b)
    stint_words = _stint_words(analysis.stints)
    left_out = _left_out(analysis, set(b.player_anchor))
    cols = ["player_id", "player", "season", "team", "games", "minutes", "role", "role_prob", "out_of_reference"]
    cols += ["second_role"] if "second_role" in pl else []
    grouped = {}
    ordered = paged.sort_values(["player", "player_id", "season"], kind="stable")
    for pos, rec in zip(ordered.index, ordered[cols].to_dict(orient="records")):
        grouped.setdefault(rec["player_id"], []).append((pos, rec))
    pages, index = [], []
    for pid, items in grouped.items():
        pos = [p for p, _ in items]
        rows = [r for _, r in items]
        last = rows[-1]
        player_moves = rows_by.get(pid, [])
        role = b.role(last["role"])
        pages.append({
            "anchor": b.player_anchor[pid], "id": str(pid), "name": last["player"], "team": str(last["team"]),
            "role": role, "timeline": _timeline(rows, into, b, stint_words, left_out.get(pid, ())),
            "path": Markup(sketch.player_path(frame, [r["season"] for r in rows], scores[pos, 0], scores[pos, 1],
                                              [r["role"] for r in rows], last["player"])),
            "profile_season": last["season"], "profile": profiles.rows(last["role"], values[pos[-1]]),
            "moves": [m for m in player_moves if m["note"] != "mid-season trade"],
            "trades": [m for m in player_moves if m["note"] == "mid-season trade"],
            "comparables": comps.get((pid, last["season"]), []), "outlook": outlooks.get(pid),
        })
        # the index shows his latest move between seasons (not the requested comparison or a trade)
        seasonal = [m for m in player_moves if m["note"] not in ("requested comparison", "mid-season trade")]
        latest_move = seasonal[-1] if seasonal else None
        index.append({"anchor": b.player_anchor[pid], "player": last["player"], "season": last["season"],
                      "team": str(last["team"]), "role": role, "seasons": len(rows),
                      "status": latest_move["status"] if latest_move else "",
                      "traded": any(m["traded"] for m in player_moves)})
    return {"players": pages, "player_index": index,
            "map_symbol": Markup(sketch.map_symbol(frame, cents, model.role_ids_, b.colours))}


def _group(moves, b):
    """(player id -> his formatted moves in season order, (player id, season) -> the move into it)."""
    from drift.report.moves import move_rows

    if not len(moves):
        return {}, {}
    ordered = moves.sort_values(["season_to", "kind"], kind="stable")
    by_player, into = {}, {}
    for raw, row in zip(ordered[["player_id", "season_to", "kind"]].itertuples(index=False),
                        move_rows(ordered, b, comps=False)):
        by_player.setdefault(raw.player_id, []).append(row)
        if raw.kind == "consecutive":
            into[(raw.player_id, raw.season_to)] = row
    return by_player, into


def build_search(analysis, b) -> dict:
    """The search box's index: every paged player and every team, as JSON safe inside ``<script>``.

    Each entry is [label, anchor, kind, keys]; a term equal to a key (a team code, a player's
    name or id, lower case) is listed before the labels that merely contain it."""
    import json

    from markupsafe import Markup

    pl = analysis.placements
    last = pl[pl["player_id"].isin(b.player_anchor)].drop_duplicates("player_id", keep="last")
    # the fourth element: lower-case keys an exact search term ranks first (a team code before
    # the dozen players whose label contains it)
    items = [[f"{r.player} · {r.team}", b.player_anchor[r.player_id], "player",
              [str(r.player).lower(), str(r.player_id).lower()]]
             for r in last[["player_id", "player", "team"]].itertuples(index=False)]
    items += [[f"team {t} (team page)", anchor, "team", [str(t).lower(), f"team {t}".lower()]]
              for t, anchor in b.team_anchor.items()]
    text = json.dumps(items, ensure_ascii=False)
    # "<" is escaped so no name can close the script element; JSON reads \u003c back as "<"
    return {"search_index": Markup(text.replace("<", "\\u003c").replace(">", "\\u003e").replace("&", "\\u0026"))}
