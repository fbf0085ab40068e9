"""Speed target: automatic choice of components and roles, every criterion, on a 3,000-row pool.

    python benchmarks/selection_speed.py

Target: under 20 s on 2 cores. The pool is the demo generator at a larger size.
"""

from __future__ import annotations

import tempfile
import time
from pathlib import Path

from drift.api import prepare, reference_pool
from drift.model import RoleModel
from drift.sim.demo import generate_league, write_league


def main():
    league = generate_league(seed=5, n_teams=20, roster=20,
                             seasons=("2016-17", "2017-18", "2018-19", "2019-20", "2020-21",
                                      "2021-22", "2022-23", "2023-24", "2024-25", "2025-26"))
    with tempfile.TemporaryDirectory() as tmp:
        write_league(Path(tmp), league)
        prepared = prepare(tmp)
    pool = reference_pool(prepared).iloc[:3000].reset_index(drop=True)
    start = time.perf_counter()
    # the defaults: 90% of variance, the gap consensus for the role count
    model = RoleModel().fit(pool, features=prepared.features)
    seconds = time.perf_counter() - start
    verdict = "ok" if seconds < 20 else "TOO SLOW"
    print(f"pool {len(pool)} rows x {len(prepared.features)} features: {model.components_.shape[0]} components, "
          f"{len(model.role_ids_)} roles chosen in {seconds:.1f} s (target < 20 s: {verdict})")


if __name__ == "__main__":
    main()
