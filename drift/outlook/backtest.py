"""Backtest of the preseason outlook on the user's own seasons, and its scores.

For every season that has earlier pairs of consecutive seasons, the outlook
(:class:`drift.outlook.RoleOutlook`) is refitted on the seasons before it and
scored on what drift placed that season: log loss, Brier score (sum over roles
of the squared error) and the accuracy of the projected role, beside the naive
forecast "same role as last season" with a constant confidence: fitted on the
same earlier seasons (``naive_*``), and the best one for the season scored
(``oracle_*``, an advantage no forecast has). Two calibration tables pool the
scored seasons: every player-and-role chance in bins of 0.1, and players in ten
equal groups by their chance of changing role.
"""

from __future__ import annotations

from dataclasses import dataclass

__all__ = ["Backtest", "backtest", "calibration_table", "change_deciles", "naive_proba", "scores",
           "BACKTEST_COLUMNS", "season_outlook"]


@dataclass(frozen=True)
class Backtest:
    """Scores per season (``seasons``) and the pooled calibration tables (``calibration``:
    role chances in bins of 0.1, then players in deciles of their chance of changing role)."""

    seasons: object
    calibration: object


def scores(prob, truth_idx):
    """Log loss and Brier score of probabilities (n, k) for true columns ``truth_idx``."""
    import numpy as np

    n = len(truth_idx)
    onehot = np.zeros_like(prob)
    onehot[np.arange(n), truth_idx] = 1.0
    ll = float(-np.log(np.clip(prob[np.arange(n), truth_idx], 1e-15, 1.0)).mean())
    brier = float(((prob - onehot) ** 2).sum(axis=1).mean())
    return ll, brier


def naive_proba(last_idx, k, confidence):
    """"Same role as last season" with probability ``confidence``, the rest spread evenly."""
    import numpy as np

    prob = np.full((len(last_idx), k), (1 - confidence) / max(k - 1, 1))
    prob[np.arange(len(last_idx)), last_idx] = confidence
    return prob


#: backtest.csv columns
BACKTEST_COLUMNS = ("season", "scored", "n_train", "n_test", "stay_rate", "log_loss", "brier", "accuracy",
                    "naive_confidence", "naive_log_loss", "naive_brier", "oracle_log_loss", "oracle_brier")
_SCORES = ("log_loss", "brier", "accuracy", "naive_log_loss", "naive_brier", "oracle_log_loss", "oracle_brier")


def _score_season(fitted, train, test, ids):
    """Scores of one season: the outlook, and "same role as last season" at two confidences."""
    import numpy as np

    k = len(ids)
    prob = fitted.predict_proba(test)
    truth = np.array([ids.index(r) for r in test["next_role"]], int)
    last = np.array([ids.index(r) for r in test["role"]], int)
    stay = float((truth == last).mean())
    # the naive confidence a user could have had: the share who kept their role before
    conf = float(np.clip((train["next_role"] == train["role"]).mean(), 1e-6, 1 - 1e-6))
    row = {"scored": True, "stay_rate": stay, "naive_confidence": conf,
           "accuracy": float((prob.argmax(axis=1) == truth).mean())}
    row["log_loss"], row["brier"] = scores(prob, truth)
    row["naive_log_loss"], row["naive_brier"] = scores(naive_proba(last, k, conf), truth)
    oracle = float(np.clip(stay, 1e-6, 1 - 1e-6))
    row["oracle_log_loss"], row["oracle_brier"] = scores(naive_proba(last, k, oracle), truth)
    return row, prob, truth, last


def backtest(placements, model, *, decay=0.5, penalty=10.0, min_pairs=30):
    """Refit the outlook on the seasons before each season and score it on that season.

    Two naive forecasts keep last season's role: ``naive_*`` with the constant
    confidence fitted on the same earlier seasons (the share who kept their role),
    and ``oracle_*`` with the confidence that is best on the season scored (an
    advantage no forecast has). Seasons with fewer than ``min_pairs`` earlier
    pairs are listed with ``scored`` false.

    Returns
    -------
    Backtest
        ``seasons``: :data:`BACKTEST_COLUMNS`, one row per season with a previous one,
        plus an ``all`` row (scores averaged over players); ``calibration``: see
        :func:`calibration_table`.
    """
    import numpy as np
    import pandas as pd

    from drift.outlook.forecast import RoleOutlook, history_table

    h = history_table(placements, decay=decay)
    ids = list(model.role_ids_)
    rows, probs, truths, lasts = [], [], [], []
    for season in sorted(h["next_season"].dropna().unique()):
        train = h[h["next_season"].notna() & (h["next_season"] < season)]
        test = h[h["next_season"] == season].reset_index(drop=True)
        row = {"season": season, "scored": False, "n_train": int(len(train)), "n_test": int(len(test))}
        if len(train) >= min_pairs and len(test):
            fitted = RoleOutlook(decay=decay, penalty=penalty, min_pairs=min_pairs).fit(train, model)
            scored, prob, truth, last = _score_season(fitted, train, test, ids)
            row.update(scored)
            probs.append(prob)
            truths.append(truth)
            lasts.append(last)
        rows.append(row)
    seasons = pd.DataFrame(rows, columns=list(BACKTEST_COLUMNS))
    done = seasons[seasons["scored"].astype(bool)]
    if len(done):
        w = done["n_test"].to_numpy(float)
        allrow = {c: float(np.average(done[c].astype(float), weights=w)) for c in _SCORES}
        allrow.update(season="all", scored=True, n_test=int(w.sum()))
        seasons = pd.concat([seasons, pd.DataFrame([allrow], columns=list(BACKTEST_COLUMNS))],
                            ignore_index=True)
    k = len(ids)
    prob = np.vstack(probs) if probs else np.zeros((0, k))
    truth = np.concatenate(truths) if truths else np.zeros(0, int)
    last = np.concatenate(lasts) if lasts else np.zeros(0, int)
    return Backtest(seasons=seasons, calibration=pd.concat(
        [calibration_table(prob, truth), change_deciles(prob, truth, last)], ignore_index=True))


def change_deciles(prob, truth_idx, last_idx, *, groups=10):
    """Players in ten equal groups by their predicted chance of changing role: predicted and observed.

    Returns
    -------
    DataFrame with :func:`calibration_table`'s columns, ``kind`` = "change decile";
    ``bin_low`` / ``bin_high`` are the smallest and largest chance in the group.
    """
    import numpy as np
    import pandas as pd

    rows = np.arange(len(truth_idx))
    change = 1 - prob[rows, last_idx] if len(rows) else np.zeros(0)
    moved = (truth_idx != last_idx).astype(float)
    order = np.argsort(change, kind="stable")
    out = []
    for part in np.array_split(order, min(groups, len(order))) if len(order) else []:
        pred, obs = float(change[part].mean()), float(moved[part].mean())
        out.append({"kind": "change decile", "bin_low": float(change[part].min()),
                    "bin_high": float(change[part].max()), "n": int(len(part)), "predicted": pred,
                    "observed": obs, "gap": obs - pred})
    return pd.DataFrame(out, columns=["kind", "bin_low", "bin_high", "n", "predicted", "observed", "gap"])


def calibration_table(prob, truth_idx, *, bins=10):
    """Every (player, role) probability in equal-width bins: n, mean predicted, observed share.

    Returns
    -------
    DataFrame: kind (= "role chance"), bin_low, bin_high, n, predicted, observed,
    gap (observed - predicted).
    """
    import numpy as np
    import pandas as pd

    n, k = prob.shape
    hit = np.zeros((n, k))
    if n:
        hit[np.arange(n), truth_idx] = 1.0
    p, y = prob.ravel(), hit.ravel()
    which = np.clip((p * bins).astype(int), 0, bins - 1)
    rows = []
    for b in range(bins):
        sel = which == b
        m = int(sel.sum())
        pred = float(p[sel].mean()) if m else np.nan
        obs = float(y[sel].mean()) if m else np.nan
        rows.append({"kind": "role chance", "bin_low": b / bins, "bin_high": (b + 1) / bins, "n": m, "predicted": pred,
                     "observed": obs, "gap": obs - pred if m else np.nan})
    return pd.DataFrame(rows)


def season_outlook(placements, model, *, decay=0.5, penalty=10.0, min_pairs=30):
    """The outlook for the season after the latest, and its backtest, as a run makes them.

    Returns
    -------
    (DataFrame or None, Backtest or None)
        ``None`` when the data have fewer than ``min_pairs`` pairs of consecutive
        placed seasons (nothing to learn year-to-year stability from).
    """
    from drift.outlook.forecast import RoleOutlook, history_table

    h = history_table(placements, decay=decay)
    if int(h["next_role"].notna().sum()) < min_pairs:
        return None, None
    fitted = RoleOutlook(decay=decay, penalty=penalty, min_pairs=min_pairs).fit(h, model)
    return fitted.outlook(placements), backtest(placements, model, decay=decay, penalty=penalty,
                                                min_pairs=min_pairs)
