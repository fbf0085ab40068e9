"""Combine a traded player's team rows (stints) into one season row.

Rule: games, minutes and possessions add up; every feature is the average of
the stints weighted by each stint's sample behind that feature (minutes, or
possessions where given; an efficiency by its play type's possessions, i.e.
minutes x share). This is exact for shares and points per possession when
possessions are given, and approximate for rate stats (usage, assist,
rebound percentages), whose true denominators are team events while the
player was on the floor. If the file carries a combined row (team equal to
the config's ``total_marker``) that row is used as the season and never
added to the stints, so no minutes are counted twice.
"""

from __future__ import annotations

from drift.intake.features import FeatureSpec, exposure_matrix

__all__ = ["combine_stints"]


def combine_stints(raw, spec: FeatureSpec, *, total_marker=None):
    """One row per player-season, plus the stints of traded players.

    Parameters
    ----------
    raw : DataFrame
        Rows as read by :func:`drift.intake.read_seasons`.
    spec : FeatureSpec

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

    raw = raw.copy()
    raw["_order"] = np.arange(len(raw))
    is_total = raw["team"].eq(total_marker) if total_marker else pd.Series(False, index=raw.index)
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
