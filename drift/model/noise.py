"""Sampling noise of every feature, its reliability, and empirical-Bayes shrinkage.

Model, per feature f and player-season i with sample (exposure) e_if::

    observed = true + noise,   Var(noise) = sigma2_f * g_f(y) / e_if

with g = 1 for most features and g = p(1 - p) for play-type shares (a share is a
proportion of possessions, so its noise is binomial: largest near one half,
nil for a play type never used); p is smoothed toward 1/2 by half a possession.

``sigma2_f`` is estimated from returning players: for two seasons of the same
player, Var(y2 - y1) = drift_f + sigma2_f (1/e1 + 1/e2), where ``drift_f`` is the
true year-to-year change of a typical player. The line is fitted to robust
(median absolute deviation) variances in bins of 1/e1 + 1/e2, so the few real
role changes do not inflate it. With no returning players the cross-section is
used instead: Var(y) = between_f + sigma2_f / e.

The name rule only supplies the sample e (possessions of a play type, minutes);
how much of a feature is signal is *measured*: a value is persistent style +
transient part + sampling noise, and the same players in consecutive seasons
share only the persistent style. So, on the returning players' pairs,

    transient_f = max(Var(y) - Cov(y1, y2) - mean(sigma2_f g / e), 0)

is the spread that neither persists year to year nor shrinks with the sample
(a column whose sample was misread, or a measure that is noise at any sample),
and the persistent between-player variance is tau2_f = max(total_f - transient_f, 0),
total_f = S / (k - 3) - mean(sigma2_f g / e) over the k pool values (S their sum
of squared deviations). A value's noise is then v_i = sigma2_f g / e_i + transient_f,
and shrinkage pulls it toward the pool mean by B_i = tau2 / (tau2 + v_i): with
equal samples and no transient part this is exactly the James-Stein factor of
Efron & Morris (1975), 1 - (k - 3) v / S. A feature whose year-to-year agreement
is nil gets tau2 near 0, so it is shrunk flat and weighs nothing, whatever its
name said. ``signal_share`` = tau2 / (tau2 + transient + sigma2 g / e) at the median
sample. Without 20 returning pairs nothing can be measured: transient = 0 and
the name rule's noise stands alone. A missing value has e = 0 and lands on the mean.
"""

from __future__ import annotations

__all__ = ["james_stein_factor", "shrinkage_factors", "fit_noise", "consecutive_pairs",
           "level_term", "transient_variance", "LOW_SIGNAL_SHARE", "low_signal_features"]

#: a feature whose measured signal share at the median sample is below this is "near zero":
#: it is shrunk nearly flat (so nearly weightless) and named in a warning
LOW_SIGNAL_SHARE = 0.1

_MAD_TO_SD = 1.4826


def james_stein_factor(values, noise_var: float) -> float:
    """Efron & Morris (1975) shrinkage factor c = 1 - (k - 3) s2 / sum (y - ybar)^2, clipped to [0, 1].

    Parameters
    ----------
    values : array of shape (k,)
    noise_var : float
        Sampling variance s2 of each value (all equal).
    """
    import numpy as np

    y = np.asarray(values, float)
    s = float(((y - y.mean()) ** 2).sum())
    return float(np.clip(1 - (len(y) - 3) * noise_var / s, 0.0, 1.0)) if s > 0 else 0.0


def shrinkage_factors(values, noise_var, *, tau2=None):
    """Per-value shrinkage factor toward the mean and the between-value variance tau2.

    Parameters
    ----------
    values : array of shape (k,)
        NaN entries (no sample) are ignored in the estimate and get factor 0.
    noise_var : array of shape (k,)
        Sampling variance of each value (``inf`` for no sample).
    tau2 : float, optional
        A fitted between-value variance; estimated from ``values`` when omitted.

    Returns
    -------
    factors : array of shape (k,)
    tau2 : float
    """
    import numpy as np

    y = np.asarray(values, float)
    v = np.asarray(noise_var, float)
    ok = np.isfinite(y) & np.isfinite(v)
    if tau2 is None:
        k = int(ok.sum())
        if k > 3:
            s = float(((y[ok] - y[ok].mean()) ** 2).sum())
            tau2 = max(s / (k - 3) - float(v[ok].mean()), 0.0)
        else:
            tau2 = 0.0
    with np.errstate(invalid="ignore", divide="ignore"):
        factors = np.where(ok, tau2 / (tau2 + v), 0.0)
    factors = np.where(ok & (v == 0), 1.0, factors)
    return np.nan_to_num(factors, nan=0.0), float(tau2)


def level_term(values, exposure, family: str):
    """The level factor g(y) of the noise variance (see module docstring), same shape as values."""
    import numpy as np

    if family != "share":
        return np.ones_like(np.asarray(values, float))
    e = np.asarray(exposure, float)
    p = (np.nan_to_num(np.asarray(values, float)) * e + 0.5) / (e + 1.0)
    return p * (1 - p)


def consecutive_pairs(table):
    """Row positions (i, j) of the same player in consecutive seasons he appears in.

    Parameters
    ----------
    table : DataFrame with ``player_id`` and ``season``

    Returns
    -------
    first, second : int arrays of equal length
    """
    import numpy as np

    order = np.lexsort((table["season"].to_numpy(), table["player_id"].to_numpy()))
    pid = table["player_id"].to_numpy()[order]
    same = pid[1:] == pid[:-1]
    return order[:-1][same], order[1:][same]


def _robust_line(x, d, *, n_bins=10):
    """Fit Var(d) = a + b x from robust variances in quantile bins of x; returns a, b.

    Where the spread shows no growth with x (too few rows, one sample size for
    all, or a falling line) no sampling noise is claimed: b = 0 and all spread is a.
    """
    import numpy as np
    from scipy.stats import median_abs_deviation

    def robust_var(v):
        return float((_MAD_TO_SD * median_abs_deviation(v)) ** 2) if len(v) else 0.0

    if len(x) < 20 or np.ptp(x) == 0:
        return robust_var(d), 0.0
    n_bins = int(min(n_bins, max(len(x) // 30, 2)))
    edges = np.quantile(x, np.linspace(0, 1, n_bins + 1))
    which = np.clip(np.searchsorted(edges, x, side="right") - 1, 0, n_bins - 1)
    xs, vs, ws = [], [], []
    for b in range(n_bins):
        sel = which == b
        if sel.sum() < 8:
            continue
        xs.append(x[sel].mean())
        vs.append(robust_var(d[sel]))
        ws.append(sel.sum())
    xs, vs, ws = map(np.asarray, (xs, vs, ws))
    if len(xs) < 2 or np.ptp(xs) == 0:
        return robust_var(d), 0.0
    b, a = np.polyfit(xs, vs, 1, w=np.sqrt(ws))
    if b <= 0:
        return float(np.average(vs, weights=ws)), 0.0
    if a < 0:  # a line through the origin, refitted by weighted least squares
        a, b = 0.0, float((ws * xs * vs).sum() / (ws * xs * xs).sum())
    return float(a), float(b)


def transient_variance(y1, y2, noise1, noise2) -> float:
    """Spread of consecutive-season pairs that neither persists nor is sampling noise (>= 0).

    Var(y) (each season about its mean) less the year-to-year covariance Cov(y1, y2) less the
    mean modelled sampling variance ``noise1``, ``noise2`` of the values.
    """
    import numpy as np

    if len(y1) < 2:
        return 0.0
    cov = float(np.mean((y1 - y1.mean()) * (y2 - y2.mean())))
    sampling = float(np.mean(np.concatenate([noise1, noise2])))
    # each season about its own mean: a league-wide trend between seasons is not a player's spread
    return max((float(y1.var()) + float(y2.var())) / 2 - cov - sampling, 0.0)


def fit_noise(table, spec, exposure):
    """Estimate each feature's noise, reliability and shrinkage constants on the pool.

    Parameters
    ----------
    table : DataFrame
        Pool season rows: ``player_id``, ``season`` and the features.
    spec : FeatureSpec
    exposure : array of shape (n_rows, n_features)
        From :func:`drift.intake.features.exposure_matrix`.

    Returns
    -------
    DataFrame indexed by feature with columns ``family``, ``mean``, ``sd``,
    ``sigma2`` (noise variance x sample), ``drift_var`` (true yearly change beyond the
    transient part), ``tau2`` (persistent between-player variance), ``transient_var``
    (spread that neither persists nor shrinks with the sample; part of every value's
    noise), ``year_to_year_r`` (correlation of consecutive seasons of returning
    players; NaN with none), ``signal_share`` (tau2 / (tau2 + transient + sampling
    noise at the median sample)), ``median_sample``, ``n_pairs``, ``missing``
    (values without a sample).
    """
    import numpy as np
    import pandas as pd

    first, second = consecutive_pairs(table)
    rows = []
    for j, name in enumerate(spec.names):
        y = table[name].to_numpy(float)
        e = exposure[:, j]
        has = np.isfinite(y) & (e > 0)
        ok = has[first] & has[second]
        i1, i2 = first[ok], second[ok]
        fam = spec.families[j]
        if len(i1) >= 20:
            mean_e = (e[i1] + e[i2]) / 2
            g = level_term((y[i1] + y[i2]) / 2, mean_e, fam)
            x = g * (1 / e[i1] + 1 / e[i2])
            line_var, sigma2 = _robust_line(x, y[i2] - y[i1])
            r = float(np.corrcoef(y[i1], y[i2])[0, 1]) if np.std(y[i1]) > 0 and np.std(y[i2]) > 0 else np.nan
            transient = transient_variance(y[i1], y[i2], sigma2 * level_term(y[i1], e[i1], fam) / e[i1],
                                           sigma2 * level_term(y[i2], e[i2], fam) / e[i2])
            # the line's intercept is the whole season-to-season spread beyond sampling noise; the
            # transient part of both seasons is in each value's noise, so only the rest is true change
            drift_var = max(line_var - 2 * transient, 0.0)
        else:
            g = level_term(y[has], e[has], fam)
            between, sigma2 = (_robust_line(g / e[has], y[has] - np.median(y[has]))
                               if has.any() else (0.0, 0.0))
            drift_var, r, transient = 0.0, np.nan, 0.0
        v = np.where(has, sigma2 * level_term(y, e, fam) / np.where(has, e, 1.0), np.inf)
        _, total = shrinkage_factors(np.where(has, y, np.nan), v)
        tau2 = max(total - transient, 0.0)
        med_e = float(np.median(e[has])) if has.any() else 0.0
        med_g = float(np.median(level_term(y[has], e[has], fam))) if has.any() else 1.0
        noise_at_median = (sigma2 * med_g / med_e if med_e > 0 else np.inf) + transient
        rows.append({
            "feature": name, "family": spec.families[j],
            "mean": float(np.nanmean(y[has])) if has.any() else 0.0,
            "sd": float(np.nanstd(y[has])) if has.any() else 0.0,
            "sigma2": float(sigma2), "drift_var": float(drift_var), "tau2": float(tau2),
            "transient_var": float(transient), "year_to_year_r": r,
            "signal_share": float(tau2 / (tau2 + noise_at_median)) if tau2 + noise_at_median > 0 else 0.0,
            "median_sample": med_e, "n_pairs": int(len(i1)), "missing": int((~np.isfinite(y)).sum()),
        })
    return pd.DataFrame(rows).set_index("feature")


def low_signal_features(noise) -> list:
    """Features whose measured signal share is below :data:`LOW_SIGNAL_SHARE` (measured = 20+ pairs)."""
    measured = noise["n_pairs"] >= 20
    return list(noise.index[measured & (noise["signal_share"] < LOW_SIGNAL_SHARE)])
