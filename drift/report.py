"""The static HTML report: context built here, rendered by jinja2 templates.

Templates live in the top-level ``templates/`` folder (installed as the
``drift.templates`` package data). They only loop, branch and format: every
figure and sentence is prepared in :func:`build_context`, whose fields are
documented on :class:`ReportContext`.
"""

from __future__ import annotations

from dataclasses import dataclass, fields

__all__ = ["ReportContext", "build_context", "render_report", "write_report", "template_environment",
           "CAUTIONS"]

CAUTIONS = (
    "This report describes playstyle: how a player's possessions, rates and shot profile sit "
    "relative to role groups defined on the reference seasons. It does not measure a player's worth, "
    "impact or value.",
    "Small samples are noisy. A move is called beyond noise only when it exceeds what players with "
    "the same minutes show by chance; below the filters (games, minutes per game) a season is not "
    "placed at all, and a season near them is still uncertain.",
    "The numbers carry no context: teammates, coaching and scheme, injuries, health and role "
    "assignments all change a stat line without a change in the player.",
    "Decisions about people (trades, contracts, playing time, development plans) need far more "
    "than this report: film, staff knowledge, medical information and conversation with the player.",
)


@dataclass(frozen=True)
class ReportContext:
    """Everything the report template receives.

    Attributes
    ----------
    title : str
    drift_version : str
    fingerprint : str
        Hash of the reference pool (same pool, same fingerprint).
    seasons : list of str
        Every season placed.
    reference_seasons : list of str
    cautions : tuple of str
        The limits of the report, shown first.
    summary : list of (label, value) pairs
        Headline counts.
    roles : list of dict
        One per role: id, name, description, size, stability, unstable (bool),
        colour, features (list of dict: label, value, pool, sd_diff).
    role_map : Markup
        SVG of the pool on the first two components.
    components_chart, roles_chart, drift_chart, moves_chart : Markup
        SVG charts.
    component_rule, role_rule : str
        How the counts were chosen, in a sentence.
    components_table, roles_table : list of dict
        Per-count diagnostics, formatted.
    changed, unsettled, shifted, stint_moves, requested : list of dict
        Move rows formatted for the tables (player, seasons, teams, roles, distance,
        noise, z, percentile, drivers, and the three nearest reference player-seasons of
        other players to the later placement), strongest evidence first. ``requested``
        holds the moves of ``--compare A B`` (empty without it).
    requested_label : str
        "A → B" of the requested comparison, or "".
    reliability_chart : Markup
        SVG of each feature's year-to-year correlation and signal share.
    shown : int
        How many rows of each move table are shown open; the rest sit in a
        collapsed block below it.
    drift_headlines : list of str
    reliability : list of dict
        Per feature: label, family, r, signal_share, weight, missing.
    excluded_summary : list of dict
        reason kind and count.
    missing : list of dict
        Per feature with missing values: feature, count, action.
    ignored_columns : list of str
    files : list of str
    out_of_reference : list of dict
    alignment : list of dict or None
    noise_note : str
        Calibration of the noise model, in a sentence.
    alpha : float
    """

    title: str
    drift_version: str
    fingerprint: str
    seasons: list
    reference_seasons: list
    cautions: tuple
    summary: list
    roles: list
    role_map: object
    components_chart: object
    roles_chart: object
    drift_chart: object
    moves_chart: object
    component_rule: str
    role_rule: str
    components_table: list
    roles_table: list
    changed: list
    unsettled: list
    shifted: list
    stint_moves: list
    requested: list
    requested_label: str
    reliability_chart: object
    drift_headlines: list
    reliability: list
    excluded_summary: list
    missing: list
    ignored_columns: list
    files: list
    out_of_reference: list
    alignment: list | None
    noise_note: str
    alpha: float
    shown: int = 25


def template_environment():
    """The one jinja2 Environment: templates from the package data, autoescape on."""
    from pathlib import Path

    import jinja2

    here = Path(__file__).resolve().parent
    # installed: drift/templates (package data); source checkout: the top-level templates/
    folder = next((f for f in (here / "templates", here.parent / "templates") if f.is_dir()), None)
    if folder is None:  # pragma: no cover - a broken install
        raise FileNotFoundError(f"drift's templates are missing (looked in {here / 'templates'}); reinstall drift")
    loader = jinja2.FileSystemLoader(str(folder))
    env = jinja2.Environment(loader=loader, autoescape=True, undefined=jinja2.StrictUndefined,
                             trim_blocks=True, lstrip_blocks=True)
    env.filters["num"] = lambda v, d=2: "" if v is None or v != v else f"{v:,.{d}f}"
    env.filters["pct"] = lambda v, d=0: "" if v is None or v != v else f"{100 * v:.{d}f}%"
    env.filters["signed"] = lambda v, d=2: "" if v is None or v != v else f"{v:+.{d}f}"
    return env


def _drivers(row, n=3):
    from .describe import feature_label

    parts = []
    for i in range(1, n + 1):
        name = row.get(f"driver_{i}")
        if not isinstance(name, str):
            continue
        parts.append(f"{feature_label(name)} {row[f'driver_{i}_change']:+.3g} "
                     f"({row[f'driver_{i}_change_sd']:+.1f} SD, {row[f'driver_{i}_share']:.0%} of the move)")
    return "; ".join(parts)


def _comparable_text(comparables, n=3):
    """(player_id, season) -> "Name (season), ..." of the nearest other players."""
    if comparables is None or comparables.empty:
        return {}
    top = comparables[comparables["rank"] <= n]
    text = top["comp_player"].astype(str) + " (" + top["comp_season"].astype(str) + ")"
    return text.groupby([top["player_id"], top["season"]]).agg(", ".join).to_dict()


def _move_rows(moves, names, limit=None, comps=None):
    comps = comps or {}
    rows = []
    for row in (moves if limit is None else moves.head(limit)).to_dict(orient="records"):
        rows.append({
            "player": row["player"], "player_id": row["player_id"],
            "seasons": (f"{row['season_from']} → {row['season_to']}" if row["season_from"] != row["season_to"]
                        else f"{row['season_from']} stint {row.get('stint_from', '')} → {row.get('stint_to', '')}"),
            "teams": f"{row['team_from']} → {row['team_to']}", "traded": bool(row["traded"]),
            "role_from": f"{row['role_from']} {names.get(row['role_from'], '')}",
            "role_to": f"{row['role_to']} {names.get(row['role_to'], '')}",
            "prob_from": row["prob_from"], "prob_to": row["prob_to"],
            "distance": row["distance"], "noise": row["noise_distance"], "z": row["z"],
            "percentile": row["percentile"], "minutes": f"{row['minutes_from']:.0f} / {row['minutes_to']:.0f}",
            "drivers": _drivers(row),
            "comparables": comps.get((row["player_id"], row["season_to"]), ""),
        })
    return rows


def _reason_kind(reason: str) -> str:
    kinds = []
    if "games " in reason:
        kinds.append("too few games")
    if "minutes per game" in reason:
        kinds.append("too few minutes per game")
    return " and ".join(kinds) or reason


def build_context(analysis) -> ReportContext:
    """Shape an :class:`~drift.api.Analysis` into the report's context."""
    import numpy as np
    from markupsafe import Markup

    from . import __version__, charts
    from .describe import feature_label
    from .roledrift import drift_headlines
    from .selection import STABLE_JACCARD

    model, prepared, config = analysis.model, analysis.prepared, analysis.config
    placements, moves = analysis.placements, analysis.moves
    names = dict(zip(model.role_ids_, model.role_names_))
    colours = charts.colour_of(model.role_ids_)
    pool_mask = placements["season"].isin(model.reference_seasons_)
    consecutive = moves[moves["kind"] == "consecutive"] if len(moves) else moves
    noise = model.noise_
    mean = noise["mean"].to_numpy(float)
    sd = np.where(noise["sd"].to_numpy(float) > 0, noise["sd"].to_numpy(float), 1.0)

    roles = []
    for r, rid in enumerate(model.role_ids_):
        cent = np.asarray(model.centroids_features_[r])
        diff = (cent - mean) / sd
        top = np.argsort(-np.abs(diff), kind="stable")[:6]
        roles.append({
            "id": rid, "name": model.role_names_[r], "description": model.role_descriptions_[r],
            "size": int(model.role_sizes_[r]), "stability": float(model.role_stability_[r]),
            "unstable": bool(model.role_stability_[r] < STABLE_JACCARD), "colour": colours[rid],
            "features": [{"label": feature_label(model.features_[j]), "value": float(cent[j]),
                          "pool": float(mean[j]), "sd_diff": float(diff[j])} for j in top],
        })
    comp = model.component_diagnostics_
    q = model.components_.shape[0]
    rule = model.components
    if isinstance(rule, str):
        component_rule = {
            "parallel": "Horn's parallel analysis: components whose eigenvalue beats the 95th "
                        "percentile of random data of the same shape",
            "elbow": "the elbow of the cumulative explained-variance curve",
            "variance": f"the fewest components reaching {model.variance_threshold:.0%} of variance",
        }[rule]
    elif isinstance(rule, float):
        component_rule = f"the fewest components reaching {rule:.0%} of variance"
    else:
        component_rule = f"a fixed count ({rule})"
    component_rule = (f"{q} components kept by {component_rule}; together they hold "
                      f"{float(np.sum(model.explained_variance_ratio_)):.0%} of the variance.")
    rd = model.role_diagnostics_
    k = len(model.role_ids_)
    if model.roles == "auto":
        picks = {c: int(rd.loc[rd[f"pick_{c}"], "k"].iloc[0]) for c in
                 ("silhouette", "calinski_harabasz", "gap") if f"pick_{c}" in rd and rd[f"pick_{c}"].any()}
        role_rule = (f"{k} roles: silhouette picks {picks.get('silhouette')}, Calinski-Harabasz "
                     f"{picks.get('calinski_harabasz')}, the gap statistic {picks.get('gap')}, among "
                     f"counts whose every role reproduces on bootstrap resamples (Jaccard >= {STABLE_JACCARD}); "
                     "the decision is the count two criteria agree on, else their median.")
    else:
        role_rule = f"{k} roles, fixed by the settings."
    components_table = comp.head(max(q + 3, 8)).to_dict(orient="records")
    roles_table = rd.to_dict(orient="records")

    def sel(status):
        m = consecutive[consecutive["status"] == status] if len(consecutive) else consecutive
        return m.sort_values("p_value", kind="stable") if len(m) else m

    comps = _comparable_text(analysis.comparables)
    requested = moves[moves["kind"] == "requested"] if len(moves) else moves
    requested_label = (f"{config.compare[0]} → {config.compare[1]}" if config.compare else "")
    requested_rows = _move_rows(requested.sort_values("p_value", kind="stable"), names, comps=comps) \
        if len(requested) else []

    stints = analysis.stints
    stint_rows = _move_rows(stints.sort_values("p_value", kind="stable"), names) if len(stints) else []
    excluded = prepared.excluded
    excl = (excluded["reason"].map(_reason_kind).value_counts().rename_axis("reason")
            .reset_index(name="count").to_dict(orient="records")) if len(excluded) else []
    missing = prepared.missing[prepared.missing["missing"] > 0]
    reliability = []
    for j, (feat, row) in enumerate(noise.iterrows()):
        reliability.append({"feature": feat, "label": feature_label(feat), "family": row["family"],
                            "r": row["year_to_year_r"], "signal_share": row["signal_share"],
                            "weight": float(model.weights_[j]), "missing": int(row["missing"]),
                            "median_sample": row["median_sample"]})
    oor = placements[placements["out_of_reference"]].sort_values("distance", ascending=False)
    out_of_reference = [{"player": r["player"], "season": r["season"], "team": r["team"],
                         "role": r["role"], "distance": r["distance"]}
                        for r in oor.head(25).to_dict(orient="records")]
    a, b = model.noise_calibration_
    noise_note = (f"The noise model was calibrated on {int(len(consecutive))} returning player pairs: "
                  f"its covariance is scaled by {a:.2f} + {b:.2f} x (sample-size term at the pool median = 1), "
                  "so that the median returning player sits at the median of the no-change distribution.")
    n_changed = int((consecutive["status"] == "changed").sum()) if len(consecutive) else 0
    n_unsettled = int((consecutive["status"] == "unsettled").sum()) if len(consecutive) else 0
    summary = [
        ("player-seasons placed", f"{len(placements):,}"),
        ("excluded by the filters", f"{len(excluded):,}"),
        ("reference pool", f"{model.n_pool_:,} player-seasons, {len(model.reference_seasons_)} seasons"),
        ("components / roles", f"{q} / {k}"),
        ("season-to-season moves", f"{len(consecutive):,}"),
        ("label flips between seasons", f"{n_changed + n_unsettled:,}"),
        ("of which role changes beyond noise", f"{n_changed:,}"),
        ("unsettled (label flip within noise)", f"{n_unsettled:,}"),
        ("mid-season trade stint pairs", f"{len(stints):,}"),
    ]
    alignment = analysis.alignment.table.to_dict(orient="records") if analysis.alignment is not None else None
    return ReportContext(
        title="drift: role drift report", drift_version=__version__, fingerprint=model.fingerprint_,
        seasons=sorted(map(str, placements["season"].unique())),
        reference_seasons=list(model.reference_seasons_), cautions=CAUTIONS, summary=summary,
        roles=roles,
        role_map=Markup(charts.role_map_chart(placements[pool_mask], model)),
        components_chart=Markup(charts.components_chart(comp)),
        roles_chart=Markup(charts.roles_chart(rd)) if len(rd) > 1 else Markup(""),
        drift_chart=Markup(charts.drift_chart(analysis.role_drift, model)),
        moves_chart=Markup(charts.moves_chart(consecutive)),
        component_rule=component_rule, role_rule=role_rule,
        components_table=components_table, roles_table=roles_table,
        changed=_move_rows(sel("changed"), names, comps=comps),
        unsettled=_move_rows(sel("unsettled"), names, comps=comps),
        shifted=_move_rows(sel("shifted"), names, comps=comps), stint_moves=stint_rows,
        requested=requested_rows, requested_label=requested_label,
        reliability_chart=Markup(charts.reliability_chart(noise, model.weights_)),
        drift_headlines=list(drift_headlines(analysis.role_drift)["text"]),
        reliability=reliability, excluded_summary=excl,
        missing=missing.to_dict(orient="records"),
        ignored_columns=list(prepared.ignored_columns),
        files=[str(f) for f in prepared.files], out_of_reference=out_of_reference,
        alignment=alignment, noise_note=noise_note, alpha=config.alpha,
    )


def render_report(context: ReportContext) -> str:
    """Render the report page from its context."""
    env = template_environment()
    values = {f.name: getattr(context, f.name) for f in fields(context)}
    return env.get_template("report.html").render(**values)


def write_report(analysis, path):
    """Build the context, render it and write ``path``."""
    from pathlib import Path

    Path(path).write_text(render_report(build_context(analysis)), encoding="utf-8")
