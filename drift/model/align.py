"""Alignment: keep role identities stable across refits with Hungarian matching.

Two models' component spaces differ, so roles are compared by their centroids
in feature units, standardised with the *previous* model's scaler (the space
the analyst already knows), over the features both models share. The cost of
a pair is the root-mean-square difference in those standard deviations.
``scipy.optimize.linear_sum_assignment`` finds the matching of least total
cost; a matched pair costing more than the threshold is not called the same
role. The default threshold is half the median distance from each previous
role to its nearest other previous role: a new centroid that close to an old
one is nearer to it than to any neighbour.
"""

from __future__ import annotations

from dataclasses import dataclass

from drift.errors import ModelFileError

__all__ = ["align_models", "Alignment", "relabel"]


@dataclass(frozen=True)
class Alignment:
    """``table``: previous_id, new_id, cost, status (kept/new/retired); ``ids``: new role -> carried id."""

    table: object
    ids: dict
    threshold: float


def _standardised(model, features):
    import numpy as np

    idx = [model.features_.index(f) for f in features]
    return np.asarray(model.centroids_features_)[:, idx]


def align_models(previous, new, *, threshold=None) -> Alignment:
    """Match the roles of ``new`` to those of ``previous``.

    Parameters
    ----------
    previous, new : RoleModel
        Fitted models; they may have different numbers of roles.
    threshold : float, optional
        Largest cost (RMS standard deviations) for a match to count.

    Returns
    -------
    Alignment
    """
    import numpy as np
    import pandas as pd
    from scipy.optimize import linear_sum_assignment
    from scipy.spatial.distance import cdist

    from drift.constants import role_id, role_number

    shared = [f for f in previous.features_ if f in new.features_]
    if not shared:
        raise ModelFileError("the two models share no features; they cannot be aligned")
    idx = [previous.features_.index(f) for f in shared]
    mean, scale = previous.scaler_mean_[idx], previous.scaler_scale_[idx]
    a = (_standardised(previous, shared) - mean) / scale
    b = (_standardised(new, shared) - mean) / scale
    cost = cdist(a, b) / np.sqrt(len(shared))
    if threshold is None:
        own = cdist(a, a) / np.sqrt(len(shared))
        np.fill_diagonal(own, np.inf)
        threshold = 0.5 * float(np.median(own.min(axis=1))) if len(a) > 1 else np.inf
    rows, cols = linear_sum_assignment(cost)
    records, ids = [], {}
    matched_prev, matched_new = set(), set()
    for r, c in zip(rows, cols):
        if cost[r, c] <= threshold:
            records.append({"previous_id": previous.role_ids_[r], "new_id": new.role_ids_[c],
                            "cost": float(cost[r, c]), "status": "kept"})
            ids[new.role_ids_[c]] = previous.role_ids_[r]
            matched_prev.add(r)
            matched_new.add(c)
    used = {role_number(i) for i in previous.role_ids_} - {None}
    next_num = max(used, default=0) + 1
    for c, rid in enumerate(new.role_ids_):
        if c not in matched_new:
            carried = role_id(next_num - 1)
            next_num += 1
            ids[rid] = carried
            nearest = int(np.argmin(cost[:, c]))
            records.append({"previous_id": "", "new_id": rid, "cost": float(cost[nearest, c]),
                            "status": "new"})
    for r, rid in enumerate(previous.role_ids_):
        if r not in matched_prev:
            records.append({"previous_id": rid, "new_id": "", "cost": float(cost[r].min()),
                            "status": "retired"})
    table = pd.DataFrame(records, columns=["previous_id", "new_id", "cost", "status"])
    table["carried_id"] = table["new_id"].map(ids).fillna("")
    return Alignment(table=table, ids=ids, threshold=float(threshold))


def relabel(new, previous, alignment: Alignment, *, keep_names=None):
    """Give ``new`` the previous model's ids, names and descriptions where roles were kept.

    ``keep_names`` (role id -> name from the user's config) wins over carried names.
    Returns a relabelled copy; ``new`` itself is left as it was fitted.
    """
    import copy

    prev_name = dict(zip(previous.role_ids_, previous.role_names_))
    prev_desc = dict(zip(previous.role_ids_, previous.role_descriptions_))
    kept = set(alignment.table.loc[alignment.table["status"] == "kept", "new_id"])
    ids = [alignment.ids[r] for r in new.role_ids_]
    names, descs = [], []
    for old, carried, name, desc in zip(new.role_ids_, ids, new.role_names_, new.role_descriptions_):
        names.append(prev_name[carried] if old in kept else name)
        descs.append(prev_desc[carried] if old in kept else desc)
    given = keep_names or {}
    out = copy.copy(new)  # learned arrays are shared, never written to; the lists are new
    out.role_ids_ = ids
    out.role_names_ = [given.get(i, n) for i, n in zip(ids, names)]
    out.role_descriptions_ = descs
    return out
