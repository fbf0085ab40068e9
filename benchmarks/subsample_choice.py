"""Does the automatic role count chosen on a seeded sample hold against the full pool?

``drift.model.counting`` runs the automatic role-count rule on at most ``ROLE_SWEEP_ROWS``
pool rows and fits only the final K-means on every row. Here simulated leagues
(:mod:`drift.sim.family`, held-out seeds) are fitted twice with the default settings:
once with the sweep on the whole pool, once on a sample of a third of it (the
same ratio as 5,000 rows of a 15,000-row pool; smaller pools keep the run short).
It prints, per league, both choices, the adjusted Rand index between the two
final role assignments and the times, then the share of leagues where k agrees.

    python benchmarks/subsample_choice.py --leagues 6
"""

from __future__ import annotations

import argparse
import tempfile
import time
import warnings


def fit_with_bound(prepared, bound, config=None):
    import drift.model.counting as workload
    from drift.api import fit_model

    saved = workload.ROLE_SWEEP_ROWS
    workload.ROLE_SWEEP_ROWS = bound
    try:
        start = time.process_time()
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            model = fit_model(prepared)
        return model, time.process_time() - start
    finally:
        workload.ROLE_SWEEP_ROWS = saved


def main(argv=None):
    from sklearn.metrics import adjusted_rand_score

    from drift.api import prepare
    from drift.config import Config
    from drift.sim.family import HELD_OUT_START, family, simulate_league

    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("--leagues", type=int, default=6)
    parser.add_argument("--fraction", type=float, default=1 / 3)
    args = parser.parse_args(argv)
    agree = 0
    print("| league | roles (truth) | pool rows | sample rows | k full | k sample | ARI full vs sample | CPU s full | CPU s sample |")
    print("|---|---|---|---|---|---|---|---|---|")
    for spec in family(args.leagues, start=HELD_OUT_START + 500):
        league = simulate_league(spec)
        with tempfile.TemporaryDirectory() as tmp:
            league.write(tmp)
            with warnings.catch_warnings():
                warnings.simplefilter("ignore")
                prepared = prepare(tmp, Config().replace(columns=league.columns) if league.columns else None)
        n = len(prepared.kept)
        bound = max(300, int(n * args.fraction))
        full, t_full = fit_with_bound(prepared, 10 ** 9)
        part, t_part = fit_with_bound(prepared, bound)
        scores = full.transform(prepared.kept)
        ari = adjusted_rand_score(full.distances(scores).argmin(axis=1), part.distances(part.transform(prepared.kept)).argmin(axis=1))
        k_full, k_part = len(full.role_ids_), len(part.role_ids_)
        agree += k_full == k_part
        print(f"| {spec.seed} | {spec.n_roles} | {n:,} | {bound:,} | {k_full} | {k_part} | {ari:.3f} | "
              f"{t_full:.1f} | {t_part:.1f} |", flush=True)
    print(f"\nk agrees in {agree} of {args.leagues} leagues")


if __name__ == "__main__":
    main()
