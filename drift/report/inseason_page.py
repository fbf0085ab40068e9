"""The in-season check's small HTML page: context built here, rendered by ``templates/inseason.html``."""

from __future__ import annotations

from dataclasses import dataclass, fields

__all__ = ["InseasonContext", "build_page_context", "write_page"]

_MEANING = {
    "changed": "role differs from last season and the move is beyond noise",
    "shifted": "same role, but the move is beyond noise",
    "too early": "within noise, and at this sample not even a full move to the nearest other role would show",
    "unsettled": "role label differs, but within noise: a player between two roles",
    "steady": "same role, within noise",
}


@dataclass(frozen=True)
class InseasonContext:
    """Everything ``templates/inseason.html`` receives.

    Attributes
    ----------
    title : str
    cautions : tuple of str
        The report's limits, plus the partial-season caveat.
    summary : list of (label, count)
        Players per status, in :data:`drift.inseason.INSEASON_STATUSES` order.
    statuses : list of (status, meaning)
    groups : list of (status, rows)
        Formatted check rows per status (player, seasons, teams, traded, games,
        minutes, roles, distance, noise, z, p (text, "<0.001" below that), drivers, more_games), strongest
        evidence first.
    alpha : float
    season_games : int
    n_excluded : int
        Partial-season rows not checked (filters, or no earlier season).
    """

    title: str
    cautions: tuple
    summary: list
    statuses: list
    groups: list
    alpha: float
    season_games: int
    n_excluded: int


def _drivers(row, names):
    """"spot-up share +3.0 pp, ..." in each feature's own units, as on the report's pages."""
    from drift.report._moves import _change_text

    parts = []
    for n in (1, 2, 3):
        f = row.get(f"driver_{n}")
        if isinstance(f, str):
            parts.append(f"{names.get(f, f)} {_change_text(f, row[f'driver_{n}_change'])}")
    return ", ".join(parts)


def _more_games(value, games_to, season_games):
    if value != value:  # NaN: not within the season
        return f"not within {season_games} games"
    if value == 0:
        return "conclusive now"
    return f"{int(value)} more at this pace"


def build_page_context(checks, model, *, alpha, season_games, n_excluded) -> InseasonContext:
    """Context of the in-season page (see :class:`InseasonContext`)."""
    from drift.measure.inseason import INSEASON_STATUSES
    from drift.model.describe import feature_label
    from drift.report import CAUTIONS

    names = {f: feature_label(f) for f in model.features_}
    role_names = dict(zip(model.role_ids_, model.role_names_))
    groups = []
    for status in INSEASON_STATUSES:
        block = checks[checks["status"] == status]
        rows = [{"player": r["player"], "seasons": f"{r['season_from']} → {r['season_to']} (so far)",
                 "teams": f"{r['team_from']} → {r['team_to']}", "traded": bool(r["traded"]),
                 "games": int(r["games_to"]), "minutes": f"{r['minutes_from']:,.0f} / {r['minutes_to']:,.0f}",
                 "role_from": f"{r['role_from']} {role_names.get(r['role_from'], '')}",
                 "role_to": f"{r['role_to']} {role_names.get(r['role_to'], '')}",
                 "distance": r["distance"], "noise": r["noise_distance"], "z": r["z"],
                 "p": "<0.001" if r["p_value"] < 0.001 else f"{r['p_value']:.3f}",
                 "drivers": _drivers(r, names),
                 "more_games": _more_games(r["games_to_conclusive"], r["games_to"], season_games)}
                for r in block.to_dict(orient="records")]
        groups.append((status, rows))
    caution = ("A partial season is a small sample: the check compares it with last season at both "
               "samples' noise, and a difference that is not yet beyond noise is not evidence of no change.")
    return InseasonContext(
        title="drift in-season check", cautions=(*CAUTIONS, caution),
        summary=[(s, int((checks["status"] == s).sum())) for s in INSEASON_STATUSES],
        statuses=[(s, _MEANING[s]) for s in INSEASON_STATUSES], groups=groups, alpha=alpha,
        season_games=int(season_games), n_excluded=int(n_excluded))


def write_page(checks, model, path, *, alpha, season_games, n_excluded):
    """Render the page to ``path`` (self-contained: inline style, no scripts, no network)."""
    from drift.report import template_environment

    context = build_page_context(checks, model, alpha=alpha, season_games=season_games,
                                 n_excluded=n_excluded)
    values = {f.name: getattr(context, f.name) for f in fields(context)}
    html = template_environment().get_template("inseason.html").render(**values)
    with open(path, "w", encoding="utf-8") as fh:
        fh.write(html)
