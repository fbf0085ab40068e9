"""Noise model and shrinkage, against Efron & Morris (1975) and simulations with known truth."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from drift.intake.features import exposure_matrix, feature_spec
from drift.model.noise import (consecutive_pairs, fit_noise, james_stein_factor, low_signal_features,
                               shrinkage_factors, transient_variance)

# source: Efron & Morris (1975), JASA 70:311-319, table 1 (18 players after 45 at-bats)
EM_FIRST_45 = [.400, .378, .356, .333, .311, .311, .289, .267, .244, .244, .222, .222, .222, .222,
               .222, .200, .178, .156]
EM_REST = [.346, .298, .276, .222, .273, .270, .263, .210, .269, .230, .264, .256, .303, .264, .226,
           .285, .316, .200]


def test_james_stein_factor_matches_efron_morris():
    y = np.array(EM_FIRST_45)
    ybar = y.mean()
    s2 = ybar * (1 - ybar) / 45
    # source: Efron & Morris (1975): grand mean 0.265, factor c = 0.212 (published to 3 digits)
    assert ybar == pytest.approx(0.265, abs=1e-3)
    assert james_stein_factor(y, s2) == pytest.approx(0.212, abs=1e-3)


def test_shrinkage_factors_reduce_to_james_stein_with_equal_samples():
    y = np.array(EM_FIRST_45)
    s2 = y.mean() * (1 - y.mean()) / 45
    factors, _ = shrinkage_factors(y, np.full(len(y), s2))
    np.testing.assert_allclose(factors, james_stein_factor(y, s2), rtol=1e-12)
    shrunk = y.mean() + factors * (y - y.mean())
    raw_sse = ((y - EM_REST) ** 2).sum()
    shrunk_sse = ((shrunk - EM_REST) ** 2).sum()
    # computed from the published numbers (shared/check-values.md): 0.0754 raw, 0.0213 shrunk
    assert raw_sse == pytest.approx(0.0754, abs=5e-4)
    assert shrunk_sse == pytest.approx(0.0213, abs=5e-4)


def test_no_sample_lands_on_the_mean():
    factors, _ = shrinkage_factors([0.3, np.nan, 0.2, 0.25, 0.4], [0.001, np.inf, 0.001, 0.001, 0.001])
    assert factors[1] == 0.0


def test_consecutive_pairs():
    t = pd.DataFrame({"player_id": ["a", "b", "a", "a", "c"], "season": ["2021", "2021", "2022", "2024", "2022"]})
    i, j = consecutive_pairs(t)
    assert sorted(zip(i.tolist(), j.tolist())) == [(0, 2), (2, 3)]


def test_noise_variance_recovered_by_simulation():
    """Simulation with known truth: sigma2 = 400 per minute, true values constant across seasons."""
    rng = np.random.default_rng(3)
    n = 1500
    truth = rng.normal(20, 4, n)
    minutes = rng.uniform(300, 2500, (2, n))
    obs = truth + rng.normal(0, 1, (2, n)) * np.sqrt(400 / minutes)
    t = pd.DataFrame({"player_id": np.tile(np.arange(n).astype(str), 2),
                      "season": np.repeat(["2021", "2022"], n),
                      "minutes": minutes.ravel(), "usage_pct": obs.ravel()})
    spec = feature_spec(("usage_pct",))
    noise = fit_noise(t, spec, exposure_matrix(t, spec))
    assert noise.loc["usage_pct", "sigma2"] == pytest.approx(400, rel=0.2)
    assert noise.loc["usage_pct", "tau2"] == pytest.approx(16, rel=0.15)
    assert noise.loc["usage_pct", "year_to_year_r"] > 0.9


def _two_seasons(columns, n, rng):
    minutes = rng.uniform(300, 2500, (2, n))
    t = pd.DataFrame({"player_id": np.tile(np.arange(n).astype(str), 2),
                      "season": np.repeat(["2021", "2022"], n), "minutes": minutes.ravel()})
    for name, make in columns.items():
        t[name] = make(minutes).ravel()
    return t


def test_reliability_is_measured_whatever_the_name_says():
    """Known truth: persistent style (var 16), a transient part (var 4) and sampling noise 400 / minutes;
    and a column named like a rate that is pure noise whose spread does not shrink with minutes (what a
    points-per-possession column read as a rate is)."""
    rng = np.random.default_rng(4)
    n = 3000
    style = rng.normal(20, 4, n)
    t = _two_seasons({
        "usage_pct": lambda m: style + rng.normal(0, 2, (2, n)) + rng.normal(0, 1, (2, n)) * np.sqrt(400 / m),
        "roller_pct": lambda m: 1.0 + rng.standard_t(4, (2, n)) * 0.3,
    }, n, rng)
    spec = feature_spec(("usage_pct", "roller_pct"))
    noise = fit_noise(t, spec, exposure_matrix(t, spec))
    assert noise.loc["usage_pct", "tau2"] == pytest.approx(16, rel=0.15)
    assert noise.loc["usage_pct", "transient_var"] == pytest.approx(4, rel=0.3)
    # signal share at the median sample: 16 / (16 + 4 + 400 / median minutes)
    med = float(np.median(t["minutes"]))
    assert noise.loc["usage_pct", "signal_share"] == pytest.approx(16 / (20 + 400 / med), abs=0.05)
    assert abs(noise.loc["roller_pct", "year_to_year_r"]) < 0.08
    assert noise.loc["roller_pct", "signal_share"] < 0.05  # the name said "rate": the data says noise
    assert low_signal_features(noise) == ["roller_pct"]


def test_transient_variance_from_moments():
    # y1 = s + t1, y2 = s + t2 with Var s = 1, Var t = 0.25 and no sampling noise: transient 0.25
    rng = np.random.default_rng(5)
    s = rng.normal(0, 1, 20000)
    y1, y2 = s + rng.normal(0, 0.5, 20000), s + rng.normal(0, 0.5, 20000)
    zero = np.zeros(20000)
    assert transient_variance(y1, y2, zero, zero) == pytest.approx(0.25, abs=0.02)
    # the part the sampling model already explains is not counted twice
    assert transient_variance(y1, y2, zero + 0.25, zero + 0.25) == pytest.approx(0.0, abs=0.02)
    assert transient_variance(y1, y2, zero + 1.0, zero + 1.0) == 0.0  # never negative
