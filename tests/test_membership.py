"""Role membership with the placement's own noise (drift/model/membership.py)."""

from __future__ import annotations

import numpy as np
from scipy import stats

from drift.model._membership import membership_probabilities, true_within_cov


def test_posterior_matches_scipy_gaussians():
    rng = np.random.default_rng(0)
    q, k, n = 3, 4, 20
    centroids = rng.normal(0, 2, (k, q))
    a = rng.normal(size=(q, q))
    within = a @ a.T + np.eye(q)
    point = np.stack([np.eye(q) * v for v in rng.uniform(0, 2, n)])
    x = rng.normal(0, 2, (n, q))
    priors = np.array([1.0, 2.0, 3.0, 4.0])
    got = membership_probabilities(x, centroids, within, priors, point)
    # source: scipy.stats.multivariate_normal densities, Bayes' rule by hand
    dens = np.array([[stats.multivariate_normal(c, within + point[i]).pdf(x[i]) for c in centroids]
                     for i in range(n)]) * priors / priors.sum()
    np.testing.assert_allclose(got, dens / dens.sum(axis=1, keepdims=True), rtol=1e-8)


def test_spherical_equal_weight_case_is_the_former_rule():
    rng = np.random.default_rng(1)
    centroids, x = rng.normal(size=(3, 2)), rng.normal(size=(10, 2))
    d2 = ((x[:, None] - centroids[None]) ** 2).sum(axis=2)
    former = np.exp(-d2 / (2 * 0.7))
    got = membership_probabilities(x, centroids, 0.7 * np.eye(2), np.ones(3))
    np.testing.assert_allclose(got, former / former.sum(axis=1, keepdims=True))


def test_noisier_placement_gets_a_wider_membership():
    centroids = np.array([[0.0, 0.0], [3.0, 0.0]])
    x = np.array([[1.0, 0.0], [1.0, 0.0]])
    point = np.stack([np.zeros((2, 2)), 4 * np.eye(2)])
    p = membership_probabilities(x, centroids, 0.5 * np.eye(2), np.ones(2), point)
    assert p[0, 0] > p[1, 0] > 0.5  # same spot, same favourite, less sure on the small sample


def test_within_cov_of_true_styles_removes_the_noise():
    rng = np.random.default_rng(2)
    centroids = np.array([[0.0, 0.0], [10.0, 0.0]])
    labels = rng.integers(0, 2, 4000)
    noise = np.stack([np.eye(2) * 0.5] * 4000)
    x = centroids[labels] + rng.normal(size=(4000, 2)) * np.sqrt(1.0 + 0.5)
    w = true_within_cov(x, labels, centroids, noise)
    np.testing.assert_allclose(w, np.eye(2), atol=0.1)  # true spread 1, noise 0.5 taken off
