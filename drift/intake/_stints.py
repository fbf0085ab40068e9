"""Combine a traded player's team rows (stints) into one season row.

Rule: games, minutes and possessions add up; every feature is the average of
the stints weighted by each stint's sample behind that feature (minutes, or
possessions where given; an efficiency by its play type's possessions, i.e.
minutes x share). This is exact for shares and points per possession when
possessions are given, and approximate for rate stats (usage, assist,
rebound percentages), whose true denominators are team events while the
player was on the floor.

**Combined rows.** Many exports add a traded player's season total as one more row
(team ``TOT``, ``2TM``, ``3TM``, or the last team). Such a row is used as the season
and never added to the stints, so no minutes are counted twice. It is found from the
data (:func:`find_combined`), not only from its marker:

* ``marker``: its team is the config's ``total_marker`` (``TOT`` by default);
* ``sum``: its games equal the sum of the player's other rows that season (two or more),
  and its minutes and possessions do too within rounding (1, 2 %, or one per game,
  whichever is largest: per-game exports round, to whole minutes at worst);
* ``label``: its team is no team of its own (carried by two or more players, and at
  most one in five of its rows is a player's only row that season) and each of its
  rows holds at least the games, and nine tenths of the minutes, of the player's
  other rows put together (a stint left out of the export only adds to it).
"""

from __future__ import annotations

from drift.intake.features import FeatureSpec, exposure_matrix

__all__ = ["combine_stints", "find_combined", "describe_combined", "COMBINED_FIELDS"]


#: columns of :func:`find_combined`'s table
COMBINED_FIELDS = ("player_id", "season", "team", "source_file", "source_row", "how")
_HOW = {"marker": "by the team marker", "sum": "as the sum of the player's other rows",
        "label": "by a team that is no team of its own"}


def _near(value, target, games):
    import numpy as np

    tol = np.maximum.reduce([np.ones_like(target), 0.02 * np.abs(target), games])
    return np.abs(value - target) <= tol


def _by_label(rest, n_rest, other_games, other_minutes):
    """Rows whose team is no team of its own and that hold their player's other rows' games and minutes."""

    lone = n_rest == 1
    stats = rest.assign(_lone=lone, _multi=~lone).groupby("team")[["_lone", "_multi"]].sum()
    size = stats["_lone"] + stats["_multi"]
    pseudo = stats.index[(stats["_multi"] >= 2) & (stats["_lone"] <= 0.2 * size)]
    holds = ~lone & (rest["games"] >= other_games) & (rest["minutes"] >= 0.9 * other_minutes)
    carried = rest["team"].isin(pseudo) & ~lone
    # a label is pseudo only when every row of it with other rows holds them
    failing = set(rest.loc[carried & ~holds, "team"])
    return carried & holds & ~rest["team"].isin(failing)


def find_combined(raw, *, total_marker=None):
    """The rows that are a traded player's season total, and how each was found (module docstring).

    Returns
    -------
    DataFrame
        One row per combined row, indexed like ``raw``, with :data:`COMBINED_FIELDS`.
    """
    import numpy as np
    import pandas as pd

    how = pd.Series("", index=raw.index, dtype=object)
    if total_marker:
        how[raw["team"].eq(total_marker)] = "marker"
    key = [raw["player_id"], raw["season"]]
    has_marker = how.eq("marker").groupby(key).transform("any")
    rest = raw[~has_marker]
    rkey = [rest["player_id"], rest["season"]]
    n_rest = rest.groupby(rkey)["team"].transform("size")
    sums = ["games", "minutes"] + (["possessions"] if "possessions" in rest.columns else [])
    others = rest.groupby(rkey)[sums].transform("sum") - rest[sums]
    games = rest["games"].to_numpy(float)
    by_sum = (n_rest >= 3) & (games > 0) & (rest["games"] == others["games"])
    for column in sums[1:]:
        value, target = rest[column].to_numpy(float), others[column].to_numpy(float)
        unknown = ~np.isfinite(value) | ~np.isfinite(target)
        by_sum &= unknown | _near(value, target, games)
    # one combined row per player-season: the one with the most minutes if several fit
    by_sum &= rest["minutes"].where(by_sum).groupby(rkey).transform("max").eq(rest["minutes"])
    by_sum &= ~by_sum.groupby(rkey).cumsum().gt(1)
    how[by_sum[by_sum].index] = "sum"
    label = _by_label(rest, n_rest, others["games"], others["minutes"]) & ~by_sum
    label &= ~label.groupby(rkey).cumsum().gt(1)
    how[label[label].index] = "label"
    found = raw.loc[how.ne(""), ["player_id", "season", "team", "source_file", "source_row"]].copy()
    found["how"] = how[how.ne("")]
    return found


def describe_combined(found, total_marker=None) -> str:
    """One sentence on the combined rows found (``""`` when none), for ``drift check`` and the report."""
    if found is None or not len(found):
        return ""
    parts = []
    for how in ("marker", "sum", "label"):
        rows = found[found["how"] == how]
        if len(rows):
            teams = ", ".join(repr(t) for t in dict.fromkeys(rows["team"]))
            what = f"{_HOW[how]} {total_marker!r}" if how == "marker" else f"{_HOW[how]} (team {teams})" \
                if how == "label" else _HOW[how]
            parts.append(f"{len(rows)} {what}")
    return (f"{len(found)} combined row(s) (a traded player's season total) found and used as the season, their "
            f"stints not added again: {'; '.join(parts)}")


def combine_stints(raw, spec: FeatureSpec, *, total_marker=None, combined=None):
    """One row per player-season, plus the stints of traded players.

    Parameters
    ----------
    raw : DataFrame
        Rows as read by :func:`drift.intake.read_seasons`.
    spec : FeatureSpec
    total_marker : str, optional
        The team value of a combined row (the config's ``total_marker``).
    combined : DataFrame, optional
        :func:`find_combined`'s table, when the caller already has it.

    Returns
    -------
    seasons : DataFrame
        One row per (player_id, season); ``team`` joins the stints' teams with
        "/" in stint order, ``team_first``/``team_last`` name the ends and
        ``n_stints`` counts them.
    stints : DataFrame
        The rows of players with two or more teams in a season, with
        ``stint`` numbered from 1 in order (the ``stint`` column if given,
        else the row order of the files).
    """
    import numpy as np
    import pandas as pd

    if combined is None:
        combined = find_combined(raw, total_marker=total_marker)
    is_total = pd.Series(raw.index.isin(combined.index), index=raw.index)
    raw = raw.copy()
    raw["_order"] = np.arange(len(raw))
    parts = raw[~is_total]
    totals = raw[is_total].set_index(["player_id", "season"])
    sort_cols = ["player_id", "season"] + (["stint"] if "stint" in parts.columns else []) + ["_order"]
    parts = parts.sort_values(sort_cols, kind="stable")
    counts = parts.groupby(["player_id", "season"], sort=False)["team"].transform("size")
    multi = parts[counts > 1].copy()
    multi["stint"] = multi.groupby(["player_id", "season"], sort=False).cumcount() + 1
    feats = list(spec.names)
    sums = ["games", "minutes"] + (["possessions"] if "possessions" in raw.columns else [])

    weights = exposure_matrix(multi, spec)
    values = multi[feats].to_numpy(float)
    wv = pd.DataFrame(np.nan_to_num(values) * weights, columns=feats, index=multi.index)
    w = pd.DataFrame(weights, columns=feats, index=multi.index)
    key = [multi["player_id"], multi["season"]]
    num, den = wv.groupby(key, sort=False).sum(), w.groupby(key, sort=False).sum()
    combined = num / den.where(den > 0)
    grouped = multi.groupby(["player_id", "season"], sort=False)
    combined[sums] = grouped[sums].sum()
    combined["player"] = grouped["player"].first()
    combined["team"] = grouped["team"].agg("/".join)
    combined["team_first"] = grouped["team"].first()
    combined["team_last"] = grouped["team"].last()
    combined["n_stints"] = grouped.size()
    combined["source_file"] = grouped["source_file"].first()
    combined["source_row"] = grouped["source_row"].first()
    # shares of a combined row are rebuilt from combined possessions, so unused play types stay 0
    for name, fam in zip(spec.names, spec.families):
        if fam == "share":
            combined[name] = combined[name].fillna(0.0)

    with_total = combined.index.intersection(totals.index)
    if len(with_total):
        keep_cols = [c for c in totals.columns if c in combined.columns and c not in
                     ("team", "team_first", "team_last", "n_stints")]
        combined.loc[with_total, keep_cols] = totals.loc[with_total, keep_cols].to_numpy()
    single = parts[counts == 1].set_index(["player_id", "season"])
    single = single[~single.index.isin(totals.index)]  # a total row outranks a lone part of it
    single = single.assign(team_first=single["team"], team_last=single["team"], n_stints=1)
    # a total row without two stints in the file is the season row itself
    orphan_totals = totals.index.difference(combined.index)
    orphans = totals.loc[orphan_totals].assign(team_first=lambda d: d["team"],
                                               team_last=lambda d: d["team"], n_stints=1)
    seasons = pd.concat([single, combined, orphans])
    seasons = seasons.drop(columns=[c for c in ("_order", "stint") if c in seasons.columns])
    seasons = seasons.reset_index().sort_values(["season", "player_id"], kind="stable")
    multi = multi.drop(columns="_order").reset_index(drop=True)
    return seasons.reset_index(drop=True), multi
