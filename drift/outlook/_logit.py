"""Conditional logit: the chance of each role, from features of the player *and* that role.

Role r's utility for player i is ``X[i, r] @ beta``; the chances are their
softmax over roles. Because the coefficients are shared by all roles, a handful
of them describe "how often players keep their role" and "how much a player
sitting near another role drifts to it" for any number of roles, and the
per-role terms (each role's pull and its own stay rate) are ridge-penalised
toward zero, i.e. toward the shared behaviour: the data's role-by-role rates
regressed toward the league-wide ones, less so the more players a role has.
"""

from __future__ import annotations

__all__ = ["fit_choice", "choice_proba"]


def choice_proba(X, beta):
    """Chances (n, k) of alternatives with features ``X`` (n, k, m) and coefficients ``beta`` (m,)."""
    import numpy as np

    u = X @ beta
    u -= u.max(axis=1, keepdims=True)
    e = np.exp(u)
    return e / e.sum(axis=1, keepdims=True)


def fit_choice(X, y, *, penalised, penalty=1.0):
    """Penalised maximum likelihood of a conditional logit.

    Parameters
    ----------
    X : ndarray (n, k, m)
        Features of each player and role.
    y : int ndarray (n,)
        Index of the chosen role.
    penalised : bool ndarray (m,)
        Coefficients with the ridge penalty (the others are free).
    penalty : float
        Ridge strength, in observations: ``penalty / 2 * sum(beta_pen ** 2)`` is added
        to the summed negative log-likelihood.

    Returns
    -------
    ndarray (m,)
    """
    import numpy as np
    from scipy.optimize import minimize

    n, k, m = X.shape
    rows = np.arange(n)
    chosen = X[rows, y]  # (n, m)
    mask = np.asarray(penalised, float)

    def objective(beta):
        u = X @ beta
        top = u.max(axis=1, keepdims=True)
        e = np.exp(u - top)
        s = e.sum(axis=1, keepdims=True)
        p = e / s
        nll = float((np.log(s[:, 0]) + top[:, 0] - u[rows, y]).sum())
        grad = np.einsum("nk,nkm->m", p, X) - chosen.sum(axis=0)
        return nll + 0.5 * penalty * float((mask * beta ** 2).sum()), grad + penalty * mask * beta

    result = minimize(objective, np.zeros(m), jac=True, method="L-BFGS-B", options={"maxiter": 500})
    return result.x
