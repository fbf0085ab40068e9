"""Backtest of the preseason outlook on the user's own seasons, and its scores.

For every season that has earlier pairs of consecutive seasons, the outlook
(:class:`drift.outlook.RoleOutlook`) is refitted on the seasons before it and
scored on what drift placed that season: log loss, Brier score (sum over roles
of the squared error) and the accuracy of the projected role, beside the naive
forecast "same role as last season" with the constant confidence that is best on
the season scored. The calibration table pools every player-and-role
probability in bins of 0.1.
"""

from __future__ import annotations

from dataclasses import dataclass

__all__ = ["Backtest", "backtest", "calibration_table", "naive_proba", "scores"]


@dataclass(frozen=True)
class Backtest:
    """Scores per season (``seasons``) and the pooled calibration table (``calibration``)."""

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


def backtest(placements, model, *, decay=0.5, C=0.3, min_pairs=30):
    """Refit the outlook on the seasons before each season and score it on that season.

    The naive forecast keeps last season's role with the constant confidence that
    is best *on the season scored* (the share who kept their role), an oracle
    advantage that makes it a strict baseline. Seasons with fewer than
    ``min_pairs`` earlier pairs are listed with ``scored`` false.

    Returns
    -------
    Backtest
        ``seasons``: season, scored, n_train, n_test, stay_rate, log_loss, brier,
        naive_confidence, naive_log_loss, naive_brier, accuracy (of the projected
        role) plus a pooled ``all`` row; ``calibration``: see :func:`calibration_table`.
    """
    import numpy as np
    import pandas as pd

    from .outlook import RoleOutlook, history_table

    h = history_table(placements, decay=decay)
    ids = list(model.role_ids_)
    k = len(ids)
    rows, probs, truths = [], [], []
    pooled = {"ll": [], "br": [], "nll": [], "nbr": [], "acc": [], "n": []}
    for season in sorted(h["next_season"].dropna().unique()):
        train = h[h["next_season"].notna() & (h["next_season"] < season)]
        test = h[h["next_season"] == season].reset_index(drop=True)
        row = {"season": season, "scored": False, "n_train": int(len(train)), "n_test": int(len(test))}
        if len(train) < min_pairs or not len(test):
            rows.append(row)
            continue
        fitted = RoleOutlook(decay=decay, C=C, min_pairs=min_pairs).fit(train, model)
        prob = fitted.predict_proba(test)
        truth = np.array([ids.index(r) for r in test["next_role"]], int)
        last = np.array([ids.index(r) for r in test["role"]], int)
        stay = float((truth == last).mean())
        conf = float(np.clip(stay, 1e-6, 1 - 1e-6))
        ll, br = scores(prob, truth)
        nll, nbr = scores(naive_proba(last, k, conf), truth)
        acc = float((prob.argmax(axis=1) == truth).mean())
        row.update(scored=True, stay_rate=stay, log_loss=ll, brier=br, naive_confidence=conf,
                   naive_log_loss=nll, naive_brier=nbr, accuracy=acc)
        rows.append(row)
        for key, v in zip(("ll", "br", "nll", "nbr", "acc", "n"), (ll, br, nll, nbr, acc, len(test))):
            pooled[key].append(v)
        probs.append(prob)
        truths.append(truth)
    if pooled["n"]:
        w = np.asarray(pooled["n"], float)
        avg = {key: float(np.average(pooled[key], weights=w)) for key in ("ll", "br", "nll", "nbr", "acc")}
        rows.append({"season": "all", "scored": True, "n_train": np.nan, "n_test": int(w.sum()),
                     "stay_rate": np.nan, "log_loss": avg["ll"], "brier": avg["br"],
                     "naive_confidence": np.nan, "naive_log_loss": avg["nll"], "naive_brier": avg["nbr"],
                     "accuracy": avg["acc"]})
    seasons = pd.DataFrame(rows, columns=["season", "scored", "n_train", "n_test", "stay_rate", "log_loss",
                                          "brier", "naive_confidence", "naive_log_loss", "naive_brier",
                                          "accuracy"])
    calib = calibration_table(np.vstack(probs), np.concatenate(truths)) if probs else calibration_table(
        np.zeros((0, k)), np.zeros(0, int))
    return Backtest(seasons=seasons, calibration=calib)


def calibration_table(prob, truth_idx, *, bins=10):
    """Every (player, role) probability in equal-width bins: n, mean predicted, observed share.

    Returns
    -------
    DataFrame: bin_low, bin_high, n, predicted, observed, gap (observed - predicted).
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
        rows.append({"bin_low": b / bins, "bin_high": (b + 1) / bins, "n": m, "predicted": pred,
                     "observed": obs, "gap": obs - pred if m else np.nan})
    return pd.DataFrame(rows)
