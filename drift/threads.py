"""One fixed thread limit for the math libraries while drift computes.

drift runs hundreds of small K-means fits and small linear-algebra calls. Each
one starts an OpenMP or BLAS thread region; on a busy machine those regions wait
for cores other programs hold, and a run can take a hundred times longer than on
a quiet one. One thread per call costs little (the work is small) and keeps the
results independent of how many cores the machine has: the K-means sums are then
always added in the same order.
"""

from __future__ import annotations

from contextlib import contextmanager

__all__ = ["limited_threads", "thread_limited", "MATH_THREADS"]

#: threads the math libraries may use inside drift's API calls
MATH_THREADS = 1


@contextmanager
def limited_threads(limit: int = MATH_THREADS, *, fitting: bool = True):
    """Limit the BLAS and OpenMP thread pools to ``limit`` threads inside the block.

    Parameters
    ----------
    limit : int
    fitting : bool
        Also load scikit-learn's OpenMP runtime first (a pool that is not loaded yet
        cannot be limited); placement needs numpy only.
    """
    import numpy  # noqa: F401  (its BLAS must be loaded to be limited)

    if fitting:
        import sklearn.cluster  # noqa: F401  (loads scikit-learn's OpenMP runtime)
    from threadpoolctl import threadpool_limits

    with threadpool_limits(limits=limit):
        yield


def thread_limited(*, fitting: bool = True):
    """Decorator: run the function inside :func:`limited_threads`."""
    import functools

    def wrap(func):
        @functools.wraps(func)
        def limited(*args, **kwargs):
            with limited_threads(fitting=fitting):
                return func(*args, **kwargs)
        return limited
    return wrap
