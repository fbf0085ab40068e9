"""Checks made before any fitting.

Everything a run can check before its expensive part is checked here, so a mistake costs a
second, not a fit: settings the data cannot honour are refused (never clamped).
"""

from __future__ import annotations

from drift.errors import InputError

__all__ = ["check_settings", "check_regular", "check_distinct", "check_placements_finite"]


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


def check_regular(paths) -> None:
    """Refuse a given input that is neither a folder nor a regular file.

    Reading a named pipe or a device waits for a writer that may never come; drift refuses it
    at once instead of hanging. Missing paths are left to the reader, which says what it wanted.
    """
    import os
    import stat

    for path in paths:
        if path is None:
            continue
        try:
            mode = os.stat(path).st_mode
        except OSError:
            continue
        if not (stat.S_ISDIR(mode) or stat.S_ISREG(mode)):
            raise InputError("is not a regular file or folder (a pipe, socket or device); give a file",
                             file=path)


def check_distinct(paths) -> None:
    """Refuse data given twice: the same path, or a file and the folder that holds it.

    Read twice, every row would be a duplicate of itself, and the message about it would
    point at rows that look different.
    """
    import os
    from pathlib import Path

    seen = {}
    for given in paths:
        real = Path(os.path.realpath(given))
        if real in seen:
            raise InputError(f"is given twice (also as {seen[real]}); give each file or folder once",
                             file=given)
        seen[real] = given
    folders = {real: given for real, given in seen.items() if real.is_dir()}
    for real, given in seen.items():
        if real.parent in folders and real not in folders:
            raise InputError(f"is also read as part of the folder {folders[real.parent]}; give the file "
                             "or its folder, not both", file=given)


def check_placements_finite(placements, source) -> None:
    """Refuse placements with a non-finite distance, probability or score.

    A model file whose numbers pass every check one by one can still overflow together;
    its placements would be NaN, which must never be written as a result.
    """
    import numpy as np

    cols = [c for c in placements.columns if c in ("distance", "role_prob", "margin")
            or c.startswith(("dist_", "prob_", "pc"))]
    values = placements[cols].to_numpy(dtype=float)
    if not np.isfinite(values).all():
        raise InputError("placing with this model gives non-finite numbers (its values are out of range); "
                         "the file was changed or is broken, refit", file=source)
