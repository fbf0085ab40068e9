"""Player moves: how far a player moved between two placements, and whether it beats noise.

For a pair of placements (two seasons, or the stints either side of a trade):

* ``distance`` is the Euclidean length of the move in component space;
* its null distribution comes from the noise model (:mod:`drift.model.noise`): the
  sampling noise of both placements at their sample sizes plus the typical
  true yearly change of a returning player, carried into component space and
  calibrated on the pool's returning players. The squared Mahalanobis length
  is chi-square with q degrees of freedom under "no real change": ``p_value``
  and the equivalent one-sided normal ``z``;
* ``status``: *changed* (roles differ and the move is beyond noise, p < alpha),
  *unsettled* (roles differ within noise: a boundary player's label flip),
  *shifted* (same role, beyond noise), *steady* (same role, within noise).
  ``role_changed`` is true only for *changed*.
"""

from __future__ import annotations

__all__ = ["pair_moves", "requested_pairs", "stint_pairs",
           "MOVE_STATUSES"]

MOVE_STATUSES = ("changed", "unsettled", "shifted", "steady")


def requested_pairs(seasons, season_a: str, season_b: str):
    """Row positions of players qualifying in both requested seasons."""

    s = seasons.reset_index(drop=True)
    a = s.loc[s["season"] == season_a, ["player_id"]].reset_index(names="i")
    b = s.loc[s["season"] == season_b, ["player_id"]].reset_index(names="j")
    both = a.merge(b, on="player_id")
    return both["i"].to_numpy(int), both["j"].to_numpy(int)


def stint_pairs(stints):
    """Row positions of each traded player's stint n and stint n + 1 in one season."""
    import numpy as np

    s = stints.reset_index(drop=True)
    order = np.lexsort((s["stint"].to_numpy(), s["season"].to_numpy(), s["player_id"].to_numpy()))
    key = (s["player_id"] + "\x00" + s["season"]).to_numpy()[order]
    same = key[1:] == key[:-1]
    return order[:-1][same], order[1:][same]


def pair_moves(model, table, placements, first, second, *, alpha, n_drivers=3, kind="consecutive",
               processed=None):
    """Moves between rows ``first[i]`` and ``second[i]`` of ``table``.

    Parameters
    ----------
    model : RoleModel
    table : DataFrame
        The placed rows (season rows or stints) with features.
    placements : DataFrame
        ``model.place(table)``, same row order.
    first, second : int arrays of length m
    alpha : float
        Level for "beyond noise".
    n_drivers : int
        Features reported as driving each move.
    kind : str
        Written to the ``kind`` column.
    processed : tuple, optional
        ``model.processed(table)`` when the caller already has it (saves redoing it).

    Returns
    -------
    DataFrame, one row per pair (columns in docs/outputs.md, "moves.csv").
    """
    import numpy as np
    from scipy.stats import chi2, norm

    from drift.model.movenoise import null_in_blocks

    table = table.reset_index(drop=True)
    processed, noise_var = processed if processed is not None else model.processed(table)
    scores = model.scores_from_processed(processed)
    q = scores.shape[1]
    delta = scores[second] - scores[first]
    distance = np.sqrt((delta ** 2).sum(axis=1))
    d2, noise_distance = null_in_blocks(model.move_null, noise_var.take(first), noise_var.take(second), delta)
    p = chi2.sf(d2, q)
    # a move of exactly zero has p = 1: keep z finite (about -8.3) rather than minus infinity
    z = norm.isf(np.clip(p, 1e-300, 1 - 1e-16))
    pl = placements.reset_index(drop=True)
    out = _pair_identity(table, first, second, kind)
    out["minutes_from"] = table["minutes"].to_numpy()[first]
    out["minutes_to"] = table["minutes"].to_numpy()[second]
    role_from = pl["role"].to_numpy()[first]
    role_to = pl["role"].to_numpy()[second]
    out["role_from"], out["role_to"] = role_from, role_to
    out["prob_from"] = pl["role_prob"].to_numpy()[first]
    out["prob_to"] = pl["role_prob"].to_numpy()[second]
    prob = pl[[f"prob_{r}" for r in model.role_ids_]].to_numpy()
    role_col = {r: j for j, r in enumerate(model.role_ids_)}
    from_col = np.array([role_col[r] for r in role_from], int)
    out["prob_to_of_role_from"] = prob[second, from_col] if len(first) else []
    out["distance"] = distance
    out["noise_distance"] = noise_distance
    out["z"] = z
    out["p_value"] = p
    out["beyond_noise"] = p < alpha
    group = out["season_from"].astype(str) + "|" + out["season_to"].astype(str)
    out["percentile"] = out.groupby(group)["distance"].rank(pct=True) * 100
    differs = role_from != role_to
    out["status"] = np.select(
        [differs & out["beyond_noise"], differs, out["beyond_noise"]],
        list(MOVE_STATUSES[:3]), default=MOVE_STATUSES[3])
    out["role_changed"] = out["status"] == "changed"
    _add_drivers(out, model, processed, delta, distance, first, second, n_drivers)
    for j in range(q):
        out[f"move_pc{j + 1}"] = delta[:, j]
    return out


def _pair_identity(table, first, second, kind):
    """Who moved, between which seasons and teams, and whether a trade lies between."""
    import pandas as pd

    out = pd.DataFrame({
        "kind": kind,
        "player_id": table["player_id"].to_numpy()[first],
        "player": table["player"].to_numpy()[first],
        "season_from": table["season"].to_numpy()[first],
        "season_to": table["season"].to_numpy()[second],
    })
    if "stint" in table.columns:
        out["stint_from"] = table["stint"].to_numpy()[first].astype(int)
        out["stint_to"] = table["stint"].to_numpy()[second].astype(int)
        out["team_from"] = table["team"].to_numpy()[first]
        out["team_to"] = table["team"].to_numpy()[second]
        out["traded"] = True
    else:
        last = table.get("team_last", table["team"]).to_numpy()
        first_team = table.get("team_first", table["team"]).to_numpy()
        n_stints = table.get("n_stints", pd.Series(1, index=table.index)).to_numpy()
        out["team_from"] = table["team"].to_numpy()[first]
        out["team_to"] = table["team"].to_numpy()[second]
        out["traded"] = (last[first] != first_team[second]) | (n_stints[first] > 1) | (n_stints[second] > 1)
    return out


def _add_drivers(out, model, processed, delta, distance, first, second, n_drivers):
    """Add the ``n_drivers`` features that carry most of each move, in units and pool SDs."""
    import numpy as np

    from drift.intake.features import safe_scale

    # drivers: each feature's share of the distance, i.e. its contribution to the move
    # projected on the move's direction (the contributions add up to the distance)
    change = processed[second] - processed[first]
    with np.errstate(invalid="ignore", divide="ignore"):
        direction = np.where(distance[:, None] > 0, delta / distance[:, None], 0.0)
    contribution = (direction @ model.loadings()) * change  # (m, p)
    change_sd = change / safe_scale(model.noise_["sd"].to_numpy(float))
    rank = np.argsort(-contribution, axis=1, kind="stable")[:, :n_drivers]
    feats = np.asarray(model.features_)
    rows = np.arange(len(first))
    for n in range(min(n_drivers, len(feats))):
        col = rank[:, n] if len(first) else np.zeros(0, int)
        out[f"driver_{n + 1}"] = feats[col]
        out[f"driver_{n + 1}_change"] = change[rows, col]
        out[f"driver_{n + 1}_change_sd"] = change_sd[rows, col]
        out[f"driver_{n + 1}_share"] = contribution[rows, col] / np.where(distance > 0, distance, 1.0)
