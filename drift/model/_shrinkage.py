"""Processing of raw feature values: empirical-Bayes shrinkage toward the pool mean.

A pure function of the values, their samples and the pool's fitted noise table
(:func:`drift.model.noise.fit_noise`); the estimator and the move statistics share it,
so a fitted and a loaded model process data identically.
"""

from __future__ import annotations

from dataclasses import dataclass

__all__ = ["NoiseState", "process"]


@dataclass(frozen=True)
class NoiseState:
    """Per-value noise variance ``var``, shrinkage ``factor`` and share term ``u``, each (n, p).

    ``var`` is the sampling noise at the value's sample plus the feature's measured
    transient variance (the spread that does not persist year to year).

    ``u`` is non-zero for play-type shares only: their noise covariance is
    -u_a u_b off the diagonal (multinomial), so a share's rise is partly
    another's fall. ``base`` (n,) is each row's minutes, at least 1 (the sample
    size of the move calibration).
    """

    var: object
    factor: object
    u: object
    base: object

    def take(self, index) -> "NoiseState":
        """The state of the rows ``index`` (positions or a mask)."""
        return NoiseState(self.var[index], self.factor[index], self.u[index], self.base[index])


def process(values, exposure, base, noise, families, *, shrink: bool):
    """Processed feature values, shape (n, p), and their :class:`NoiseState`.

    Parameters
    ----------
    values : array of shape (n, p)
        Raw feature values (NaN = no value).
    exposure : array of shape (n, p)
        Sample behind each value (:func:`drift.intake.features.exposure_matrix`); 0 = none.
    base : array of shape (n,)
        Each row's sample, used by the move calibration.
    noise : DataFrame indexed by feature
        The pool's noise table: ``mean``, ``sigma2``, ``tau2``, ``transient_var``.
    families : sequence of str, length p
    shrink : bool
        Pull each value toward the pool mean by B = tau2 / (tau2 + v); when
        False a value is kept as it is and only missing values get the mean.
    """
    import numpy as np

    from drift.model.noise import level_term

    mean = noise["mean"].to_numpy(float)
    sigma2 = noise["sigma2"].to_numpy(float)
    tau2 = noise["tau2"].to_numpy(float)
    transient = noise["transient_var"].to_numpy(float)
    has = np.isfinite(values) & (exposure > 0)
    level = np.column_stack([level_term(values[:, j], exposure[:, j], fam)
                             for j, fam in enumerate(families)])
    with np.errstate(divide="ignore", invalid="ignore"):
        # sampling noise at this sample plus the measured transient part (see drift.model.noise)
        v = np.where(has, sigma2 * level / np.where(has, exposure, 1.0) + transient, 0.0)
        factor = np.where(has, tau2 / (tau2 + v), 0.0) if shrink else has.astype(float)
    factor = np.nan_to_num(factor, nan=1.0)
    y = np.where(has, values, mean)
    processed = mean + factor * (y - mean)
    # shares of one player's possessions are multinomial: Cov(a, b) = -u_a u_b
    is_share = np.array([f == "share" for f in families])
    with np.errstate(divide="ignore", invalid="ignore"):
        p_smooth = (np.nan_to_num(values) * exposure + 0.5) / (exposure + 1.0)
        u = np.where(has & is_share, np.sqrt(sigma2 / np.where(has, exposure, 1.0)) * p_smooth, 0.0)
    return processed, NoiseState(v, factor, np.nan_to_num(u), base)
