"""The gap statistic (Tibshirani, Walther & Hastie 2001) and the decisions made on it.

Reference sets are uniform over the box of the data (component scores, so the box
is aligned with the principal axes). :func:`gap_pick` is the one-standard-error rule
(or the global variant), :func:`gap_consensus` the median of several seeds' picks (the
former default), and :func:`gap_tolerant` the default: the seeds' reference sets pooled
and no decision on a margin within its own uncertainty. Re-exported by
:mod:`drift.model.count_rules`.
"""

from __future__ import annotations

__all__ = ["reference_log_w", "gap_statistic", "gap_pick", "gap_consensus", "gap_margins", "gap_tolerant"]


def _kmeans(x, k, *, seed, n_init):
    from sklearn.cluster import KMeans

    return KMeans(n_clusters=k, n_init=n_init, random_state=seed).fit(x)


def _log_inertia(x, k, *, seed, n_init):
    """log of the within-cluster sum of squares of a K-means fit (k = 1: the total)."""
    import numpy as np

    if k == 1:
        return float(np.log(((x - x.mean(axis=0)) ** 2).sum()))
    return float(np.log(_kmeans(x, k, seed=seed, n_init=n_init).inertia_))


def reference_log_w(x, ks, *, n_refs: int = 10, seed: int = 0, n_init: int = 3):
    """log W(k) of ``n_refs`` reference sets uniform over the data's box, shape (n_refs, len(ks))."""
    import numpy as np

    x = np.asarray(x, float)
    rng = np.random.default_rng(seed)
    lo, hi = x.min(axis=0), x.max(axis=0)
    refs = [rng.uniform(lo, hi, size=x.shape) for _ in range(n_refs)]
    return np.array([[_log_inertia(r, k, seed=seed, n_init=n_init) for k in ks] for r in refs])


def gap_statistic(x, ks, *, n_refs: int = 10, seed: int = 0, n_init: int = 3, log_w=None):
    """Gap(k) and s_k for each k, reference sets uniform over the data's bounding box.

    Parameters
    ----------
    x : array of shape (n, q)
        Data (component scores, so the box is aligned with the principal axes).
    ks : sequence of int
    n_refs : int
        Reference sets.
    seed : int
        Seeds the reference sets and their K-means fits.
    n_init : int
        K-means restarts (for the data when ``log_w`` is not given, and the references).
    log_w : sequence of float, optional
        log W(k) of the data for each k, when the caller already fitted it.

    Returns
    -------
    gap, s : arrays of shape (len(ks),)
    """
    import numpy as np

    x = np.asarray(x, float)
    if log_w is None:
        log_w = [_log_inertia(x, k, seed=seed, n_init=n_init) for k in ks]
    ref = reference_log_w(x, ks, n_refs=n_refs, seed=seed, n_init=n_init)
    return ref.mean(axis=0) - np.asarray(log_w, float), ref.std(axis=0) * np.sqrt(1 + 1 / n_refs)


def gap_margins(log_w, ref):
    """The one-standard-error rule's margin at each k and the margin's own uncertainty.

    Parameters
    ----------
    log_w : array of shape (K,)
        log W(k) of the data for consecutive k.
    ref : array of shape (B, K)
        log W(k) of B reference sets (several seeds' draws pooled).

    Returns
    -------
    margin, margin_se : arrays of shape (K - 1,)
        margin_k = Gap(k) - (Gap(k + 1) - s(k + 1)): the rule stops at the first k with
        margin >= 0. Its standard error is that of the reference sets' mean paired
        difference log W*(k) - log W*(k + 1) and of s(k + 1) itself (about s / sqrt(2B)).
    """
    import numpy as np

    ref = np.asarray(ref, float)
    b = len(ref)
    gap = ref.mean(axis=0) - np.asarray(log_w, float)
    s = ref.std(axis=0) * np.sqrt(1 + 1 / b)
    margin = gap[:-1] - gap[1:] + s[1:]
    paired = ref[:, :-1] - ref[:, 1:]
    se = np.sqrt(paired.var(axis=0, ddof=1) / b + s[1:] ** 2 / (2 * b))
    return margin, se


def gap_tolerant(x, ks, log_w, refs, *, more_refs, n_init: int = 1, data_n_init: int = 10,
                 z_clear: float = 3.0, z: float = 2.0):
    """The one-standard-error choice of k, never decided on a margin within its own uncertainty.

    The margin's uncertainty has two parts: the reference sets' (the standard error of
    :func:`gap_margins`) and the data's (K-means optima move with the seed: the variance over
    the seeds' fits of log W(k) - log W(k + 1)); the data's log W is the best fit of all seeds.
    Walks k upward. A k whose margin is below -``z_clear`` times its uncertainty goes on, one
    above it stops. Nearer than that the first measurement does not decide: the margin is
    measured again with the reference draws and data fits of ``more_refs`` seeds added (for
    k and k + 1 only); then the k goes on only if the margin is below -``z`` times its
    uncertainty, and a margin still within that stops (a further role must show a gain
    beyond noise to be added; where the evidence is within noise the convention decides,
    not the noise).

    Parameters
    ----------
    ks : sequence of int
        Consecutive counts, starting at 1 (log W(1) is the total spread).
    log_w : array of shape (S, len(ks))
        The data's log W(k) fitted from each of S seeds (one row is accepted).
    refs : array of shape (B, len(ks))
        Reference log W of the first draws (see :func:`reference_log_w`).
    more_refs : sequence of int
        Seeds of the extra draws (10 reference sets each) and of the data's refits.
    data_n_init : int
        K-means restarts of each refit of the data.

    Returns
    -------
    k : int
    margin, margin_se : arrays of shape (len(ks) - 1,)
        As first measured: the margin on the best fits and its whole uncertainty.
    refined : list of int
        The k whose margin was measured again.
    """
    import numpy as np

    fits = np.atleast_2d(np.asarray(log_w, float))
    margin, se = gap_margins(fits.min(axis=0), refs)
    se = np.sqrt(se ** 2 + _data_var(fits))
    refined = []
    for i in range(len(ks) - 1):
        if margin[i] < -z_clear * se[i]:
            continue
        if margin[i] > z_clear * se[i]:
            return int(ks[i]), margin, se, refined
        pair = [ks[i], ks[i + 1]]
        extra = np.vstack([reference_log_w(x, pair, seed=sd, n_init=n_init) for sd in more_refs])
        more = np.vstack([fits[:, i:i + 2], [[_log_inertia(x, k, seed=sd, n_init=data_n_init) for k in pair]
                                             for sd in more_refs]])
        m2, s2 = gap_margins(more.min(axis=0), np.vstack([np.asarray(refs)[:, i:i + 2], extra]))
        refined.append(int(ks[i]))
        if m2[0] >= -z * float(np.sqrt(s2[0] ** 2 + _data_var(more)[0])):
            return int(ks[i]), margin, se, refined
    return int(ks[-1]), margin, se, refined


def _data_var(fits):
    """Uncertainty (variance) of the data's log W(k) - log W(k + 1), shape (K - 1,); 0 with one seed.

    The best of S seeds' fits is used; its uncertainty is taken as the variance of the single
    fits' differences over S (as for a mean of S fits: the best of them moves less than one).
    """
    import numpy as np

    diff = fits[:, :-1] - fits[:, 1:]
    return diff.var(axis=0, ddof=1) / len(fits) if len(fits) > 1 else np.zeros(diff.shape[1])


def gap_pick(ks, gap, s, *, how: str = "first") -> int:
    """The gap statistic's one-standard-error choice of k.

    ``how="first"``: the smallest k with Gap(k) >= Gap(k+1) - s(k+1) (Tibshirani,
    Walther & Hastie 2001); the largest k if none. ``how="global"``: the smallest
    k with Gap(k) >= Gap(k*) - s(k*), k* the global maximum (the "globalSEmax"
    variant of Dudoit & Fridlyand 2002); it is not stopped by an early plateau
    of the curve, such as blobs on a grid.
    """
    import numpy as np

    if how == "global":
        best = int(np.argmax(gap))
        return int(next(k for k, g in zip(ks, gap) if g >= gap[best] - s[best]))
    for i in range(len(ks) - 1):
        if gap[i] >= gap[i + 1] - s[i + 1]:
            return int(ks[i])
    return int(ks[-1])


def gap_consensus(x, ks, log_w, *, n_refs: int = 10, seeds=(0, 1, 2), n_init: int = 1,
                  how: str = "first", curves=None):
    """The gap statistic's one-standard-error pick on several sets of reference draws.

    The pick of one set of reference draws can move by one or two roles with the
    seed in a league whose roles blend; the median over ``seeds`` is the
    consensus (with three seeds it needs two of them to move).

    Parameters
    ----------
    curves : list of (gap, s), optional
        Curves already computed for these seeds (another ``how`` on the same draws).

    Returns
    -------
    k : int
        Median of the picks (the lower middle value for an even count).
    picks : list of int
        One pick per seed.
    curves : list of (gap, s, ref)
        One curve per seed: two arrays of shape (len(ks),) and the reference sets' log W,
        shape (n_refs, len(ks)).
    """
    import numpy as np

    if curves is None:
        curves = []
        for sd in seeds:
            ref = reference_log_w(x, ks, n_refs=n_refs, seed=sd, n_init=n_init)
            curves.append((ref.mean(axis=0) - np.asarray(log_w, float), ref.std(axis=0) * np.sqrt(1 + 1 / n_refs),
                           ref))
    picks = [gap_pick(ks, c[0], c[1], how=how) for c in curves]
    return int(sorted(picks)[(len(picks) - 1) // 2]), picks, curves
