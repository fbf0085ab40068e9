"""The math libraries run on a fixed thread count inside drift, whatever the caller set."""

from __future__ import annotations

import numpy as np
from sklearn.datasets import make_blobs
from threadpoolctl import threadpool_info, threadpool_limits

from drift.model.counting import select_roles
from drift.threads import MATH_THREADS, limited_threads, thread_limited


def test_every_loaded_pool_is_limited_inside_the_block():
    with threadpool_limits(limits=2):
        with limited_threads():
            inside = threadpool_info()
    assert inside and all(pool["num_threads"] == MATH_THREADS for pool in inside)


def test_results_do_not_depend_on_the_callers_thread_setting():
    x, _ = make_blobs(n_samples=2000, centers=5, n_features=4, random_state=0)
    fit = thread_limited()(lambda: select_roles(x, 5, seed=1, n_init=4, n_boot=3, max_roles=14))
    with threadpool_limits(limits=2):
        two = fit()
    with threadpool_limits(limits=1):
        one = fit()
    np.testing.assert_array_equal(one.kmeans.cluster_centers_, two.kmeans.cluster_centers_)
    np.testing.assert_array_equal(one.stability, two.stability)
