"""Sections "Roles" and "How the roles were chosen": role cards, role map, count diagnostics."""

from __future__ import annotations

__all__ = ["build_roles", "build_choice", "axis_label"]

_COMPONENT_RULES = {
    "parallel": "Horn's parallel analysis: components whose eigenvalue beats the 95th "
                "percentile of random data of the same shape",
    "elbow": "the elbow of the cumulative explained-variance curve",
}


def axis_label(model, i, n=2, short=False) -> str:
    """Name component ``i`` by the features that load on it: "post-up share ← → spot-up share"."""
    import numpy as np

    from drift.model.describe import feature_label

    if model.components_.shape[0] <= i:
        return ""
    load = np.asarray(model.components_[i], float)
    order = np.argsort(load, kind="stable")
    low = [feature_label(model.features_[j]) for j in order[:n] if load[j] < 0]
    high = [feature_label(model.features_[j]) for j in order[::-1][:n] if load[j] > 0]
    if short:
        return f"← {', '.join(low) or '—'} · {', '.join(high) or '—'} →"
    return f"component {i + 1}: more {', '.join(low) or '—'} ← → more {', '.join(high) or '—'}"


def build_roles(analysis, b) -> dict:
    """Role cards (centre against the pool on the six most distinctive features) and the role map."""
    import numpy as np
    from markupsafe import Markup

    from drift.model.count_rules import STABLE_JACCARD
    from drift.model.describe import feature_label
    from drift.report import _charts as charts
    from drift.report._fmt import feature_value

    model = analysis.model
    mean = model.noise_["mean"].to_numpy(float)
    roles = []
    for r, rid in enumerate(model.role_ids_):
        cent = np.asarray(model.centroids_features_[r])
        diff = model.in_pool_sd(cent)
        top = np.argsort(-np.abs(diff), kind="stable")[:6]
        roles.append({
            "id": rid, "name": model.role_names_[r], "description": model.role_descriptions_[r],
            "size": int(model.role_sizes_[r]), "stability": float(model.role_stability_[r]),
            "unstable": bool(model.role_stability_[r] < STABLE_JACCARD), "colour": b.colours[rid], "css": b.role(rid)["css"],
            "features": [{"label": feature_label(model.features_[j]),
                          "value": feature_value(model.features_[j], cent[j]),
                          "pool": feature_value(model.features_[j], mean[j]), "sd_diff": f"{diff[j]:+.1f}"}
                         for j in top],
        })
    labels = (axis_label(model, 0), axis_label(model, 1))
    return {"roles": roles,
            "role_map": Markup(charts.role_map_chart(analysis.placements[b.pool_mask], model, labels=labels))}


def _component_rule(model) -> str:
    import numpy as np

    q = model.components_.shape[0]
    rule = model.components
    if isinstance(rule, str):
        text = _COMPONENT_RULES.get(rule) or f"the fewest components reaching {model.variance_threshold:.0%} of variance"
    elif isinstance(rule, float):
        text = f"the fewest components reaching {rule:.0%} of variance"
    else:
        text = f"a fixed count ({rule})"
    return (f"{q} components kept by {text}; together they hold "
            f"{float(np.sum(model.explained_variance_ratio_)):.0%} of the variance.")


def _role_rule(model) -> str:
    from drift.model.count_rules import STABLE_JACCARD

    rd = model.role_diagnostics_
    k = len(model.role_ids_)
    if model.roles != "auto":
        return f"{k} roles, fixed by the settings."
    picks = {c: int(rd.loc[rd[f"pick_{c}"], "k"].iloc[0]) for c in
             ("silhouette", "calinski_harabasz", "gap") if f"pick_{c}" in rd and rd[f"pick_{c}"].any()}
    weak = int((~rd["stable"]).sum()) if "stable" in rd else 0
    return (f"{k} roles by the gap statistic's one-standard-error rule, the median over three sets of "
            f"reference draws (up to {model.max_roles} roles tried). Silhouette would pick "
            f"{picks.get('silhouette')} and Calinski-Harabasz {picks.get('calinski_harabasz')}; they are "
            "shown, not used, because on blended roles they favour the coarse guards/wings/bigs split. "
            f"Bootstrap stability (Jaccard >= {STABLE_JACCARD} for every role) is a warning, not a veto"
            + (f"; {weak} of the counts tried have a role below it." if weak else "."))


def _role_rule_plain(model) -> str:
    k = len(model.role_ids_)
    if model.roles != "auto":
        return f"{k} roles, a number fixed by the settings."
    return (f"{k} roles: the number past which splitting the reference players further stops giving groups "
            f"clearly tighter than random data of the same spread would (up to {model.max_roles} tried).")


def _self_check(analysis) -> str:
    check = getattr(analysis, "self_check", None)
    if check is None:
        return ""
    return (f"{check.sentence} Simulated from this model: its roles, the spread within each, each "
            f"feature's noise at your players' real minutes, and a yearly role-change rate of "
            f"{check.change_rate:.0%}; the whole pipeline reran on each (self_check.csv).")


def build_choice(analysis, b) -> dict:
    """How the component and role counts were chosen, with their charts and tables."""
    from markupsafe import Markup

    from drift.report import _charts as charts

    model = analysis.model
    comp, rd = model.component_diagnostics_, model.role_diagnostics_
    q = model.components_.shape[0]
    alignment = analysis.alignment
    return {
        "component_rule": _component_rule(model), "role_rule": _role_rule(model),
        "role_rule_plain": _role_rule_plain(model),
        "components_chart": Markup(charts.components_chart(comp)),
        "roles_chart": Markup(charts.roles_chart(rd)) if len(rd) > 1 else Markup(""),
        "components_table": comp.head(max(q + 3, 8)).to_dict(orient="records"),
        "roles_table": rd.to_dict(orient="records"),
        "alignment": alignment.table.to_dict(orient="records") if alignment is not None else None,
        "self_check": _self_check(analysis),
    }
