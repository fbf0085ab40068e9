"""Sections "Summary", "Role drift", "Features" and "Data"."""

from __future__ import annotations

__all__ = ["build_summary", "build_drift", "build_features", "build_data"]


def build_summary(analysis, b) -> dict:
    """Headline counts and the page's heading facts."""
    from .. import __version__

    model, placements = analysis.model, analysis.placements
    consecutive = b.consecutive
    status = consecutive["status"] if len(consecutive) else None
    n_changed = int((status == "changed").sum()) if status is not None else 0
    n_unsettled = int((status == "unsettled").sum()) if status is not None else 0
    summary = [
        ("player-seasons placed", f"{len(placements):,}"),
        ("excluded by the filters", f"{len(analysis.prepared.excluded):,}"),
        ("reference pool", f"{model.n_pool_:,} player-seasons, {len(model.reference_seasons_)} seasons"),
        ("components / roles", f"{model.components_.shape[0]} / {len(model.role_ids_)}"),
        ("season-to-season moves", f"{len(consecutive):,}"),
        ("label flips between seasons", f"{n_changed + n_unsettled:,}"),
        ("of which role changes beyond noise", f"{n_changed:,}"),
        ("unsettled (label flip within noise)", f"{n_unsettled:,}"),
        ("mid-season trade stint pairs", f"{len(analysis.stints):,}"),
    ]
    return {"title": "drift: role drift report", "drift_version": __version__,
            "fingerprint": model.fingerprint_, "seasons": sorted(map(str, placements["season"].unique())),
            "reference_seasons": list(model.reference_seasons_), "summary": summary}


def build_drift(analysis, b) -> dict:
    """Role-definition drift: the stage's headlines and the chart."""
    from markupsafe import Markup

    from .. import charts
    from ..roledrift import drift_headlines

    return {"drift_headlines": list(drift_headlines(analysis.role_drift)["text"]),
            "drift_chart": Markup(charts.drift_chart(analysis.role_drift, analysis.model))}


def build_features(analysis, b) -> dict:
    """Each feature's reliability (year-to-year r, signal share, weight, missing values)."""
    from markupsafe import Markup

    from .. import charts
    from ..describe import feature_label

    model = analysis.model
    noise = model.noise_
    reliability = []
    for j, (feat, row) in enumerate(noise.iterrows()):
        reliability.append({"feature": feat, "label": feature_label(feat), "family": row["family"],
                            "r": row["year_to_year_r"], "signal_share": row["signal_share"],
                            "weight": float(model.weights_[j]), "missing": int(row["missing"]),
                            "median_sample": row["median_sample"]})
    return {"reliability": reliability,
            "reliability_chart": Markup(charts.reliability_chart(noise, model.weights_))}


def _reason_kind(reason: str) -> str:
    kinds = []
    if "games " in reason:
        kinds.append("too few games")
    if "minutes per game" in reason:
        kinds.append("too few minutes per game")
    return " and ".join(kinds) or reason


def build_data(analysis, b) -> dict:
    """Exclusions by reason, missing values, seasons outside the reference, files read."""
    prepared, placements = analysis.prepared, analysis.placements
    excluded = prepared.excluded
    excl = (excluded["reason"].map(_reason_kind).value_counts().rename_axis("reason")
            .reset_index(name="count").to_dict(orient="records")) if len(excluded) else []
    missing = prepared.missing[prepared.missing["missing"] > 0]
    oor = placements[placements["out_of_reference"]].sort_values("distance", ascending=False)
    out_of_reference = [{"player": r["player"], "season": r["season"], "team": r["team"],
                         "role": r["role"], "distance": r["distance"]}
                        for r in oor.head(25).to_dict(orient="records")]
    return {"excluded_summary": excl, "missing": missing.to_dict(orient="records"),
            "ignored_columns": list(prepared.ignored_columns),
            "files": [str(f) for f in prepared.files], "out_of_reference": out_of_reference}
