"""In-season check: is a player's partial season a real change from his last full season?

Each player's partial season (say his first 15 games) is compared with his
latest earlier qualifying season, at both samples' noise, with the same move
machinery as season-to-season moves (:func:`drift.moves.pair_moves`): distance
in component space, chi-square p-value, z, and the features that drove it.
Two things are added for a season still under way:

* **too early**: a move within noise is called *too early* when, at these
  samples, not even a full move from last season's position to the centre of his
  nearest other role would be beyond noise; the sample cannot yet tell.
* **games to conclusive**: if the current difference held, how many more games
  at the current pace (minutes and possessions per game) would put it beyond
  noise; 0 when it already is, empty when it would not within ``season_games``.

The null is the model's move noise (calibrated on full seasons) times a scale
fitted on the checked players themselves (:func:`null_scale`): on the demo
league a 15-game sample has about 20% more spread than the full-season
calibration gives, and the median of the many players who did not change
measures it. The scale is never below 1 and needs 30 players.

Statuses: *changed*, *shifted* (beyond noise, role differs / same), *too early*,
*unsettled*, *steady* (within noise, role differs / same).
"""

from __future__ import annotations

__all__ = ["check_partial", "baseline_pairs", "INSEASON_STATUSES", "INSEASON_COLUMNS"]

INSEASON_STATUSES = ("changed", "shifted", "too early", "unsettled", "steady")
INSEASON_COLUMNS = ("player_id", "player", "season_from", "season_to", "team_from", "team_to", "traded",
                    "games_from", "games_to", "minutes_from", "minutes_to", "role_from", "role_to",
                    "prob_to", "distance", "noise_distance", "z", "p_value", "null_scale", "status",
                    "full_move_p", "games_to_conclusive", "driver_1", "driver_1_change",
                    "driver_2", "driver_2_change", "driver_3", "driver_3_change")


def baseline_pairs(partial, against):
    """Each partial-season row with its player's latest earlier season in ``against``.

    Parameters
    ----------
    partial, against : DataFrame
        Qualifying season rows (``player_id``, ``season``, features...).

    Returns
    -------
    (table, first, second, unmatched)
        ``table`` stacks the matched baseline rows then the partial rows;
        ``first[i]`` / ``second[i]`` are a pair's positions in it; ``unmatched``
        holds the partial rows with no earlier season in ``against``.
    """
    import numpy as np
    import pandas as pd

    partial = partial.reset_index(drop=True)
    base_rows, part_rows = [], []
    for i, row in partial.iterrows():
        earlier = against[(against["player_id"] == row["player_id"]) & (against["season"] < row["season"])]
        if len(earlier):
            base_rows.append(earlier.sort_values("season").iloc[-1])
            part_rows.append(i)
    matched = partial.iloc[part_rows]
    unmatched = partial.drop(index=part_rows).reset_index(drop=True)
    base = pd.DataFrame(base_rows)
    table = pd.concat([base, matched], ignore_index=True)
    m = len(part_rows)
    return table, np.arange(m), np.arange(m, 2 * m), unmatched


def _statistic(model, first_rows, second_rows, target=None):
    """Squared null length of each move, or of moves from the first rows to ``target`` positions."""
    proc_a, na = model.processed(first_rows)
    proc_b, nb = model.processed(second_rows)
    start = model.scores_from_processed(proc_a)
    delta = (target - start) if target is not None else model.scores_from_processed(proc_b) - start
    return model.move_null(na, nb).statistic(delta)


def _scaled_statistic(model, table, first, second, factor):
    """Move statistic if each partial row's sample were ``factor`` times larger (same rates)."""
    part = table.iloc[second].copy()
    for col in ("games", "minutes", "possessions"):
        if col in part.columns:
            part[col] = part[col].to_numpy(float) * factor
    return _statistic(model, table.iloc[first], part)


def null_scale(d2, q, *, min_players=30):
    """Scale of the null fitted on the checked players themselves (1 with too few).

    As for the model's own calibration: the median of the statistic over players
    within the null's 99.9th percentile is put on the null's (truncated) median;
    the few real changers barely move a median. Never below 1: the players checked
    can make the test stricter than the model, not looser.
    """
    import numpy as np
    from scipy.stats import chi2

    if len(d2) < min_players:
        return 1.0
    scale = 1.0
    target = chi2.ppf(0.5 * 0.999, q)
    for _ in range(5):
        keep = d2 / scale <= chi2.ppf(0.999, q)
        scale = float(np.median(d2[keep]) / target)
    return max(scale, 1.0)


def _games_to_conclusive(model, table, first, second, crit, season_games):
    """Smallest number of further games at the current pace that makes each move beyond noise."""
    import numpy as np

    games = np.maximum(table["games"].to_numpy(float)[second], 1.0)
    need = np.full(len(second), np.nan)
    open_ = np.ones(len(second), bool)
    for total in range(1, int(season_games) + 1):
        rows = open_ & (games < total)
        if not rows.any():
            continue
        d2 = _scaled_statistic(model, table, first[rows], second[rows], total / games[rows])
        hit = np.zeros(len(second), bool)
        hit[np.flatnonzero(rows)[d2 >= crit]] = True
        need[hit] = total - games[hit]
        open_ &= ~hit
        if not open_.any():
            break
    return need


def _full_move_stat(model, table, first, second, scores):
    """Statistic of a move from last season's position to the centre of his nearest other role."""
    import numpy as np

    d = model.distances(scores[first])
    d[np.arange(len(d)), d.argmin(axis=1)] = np.inf
    target = model.centroids_[d.argmin(axis=1)]
    return _statistic(model, table.iloc[first], table.iloc[second], target=target)


def check_partial(model, partial, against, *, alpha, season_games):
    """Compare every partial season with the player's latest earlier season.

    Parameters
    ----------
    model : RoleModel
    partial : DataFrame
        Qualifying rows of the season under way (combined over stints).
    against : DataFrame
        Qualifying rows of full seasons (any number; the latest before the partial
        season is used per player).
    alpha : float
        Level for "beyond noise".
    season_games : int
        Games in a full season: the horizon of ``games_to_conclusive``.

    Returns
    -------
    (DataFrame, DataFrame)
        The checks (:data:`INSEASON_COLUMNS`, strongest evidence first) and the
        partial rows with no earlier season to compare with.
    """
    import numpy as np
    from scipy.stats import chi2, norm

    from drift.measure.moves import pair_moves

    table, first, second, unmatched = baseline_pairs(partial, against)
    if not len(first):
        return _empty(), unmatched
    placements = model.place(table)
    processed = model.processed(table)
    moves = pair_moves(model, table, placements, first, second, alpha=alpha, kind="in-season",
                       processed=processed)
    scores = model.scores_from_processed(processed[0])
    q = scores.shape[1]
    d2 = _statistic(model, table.iloc[first], table.iloc[second])
    scale = null_scale(d2, q)
    moves["p_value"] = chi2.sf(d2 / scale, q)
    moves["z"] = norm.isf(np.clip(moves["p_value"].to_numpy(), 1e-300, 1.0))
    moves["null_scale"] = scale
    moves["games_from"] = table["games"].to_numpy()[first]
    moves["games_to"] = table["games"].to_numpy()[second]
    moves["full_move_p"] = chi2.sf(_full_move_stat(model, table, first, second, scores) / scale, q)
    beyond = moves["p_value"].to_numpy() < alpha
    differs = (moves["role_from"] != moves["role_to"]).to_numpy()
    early = ~beyond & (moves["full_move_p"].to_numpy() >= alpha)
    moves["status"] = np.select([beyond & differs, beyond, early, differs],
                                ["changed", "shifted", "too early", "unsettled"], default="steady")
    crit = chi2.isf(alpha, q) * scale
    need = np.zeros(len(first))
    open_ = ~beyond
    if open_.any():
        need[open_] = _games_to_conclusive(model, table, first[open_], second[open_], crit, season_games)
    moves["games_to_conclusive"] = need
    order = np.lexsort((moves["player_id"].to_numpy(), moves["p_value"].to_numpy()))
    moves = moves.iloc[order].reset_index(drop=True)
    return moves[[c for c in INSEASON_COLUMNS if c in moves.columns]], unmatched


def _empty():
    import pandas as pd

    return pd.DataFrame(columns=list(INSEASON_COLUMNS))
