"""Conditional logit: with role-specific coefficients it is the multinomial logistic regression."""

from __future__ import annotations

import numpy as np

from drift.outlook._logit import choice_proba, fit_choice


def test_matches_scikit_learn_multinomial_on_wine():
    from sklearn.datasets import load_wine
    from sklearn.linear_model import LogisticRegression

    # source: scikit-learn's bundled wine data and its LogisticRegression (reference library)
    x, y = load_wine(return_X_y=True)
    x = (x - x.mean(axis=0)) / x.std(axis=0)
    n, p = x.shape
    k = 3
    # alternative r carries [e_r (intercept), e_r kron x]: one coefficient set per class
    X = np.zeros((n, k, k + k * p))
    for r in range(k):
        X[:, r, r] = 1.0
        X[:, r, k + r * p: k + (r + 1) * p] = x
    penalised = np.r_[np.zeros(k, bool), np.ones(k * p, bool)]
    beta = fit_choice(X, y, penalised=penalised, penalty=1.0)
    ours = choice_proba(X, beta)
    theirs = LogisticRegression(C=1.0, max_iter=5000, tol=1e-10).fit(x, y).predict_proba(x)
    assert np.abs(ours - theirs).max() < 1e-3


def test_stay_only_model_gives_the_stay_rate():
    rng = np.random.default_rng(0)
    n, k = 2000, 5
    last = rng.integers(0, k, n)
    stays = rng.random(n) < 0.8
    y = np.where(stays, last, (last + rng.integers(1, k, n)) % k)
    X = np.zeros((n, k, 1))
    X[np.arange(n), last, 0] = 1.0
    prob = choice_proba(X, fit_choice(X, y, penalised=np.array([False])))
    # maximum likelihood of a single "stays" weight: the observed stay share
    assert abs(prob[np.arange(n), last].mean() - stays.mean()) < 1e-4
