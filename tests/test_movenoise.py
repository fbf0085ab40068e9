"""The null of a move: a statistic that is chi-square when the covariance is right; the calibration."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from scipy import stats

from drift.model._shrinkage import NoiseState
from drift.model.movenoise import MoveCalibration, MoveNull, fit_calibration


def _states(m, p, rng):
    var = rng.uniform(0.5, 2.0, (m, p))
    ones = np.ones((m, p))
    base = rng.uniform(200, 2000, m)
    return NoiseState(var, ones, np.zeros((m, p)), base), NoiseState(var, ones, np.zeros((m, p)), base)


def test_statistic_is_chi_square_under_the_modelled_noise():
    rng = np.random.default_rng(0)
    m, p, q = 4000, 5, 3
    loadings = np.linalg.qr(rng.normal(size=(p, q)))[0].T  # (q, p)
    noise = pd.DataFrame({"tau2": np.zeros(p), "drift_var": np.zeros(p)})
    a, b = _states(m, p, rng)
    null = MoveNull.between(loadings, noise, a, b)
    # simulate feature changes with exactly the modelled variance (v1 + v2), carry them
    change = rng.normal(size=(m, p)) * np.sqrt(a.var + b.var)
    d2 = null.statistic(change @ loadings.T)
    # source: scipy.stats.kstest against scipy's chi2 with q degrees of freedom
    assert stats.kstest(d2, stats.chi2(q).cdf).pvalue > 0.01
    assert null.noise_distance().shape == (m,) and len(null.statistic(np.zeros((0, q)))) == 0


def test_calibration_recovers_a_known_inflation():
    rng = np.random.default_rng(1)
    q, m = 3, 3000
    x = rng.uniform(0.5, 2.0, m)
    true_scale = 1.5 + 0.5 * x / np.median(x)
    d2 = stats.chi2(q).rvs(m, random_state=rng) * true_scale
    cal = fit_calibration(d2, x, q)
    assert cal.a == pytest.approx(1.5, abs=0.25) and cal.b == pytest.approx(0.5, abs=0.25)
    scaled = d2 / cal.scale(1 / (x / 2), 1 / (x / 2))
    assert np.median(scaled) == pytest.approx(stats.chi2(q).median(), rel=0.08)


def test_too_few_pairs_keep_the_model_as_it_is():
    assert fit_calibration(np.ones(5), np.ones(5), 2) == MoveCalibration()


def test_heavy_tail_is_fitted_and_mapped_to_chi_square():
    from drift.model.movenoise import CHI_SQUARE_DF, chi_square_equivalent

    rng = np.random.default_rng(2)
    q, m = 6, 6000
    x = rng.uniform(0.5, 2.0, m)
    # d2 / q drawn from F(q, 8): heavier tail than chi-square at the same median
    d2 = q * stats.f(q, 8).rvs(m, random_state=rng)
    cal = fit_calibration(d2, x, q)
    assert 4 < cal.df < 20
    mapped = chi_square_equivalent(d2 / cal.scale(2 / x, 2 / x), q, cal.df)
    # source: scipy.stats.chi2; after the mapping the tail rates are the nominal ones
    for alpha in (0.01, 0.05):
        assert np.mean(stats.chi2(q).sf(mapped) < alpha) == pytest.approx(alpha, rel=0.3)
    # chi-square data keep (almost) chi-square: a large df, and the mapping is the identity at 1e6
    plain = fit_calibration(stats.chi2(q).rvs(m, random_state=rng), x, q)
    assert plain.df > 50
    assert np.array_equal(chi_square_equivalent(d2, q, CHI_SQUARE_DF), d2)
