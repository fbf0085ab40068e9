"""Only the work the settings need: shortcuts agree with the full rules, bounds hold."""

from __future__ import annotations

import numpy as np
import pytest
from sklearn.datasets import load_iris, make_blobs
from sklearn.metrics import adjusted_rand_score

from drift.model.count_rules import choose_components, choose_roles
from drift.model.counting import fit_kmeans, select_components, select_roles, subsample


def _iris_z():
    # source: scikit-learn's bundled iris data, standardised
    x = load_iris().data
    return (x - x.mean(axis=0)) / x.std(axis=0)


@pytest.mark.parametrize("rule", [2, 3, 0.9, 0.7])
def test_fixed_components_agree_with_the_full_rule_without_parallel_analysis(rule):
    z = _iris_z()
    n, diag = select_components(z, rule, variance_threshold=0.9, seed=0)
    n_full, full = choose_components(z, rule, variance_threshold=0.9, seed=0)
    assert n == n_full
    # eigenvalues from the covariance agree with numpy's SVD (reference library)
    np.testing.assert_allclose(diag["eigenvalue"], full["eigenvalue"], rtol=1e-10, atol=1e-12)
    # source: shared check-values list (iris standardised: 0.729624; R prcomp 0.7296, from memory)
    assert diag["explained_ratio"].iloc[0] == pytest.approx(0.7296, abs=1e-3)
    assert diag["random_eigenvalue_95"].isna().all()
    assert not diag["pick_parallel"].any()
    assert (diag["pick_variance"] == full["pick_variance"]).all()


def test_automatic_components_on_a_large_pool_use_a_bounded_sample():
    rng = np.random.default_rng(3)
    latent = rng.standard_normal((6000, 3))
    z = latent @ rng.standard_normal((3, 12)) + 0.3 * rng.standard_normal((6000, 12))
    z = (z - z.mean(axis=0)) / z.std(axis=0)
    n_sample, _ = select_components(z, "parallel", max_rows=1500, variance_threshold=0.9, seed=0)
    n_full, _ = choose_components(z, "parallel", variance_threshold=0.9, seed=0)
    assert n_sample == n_full == 3


def test_fixed_roles_give_the_same_fit_as_the_rule_and_skip_the_gap():
    x, _ = make_blobs(n_samples=600, centers=4, n_features=3, random_state=1)
    fast = select_roles(x, 4, seed=0, n_init=3, n_boot=5, max_roles=14)
    full = choose_roles(x, 4, seed=0, n_init=3, n_boot=5, max_roles=14)
    np.testing.assert_array_equal(fast.kmeans.labels_, full.kmeans.labels_)
    np.testing.assert_allclose(fast.stability, full.stability)
    assert fast.diagnostics["gap"].isna().all()
    assert fast.diagnostics["silhouette"].iloc[0] == pytest.approx(full.diagnostics["silhouette"].iloc[0])


def test_automatic_roles_on_a_sample_then_the_final_fit_on_every_row():
    x, truth = make_blobs(n_samples=3000, centers=4, n_features=3, cluster_std=0.8, random_state=2)
    choice = select_roles(x, "auto", max_roles=6, seed=0, n_init=3, n_boot=5, max_rows=400)
    assert choice.k == 4
    assert len(choice.kmeans.labels_) == len(x)
    assert adjusted_rand_score(truth, choice.kmeans.labels_) > 0.99
    assert choice.stability.shape == (4,) and (choice.stability > 0.9).all()


def test_kmeans_on_a_large_pool_refines_a_sampled_start_to_the_full_optimum():
    x, _ = make_blobs(n_samples=5000, centers=6, n_features=4, random_state=4)
    full = fit_kmeans(x, 6, seed=0, n_init=5)
    fast = fit_kmeans(x, 6, seed=0, n_init=5, max_rows=500)
    assert adjusted_rand_score(full.labels_, fast.labels_) > 0.999
    assert fast.inertia_ == pytest.approx(full.inertia_, rel=1e-3)


def test_subsample_is_seeded_sorted_and_only_when_needed():
    assert subsample(10, 10, 0) is None
    a, b = subsample(1000, 50, 7), subsample(1000, 50, 7)
    np.testing.assert_array_equal(a, b)
    assert len(np.unique(a)) == 50 and (np.diff(a) > 0).all()
