"""Preseason outlook: where a returning player is likely to sit next season, and in which role.

The data's own returning players are the evidence. For every placed season a
player's *history* is summarised by the sample-weighted mean of his component
scores over the seasons so far (each season weighted by its minutes times
``decay`` per season back, so the latest season counts most), together with his
latest role and the decayed minutes behind the summary.

* **Role probabilities** come from a conditional logit (:mod:`drift.outlook._logit`):
  each role's utility for a player is a weighted sum of features of the player
  *and* that role, with weights shared by all roles: he stays (the role is his
  latest); how close his history summary and his latest season sit to the role's
  centre (minus log(1 + d^2 / 2 s^2), s^2 the pool's within-role variance), each
  also times the log sample behind the history (how far to trust it); the role
  is the one nearest his history, or the second nearest his latest season. Per role, the
  role's pull and its own extra stay rate. Every weight except "stays" carries a
  ridge penalty (``penalty``, in players), so with little evidence the outlook is
  "same role as last season" at the data's stay rate, and role-by-role rates are
  regressed toward the league-wide ones. The fit uses every pair of consecutive
  qualifying seasons in the data.
* **Expected position**: per component, a least-squares line of next season's
  score on the history score, its slope depending on the log sample
  (regression to the mean is stronger for short histories); the root-mean-square
  residual distance in three sample-size bins is the position's spread.

:func:`drift.outlook.backtest.backtest` refits all of it on the seasons before each season and scores it
against what happened, beside the naive forecast "same role as last season"
with its own best constant confidence (see docs/cli.md, "Preseason outlook").
"""

from __future__ import annotations

from drift.errors import NotFittedError

__all__ = ["RoleOutlook", "history_table", "OUTLOOK_COLUMNS"]

#: outlook.csv columns before the per-role probabilities (see docs/cli.md, "Preseason outlook")
OUTLOOK_COLUMNS = ("player_id", "player", "season", "team", "minutes", "role", "projected_role",
                   "projected_prob", "stay_prob", "change_prob", "position_spread", "history_seasons",
                   "history_minutes")


def history_table(placements, *, decay=0.5):
    """Per placed season, the player's history up to and including it.

    Parameters
    ----------
    placements : DataFrame
        ``player_id``, ``season``, ``minutes``, ``role`` and ``pc1..pcq`` (as placed).
    decay : float
        Weight of a season per season back, on top of its minutes.

    Returns
    -------
    DataFrame, sorted by player and season, with the placement columns plus
    ``hist_pc1..`` (decayed, minutes-weighted mean scores), ``history_minutes``
    (the decayed minutes), ``history_seasons`` and ``next_role`` / ``next_season``
    (the player's next placed season, empty for his latest) and ``next_pc1..``.
    """
    import numpy as np

    pcs = _pcs(placements)
    t = placements.sort_values(["player_id", "season"], kind="stable").reset_index(drop=True)
    x = t[pcs].to_numpy(float)
    w = t["minutes"].to_numpy(float)
    same_prev = np.r_[False, t["player_id"].to_numpy()[1:] == t["player_id"].to_numpy()[:-1]]
    s, wsum, count = np.zeros_like(x), np.zeros(len(t)), np.zeros(len(t), int)
    for i in range(len(t)):  # a few thousand rows: a plain recursion is clearest
        prev = same_prev[i]
        s[i] = w[i] * x[i] + (decay * s[i - 1] if prev else 0.0)
        wsum[i] = w[i] + (decay * wsum[i - 1] if prev else 0.0)
        count[i] = 1 + (count[i - 1] if prev else 0)
    hist = s / np.maximum(wsum, 1e-9)[:, None]
    for j, c in enumerate(pcs):
        t[f"hist_{c}"] = hist[:, j]
    t["history_minutes"] = wsum
    t["history_seasons"] = count
    has_next = np.r_[same_prev[1:], False]
    nxt = np.r_[np.arange(1, len(t)), 0]
    t["next_season"] = np.where(has_next, t["season"].to_numpy()[nxt], None)
    t["next_role"] = np.where(has_next, t["role"].to_numpy()[nxt], None)
    for c in pcs:
        t[f"next_{c}"] = np.where(has_next, t[c].to_numpy()[nxt], np.nan)
    return t


def _pcs(frame):
    return [c for c in frame.columns if c.startswith("pc") and c[2:].isdigit()]


class RoleOutlook:
    """Next-season role probabilities and expected position of returning players.

    Parameters
    ----------
    decay : float
        Weight of each earlier season per season back (with its minutes).
    penalty : float
        Ridge strength on the per-role terms, in players (larger: each role's rates
        closer to the league-wide ones).
    min_pairs : int
        Fewest consecutive-season pairs needed to fit.

    Attributes
    ----------
    role_ids_ : list of str
    centroids_ : ndarray (k, q)
    within_var_ : float
    n_pairs_ : int
    coef_ : ndarray (m,)
        Conditional-logit coefficients (:meth:`_design` order).
    stay_rates_ : dict
        Role id -> share of its players who kept it the next season.
    slopes_ : ndarray (q, 2)
        Per component, the slope on the history score and its change per unit log sample.
    spread_edges_, spread_ : ndarrays
        Sample-size bin edges (log decayed minutes) and the RMS residual distance in each.
    """

    def __init__(self, *, decay=0.5, penalty=10.0, min_pairs=30):
        self.decay = decay
        self.penalty = penalty
        self.min_pairs = min_pairs

    def _design(self, h):
        """Features (n, k, m) of each history row and role (see :mod:`drift.outlook._logit`).

        Shared: stays (the role is his latest), closeness of the history and of the
        latest season to the role (minus log(1 + d^2 / 2 s^2), s^2 the within-role
        variance), both also times the log sample; nearest to the history; second
        nearest to the latest season. Per role: the role's pull, and its own extra
        stay rate. (A stay weight growing with sample or seasons was tried: it made
        the most stable players' chances of change too low on simulated leagues.)
        """
        import numpy as np

        pcs = [f"pc{j + 1}" for j in range(self.centroids_.shape[1])]
        hist = h[[f"hist_{c}" for c in pcs]].to_numpy(float)
        last = h[pcs].to_numpy(float)
        scale = 2 * self.within_var_
        near_hist = -np.log1p(((hist[:, None, :] - self.centroids_[None]) ** 2).sum(axis=2) / scale)
        near_last = -np.log1p(((last[:, None, :] - self.centroids_[None]) ** 2).sum(axis=2) / scale)
        k = len(self.role_ids_)
        stay = (h["role"].to_numpy()[:, None] == np.asarray(self.role_ids_)[None]).astype(float)
        size = (np.log(np.maximum(h["history_minutes"].to_numpy(float), 1.0)) - self.size_mean_)[:, None]
        rows = np.arange(len(h))
        first_hist = np.zeros_like(stay)
        first_hist[rows, near_hist.argmax(axis=1)] = 1.0
        second_last = np.zeros_like(stay)
        second_last[rows, np.argsort(-near_last, axis=1)[:, 1 if k > 1 else 0]] = 1.0
        shared = np.stack([stay, near_hist, near_last, near_hist * size, near_last * size, first_hist,
                           second_last], axis=2)
        eye = np.broadcast_to(np.eye(k)[None], (len(h), k, k))
        return np.concatenate([shared, eye, stay[:, :, None] * eye], axis=2)

    def fit(self, placements, model):
        """Fit on every pair of a player's consecutive placed seasons.

        Parameters
        ----------
        placements : DataFrame
            As written by :func:`drift.model._placement.place` (all seasons), or a
            :func:`history_table` of them.
        model : RoleModel
            The fitted model that placed them (role ids, centres, within-role variance).

        Returns
        -------
        self
        """
        import numpy as np

        from drift.outlook._logit import fit_choice

        self.role_ids_ = list(model.role_ids_)
        self.centroids_ = np.asarray(model.centroids_, float)
        self.within_var_ = float(model.within_var_)
        h = placements if "hist_pc1" in placements.columns else history_table(placements, decay=self.decay)
        pairs = h[h["next_role"].notna()].reset_index(drop=True)
        if len(pairs) < self.min_pairs:
            raise ValueError(f"the outlook needs at least {self.min_pairs} pairs of consecutive seasons; "
                             f"the data have {len(pairs)}")
        self.n_pairs_ = int(len(pairs))
        self.size_mean_ = float(np.log(np.maximum(pairs["history_minutes"].to_numpy(float), 1.0)).mean())
        y = pairs["next_role"].to_numpy()
        known = np.isin(y, self.role_ids_)
        pairs, y = pairs[known].reset_index(drop=True), y[known]
        X = self._design(pairs)
        # everything but "stays" is pulled toward zero: with no evidence the outlook is
        # "same role as last season" at the data's stay rate
        penalised = np.r_[False, np.ones(X.shape[2] - 1, bool)]
        target = np.array([self.role_ids_.index(r) for r in y], int)
        self.coef_ = fit_choice(X, target, penalised=penalised, penalty=self.penalty)
        self.stay_rates_ = {r: float((y[pairs["role"].to_numpy() == r] == r).mean())
                            for r in self.role_ids_ if (pairs["role"] == r).any()}
        self._fit_position(pairs)
        return self

    def _fit_position(self, pairs):
        import numpy as np

        q = self.centroids_.shape[1]
        size = np.log(np.maximum(pairs["history_minutes"].to_numpy(float), 1.0)) - self.size_mean_
        slopes, intercepts, resid = np.zeros((q, 2)), np.zeros(q), np.zeros((len(pairs), q))
        for j in range(q):
            xh = pairs[f"hist_pc{j + 1}"].to_numpy(float)
            yn = pairs[f"next_pc{j + 1}"].to_numpy(float)
            A = np.column_stack([np.ones_like(xh), xh, xh * size])
            coef, *_ = np.linalg.lstsq(A, yn, rcond=None)
            intercepts[j], slopes[j] = coef[0], coef[1:]
            resid[:, j] = yn - A @ coef
        self.intercepts_, self.slopes_ = intercepts, slopes
        dist2 = (resid ** 2).sum(axis=1)
        self.spread_edges_ = np.quantile(size, [1 / 3, 2 / 3])
        which = np.searchsorted(self.spread_edges_, size)
        overall = float(np.sqrt(dist2.mean()))
        self.spread_ = np.array([float(np.sqrt(dist2[which == b].mean())) if (which == b).any() else overall
                                 for b in range(3)])

    def _check(self):
        if not hasattr(self, "n_pairs_"):
            raise NotFittedError("This RoleOutlook is not fitted yet; call fit(placements, model).")

    def predict_proba(self, history):
        """Role probabilities, shape (n, k) in ``role_ids_`` order, for history rows."""
        from drift.outlook._logit import choice_proba

        self._check()
        return choice_proba(self._design(history), self.coef_)

    def predict_position(self, history):
        """Expected component scores next season (n, q) and each row's spread (n,)."""
        import numpy as np

        self._check()
        q = self.centroids_.shape[1]
        size = np.log(np.maximum(history["history_minutes"].to_numpy(float), 1.0)) - self.size_mean_
        hist = history[[f"hist_pc{j + 1}" for j in range(q)]].to_numpy(float)
        slope = self.slopes_[None, :, 0] + self.slopes_[None, :, 1] * size[:, None]
        expected = self.intercepts_[None] + slope * hist
        return expected, self.spread_[np.searchsorted(self.spread_edges_, size)]

    def outlook(self, placements):
        """One row per player placed in the latest season: the outlook for the season after.

        Returns
        -------
        DataFrame with :data:`OUTLOOK_COLUMNS`, then ``prob_<role>`` per role and the
        expected scores ``exp_pc1..``.
        """
        import numpy as np

        h = history_table(placements, decay=self.decay)
        latest = h[h["season"] == h["season"].max()].reset_index(drop=True)
        prob = self.predict_proba(latest)
        expected, spread = self.predict_position(latest)
        ids = np.asarray(self.role_ids_)
        out = latest[[c for c in ("player_id", "player", "season", "team", "minutes", "role")
                      if c in latest.columns]].copy()
        best = prob.argmax(axis=1)
        out["projected_role"] = ids[best]
        out["projected_prob"] = prob[np.arange(len(out)), best]
        own = np.array([self.role_ids_.index(r) for r in latest["role"]], int)
        out["stay_prob"] = prob[np.arange(len(out)), own]
        out["change_prob"] = 1 - out["stay_prob"]
        out["position_spread"] = spread
        out["history_seasons"] = latest["history_seasons"].to_numpy()
        out["history_minutes"] = latest["history_minutes"].to_numpy()
        for j, r in enumerate(self.role_ids_):
            out[f"prob_{r}"] = prob[:, j]
        for j in range(expected.shape[1]):
            out[f"exp_pc{j + 1}"] = expected[:, j]
        return out.sort_values(["change_prob", "player_id"], ascending=[False, True]).reset_index(drop=True)
