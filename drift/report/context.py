"""What the report templates receive (:class:`ReportContext`) and what sections share (:class:`Basis`)."""

from __future__ import annotations

from dataclasses import dataclass, field

__all__ = ["CAUTIONS", "PLAYER_LIST", "ReportContext", "Basis", "basis"]

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


#: Most rows of the front page's list of players (every player has a page; search finds each one).
PLAYER_LIST = 1000


@dataclass(frozen=True)
class Basis:
    """Facts several section builders need, computed once per report.

    Attributes
    ----------
    names, colours : dict
        Role id -> role name; role id -> hex colour (:data:`drift.report._charts.ROLE_COLOURS`).
    seasons : list of str
        Every placed season, in order; ``season_index`` maps each to its position.
    season_index : dict
    latest_pair : tuple of str or None
        The last two placed seasons (the front page's review), None with one season.
    consecutive, requested : DataFrame
        Moves between a player's consecutive qualifying seasons; moves of the requested
        comparison (empty without one).
    comparables : mapping
        ``.get((player_id, season))`` -> "Name (season), ..." of the three nearest other players.
    pool_mask : ndarray of bool
        Placements that belong to the reference pool.
    player_anchor, team_anchor : dict
        Player id / team code -> the id of its page (every placed player and every team has one).
    alpha : float
        The level for "beyond noise".
    frame : drift.report._sketch.MapFrame
        Where component scores land on the small role map of the player pages.
    ext : str
        File extension of the run's tables ("csv", or "parquet" with ``--format parquet``),
        for the sentences that name them.
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
    frame: object = None
    ext: str = "csv"
    #: work two builders share, done once (team rosters and minutes; see drift.report._teams)
    memo: dict = field(default_factory=dict, compare=False, repr=False)

    def role(self, rid) -> dict:
        """A role as the templates show it: id, name, colour and css (its class for the colour)."""
        from drift.report._fmt import slug

        return {"id": rid, "name": self.names.get(rid, ""), "colour": self.colours.get(rid, "#888"),
                "css": slug("c-", rid)}


class _Comparables:
    """(player id, season) -> "Name (season), ..." of the ``n`` nearest other players, formatted on demand
    (the front page asks for a few hundred of a pool's rows)."""

    def __init__(self, comparables, n=3):
        self.rows = {}
        if comparables is None or comparables.empty:
            return
        top = comparables[comparables["rank"] <= n].sort_values("rank", kind="stable")
        names, seasons = top["comp_player"].astype(str).tolist(), top["comp_season"].astype(str).tolist()
        for key, name, season in zip(zip(top["player_id"].tolist(), top["season"].tolist()), names, seasons):
            self.rows.setdefault(key, []).append(f"{name} ({season})")

    def get(self, key, default=""):
        found = self.rows.get(key)
        return ", ".join(found) if found else default


def _frame(analysis, pool_mask):
    """The small role map's frame: the pool's middle 98% and the role centres on components 1 and 2."""
    import numpy as np

    from drift.report import _sketch as sketch
    from drift.report._roles import axis_label

    model, pl = analysis.model, analysis.placements
    has_pc2 = "pc2" in pl
    scores = np.column_stack([pl["pc1"], pl["pc2"] if has_pc2 else np.zeros(len(pl))])
    cents = np.asarray(model.centroids_)[:, :2] if model.centroids_.shape[1] > 1 else np.column_stack(
        [model.centroids_[:, 0], np.zeros(len(model.role_ids_))])
    return sketch.map_frame(scores[pool_mask], cents, axis_label(model, 0, n=1, short=True),
                            axis_label(model, 1, n=1, short=True) if has_pc2 else "")


def basis(analysis, *, ext="csv") -> Basis:
    """The shared facts of ``analysis`` (an :class:`~drift.api.Analysis`); ``ext`` names its tables' format."""
    from drift.report import _charts as charts
    from drift.report._fmt import slug

    model, moves, placements = analysis.model, analysis.moves, analysis.placements
    kind = moves["kind"] if len(moves) else None
    consecutive = moves[kind == "consecutive"] if kind is not None else moves
    seasons = sorted(map(str, placements["season"].unique()))
    latest_pair = tuple(seasons[-2:]) if len(seasons) > 1 else None
    teams = sorted({t for value in placements["team"].astype(str).unique() for t in value.split("/")})
    pool_mask = placements["season"].isin(model.reference_seasons_).to_numpy()
    return Basis(
        names=dict(zip(model.role_ids_, model.role_names_)), colours=charts.colour_of(model.role_ids_),
        seasons=seasons, season_index={s: i for i, s in enumerate(seasons)}, latest_pair=latest_pair,
        consecutive=consecutive, requested=moves[kind == "requested"] if kind is not None else moves,
        comparables=_Comparables(analysis.comparables),
        pool_mask=pool_mask, player_anchor={p: slug("p-", p) for p in placements["player_id"].unique()},
        team_anchor={t: slug("t-", t) for t in teams}, alpha=analysis.config.alpha,
        frame=_frame(analysis, pool_mask), ext=ext,
    )


@dataclass(frozen=True)
class ReportContext:
    """Everything the report templates receive, one field per value.

    Shared shapes: a *role* is a dict ``id, name, colour, css`` (see :meth:`Basis.role`); a *move row* (see
    :func:`drift.report._moves.move_rows`) has ``player, anchor`` (the player's page id, "" when he
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
    player_list_note : str
        How many players the list shows of how many, and which ("" when it lists every one).
    latest_label : str
        "A → B" of the latest two seasons ("" with one season).
    latest_figures : list of (label, value) pairs
        Counts for the latest pair.
    latest_moves, latest_trades, earlier_moves, requested : list of move rows
        Moves into the latest season (every status); the latest season's mid-season trades;
        moves of earlier pairs that are not steady; the requested comparison.
    latest_note, latest_trades_note, earlier_note, requested_note : str
        A sentence naming the CSV when a table was cut to its strongest rows, else "".
    totals : dict
        Table id -> rows before any cut (the filter counters say "N shown of the 250 listed (289 in all)").
    latest_skips : int
        Rows of ``latest_moves`` whose player skipped a season.
    requested_label : str
        "A → B" of the requested comparison, or "".
    player_index : list of dict
        anchor, player, season, team, role, seasons, status, traded: one row per listed player
        (at most :data:`PLAYER_LIST`; player and team pages themselves are page documents in
        ``report-data/``, see :mod:`drift.report._bundle`).
    map_symbol : Markup
        The shared role-map background the player paths use.
    pages_data : Markup
        JSON for the page script (:func:`drift.report._bundle.shared`): role names and colour
        classes, page table headings and notes, the data folder.
    players_total : int
        Placed players (the list may show fewer; each has a page).
    data_dir : str
        The folder of the page chunks and the search index, beside ``report.html``.
    ext : str
        Extension of the run's tables ("csv" or "parquet"), for sentences that name them.
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
        How the counts were chosen, in a sentence naming the methods (behind a click).
    role_rule_plain : str
        The role count in plain words, shown first.
    components_table, roles_table : list of dict
        Per-count diagnostics.
    alignment : list of dict or None
        The match with a previous model's roles.
    self_check : str
        With ``--self-check N``: how often roles and role changes were recovered on leagues
        simulated like this one (:class:`drift.sim.selfcheck.SelfCheck`), in two sentences; "" otherwise.
    noise_note : str
        Calibration of the noise model, in a sentence.
    outlook : list of dict
        Next season, one per player placed in the latest season, likeliest to change role
        first: player_id, player, team, season, role, projected, stay, change, likeliest
        (the three likeliest roles with their chances), spread, seasons, minutes
        (:func:`drift.report._outlook.outlook_rows`).
    outlook_total : int
        Players in the outlook (the table lists at most :data:`drift.report._outlook.OUTLOOK_MAX`).
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
        The 25 seasons farthest outside every role (player, anchor, season, team, role (a role dict), distance).
    out_of_reference_total : int
    """

    title: str
    drift_version: str
    fingerprint: str
    seasons: list
    reference_seasons: list
    cautions: tuple
    summary: list
    player_list_note: str
    latest_label: str
    latest_figures: list
    latest_moves: list
    latest_note: str
    latest_skips: int
    totals: dict
    latest_trades: list
    latest_trades_note: str
    earlier_moves: list
    earlier_note: str
    requested: list
    requested_note: str
    requested_label: str
    player_index: list
    map_symbol: object
    pages_data: object
    players_total: int
    data_dir: str
    ext: str
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
    role_rule_plain: str
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
    outlook_total: int
    outlook_note: str
    backtest: list
    calibration: list
    backtest_note: str
    shown: int = 25
    self_check: str = ""
