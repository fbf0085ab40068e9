"""Processing raw values: shrinkage toward the pool mean."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from drift.model._shrinkage import process
from drift.model.noise import james_stein_factor


def test_equal_samples_give_the_james_stein_factor():
    # Efron & Morris (1975) batting averages, first 45 at-bats (shared/check-values.md)
    y = np.array([.400, .378, .356, .333, .311, .311, .289, .267, .244, .244, .222, .222, .222,
                  .222, .222, .200, .178, .156])
    v = y.mean() * (1 - y.mean()) / 45
    s = ((y - y.mean()) ** 2).sum()
    tau2 = s / (len(y) - 3) - v
    noise = pd.DataFrame({"mean": [y.mean()], "sigma2": [v * 45], "tau2": [tau2], "transient_var": [0.0]})
    out, state = process(y[:, None], np.full((len(y), 1), 45.0), np.full(len(y), 45.0), noise,
                         ("rate",), shrink=True)
    # source: Efron & Morris (1975), c = 1 - (k - 3) s2 / S, about 0.212 for these data
    c = james_stein_factor(y, v)
    assert c == pytest.approx(0.212, abs=0.01)
    np.testing.assert_allclose(state.factor[:, 0], c, rtol=1e-9)
    np.testing.assert_allclose(out[:, 0], y.mean() + c * (y - y.mean()), rtol=1e-9)


def test_missing_values_land_on_the_mean_and_no_shrink_keeps_values():
    noise = pd.DataFrame({"mean": [0.5], "sigma2": [1.0], "tau2": [0.01], "transient_var": [0.0]})
    y = np.array([[0.2], [np.nan], [0.9]])
    e = np.array([[100.0], [0.0], [1e9]])
    out, _ = process(y, e, np.ones(3), noise, ("rate",), shrink=True)
    assert out[1, 0] == 0.5 and abs(out[2, 0] - 0.9) < 1e-6 and 0.2 < out[0, 0] < 0.5
    kept, _ = process(y, e, np.ones(3), noise, ("rate",), shrink=False)
    np.testing.assert_allclose(kept[:, 0], [0.2, 0.5, 0.9])
