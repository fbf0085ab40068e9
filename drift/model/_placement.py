"""Placement: where each player-season sits relative to the reference roles."""

from __future__ import annotations

__all__ = ["place", "ID_COLUMNS"]

ID_COLUMNS = ("player_id", "player", "season", "team", "games", "minutes")


def place(model, table):
    """Place season (or stint, or partial-season) rows with a fitted model.

    Parameters
    ----------
    model : RoleModel
    table : DataFrame
        Rows with the model's feature columns and ``minutes``.

    Returns
    -------
    DataFrame, one row per input row:
        identity columns present in ``table``; ``role`` (id of the role with the
        highest membership), ``role_name``, ``role_prob`` (that membership),
        ``second_role`` (the next highest), ``margin`` (distance to the second role
        minus distance to the role; negative when a wider or larger role claims a
        point nearer another's centre), ``distance`` (to the role),
        ``out_of_reference`` (farther from every role than 99% of the pool),
        ``dist_<id>`` and ``prob_<id>`` per role, and the component scores ``pc1..pcq``.

    Notes
    -----
    Membership probabilities are the posterior of Gaussian roles (weights = pool
    shares, covariance = the true within-role spread plus this placement's own
    sampling noise at its sample size), so short seasons get wider memberships
    (:mod:`drift.model._membership`). The role is the one of highest membership, so
    the role shown never has a membership below 1/k; it is the nearest centre
    except where the memberships' covariance says otherwise.
    """
    import numpy as np
    import pandas as pd

    processed, state = model.processed(table)
    scores = model.scores_from_processed(processed)
    d = model.distances(scores)
    prob = model.memberships(scores, state)
    # highest membership first; ties (rare) go to the nearer centre
    order = np.lexsort((d.T, -prob.T), axis=0).T if d.shape[1] > 1 else np.zeros((len(d), 1), int)
    rows = np.arange(len(d))
    ids = np.asarray(model.role_ids_)
    names = dict(zip(model.role_ids_, model.role_names_))
    out = table[[c for c in ID_COLUMNS if c in table.columns]].reset_index(drop=True).copy()
    top, second = order[:, 0], order[:, 1] if d.shape[1] > 1 else order[:, 0]
    out["role"] = ids[top]
    out["role_name"] = [names[r] for r in out["role"]]
    out["role_prob"] = prob[rows, top]
    out["second_role"] = ids[second]
    out["distance"] = d[rows, top]
    out["margin"] = d[rows, second] - d[rows, top]
    # outside every role: farther from the nearest centre than 99% of the pool is from theirs
    out["out_of_reference"] = d.min(axis=1) > model.distance_q99_
    extra = {}
    for j, rid in enumerate(ids):
        extra[f"dist_{rid}"] = d[:, j]
    for j, rid in enumerate(ids):
        extra[f"prob_{rid}"] = prob[:, j]
    for j in range(scores.shape[1]):
        extra[f"pc{j + 1}"] = scores[:, j]
    return pd.concat([out, pd.DataFrame(extra)], axis=1)
