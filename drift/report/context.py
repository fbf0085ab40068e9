"""What the report templates receive (:class:`ReportContext`) and what sections share (:class:`Basis`)."""

from __future__ import annotations

from dataclasses import dataclass

__all__ = ["CAUTIONS", "MAX_PLAYER_PAGES", "ReportContext", "Basis", "basis", "paged_players"]

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


#: Most player pages one report carries; above it pages go to the players the front page needs.
MAX_PLAYER_PAGES = 600


@dataclass(frozen=True)
class Basis:
    """Facts several section builders need, computed once per report.

    Attributes
    ----------
    names, colours : dict
        Role id -> role name; role id -> hex colour (:data:`drift.charts.ROLE_COLOURS`).
    seasons : list of str
        Every placed season, in order; ``season_index`` maps each to its position.
    season_index : dict
    latest_pair : tuple of str or None
        The last two placed seasons (the front page's review), None with one season.
    consecutive, requested : DataFrame
        Moves between a player's consecutive qualifying seasons; moves of the requested
        comparison (empty without one).
    comparables : dict
        (player_id, season) -> "Name (season), ..." of the three nearest other players.
    pool_mask : ndarray of bool
        Placements that belong to the reference pool.
    player_anchor, team_anchor : dict
        Player id / team code -> the HTML id of its page, for those that have one.
    alpha : float
        The level for "beyond noise".
    """

    names: dict
    colours: dict
    seasons: list
    season_index: dict
    latest_pair: tuple | None
    consecutive: object
    requested: object
    comparables: dict
    pool_mask: object
    player_anchor: dict
    team_anchor: dict
    alpha: float

    def role(self, rid) -> dict:
        """A role as the templates show it: id, name, colour and css (its class for the colour)."""
        from drift.report.fmt import slug

        return {"id": rid, "name": self.names.get(rid, ""), "colour": self.colours.get(rid, "#888"),
                "css": slug("c-", rid)}


def _comparable_text(comparables, n=3):
    if comparables is None or comparables.empty:
        return {}
    top = comparables[comparables["rank"] <= n]
    text = top["comp_player"].astype(str) + " (" + top["comp_season"].astype(str) + ")"
    return text.groupby([top["player_id"], top["season"]]).agg(", ".join).to_dict()


def paged_players(analysis, consecutive, latest_pair, limit=None):
    """Player ids that get a page: all placed players, or on large leagues the ones the outputs need.

    Above ``limit`` players, pages go (strongest evidence first, up to ``limit``) to players with a
    move beyond noise or an unsettled label in the latest season pair, in the requested comparison
    or at a mid-season trade of the latest season, then to the latest pair's other players.
    """
    import pandas as pd

    limit = MAX_PLAYER_PAGES if limit is None else limit
    players = pd.unique(analysis.placements["player_id"])
    if len(players) <= limit:
        return list(players)
    moves = pd.concat([m for m in (analysis.moves, analysis.stints) if len(m)], ignore_index=True)
    latest = latest_pair[1] if latest_pair else None
    wanted = moves[(moves["season_to"] == latest) | (moves["kind"] == "requested")]
    wanted = wanted.assign(_steady=wanted["status"] == "steady").sort_values(["_steady", "p_value"], kind="stable")
    return list(pd.unique(wanted["player_id"]))[:limit]


def basis(analysis) -> Basis:
    """The shared facts of ``analysis`` (an :class:`~drift.api.Analysis`)."""
    from drift.report import charts
    from drift.report.fmt import slug

    model, moves, placements = analysis.model, analysis.moves, analysis.placements
    kind = moves["kind"] if len(moves) else None
    consecutive = moves[kind == "consecutive"] if kind is not None else moves
    seasons = sorted(map(str, placements["season"].unique()))
    latest_pair = tuple(seasons[-2:]) if len(seasons) > 1 else None
    teams = sorted({t for value in placements["team"].astype(str) for t in value.split("/")})
    return Basis(
        names=dict(zip(model.role_ids_, model.role_names_)), colours=charts.colour_of(model.role_ids_),
        seasons=seasons, season_index={s: i for i, s in enumerate(seasons)}, latest_pair=latest_pair,
        consecutive=consecutive, requested=moves[kind == "requested"] if kind is not None else moves,
        comparables=_comparable_text(analysis.comparables),
        pool_mask=placements["season"].isin(model.reference_seasons_).to_numpy(),
        player_anchor={p: slug("p-", p) for p in paged_players(analysis, consecutive, latest_pair)},
        team_anchor={t: slug("t-", t) for t in teams}, alpha=analysis.config.alpha,
    )


@dataclass(frozen=True)
class ReportContext:
    """Everything the report templates receive, one field per value.

    Shared shapes: a *role* is a dict ``id, name, colour, css`` (see :meth:`Basis.role`); a *move row* (see
    :func:`drift.report.moves.move_rows`) has ``player, anchor`` (the player's page id, "" when he
    has none), ``pair, note`` (season pair and "skips a season" / "requested comparison" /
    "mid-season trade" / ""), ``teams, team_from, team_to, traded, role_from, role_to`` (roles),
    ``prob_from, prob_to`` (membership as text), ``status`` (changed, unsettled, shifted, steady),
    ``words`` (strength in plain words), ``figures`` (distance, noise, z and p for hover), ``z``,
    ``minutes, drivers, comparables``, ``status_key`` (sort order of the status) and
    ``filter_team, filter_role`` ("|"-joined values the
    page's filters read).

    Attributes
    ----------
    title, drift_version, fingerprint : str
        Page title, drift's version and the hash of the reference pool.
    seasons, reference_seasons : list of str
        Every season placed; the seasons the roles were fitted on.
    cautions : tuple of str
        The limits of the report, shown on the front page and every player page.
    summary : list of (label, value) pairs
        Headline counts over every season.
    player_pages_note : str
        On large leagues, which players got a page and why ("" when every player has one).
    latest_label : str
        "A → B" of the latest two seasons ("" with one season).
    latest_figures : list of (label, value) pairs
        Counts for the latest pair.
    latest_moves, latest_trades, earlier_moves, requested : list of move rows
        Moves into the latest season (every status); the latest season's mid-season trades;
        moves of earlier pairs that are not steady; the requested comparison.
    latest_note, latest_trades_note, earlier_note, requested_note : str
        A sentence naming the CSV when a table was cut to its strongest rows, else "".
    latest_skips : int
        Rows of ``latest_moves`` whose player skipped a season.
    requested_label : str
        "A → B" of the requested comparison, or "".
    players : list of dict
        One player page each: ``anchor, id, name, team, role``, ``timeline`` (per season:
        season, team, placed; placed seasons: role, membership, second, games, minutes, outside,
        stints ("stints: ELM R4 → BRN R5" or ""), status, words; seasons left out: why),
        ``path`` (SVG Markup), ``profile_season``, ``profile`` (label, value, role_avg,
        percentile, bar, defining), ``moves`` and ``trades`` (move rows), ``comparables``
        (player, anchor, season, team, role) and ``outlook`` (columns, rows) or None.
    player_index : list of dict
        anchor, player, season, team, role, seasons, status, traded: one row per page.
    map_symbol : Markup
        The shared role-map background the player paths use.
    search_index : Markup
        JSON list of [label, anchor, kind, keys] for the search box (exact key matches rank
        first; safe inside a script element).
    teams : list of dict
        One team page each: ``anchor, team``, ``mix`` (per season, latest first: season,
        players, roles with share and text), ``movement`` (per pair: pair, arrivals,
        departures, stayed (on the roster in both seasons, placed in one), n_arrivals (uncut),
        note; each player, anchor, moved, other, role, status, words; arrivals and departures
        judged on every season row, placed or not), ``trades`` and
        ``changed`` (move rows) with ``trades_note`` and ``changed_note`` (set when cut).
    team_index : list of dict
        anchor, team, players (latest season), changed (latest pair), arrivals (latest pair, uncut).
    roles : list of dict
        One per role: id, name, css, description, size, stability, unstable (bool), colour,
        features (label, value, pool, sd_diff; values in the feature's own units).
    role_map : Markup
        SVG of the pool on the first two components, axes named by their loadings.
    components_chart, roles_chart, drift_chart, moves_chart, reliability_chart : Markup
        SVG charts ("" when there is nothing to draw).
    component_rule, role_rule : str
        How the counts were chosen, in a sentence.
    components_table, roles_table : list of dict
        Per-count diagnostics.
    alignment : list of dict or None
        The match with a previous model's roles.
    self_check : str
        With ``--self-check N``: how often roles and role changes were recovered on leagues
        simulated like this one (:class:`drift.selfcheck.SelfCheck`), in two sentences; "" otherwise.
    noise_note : str
        Calibration of the noise model, in a sentence.
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
    shown : int
        Rows of the outlook table shown open; the rest sit in a collapsed block.
    alpha : float
        The level for "beyond noise".
    drift_headlines : list of str
        Per role, its largest change beyond noise from the first season to the last.
    reliability : list of dict
        Per feature (formatted): label, family, r, signal_share, weight, missing, median_sample.
    excluded_summary : list of dict
        Exclusion reason and count.
    missing : list of dict
        Per feature with missing values: feature, family, missing (count), action.
    ignored_columns, files : list of str
    columns_read : list of dict
        How each export column was read (``Prepared.reading.summary()``): column,
        read_as (drift's name, or "ignored"/"sample"), family, play_type, unit,
        files (in how many it was read so), why (the rule used, or why it was left out).
    intake_notes : list of str
        Every unit conversion and intake warning, one line each.
    unreliable : list of dict
        Features whose measured signal share is near zero (below
        :data:`drift.model.noise.LOW_SIGNAL_SHARE`), down-weighted to near zero: label,
        column (as named in the export), signal_share, r (formatted).
    out_of_reference : list of dict
        The 25 seasons farthest outside every role (player, anchor, season, team, role, distance).
    out_of_reference_total : int
    """

    title: str
    drift_version: str
    fingerprint: str
    seasons: list
    reference_seasons: list
    cautions: tuple
    summary: list
    player_pages_note: str
    latest_label: str
    latest_figures: list
    latest_moves: list
    latest_note: str
    latest_skips: int
    latest_trades: list
    latest_trades_note: str
    earlier_moves: list
    earlier_note: str
    requested: list
    requested_note: str
    requested_label: str
    players: list
    player_index: list
    map_symbol: object
    search_index: object
    teams: list
    team_index: list
    roles: list
    role_map: object
    components_chart: object
    roles_chart: object
    drift_chart: object
    moves_chart: object
    reliability_chart: object
    component_rule: str
    role_rule: str
    components_table: list
    roles_table: list
    alignment: list | None
    noise_note: str
    alpha: float
    drift_headlines: list
    reliability: list
    excluded_summary: list
    missing: list
    ignored_columns: list
    columns_read: list
    intake_notes: list
    unreliable: list
    files: list
    out_of_reference: list
    out_of_reference_total: int
    outlook: list
    outlook_note: str
    backtest: list
    calibration: list
    backtest_note: str
    shown: int = 25
    self_check: str = ""
