"""Role membership that admits the placement's own sampling noise.

A player-season observed on few minutes could sit elsewhere on a full season:
its true position in component space is uncertain by S_i (q x q), carried from
the features' posterior variance at its sample (B v after shrinkage, with the
multinomial link between play-type shares). Roles are Gaussians with a shared within-role
covariance W of the *true* styles (the pool's within-role scatter less the
average placement noise, so noise is not counted twice) and prior weights
equal to their pool shares. The membership of role r is the posterior

    p_r  proportional to  pi_r N(x_i; c_r, W + S_i),

so a short season's memberships spread over the roles it might belong to,
while a full season's stay sharp. With S_i = 0 and W = s^2 I and equal weights
this is the former spherical rule.
"""

from __future__ import annotations

__all__ = ["placement_cov", "true_within_cov", "membership_probabilities"]


def placement_cov(loadings, state):
    """Uncertainty of each placement's true position in component space, shape (n, q, q).

    A shrunk value's posterior variance is B v (shrinkage factor B, sampling
    variance v): it grows as the sample shrinks (toward the between-player
    variance), where the variance of the shrunk value itself, B^2 v, would fall.

    Parameters
    ----------
    loadings : array of shape (q, p)
        Component scores per unit of each processed feature.
    state : NoiseState
        The rows' noise (variance, shrinkage factor, share term).
    """
    import numpy as np

    var = state.factor * state.var
    u = np.sqrt(state.factor) * state.u
    lu = u @ loadings.T  # (n, q)
    # L diag(var + u^2) L^T per row (multinomial shares: Var adds u^2 on the diagonal and
    # -u_a u_b off it), as one optimised contraction rather than a naive four-index loop
    cov = np.einsum("qp,np,rp->nqr", loadings, var + u ** 2, loadings, optimize=True)
    return cov - lu[:, :, None] * lu[:, None, :]


def true_within_cov(scores, labels, centroids, noise_cov, *, priors=None, n_steps: int = 5):
    """Within-role covariance of true styles: pooled scatter less mean placement noise, (q, q).

    K-means' hard labels cut each role's tails at the boundaries (a role's
    outlying members count for its neighbour), which makes the scatter too
    narrow and boundary memberships too sharp; ``n_steps`` steps of the
    mixture's EM update (soft memberships, centres and weights held) widen it
    back. Eigenvalues are floored at 1% of the largest so it stays a covariance.
    """
    import numpy as np

    resid = scores - centroids[labels]
    w = _floored(resid.T @ resid / len(scores) - noise_cov.mean(axis=0))
    weights = np.bincount(labels, minlength=len(centroids)) if priors is None else priors
    for _ in range(n_steps):
        gamma = membership_probabilities(scores, centroids, w, weights, noise_cov)
        scatter = sum((gamma[:, r, None] * (scores - c)).T @ (scores - c) for r, c in enumerate(centroids))
        w = _floored(scatter / len(scores) - noise_cov.mean(axis=0))
    return w


def _floored(w):
    import numpy as np

    w = (w + w.T) / 2
    ev, vec = np.linalg.eigh(w)
    ev = np.clip(ev, 0.01 * max(ev.max(), 1e-12), None)
    return (vec * ev) @ vec.T


def membership_probabilities(scores, centroids, within_cov, priors, point_cov=None):
    """Posterior role probabilities, shape (n, k).

    Parameters
    ----------
    scores : array of shape (n, q)
    centroids : array of shape (k, q)
    within_cov : array of shape (q, q)
    priors : array of shape (k,)
        Role weights (pool shares); normalised here.
    point_cov : array of shape (n, q, q), optional
        Each placement's sampling covariance (none: all placements exact).
    """
    import numpy as np
    from scipy.special import softmax

    n, q = scores.shape
    # whiten with the inverse Cholesky factor, computed once (one per row with point noise, else
    # one in all) and shared by every role: k batched solves would factor each row k times
    if point_cov is None:
        chol = np.linalg.cholesky(within_cov + np.eye(q) * 1e-12)
        inv = np.linalg.inv(chol)
        log_det = np.full(n, 2 * np.log(np.diagonal(chol)).sum())
    else:
        chol = np.linalg.cholesky(within_cov[None] + point_cov + np.eye(q)[None] * 1e-12)
        inv = np.linalg.inv(chol)
        log_det = 2 * np.log(np.diagonal(chol, axis1=1, axis2=2)).sum(axis=1)
    priors = np.asarray(priors, float) / np.sum(priors)
    logits = np.empty((n, len(centroids)))
    for r, c in enumerate(centroids):
        d = scores - c
        white = d @ inv.T if inv.ndim == 2 else np.einsum("nij,nj->ni", inv, d)
        logits[:, r] = np.log(priors[r]) - 0.5 * (white ** 2).sum(axis=1) - 0.5 * log_det
    return softmax(logits, axis=1)
