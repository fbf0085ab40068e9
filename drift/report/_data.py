"""Sections "Summary", "Role drift", "Features" and "Data"."""

from __future__ import annotations

__all__ = ["build_summary", "build_drift", "build_features", "build_data"]


def build_summary(analysis, b) -> dict:
    """Headline counts over every season, and the page's heading facts.

    The count of role changes covers every comparison (consecutive seasons and the requested
    one), as the command line prints it, with the split beside it.
    """
    from drift import __version__

    model, placements = analysis.model, analysis.placements
    cons, req = b.consecutive, b.requested

    def count(moves, status):
        return int((moves["status"] == status).sum()) if len(moves) else 0

    n_changed, n_req = count(cons, "changed"), count(req, "changed")
    changes = f"{n_changed + n_req:,}" + (f" ({n_changed:,} between consecutive seasons, {n_req:,} in the "
                                          "requested comparison)" if len(req) else "")
    summary = [
        ("player-seasons placed", f"{len(placements):,}"),
        ("players / teams", f"{placements['player_id'].nunique():,} / {len(b.team_anchor):,}"),
        ("excluded by the filters", f"{len(analysis.prepared.excluded):,}"),
        ("reference pool", f"{model.n_pool_:,} player-seasons, {len(model.reference_seasons_)} seasons"),
        ("components / roles", f"{model.components_.shape[0]} / {len(model.role_ids_)}"),
        ("season-to-season moves", f"{len(cons):,}"),
        ("role changes beyond noise", changes),
        ("unsettled (between two roles, within noise)", f"{count(cons, 'unsettled'):,}"),
        ("mid-season trade stint pairs", f"{len(analysis.stints):,}"),
    ]
    return {"title": "drift: role review", "drift_version": __version__,
            "fingerprint": model.fingerprint_, "seasons": b.seasons,
            "reference_seasons": list(model.reference_seasons_), "summary": summary}


def build_drift(analysis, b) -> dict:
    """Role-definition drift: the stage's beyond-noise headlines and the chart."""
    from markupsafe import Markup

    from drift.measure.role_drift import drift_headlines
    from drift.report import _charts as charts

    return {"drift_headlines": list(drift_headlines(analysis.role_drift)["text"]),
            "drift_chart": Markup(charts.drift_chart(analysis.role_drift, analysis.model))}


def build_features(analysis, b) -> dict:
    """Each feature's reliability; missing values counted once, from the intake's table."""
    from markupsafe import Markup

    from drift.model.describe import feature_label
    from drift.report import _charts as charts
    from drift.report._fmt import percent, sig

    model = analysis.model
    noise = model.noise_
    missing = analysis.prepared.missing.set_index("feature")["missing"]
    reliability = []
    for j, (feat, row) in enumerate(noise.iterrows()):
        reliability.append({"label": feature_label(feat), "family": row["family"],
                            "r": sig(row["year_to_year_r"], 2), "signal_share": percent(row["signal_share"], 2),
                            "weight": sig(float(model.weights_[j]), 2), "missing": f"{int(missing.get(feat, 0)):,}",
                            "median_sample": f"{row['median_sample']:,.0f}"})
    return {"reliability": reliability,
            "reliability_chart": Markup(charts.reliability_chart(noise, model.weights_))}


def build_data(analysis, b) -> dict:
    """Exclusions by reason, missing values, seasons outside the reference, files read."""
    from drift.constants import reason_text
    from drift.report._cells import label

    prepared, placements = analysis.prepared, analysis.placements
    excluded = prepared.excluded
    excl = (excluded["reason_code"].map(reason_text).value_counts().rename_axis("reason")
            .reset_index(name="count").to_dict(orient="records")) if len(excluded) else []
    missing = prepared.missing[prepared.missing["missing"] > 0]
    oor = placements[placements["out_of_reference"]].sort_values("distance", ascending=False)
    out_of_reference = [{"player": r["player"], "anchor": b.player_anchor.get(r["player_id"], ""),
                         "season": r["season"], "team": r["team"], "role": b.role(r["role"]),
                         "distance": f"{r['distance']:.2f}"} for r in oor.head(25).to_dict(orient="records")]
    reading = prepared.reading
    columns_read = [] if reading is None else [
        {"column": r["column"], "read_as": label(r["drift_name"]) if r["drift_name"] else r["role"],
         "family": r["family"],
         "play_type": r["play_type"], "unit": r["unit"], "files": int(r["files"]), "why": r["note"] or r["how"]}
        for r in reading.summary().to_dict(orient="records")]
    missing = [{**r, "feature": label(r["feature"])} for r in missing.to_dict(orient="records")]
    return {"excluded_summary": excl, "missing": missing,
            "unreliable": _unreliable(analysis.model, reading),
            "ignored_columns": list(prepared.ignored_columns), "columns_read": columns_read,
            "intake_notes": list(reading.notes) if reading is not None else [],
            "files": [str(f) for f in prepared.files], "out_of_reference": out_of_reference,
            "out_of_reference_total": int(len(oor))}


def _unreliable(model, reading):
    """The features the fit down-weighted for near-zero measured reliability, with their export names."""
    from drift.model.describe import feature_label
    from drift.model.noise import low_signal_features
    from drift.report._fmt import percent, sig

    noise = model.noise_
    sources = {}
    if reading is not None and len(reading.columns):
        feats = reading.columns[reading.columns["role"] == "feature"]
        for name, column in zip(feats["drift_name"], feats["column"]):
            if column not in sources.setdefault(name, []):
                sources[name].append(column)
    return [{"label": feature_label(f), "column": ", ".join(sources.get(f, [f])),
             "signal_share": percent(noise.loc[f, "signal_share"], 2), "r": sig(noise.loc[f, "year_to_year_r"], 2)}
            for f in low_signal_features(noise)]
