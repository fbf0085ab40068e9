"""What the report templates receive (:class:`ReportContext`) and what sections share (:class:`Basis`)."""

from __future__ import annotations

from dataclasses import dataclass

__all__ = ["CAUTIONS", "ReportContext", "Basis", "basis"]

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
class Basis:
    """Facts several section builders need, computed once per report.

    Attributes
    ----------
    names : dict
        Role id -> role name.
    colours : dict
        Role id -> hex colour (drift's palette, :data:`drift.charts.ROLE_COLOURS`).
    consecutive : DataFrame
        The moves between a player's consecutive qualifying seasons.
    requested : DataFrame
        The moves of the requested comparison (empty without one).
    comparables : dict
        (player_id, season) -> "Name (season), ..." of the three nearest other players.
    pool_mask : ndarray of bool
        Placements that belong to the reference pool.
    """

    names: dict
    colours: dict
    consecutive: object
    requested: object
    comparables: dict
    pool_mask: object


def _comparable_text(comparables, n=3):
    if comparables is None or comparables.empty:
        return {}
    top = comparables[comparables["rank"] <= n]
    text = top["comp_player"].astype(str) + " (" + top["comp_season"].astype(str) + ")"
    return text.groupby([top["player_id"], top["season"]]).agg(", ".join).to_dict()


def basis(analysis) -> Basis:
    """The shared facts of ``analysis`` (an :class:`~drift.api.Analysis`)."""
    from .. import charts

    model, moves = analysis.model, analysis.moves
    kind = moves["kind"] if len(moves) else None
    return Basis(
        names=dict(zip(model.role_ids_, model.role_names_)),
        colours=charts.colour_of(model.role_ids_),
        consecutive=moves[kind == "consecutive"] if kind is not None else moves,
        requested=moves[kind == "requested"] if kind is not None else moves,
        comparables=_comparable_text(analysis.comparables),
        pool_mask=analysis.placements["season"].isin(model.reference_seasons_).to_numpy(),
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
    outlook : list of dict
        Next season, one per player placed in the latest season, likeliest to change role
        first: player_id, player, team, season, role, projected, stay, change, likeliest
        (the three likeliest roles with their chances), spread, seasons, minutes
        (:func:`drift.report.outlook.outlook_rows`).
    outlook_note : str
        What the outlook is and is not, in a few sentences.
    backtest : list of dict
        ``backtest.csv`` rows (per season scored, then ``all``).
    calibration : list of dict
        ``backtest_calibration.csv`` rows.
    backtest_note : str
        The backtest's verdict against the naive forecast, in a sentence.
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
    outlook: list
    outlook_note: str
    backtest: list
    calibration: list
    backtest_note: str
    shown: int = 25


