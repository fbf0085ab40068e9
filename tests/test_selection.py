"""Component and role counts against bundled scikit-learn datasets and published methods."""

from __future__ import annotations

import numpy as np
import pytest
from sklearn.cluster import KMeans
from sklearn.datasets import load_breast_cancer, load_iris, load_wine, make_blobs
from sklearn.decomposition import PCA
from sklearn.preprocessing import StandardScaler

from drift.model.count_rules import (
    choose_components,
    choose_roles,
    eigenvalues,
    elbow_count,
    gap_consensus,
    gap_margins,
    gap_tolerant,
    reference_log_w,
    gap_pick,
    gap_statistic,
    parallel_analysis,
    variance_count,
)


def _std(loader):
    return StandardScaler().fit_transform(loader().data)


def test_correlation_eigenvalues_iris():
    # source: shared/check-values.md, eigenvalues of iris' correlation matrix (computed)
    np.testing.assert_allclose(eigenvalues(_std(load_iris)), [2.9185, 0.9140, 0.1468, 0.0207], atol=1e-4)


def test_explained_variance_ratios_standardised_iris():
    n, diag = choose_components(_std(load_iris), 2, variance_threshold=0.9, seed=0)
    # source: R prcomp(iris[,1:4], scale.=TRUE) gives 0.7296, 0.2285, 0.0367, 0.0052 (from memory);
    # scikit-learn 1.9.1 on bundled iris gives 0.729624, 0.228508, 0.036689, 0.005179
    np.testing.assert_allclose(diag["explained_ratio"], [0.729624, 0.228508, 0.036689, 0.005179], atol=1e-5)
    assert diag["cumulative"].iloc[1] == pytest.approx(0.958, abs=1e-3)


def test_raw_iris_differs_so_standardising_matters():
    raw = load_iris().data
    # source: scikit-learn documentation, "Comparison of LDA and PCA 2D projection of Iris dataset"
    ratios = PCA(2).fit(raw).explained_variance_ratio_
    np.testing.assert_allclose(ratios, [0.92461872, 0.05306648], atol=1e-6)
    _, diag = choose_components(raw, 2, variance_threshold=0.9, seed=0)
    np.testing.assert_allclose(diag["explained_ratio"].iloc[:2], ratios, atol=1e-6)
    _, std_diag = choose_components(_std(load_iris), 2, variance_threshold=0.9, seed=0)
    assert std_diag["explained_ratio"].iloc[0] < 0.75


@pytest.mark.parametrize("loader, at80, at90, at95, first", [
    # source: shared/check-values.md (computed on bundled data; equals PCA(n_components=0.90))
    (load_wine, 5, 8, 10, [0.361988, 0.192075, 0.111236, 0.070690, 0.065633]),
    (load_breast_cancer, 5, 7, 10, [0.44272, 0.18971, 0.09393]),
])
def test_variance_thresholds_wine_and_breast_cancer(loader, at80, at90, at95, first):
    z = _std(loader)
    _, diag = choose_components(z, 1, variance_threshold=0.9, seed=0)
    np.testing.assert_allclose(diag["explained_ratio"].iloc[:len(first)], first, atol=1e-5)
    ratios = diag["explained_ratio"].to_numpy()
    assert [variance_count(ratios, t) for t in (0.80, 0.90, 0.95)] == [at80, at90, at95]
    assert PCA(n_components=0.90).fit(z).n_components_ == at90  # reference library agrees


@pytest.mark.parametrize("loader, kept", [(load_iris, 1), (load_wine, 3), (load_breast_cancer, 5)])
def test_parallel_analysis(loader, kept):
    # Horn (1965), Psychometrika 30(2):179-185; a direct simulation with 1000 draws keeps 1 / 3 / 5
    # (shared/check-values.md: our own computation, a regression check)
    z = _std(loader)
    assert parallel_analysis(z, n_draws=300)[0] == kept
    assert parallel_analysis(z, n_draws=300, quantile=None)[0] == kept  # Horn's original mean rule


def test_parallel_threshold_agrees_with_direct_simulation():
    z = _std(load_wine)
    _, thr = parallel_analysis(z, n_draws=400, quantile=None, seed=1)
    rng = np.random.default_rng(99)
    direct = np.mean([eigenvalues(StandardScaler().fit_transform(rng.standard_normal(z.shape)))
                      for _ in range(400)], axis=0)
    np.testing.assert_allclose(thr, direct, rtol=0.02)


def test_kaiser_rule_counts():
    # source: shared/check-values.md, Kaiser rule (eigenvalue > 1) keeps 1 / 3 / 6 (computed)
    assert [int((eigenvalues(_std(l)) > 1).sum()) for l in (load_iris, load_wine, load_breast_cancer)] == [1, 3, 6]


def test_elbow_is_the_knee_of_the_cumulative_curve():
    ratios = np.array([0.5, 0.3, 0.05, 0.05, 0.05, 0.05])
    assert elbow_count(ratios) == 2
    assert elbow_count([0.7, 0.1, 0.1, 0.1]) == 1


def test_gap_statistic_picks_four_blobs():
    x, _ = make_blobs(300, centers=4, cluster_std=0.6, random_state=0)
    ks = list(range(1, 9))
    gap, s = gap_statistic(x, ks, n_refs=10)
    # Tibshirani, Walther & Hastie (2001), JRSS B 63(2):411-423, 1-SE rule; 4 is our own computation
    assert gap_pick(ks, gap, s) == 4


def test_wine_roles_three_by_silhouette_and_calinski_harabasz():
    z = _std(load_wine)
    choice = choose_roles(z, "auto", max_roles=8, n_boot=10, method="vote", seed=0, n_init=10)
    k, diag = choice.k, choice.diagnostics
    row = diag.set_index("k").loc[3]
    # source: shared/check-values.md, k-means k=3 on standardised wine (n_init=10, random_state=0)
    assert row["silhouette"] == pytest.approx(0.2849, abs=1e-3)
    assert row["calinski_harabasz"] == pytest.approx(70.94, abs=0.05)
    assert diag.loc[diag["silhouette"].idxmax(), "k"] == 3
    assert diag.loc[diag["calinski_harabasz"].idxmax(), "k"] == 3
    assert k == 3 and choice.stability.min() > 0.8 and len(choice.kmeans.cluster_centers_) == 3
    assert choice.picks["silhouette"] == choice.picks["calinski_harabasz"] == 3


def test_gap_consensus_is_the_median_of_its_seeds_and_finds_blobs():
    x, _ = make_blobs(400, n_features=5, centers=6, cluster_std=1.0, center_box=(-10, 10),
                      random_state=3)
    ks = list(range(1, 10))
    log_w = [np.log(((x - x.mean(0)) ** 2).sum())] + [
        np.log(KMeans(k, n_init=10, random_state=0).fit(x).inertia_) for k in ks[1:]]
    k, picks, curves = gap_consensus(x, ks, log_w, n_refs=10, seeds=(0, 1, 2))
    assert k == sorted(picks)[1] and len(curves) == 3 and len(curves[0][0]) == len(ks)
    # six well separated blobs: the 1-SE rule of Tibshirani, Walther & Hastie (2001) finds them
    assert k == 6


def test_global_gap_rule_is_not_stopped_by_a_plateau():
    # a gap curve that rises, levels off at k = 2, and rises again to its maximum at k = 5
    ks = [1, 2, 3, 4, 5, 6]
    gap = np.array([0.0, 0.30, 0.31, 0.32, 1.00, 0.98])
    s = np.full(6, 0.05)
    # firstSEmax vs globalSEmax: Dudoit & Fridlyand (2002), as in R's cluster::maxSE (from memory)
    assert gap_pick(ks, gap, s) == 2 and gap_pick(ks, gap, s, how="global") == 5


def test_default_rule_is_the_gap_and_stability_never_vetoes():
    x, _ = make_blobs(300, centers=[[0, 0], [8, 0], [0, 8], [8, 8], [4, 14]], cluster_std=1.0,
                      random_state=1)
    choice = choose_roles(x, "auto", max_roles=8, n_boot=5, seed=0, n_init=10)
    diag = choice.diagnostics.set_index("k")
    assert choice.k == choice.picks["gap"] == 5
    assert {"stable", "gap_votes", "pick_vote", "chosen"} <= set(diag.columns)
    assert diag.loc[5, "gap_votes"] >= 2
    # a k with an unstable role can still be chosen: stability is reported, not used
    low = choose_roles(np.random.default_rng(0).normal(size=(200, 2)), "auto", max_roles=6, n_boot=5, seed=0, n_init=10)
    assert low.k in range(2, 7) and "stable" in low.diagnostics


def test_fixed_roles_skip_the_search():
    z = _std(load_iris)
    choice = choose_roles(z, 4, n_boot=3, max_roles=14, seed=0, n_init=10)
    assert choice.k == 4 and list(choice.diagnostics["k"]) == [4]


def test_gap_margins_are_the_one_se_rule_with_their_own_uncertainty():
    # two counts, four reference sets: every figure by hand (Tibshirani et al. 2001, s = sd * sqrt(1 + 1/B))
    ref = np.array([[5.0, 4.0], [5.2, 4.1], [4.8, 3.9], [5.0, 4.2]])
    log_w = np.array([4.0, 2.5])
    margin, se = gap_margins(log_w, ref)
    gap = ref.mean(0) - log_w
    s = ref.std(0) * np.sqrt(1 + 1 / 4)
    assert margin[0] == pytest.approx(gap[0] - gap[1] + s[1])
    paired = ref[:, 0] - ref[:, 1]
    assert se[0] == pytest.approx(np.sqrt(paired.var(ddof=1) / 4 + s[1] ** 2 / 8))


def test_tolerant_gap_rule_finds_blobs_on_every_seed_and_measures_knife_edges_again():
    x, _ = make_blobs(400, n_features=5, centers=6, cluster_std=1.0, center_box=(-10, 10), random_state=3)
    ks = list(range(1, 11))
    picks = []
    for seed in (0, 1, 2, 3):
        log_w = [np.log(((x - x.mean(0)) ** 2).sum())] + [
            np.log(KMeans(k, n_init=10, random_state=seed).fit(x).inertia_) for k in ks[1:]]
        refs = np.vstack([reference_log_w(x, ks, n_refs=10, seed=s, n_init=1) for s in (seed, seed + 1, seed + 2)])
        k, margin, se, refined = gap_tolerant(x, ks, log_w, refs, more_refs=(seed + 3, seed + 4, seed + 5))
        picks.append(k)
        # every decision not measured again was taken on a margin beyond three times its uncertainty
        first = ks.index(k)
        for i in range(first + 1):
            assert ks[i] in refined or abs(margin[i]) > 3 * se[i]
    assert picks == [6, 6, 6, 6]  # six well separated blobs, whatever the seed


def test_a_margin_within_its_uncertainty_is_measured_again_and_then_stops():
    # a uniform cloud: no k beats the reference clearly, so k = 1 is not decided on its first margin
    x = np.random.default_rng(0).uniform(size=(300, 2))
    ks = [1, 2, 3, 4]
    log_w = [np.log(((x - x.mean(0)) ** 2).sum())] + [
        np.log(KMeans(k, n_init=10, random_state=0).fit(x).inertia_) for k in ks[1:]]
    refs = np.vstack([reference_log_w(x, ks, n_refs=10, seed=s, n_init=1) for s in (0, 1, 2)])
    k, margin, se, refined = gap_tolerant(x, ks, log_w, refs, more_refs=(3, 4, 5))
    assert k == 1 and (refined == [1] or margin[0] > 3 * se[0])
