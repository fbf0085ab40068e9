"""Only the work the settings need, bounded whatever the pool size.

The component and role-count rules of :mod:`drift.model.count_rules` are called from
here, not directly by the model, so that:

* a fixed component count (or fraction) skips parallel analysis: the table of
  eigenvalues and the variance and elbow picks are cheap and are what the report
  shows; the random-data column is left empty;
* a fixed role count skips the sweep over k and the gap statistic; the chosen
  fit's silhouette, Calinski-Harabasz and bootstrap stability are still measured
  (the report shows them), stability on a seeded subsample of bounded size;
* an automatic rule runs on a seeded subsample of bounded size, and only the
  final K-means is fitted on every row;
* K-means on a large pool runs its restarts on a seeded subsample and refines
  the best start once on every row.

Pools at or below the bounds are processed exactly as the rules define them, so
small leagues give the same results as calling the rules directly.
"""

from __future__ import annotations

__all__ = ["select_components", "select_roles", "fit_kmeans", "subsample",
           "MEMBERSHIP_ROWS", "COMPONENT_ROWS", "ROLE_SWEEP_ROWS", "STABILITY_ROWS", "KMEANS_ROWS", "SILHOUETTE_ROWS"]

#: automatic component rules run on at most this many rows
COMPONENT_ROWS = 20_000
#: the automatic role count (sweep, gap, bootstrap) runs on at most this many rows
ROLE_SWEEP_ROWS = 5_000
#: bootstrap stability of a fixed role count runs on at most this many rows
STABILITY_ROWS = 3_000
#: K-means restarts run on at most this many rows; the best start is refined on all
KMEANS_ROWS = 20_000
#: silhouette is computed on a seeded sample of at most this many rows
SILHOUETTE_ROWS = 3_000
#: the within-role covariance of true styles (q x q) is estimated on at most this many rows
MEMBERSHIP_ROWS = 50_000


def subsample(n: int, size: int, seed: int):
    """Sorted positions of a seeded sample of ``size`` out of ``n`` rows, or None if n <= size."""
    import numpy as np

    if n <= size:
        return None
    return np.sort(np.random.default_rng(seed).choice(n, size, replace=False))


def _fixed(rule) -> bool:
    return isinstance(rule, (int, float)) and not isinstance(rule, bool)


def select_components(z, rule, *, variance_threshold: float, seed: int,
                      max_rows: int | None = None):
    """Component count and per-count diagnostics, doing only what ``rule`` needs.

    Parameters
    ----------
    z : array of shape (n, p)
        The standardised, weighted pool matrix.
    rule : {"parallel", "elbow", "variance"}, int or float
    max_rows : int
        Automatic rules run on a seeded sample of at most this many rows.

    Returns
    -------
    n_components : int
    diagnostics : DataFrame (columns of :func:`drift.model.count_rules.choose_components`)
    """
    import numpy as np
    import pandas as pd

    from drift.model.count_rules import choose_components, elbow_count, variance_count

    if not _fixed(rule):
        idx = subsample(len(z), max_rows or COMPONENT_ROWS, seed)
        return choose_components(z if idx is None else z[idx], rule,
                                 variance_threshold=variance_threshold, seed=seed)
    # eigenvalues from the p x p covariance: one pass over the rows, no SVD of the pool
    zc = z - z.mean(axis=0)
    ev = np.clip(np.linalg.eigvalsh(zc.T @ zc / len(z))[::-1], 0.0, None)
    ratios = ev / ev.sum()
    n = variance_count(ratios, rule) if isinstance(rule, float) else int(min(rule, len(ev)))
    picks = {"variance": variance_count(ratios, variance_threshold), "elbow": elbow_count(ratios)}
    diag = pd.DataFrame({
        "n_components": np.arange(1, len(ev) + 1), "eigenvalue": ev, "explained_ratio": ratios,
        "cumulative": np.cumsum(ratios),
        "random_eigenvalue_95": np.nan,  # parallel analysis not run: the count is fixed
    })
    for name, k in picks.items():
        diag[f"pick_{name}"] = diag["n_components"] == k
    diag["pick_parallel"] = False
    diag["chosen"] = diag["n_components"] == n
    return n, diag


def fit_kmeans(x, k: int, *, seed: int = 0, n_init: int = 10, max_rows: int | None = None):
    """K-means with ``n_init`` restarts; on a large pool the restarts run on a sample.

    At or below ``max_rows`` rows this is ``KMeans(k, n_init=n_init,
    random_state=seed).fit(x)``. Above it, the restarts run on a seeded sample of
    ``max_rows`` rows and the best start is refined by one K-means on every row.
    """
    from sklearn.cluster import KMeans

    idx = subsample(len(x), max_rows or KMEANS_ROWS, seed)
    if idx is None:
        return KMeans(n_clusters=k, n_init=n_init, random_state=seed).fit(x)
    start = KMeans(n_clusters=k, n_init=n_init, random_state=seed).fit(x[idx]).cluster_centers_
    return KMeans(n_clusters=k, init=start, n_init=1, random_state=seed).fit(x)


def select_roles(x, rule, *, max_roles: int, seed: int, n_init: int,
                 n_boot: int = 20, max_rows: int | None = None):
    """Role count, diagnostics, stability and the final K-means, doing only what ``rule`` needs.

    Parameters
    ----------
    x : array of shape (n, q)
        Component scores of the pool.
    rule : "auto" or int
    max_rows : int
        The automatic rule runs on a seeded sample of at most this many rows; the
        final K-means is then fitted on every row.

    Returns
    -------
    drift.model.count_rules.RoleChoice
    """
    import numpy as np

    from drift.model.count_rules import RoleChoice, choose_roles

    if not _fixed(rule):
        idx = subsample(len(x), max_rows or ROLE_SWEEP_ROWS, seed)
        choice = choose_roles(x if idx is None else x[idx], rule, max_roles=max_roles, seed=seed,
                              n_init=n_init, n_boot=n_boot)
        if idx is None:
            return choice
        km = fit_kmeans(x, choice.k, seed=seed, n_init=n_init)
        # carry each sample role's stability to the full fit's role it matches
        from scipy.optimize import linear_sum_assignment
        from scipy.spatial.distance import cdist

        rows, cols = linear_sum_assignment(cdist(km.cluster_centers_, choice.kmeans.cluster_centers_))
        stability = np.empty(choice.k)
        stability[rows] = np.asarray(choice.stability)[cols]
        return RoleChoice(choice.k, choice.diagnostics, stability, km)
    return _fixed_roles(x, int(rule), seed=seed, n_init=n_init, n_boot=n_boot)


def _fixed_roles(x, k, *, seed, n_init, n_boot):
    import numpy as np
    import pandas as pd
    from sklearn.metrics import calinski_harabasz_score, silhouette_score

    from drift.model.count_rules import STABLE_JACCARD, RoleChoice, bootstrap_stability

    km = fit_kmeans(x, k, seed=seed, n_init=n_init)
    labels = km.labels_
    row = {"k": k, "inertia": km.inertia_, "silhouette": np.nan, "calinski_harabasz": np.nan}
    if k >= 2 and len(np.unique(labels)) > 1:
        row["silhouette"] = silhouette_score(x, labels, sample_size=min(SILHOUETTE_ROWS, len(x)),
                                             random_state=seed)
        row["calinski_harabasz"] = calinski_harabasz_score(x, labels)
    idx = subsample(len(x), STABILITY_ROWS, seed)
    sx, sl = (x, labels) if idx is None else (x[idx], labels[idx])
    stability = bootstrap_stability(sx, sl, km.cluster_centers_, n_boot=n_boot, seed=seed)
    row["stability_min"], row["stability_mean"] = float(stability.min()), float(stability.mean())
    # the gap statistic compares k with its neighbours: nothing to choose when k is fixed
    row["gap"] = row["gap_se"] = np.nan
    row["stable"] = row["stability_min"] >= STABLE_JACCARD
    row["chosen"] = True
    return RoleChoice(k, pd.DataFrame([row]), stability, km)
