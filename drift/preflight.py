"""Checks made before any fitting.

Everything a run can check before its expensive part is checked here, so a mistake costs a
second, not a fit: settings the data cannot honour are refused (never clamped).
"""

from __future__ import annotations

from .errors import InputError

__all__ = ["check_settings"]


def check_settings(prepared, config) -> None:
    """Refuse, before any fitting, settings the data cannot honour (never clamp them).

    Seasons named in ``reference`` or ``compare`` must be in the data (and the two compared
    seasons differ); a fixed number of components cannot exceed the number of features, nor a
    fixed number of roles the number of player-seasons in the pool.
    """
    available = sorted(set(prepared.kept["season"]))
    if config.reference:
        unknown = [s for s in config.reference if s not in available]
        if unknown:
            raise InputError(f"reference season(s) {unknown} are not in the data; available: {available}")
    if config.compare:
        a, b = config.compare
        if a == b:
            raise InputError(f"--compare needs two different seasons, got {a!r} twice")
        for s in (a, b):
            if s not in available:
                raise InputError(f"--compare season {s!r} is not in the data; available: {available}")
    p = len(prepared.features)
    c = config.components
    if isinstance(c, int) and not isinstance(c, bool) and c > p:
        raise InputError(f"components={c} is more than the data's {p} features; give at most {p}, "
                         "or a rule (parallel, elbow, variance)")
    kept = prepared.kept
    n_pool = int(kept["season"].isin(config.reference).sum()) if config.reference else len(kept)
    r = config.roles
    if isinstance(r, int) and not isinstance(r, bool) and r > n_pool:
        raise InputError(f"roles={r} is more than the {n_pool} qualifying player-seasons of the pool; "
                         "give fewer roles or more data")
