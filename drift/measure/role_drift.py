"""Role-definition drift: how each reference role's centre moves season by season.

Each season is clustered on its own (K-means in the reference component space,
as many groups as the model has roles), its groups are matched to the
reference roles by the Hungarian algorithm on centroids in feature units
scaled by the reference model's scaler, and each matched group's centroid is
reported in feature units beside the reference centroid.

Each season centre carries its noise band: the standard error of a mean of that
group (the group's spread / sqrt(size)). A change is *beyond noise* when it exceeds
:data:`BAND_Z` standard errors; the threshold is two-sided 1% with a Bonferroni correction over
the features of a role-season, since every feature of every role is looked at; and it is at
least :data:`MIN_CHANGE_SD` pool SDs, so a wiggle too small to matter (or a rounding error on a
feature with no spread) is never called a trend.
"""

from __future__ import annotations

__all__ = ["role_drift", "drift_headlines", "band_z", "MIN_CHANGE_SD"]

#: Smallest change of a role centre, in pool SDs, worth calling drift (common practice, no source).
MIN_CHANGE_SD = 0.1


def band_z(n_features, alpha=0.01):
    """The z a change must pass: two-sided ``alpha`` with a Bonferroni correction over the features."""
    from scipy.stats import norm

    return float(norm.isf(alpha / 2 / max(n_features, 1)))


def role_drift(model, seasons, *, seed, min_rows_per_role=3):
    """Season-by-season centroids of every role, in feature units.

    Parameters
    ----------
    model : RoleModel
    seasons : DataFrame
        Qualifying season rows with features and ``season``.

    Returns
    -------
    DataFrame (long): season, role, role_name, n_players, match_cost, feature,
    value, reference_value, change (value - reference_value), change_sd (in the pool's
    observed SDs of the feature),
    change_from_first (value minus the role's value in the first season listed),
    change_se (standard error of the season centre, feature units), beyond_noise
    (``|change| > band_z(n_features) * change_se``).
    """
    import numpy as np
    import pandas as pd
    from scipy.optimize import linear_sum_assignment
    from scipy.spatial.distance import cdist

    from drift.constants import KMEANS_RESTARTS
    from drift.intake.features import safe_scale
    from drift.model.counting import fit_kmeans  # restarts on a bounded sample for a very large season

    seasons = seasons.reset_index(drop=True)
    processed, _ = model.processed(seasons)
    scores = model.scores_from_processed(processed)
    k = len(model.role_ids_)
    ref = (np.asarray(model.centroids_features_) - model.scaler_mean_) / model.scaler_scale_
    records = []
    for season in sorted(seasons["season"].unique()):
        sel = (seasons["season"] == season).to_numpy()
        if sel.sum() < k * min_rows_per_role:
            continue
        km = fit_kmeans(scores[sel], k, seed=seed, n_init=KMEANS_RESTARTS)
        groups = [processed[sel][km.labels_ == g] for g in range(k)]
        cent = np.vstack([g.mean(axis=0) for g in groups])
        # the season centre's own sampling noise: a mean of n players
        se = np.vstack([g.std(axis=0, ddof=1) / np.sqrt(len(g)) if len(g) > 1 else np.full(g.shape[1], np.nan)
                        for g in groups])
        cost = cdist(ref, (cent - model.scaler_mean_) / model.scaler_scale_) / np.sqrt(ref.shape[1])
        rows, cols = linear_sum_assignment(cost)
        sizes = np.bincount(km.labels_, minlength=k)
        for r, c in zip(rows, cols):
            for j, feat in enumerate(model.features_):
                records.append({
                    "season": season, "role": model.role_ids_[r], "role_name": model.role_names_[r],
                    "n_players": int(sizes[c]), "match_cost": float(cost[r, c]), "feature": feat,
                    "value": float(cent[c, j]), "reference_value": float(model.centroids_features_[r][j]),
                    "change_se": float(se[c, j]),
                })
    out = pd.DataFrame(records, columns=["season", "role", "role_name", "n_players", "match_cost",
                                         "feature", "value", "reference_value", "change_se"])
    out["change"] = out["value"] - out["reference_value"]
    sd = pd.Series(safe_scale(model.noise_["sd"].to_numpy(float)), index=model.noise_.index)
    out["change_sd"] = out["change"] / out["feature"].map(sd)
    first = out.groupby(["role", "feature"])["value"].transform("first")
    out["change_from_first"] = out["value"] - first
    se = out.pop("change_se")
    out["change_se"] = se
    out["beyond_noise"] = ((out["change"].abs() > band_z(len(model.features_)) * se)
                           & (out["change_sd"].abs() >= MIN_CHANGE_SD)).fillna(False).astype(bool)
    return out


def drift_headlines(drift, *, n_per_role=1):
    """Per role, the largest change from the first season to the last that is beyond noise, in words.

    Roles whose centre moved no more than its noise band get no headline.

    Returns
    -------
    DataFrame: role, role_name, feature, season_first, season_last, change, change_sd, text.
    """
    import numpy as np
    import pandas as pd

    from drift.model.describe import feature_label

    columns = ["role", "role_name", "feature", "season_first", "season_last", "change", "change_sd", "text"]
    if drift.empty:
        return pd.DataFrame(columns=columns)
    seasons = sorted(drift["season"].unique())
    first, last = seasons[0], seasons[-1]
    a = drift[drift["season"] == first].set_index(["role", "feature"])
    b = drift[drift["season"] == last].set_index(["role", "feature"])
    both = a[["value", "change_sd", "change_se"]].merge(
        b[["value", "change_sd", "change_se", "role_name"]], how="inner", left_index=True, right_index=True,
        suffixes=("_first", "_last"))
    both["change"] = both["value_last"] - both["value_first"]
    # change_sd is (value - reference) / SD, so its difference is the change in SDs
    both["change_sd"] = both["change_sd_last"] - both["change_sd_first"]
    # first and last season centres are independent samples: their noise adds in quadrature
    band = band_z(drift["feature"].nunique()) * np.hypot(both["change_se_first"], both["change_se_last"])
    both = both.assign(band=band)[(both["change"].abs() > band) & (both["change_sd"].abs() >= MIN_CHANGE_SD)]
    rows = []
    for _, group in both.groupby(level="role"):
        top = group.reindex(group["change_sd"].abs().sort_values(ascending=False).index).head(n_per_role)
        for (r, feat), row in top.iterrows():
            direction = "up" if row["change"] > 0 else "down"
            rows.append({
                "role": r, "role_name": row["role_name"], "feature": feat, "season_first": first,
                "season_last": last, "change": row["change"], "change_sd": row["change_sd"],
                "text": (f"{r} ({row['role_name']}): {feature_label(feat)} {direction} "
                         f"{abs(row['change']):.3g} from {first} to {last} "
                         f"({row['change_sd']:+.2f} pool SD; noise band ±{row['band']:.2g})"),
            })
    return pd.DataFrame(rows, columns=columns)
