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


def test_within_cov_from_a_bounded_sample_matches_the_whole_pool():
    """Large pools estimate the q x q covariance on a seeded sample (drift.model.counting.MEMBERSHIP_ROWS)."""
    from drift.model.counting import subsample

    rng = np.random.default_rng(3)
    q, k, n = 3, 4, 40_000
    centroids = rng.normal(0, 4, (k, q))
    labels = rng.integers(0, k, n)
    true_w = np.diag([1.0, 0.5, 0.25])
    noise = np.broadcast_to(0.1 * np.eye(q), (n, q, q))
    x = centroids[labels] + rng.multivariate_normal(np.zeros(q), true_w + 0.1 * np.eye(q), n)
    whole = true_within_cov(x, labels, centroids, noise)
    idx = subsample(n, 10_000, 0)
    sample = true_within_cov(x[idx], labels[idx], centroids, noise[idx])
    # the known truth is recovered by both, and the sample's error is sampling error only
    np.testing.assert_allclose(whole, true_w, atol=0.03)
    np.testing.assert_allclose(sample, whole, atol=0.03)
