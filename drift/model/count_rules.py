"""How many components and how many roles: the stated methods and their diagnostics.

Components (on the standardised, weighted pool matrix):

* ``variance`` -- the smallest count whose cumulative explained variance reaches a threshold;
* ``elbow`` -- the count where the cumulative curve's slope falls to the slope of the
  chord from its first to its last point, i.e. the point farthest above that chord
  (the "knee" of Satopaa et al. 2011, "Finding a 'Kneedle' in a Haystack");
* ``parallel`` -- Horn's (1965) parallel analysis: keep component i while its eigenvalue
  exceeds the 95th percentile of the i-th eigenvalue of random normal data of the same
  shape and column scales;
* a fixed count.

Roles (K-means on the pool's component scores), for k in 2..max_roles:

* silhouette (higher is better), Calinski-Harabasz (higher is better);
* the gap statistic with the one-standard-error rule (Tibshirani, Walther & Hastie 2001),
  reference sets uniform over the box of the component scores (PCA-aligned);
* bootstrap stability: refit on resamples, match each resample's roles to the full fit's
  by the Hungarian algorithm, and take each role's mean Jaccard overlap.

The default decision (``method="gap"``, measured on the simulated-league family of
:mod:`drift.sim.family` by ``benchmarks/role_count.py``): the gap statistic's
one-standard-error rule on three seeds' reference draws pooled, where a margin within
its own uncertainty (the standard error of the reference sets' paired differences) is
not decided on: more reference draws re-measure it, and a margin still within noise
stops (a further role must show a gain beyond noise). Silhouette and
Calinski-Harabasz favour the coarse guards/wings/bigs split when roles blend, so they
are reported, not used. A k whose least stable role is below 0.6 is marked
(``stable`` false), a warning and not a veto. The former rule (``method="vote"``: stable
k only, two of silhouette, Calinski-Harabasz and gap agreeing) stays available.
"""

from __future__ import annotations

from dataclasses import dataclass

__all__ = [
    "RoleChoice",
    "eigenvalues", "parallel_analysis", "elbow_count", "variance_count", "choose_components",
    "gap_statistic", "gap_pick", "gap_consensus", "reference_log_w", "gap_margins", "gap_tolerant",
    "bootstrap_stability", "choose_roles",
    "STABLE_JACCARD", "ROLE_METHODS",
]

from drift.constants import STABLE_JACCARD  # noqa: E402  (re-exported for callers)
from drift.model._gap import (  # noqa: E402  (re-exported: the gap statistic lives in its own module)
    _log_inertia, gap_consensus, gap_margins, gap_pick, gap_statistic, gap_tolerant, reference_log_w)

ROLE_METHODS = ("gap", "gap_median", "gap_global", "gap_single", "vote", "silhouette", "calinski_harabasz")


def eigenvalues(z):
    """Eigenvalues (descending) of the covariance (ddof=0) of z, shape (n, p) -> (p,).

    On standardised data these are the correlation matrix's eigenvalues.
    """
    import numpy as np

    z = np.asarray(z, float)
    zc = z - z.mean(axis=0)
    s = np.linalg.svd(zc, compute_uv=False)
    ev = np.zeros(z.shape[1])
    ev[: len(s)] = s ** 2 / len(z)
    return ev


def parallel_analysis(z, *, n_draws: int = 200, quantile: float = 0.95, seed: int = 0):
    """Horn's parallel analysis.

    Parameters
    ----------
    z : array of shape (n, p)
        The matrix analysed (standardised, possibly column-weighted).
    n_draws : int
        Random normal matrices of the same shape and column scales.
    quantile : float
        Percentile of the random eigenvalues to beat (0.95; ``None`` for Horn's mean).

    Returns
    -------
    n_keep : int
        Components kept (at least 1).
    threshold : array of shape (p,)
        The random eigenvalue each observed one is compared with.
    """
    import numpy as np

    z = np.asarray(z, float)
    n, p = z.shape
    rng = np.random.default_rng(seed)
    scales = z.std(axis=0)
    draws = np.empty((n_draws, p))
    for b in range(n_draws):
        r = rng.standard_normal((n, p))
        r = (r - r.mean(axis=0)) / r.std(axis=0) * scales
        draws[b] = eigenvalues(r)
    threshold = draws.mean(axis=0) if quantile is None else np.quantile(draws, quantile, axis=0)
    observed = eigenvalues(z)
    above = observed > threshold
    n_keep = int(np.argmin(above)) if not above.all() else p
    return max(n_keep, 1), threshold


def elbow_count(ratios) -> int:
    """Knee of the cumulative explained-variance curve (farthest point above its chord)."""
    import numpy as np

    r = np.asarray(ratios, float)
    if len(r) <= 2:
        return 1
    cum = np.cumsum(r)
    x = np.linspace(0, 1, len(cum))
    y = (cum - cum[0]) / (cum[-1] - cum[0]) if cum[-1] > cum[0] else x
    return int(np.argmax(y - x)) + 1


def variance_count(ratios, threshold: float) -> int:
    """Smallest count whose cumulative explained variance reaches ``threshold``."""
    import numpy as np

    cum = np.cumsum(np.asarray(ratios, float))
    return int(min(np.searchsorted(cum, threshold - 1e-12) + 1, len(cum)))


def choose_components(z, rule, *, variance_threshold: float, seed: int):
    """Apply a component rule and return (count, per-count diagnostics DataFrame)."""
    import numpy as np
    import pandas as pd

    ev = eigenvalues(z)
    ratios = ev / ev.sum()
    n_par, thresholds = parallel_analysis(z, seed=seed)
    picks = {
        "variance": variance_count(ratios, variance_threshold),
        "elbow": elbow_count(ratios),
        "parallel": n_par,
    }
    if isinstance(rule, float):
        n = variance_count(ratios, rule)
    elif isinstance(rule, int):
        n = int(min(rule, len(ev)))
    else:
        n = picks[rule]
    diag = pd.DataFrame({
        "n_components": np.arange(1, len(ev) + 1),
        "eigenvalue": ev,
        "explained_ratio": ratios,
        "cumulative": np.cumsum(ratios),
        "random_eigenvalue_95": thresholds,
    })
    for name, k in picks.items():
        diag[f"pick_{name}"] = diag["n_components"] == k
    diag["chosen"] = diag["n_components"] == n
    return n, diag


def _kmeans(x, k, *, seed, n_init):
    from sklearn.cluster import KMeans

    return KMeans(n_clusters=k, n_init=n_init, random_state=seed).fit(x)


def bootstrap_stability(x, labels, centers, *, n_boot: int = 20, seed: int = 0, n_init: int = 3):
    """Mean Jaccard overlap of each role between the full fit and refits on resamples.

    Each resample's centroids are matched to the full fit's by the Hungarian
    algorithm; every row is then assigned to its nearest resample centroid.

    Returns
    -------
    array of shape (k,)
    """
    import numpy as np
    from scipy.optimize import linear_sum_assignment
    from scipy.spatial.distance import cdist

    x = np.asarray(x, float)
    k = len(centers)
    rng = np.random.default_rng(seed)
    jac = np.zeros((n_boot, k))
    for b in range(n_boot):
        idx = rng.integers(0, len(x), len(x))
        km = _kmeans(x[idx], k, seed=seed + b + 1, n_init=n_init)
        rows, cols = linear_sum_assignment(cdist(centers, km.cluster_centers_))
        mapping = np.empty(k, int)
        mapping[cols] = rows
        boot_labels = mapping[km.predict(x)]
        for r in range(k):
            a, c = labels == r, boot_labels == r
            union = (a | c).sum()
            jac[b, r] = (a & c).sum() / union if union else 1.0
    return jac.mean(axis=0)


@dataclass(frozen=True)
class RoleChoice:
    """The decision: ``k``, per-k ``diagnostics``, per-role ``stability`` (k,), the fitted
    ``kmeans``, and ``picks`` (rule -> the k each rule would choose; empty for a fixed k)."""

    k: int
    diagnostics: object
    stability: object
    kmeans: object
    picks: dict = None


def _vote(diag, gap_k):
    """The former default: silhouette, Calinski-Harabasz and the gap among stable k, two of three."""
    import numpy as np

    eligible = diag["stability_min"] >= STABLE_JACCARD
    if not eligible.any():
        eligible = diag["stability_min"] == diag["stability_min"].max()
    el = diag[eligible]
    sil_k = int(el.loc[el["silhouette"].idxmax(), "k"])
    ch_k = int(el.loc[el["calinski_harabasz"].idxmax(), "k"])
    if gap_k not in set(el["k"]):
        later = el["k"][el["k"] >= gap_k]
        gap_k = int(later.min()) if len(later) else int(el["k"].max())
    votes = [sil_k, ch_k, gap_k]
    agreed = [v for v in votes if votes.count(v) >= 2]
    return agreed[0] if agreed else int(np.median(votes))


def _gap_columns(x, ks, data_log_w, diag, *, seed, n_init, n_refs, n_consensus):
    """Gap curve, margins and the gap rules' picks; adds their columns to ``diag``.

    ``data_log_w``: k -> log W(k) of the data's fits from each consensus seed.
    Returns ({rule: k} for gap, gap_median and gap_global, the seeds' single picks).
    """
    import numpy as np

    gap_ks = [1] + ks + [ks[-1] + 1]
    seeds = range(seed, seed + n_consensus)
    total = _log_inertia(x, 1, seed=seed, n_init=1)
    by_seed = np.array([[total] + [data_log_w[k][i] for k in ks] + [_log_inertia(x, ks[-1] + 1, seed=sd, n_init=n_init)]
                        for i, sd in enumerate(seeds)])
    log_w = by_seed.min(axis=0)
    median_k, gap_picks, curves = gap_consensus(x, gap_ks, log_w, n_refs=n_refs,
                                                seeds=range(seed, seed + n_consensus))
    global_k, _, _ = gap_consensus(x, gap_ks, log_w, how="global", curves=curves)
    pooled = np.vstack([c[2] for c in curves])
    tolerant_k, margin, margin_se, refined = gap_tolerant(
        x, gap_ks, by_seed, pooled, more_refs=range(seed + n_consensus, seed + 2 * n_consensus), data_n_init=n_init)
    diag["gap"] = (pooled.mean(axis=0) - np.asarray(log_w))[1:-1]
    diag["gap_se"] = (pooled.std(axis=0) * np.sqrt(1 + 1 / len(pooled)))[1:-1]
    diag["gap_margin"] = margin[1:]
    diag["gap_margin_se"] = margin_se[1:]
    diag["gap_refined"] = [k in refined for k in diag["k"]]
    diag["gap_votes"] = [gap_picks.count(k) for k in diag["k"]]
    return {"gap": tolerant_k, "gap_median": median_k, "gap_global": global_k}, gap_picks


def choose_roles(x, rule, *, max_roles: int, seed: int, n_init: int,
                 n_boot: int = 20, n_refs: int = 10, sample_size: int = 3000,
                 method: str = "gap", n_consensus: int = 3) -> RoleChoice:
    """Pick the number of roles (``rule`` = "auto") or take a fixed one (an int).

    Parameters
    ----------
    x : array of shape (n, q)
        Component scores of the pool (a caller may pass a seeded subsample).
    rule : "auto" or int
    max_roles : int
        Largest k tried.
    method : {"gap", "gap_median", "gap_global", "gap_single", "vote", "silhouette", "calinski_harabasz"}
        The rule deciding k under "auto". ``"gap"`` (default): the gap statistic's
        one-standard-error rule on the reference sets of ``n_consensus`` seeds pooled
        (``seed`` .. ``seed + n_consensus - 1``), never deciding on a margin within its
        own uncertainty (:func:`gap_tolerant`; measured in ``benchmarks/role_count.py``).
        ``"gap_median"``: the former default, the median of the seeds' separate picks.
        ``"vote"``: the older rule (stable k only,
        two of silhouette, Calinski-Harabasz and gap agreeing). The others take
        the best k of one criterion. Every criterion and bootstrap stability is
        reported in ``diagnostics`` whatever decides; a role below the stability
        threshold is a warning, never a veto.

    Returns
    -------
    RoleChoice
    """
    import numpy as np
    import pandas as pd
    from sklearn.metrics import calinski_harabasz_score, silhouette_score

    x = np.asarray(x, float)
    if isinstance(rule, int):
        ks = [rule]
    else:
        ks = list(range(2, int(min(max_roles, len(x) - 1)) + 1))
    rows, stability, fits, data_log_w = [], {}, {}, {}
    # under "auto" each k's K-means runs from the consensus seeds' starts: the best optimum is the
    # fit (so it hardly moves with --seed) and the spread of log W over seeds is part of the gap
    # margin's uncertainty
    fit_seeds = [seed] if isinstance(rule, int) else list(range(seed, seed + n_consensus))
    for k in ks:
        candidates = [_kmeans(x, k, seed=sd, n_init=n_init) for sd in fit_seeds]
        data_log_w[k] = [float(np.log(max(c.inertia_, 1e-300))) for c in candidates]
        km = fits[k] = min(candidates, key=lambda c: c.inertia_)
        labels = km.labels_
        row = {"k": k, "inertia": km.inertia_}
        if len(set(labels)) > 1:
            row["silhouette"] = silhouette_score(
                x, labels, sample_size=min(sample_size, len(x)), random_state=seed)
            row["calinski_harabasz"] = calinski_harabasz_score(x, labels)
        else:
            row["silhouette"] = row["calinski_harabasz"] = np.nan
        stab = bootstrap_stability(x, labels, km.cluster_centers_, n_boot=n_boot, seed=seed)
        stability[k] = stab
        row["stability_min"], row["stability_mean"] = float(stab.min()), float(stab.mean())
        rows.append(row)
    diag = pd.DataFrame(rows)
    diag["stable"] = diag["stability_min"] >= STABLE_JACCARD
    if isinstance(rule, int):
        diag["chosen"] = True
        return RoleChoice(rule, diag, stability[rule], fits[rule], {})
    gap_k, gap_picks = _gap_columns(x, ks, data_log_w, diag, seed=seed, n_init=n_init, n_refs=n_refs,
                                    n_consensus=n_consensus)
    inside = lambda v: int(min(max(v, ks[0]), ks[-1]))  # noqa: E731
    picks = {
        **{name: inside(v) for name, v in gap_k.items()},
        "gap_single": inside(gap_picks[0]),
        "silhouette": int(diag.loc[diag["silhouette"].idxmax(), "k"]),
        "calinski_harabasz": int(diag.loc[diag["calinski_harabasz"].idxmax(), "k"]),
    }
    picks["vote"] = _vote(diag, picks["gap_single"])
    if method not in ROLE_METHODS:
        raise ValueError(f"method={method!r} is not one of {', '.join(ROLE_METHODS)}")
    k = picks[method]
    for name, value in picks.items():
        diag[f"pick_{name}"] = diag["k"] == value
    diag["chosen"] = diag["k"] == k
    return RoleChoice(k, diag, stability[k], fits[k], picks)
