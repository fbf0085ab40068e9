"""The null distribution of a move: its covariance under "no real change" and its calibration.

For a pair of placements the processed feature change has, under the null,
variance B1^2 v1 + B2^2 v2 + (B2 - B1)^2 tau2 + B1 B2 drift per feature (the
sampling noise of both, the change unequal shrinkage alone makes for a player
away from the mean, and the typical true yearly change of a returning player),
plus the multinomial covariance of play-type shares. Carried into component
space by the loadings, it is scaled by a line a + b x fitted on the pool's
returning players (x = 1/m1 + 1/m2 of the two seasons' minutes over its pool
median: rate stats settle with minutes on the floor, whatever the possessions).
Small samples give heavier tails than a Gaussian (shares and points per
possession on a few possessions), so the squared Mahalanobis length over q is
taken as F(q, df) with df fitted on the same pairs (the ratio of the 90th to the
50th percentile); the statistic is returned as its chi-square equivalent, so a
p-value is ``chi2.sf(statistic, q)`` whatever df is (df = 1e6 is chi-square).

:class:`MoveNull` is built once per pair table and serves both the statistic
and the noise distance.
"""

from __future__ import annotations

from dataclasses import dataclass

__all__ = ["MoveCalibration", "MoveNull", "fit_calibration", "null_in_blocks", "BLOCK",
           "chi_square_equivalent", "CHI_SQUARE_DF"]

#: pairs whose null covariance (block x q x q floats) is held in memory at once
BLOCK = 16_384

#: moves beyond this null quantile are left out of the calibration (clear movers)
_CLEAR_MOVER = 0.999
_BINS = 5
_MIN_PAIRS = 30
_MIN_PER_BIN = 10
#: degrees of freedom standing for "chi-square" (no extra tail)
CHI_SQUARE_DF = 1e6
_DF_GRID = (2.5, 3, 4, 5, 6, 8, 10, 15, 20, 30, 50, 100, 300, CHI_SQUARE_DF)


@dataclass(frozen=True)
class MoveCalibration:
    """Scale a + b x of the null covariance; x is clipped to [low, high] (no extrapolation).

    The default is "as modelled": scale 1 for every pair.
    """

    a: float = 1.0
    b: float = 0.0
    sample: float = 1.0
    low: float = 0.0
    high: float = 1e12
    df: float = CHI_SQUARE_DF

    def scale(self, base_from, base_to):
        """The factor, shape (m,), for pairs with samples ``base_from`` and ``base_to``."""
        import numpy as np

        x = (1 / base_from + 1 / base_to) / self.sample
        x = np.clip(x, self.low, self.high)
        return self.a + self.b * x


@dataclass(frozen=True)
class MoveNull:
    """Null covariance ``cov`` (m, q, q) of m moves in component space."""

    cov: object
    df: float = CHI_SQUARE_DF

    @classmethod
    def between(cls, loadings, noise, noise_from, noise_to, calibration=MoveCalibration()):
        """Build the null of moves from ``noise_from`` to ``noise_to`` (:class:`NoiseState`, m rows).

        Parameters
        ----------
        loadings : array of shape (q, p)
            Component scores per unit of each processed feature.
        noise : DataFrame indexed by feature with ``tau2`` and ``drift_var``.
        calibration : MoveCalibration
        """
        b1, b2 = noise_from.factor, noise_to.factor
        tau2 = noise["tau2"].to_numpy(float)
        drift = noise["drift_var"].to_numpy(float)
        feature_var = (b1 ** 2 * noise_from.var + b2 ** 2 * noise_to.var
                       + (b2 - b1) ** 2 * tau2 + b1 * b2 * drift)
        cov = _carry(loadings, feature_var)
        for state in (noise_from, noise_to):
            u = state.factor * state.u
            lu = u @ loadings.T  # (m, q)
            cov = cov + _carry(loadings, u ** 2) - lu[:, :, None] * lu[:, None, :]
        return cls(calibration.scale(noise_from.base, noise_to.base)[:, None, None] * cov, calibration.df)

    def statistic(self, delta):
        """Squared Mahalanobis length of the moves ``delta`` (m, q): chi-square, q d.o.f., under the null."""
        import numpy as np

        if not len(delta):
            return np.zeros(0)
        cov = self.cov + np.eye(self.cov.shape[1])[None] * 1e-9
        solved = np.linalg.solve(cov, delta[..., None])[..., 0]
        return chi_square_equivalent((delta * solved).sum(axis=1), self.cov.shape[1], self.df)

    def noise_distance(self):
        """Root of the total null variance of each move, shape (m,): a typical no-change distance."""
        import numpy as np

        return np.sqrt(np.trace(self.cov, axis1=1, axis2=2))


def null_in_blocks(make_null, noise_from, noise_to, delta, *, block=None):
    """Statistic and noise distance of m moves, their null built one block of pairs at a time.

    ``make_null(from_block, to_block)`` builds the :class:`MoveNull` of a block of
    pairs (:class:`NoiseState` rows). The null of m pairs is an (m, q, q) array; in
    blocks of :data:`BLOCK` pairs memory stays bounded whatever m, and each pair's
    figures depend on that pair only, so they are the same as in one block.

    Returns
    -------
    d2, noise_distance : arrays of shape (m,)
    """
    import numpy as np

    block = block or BLOCK
    m = len(delta)
    d2, noise_distance = np.zeros(m), np.zeros(m)
    for start in range(0, m, block):
        part = np.arange(start, min(start + block, m))
        null = make_null(noise_from.take(part), noise_to.take(part))
        d2[part] = null.statistic(delta[part])
        noise_distance[part] = null.noise_distance()
    return d2, noise_distance


def _carry(loadings, feature_var):
    """Covariance in component space, (m, q, q), of independent feature noise (m, p)."""
    import numpy as np

    # one matrix product: row n of feature_var times the outer products l_p l_p^T of the columns
    q, p = loadings.shape
    outer = (loadings.T[:, :, None] * loadings.T[:, None, :]).reshape(p, q * q)
    return (np.asarray(feature_var) @ outer).reshape(-1, q, q)


def chi_square_equivalent(d2, q: int, df: float):
    """The chi-square (q d.o.f.) value with the same upper tail as d2 / q under F(q, df)."""
    import numpy as np
    from scipy.stats import chi2, f

    if df >= CHI_SQUARE_DF:
        return d2
    p = np.clip(f.sf(np.asarray(d2, float) / q, q, df), 1e-300, 1.0)
    return chi2.isf(p, q)


def _tail_df(r, q):
    """df of F(q, df) whose 90th / 50th percentile ratio matches that of r (r = scaled d2 / q)."""
    import numpy as np
    from scipy.stats import f

    ratio = np.quantile(r, 0.9) / np.quantile(r, 0.5)
    ratios = np.array([f.ppf(0.9 * _CLEAR_MOVER, q, d) / f.ppf(0.5 * _CLEAR_MOVER, q, d) for d in _DF_GRID])
    # the ratio falls as df grows: interpolate on the reversed (increasing) grid
    return float(np.interp(ratio, ratios[::-1], np.array(_DF_GRID)[::-1]))


def fit_calibration(d2, raw_x, q: int) -> MoveCalibration:
    """Fit a + b x so the pool's returning players' statistics ``d2`` follow the null.

    Parameters
    ----------
    d2 : array of shape (m,)
        Uncalibrated statistics of the pool's consecutive-season pairs.
    raw_x : array of shape (m,)
        1/m1 + 1/m2 of each pair.
    q : int
        Components (degrees of freedom).

    In bins of sample size, the scale that puts the median on the null's median
    (the null truncated at its 99.9th percentile, since clear movers are left
    out); then a weighted line through the bins, refitted five times. Then the
    tail: df of F(q, df) from the 90th / 50th percentile ratio of the scaled
    statistics, and the scale refitted so their median is F's median.
    """
    import numpy as np
    from scipy.stats import chi2, f

    if len(d2) < _MIN_PAIRS:
        return MoveCalibration()
    median = float(np.median(raw_x))
    x = raw_x / median
    null_median = chi2.ppf(0.5 * _CLEAR_MOVER, q)
    keep = np.ones(len(d2), bool)
    a, b = 1.0, 0.0
    for _ in range(5):
        edges = np.quantile(x[keep], np.linspace(0, 1, _BINS + 1))
        which = np.clip(np.searchsorted(edges, x, side="right") - 1, 0, _BINS - 1)
        xs, cs, ws = [], [], []
        for bin_ in range(_BINS):
            sel = keep & (which == bin_)
            if sel.sum() >= _MIN_PER_BIN:
                xs.append(x[sel].mean())
                cs.append(np.median(d2[sel]) / null_median)
                ws.append(sel.sum())
        b, a = (np.polyfit(xs, cs, 1, w=np.sqrt(ws)) if len(xs) >= 2 and np.ptp(xs) > 0
                else (0.0, float(np.median(d2[keep]) / null_median)))
        if min(a + b * x.min(), a + b * x.max()) <= 0:
            a, b = float(np.median(d2[keep]) / null_median), 0.0
        keep = d2 / (a + b * x) <= chi2.ppf(_CLEAR_MOVER, q)
    df = CHI_SQUARE_DF
    for _ in range(3):
        r = d2 / (a + b * x) / q
        keep = f.sf(r, q, df) >= 1 - _CLEAR_MOVER
        df = _tail_df(r[keep], q)
        c = float(np.median(r[keep]) / f.ppf(0.5 * _CLEAR_MOVER, q, df))
        a, b = a * c, b * c
    return MoveCalibration(float(a), float(b), median, float(x.min()), float(x.max()), float(df))
