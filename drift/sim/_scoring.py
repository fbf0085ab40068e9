"""Scoring a run against a simulated league's truth (re-exported by :mod:`drift.sim.family`)."""

from __future__ import annotations

__all__ = ["season_truth", "recovery"]


def season_truth(league):
    """One truth row per player-season (stints combined; roles never change mid-season here).

    Returns
    -------
    DataFrame: player_id, season, true_role, changed, blend_role, blend_weight
    """
    t = league.truth
    return (t.sort_values(["player_id", "season", "stint"], kind="stable")
            .drop_duplicates(["player_id", "season"])
            [["player_id", "season", "true_role", "changed", "blend_role", "blend_weight"]]
            .reset_index(drop=True))


def recovery(placements, moves, truth) -> dict:
    """How well a run recovered a simulated league's truth.

    Parameters
    ----------
    placements : DataFrame
        ``player_id``, ``season``, ``role`` (one row per player-season).
    moves : DataFrame
        Moves with ``kind``, ``player_id``, ``season_from``, ``season_to``,
        ``role_changed``, ``p_value``; only ``kind == "consecutive"`` is scored.
    truth : DataFrame
        :func:`season_truth` (``player_id``, ``season``, ``true_role``).

    Returns
    -------
    dict
        ``n_roles`` (found), ``true_roles``, ``ari`` (adjusted Rand index of roles),
        ``precision``, ``recall``, ``f1`` of ``role_changed`` against a real change of
        true role (NaN when undefined, and all three NaN without any real change), ``n_changes``, ``n_pairs``, ``false_flag``
        (share of pairs without a real change flagged as changed), and
        ``beyond_<alpha>`` (share of no-change pairs with p < alpha, alpha 0.01, 0.05).
    """
    import numpy as np
    from sklearn.metrics import adjusted_rand_score

    t = truth[["player_id", "season", "true_role"]]
    placed = placements[["player_id", "season", "role"]].merge(t, on=["player_id", "season"])
    m = moves[moves["kind"] == "consecutive"]
    m = m.merge(t.rename(columns={"season": "season_from", "true_role": "a"}), on=["player_id", "season_from"])
    m = m.merge(t.rename(columns={"season": "season_to", "true_role": "b"}), on=["player_id", "season_to"])
    real = (m["a"] != m["b"]).to_numpy()
    flag = m["role_changed"].to_numpy(bool)
    tp = int((real & flag).sum())
    # no real change: nothing to find, so no precision/recall/F1 (false_flag says how clean it was)
    precision = tp / flag.sum() if flag.sum() and real.any() else np.nan
    recall = tp / real.sum() if real.sum() else np.nan
    f1 = (2 * tp / (flag.sum() + real.sum())) if real.any() else np.nan
    out = {
        "n_roles": int(placed["role"].nunique()), "true_roles": int(t["true_role"].nunique()),
        "ari": float(adjusted_rand_score(placed["true_role"], placed["role"])),
        "precision": float(precision), "recall": float(recall), "f1": float(f1),
        "n_changes": int(real.sum()), "n_pairs": int(len(m)),
        "false_flag": float(flag[~real].mean()) if (~real).any() else np.nan,
    }
    for alpha in (0.01, 0.05):
        out[f"beyond_{alpha:g}"] = float((m["p_value"].to_numpy()[~real] < alpha).mean()) if (~real).any() else np.nan
    return out
