"""Measure the noise policies on the demo league's ground truth (how the default was chosen).

    python benchmarks/noise_policy.py [demo_seasons]

For each policy and two component rules: the adjusted Rand index of roles
against the true roles (all seasons, and seasons under 800 minutes), the number
of roles chosen, how often a player with no real change flips label (noise
reaching the labels), and precision / recall of ``role_changed``.
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

import pandas as pd
from sklearn.metrics import adjusted_rand_score

from drift.api import analyse, fit_model, prepare
from drift.config import Config


def main(folder="demo_seasons"):
    truth = pd.read_csv(Path(folder) / "truth" / "truth.csv", dtype={"season": str})
    t = truth[truth["stint"] == 0][["player_id", "season", "true_role"]]
    prepared = prepare(folder)
    print(f"{'components':10} {'policy':14} {'roles':>5} {'ARI':>6} {'ARI<800':>7} {'flips':>6} "
          f"{'precision':>9} {'recall':>7} {'seconds':>7}")
    for components, policy in [(c, p) for c in ("parallel", "variance")
                               for p in ("shrink", "weight", "shrink+weight", "none")]:
        start = time.perf_counter()
        config = Config(noise_policy=policy, components=components)
        model = fit_model(prepared, config)
        a = analyse(prepared, model, config)
        placed = a.placements.merge(t, on=["player_id", "season"])
        ari = adjusted_rand_score(placed["true_role"], placed["role"])
        short = placed[placed["minutes"] < 800]
        ari_short = adjusted_rand_score(short["true_role"], short["role"])
        m = a.moves[a.moves["kind"] == "consecutive"]
        m = m.merge(t.rename(columns={"season": "season_from", "true_role": "a"}), on=["player_id", "season_from"])
        m = m.merge(t.rename(columns={"season": "season_to", "true_role": "b"}), on=["player_id", "season_to"])
        real = m["a"] != m["b"]
        tp = (real & m["role_changed"]).sum()
        flips = (m.loc[~real, "role_from"] != m.loc[~real, "role_to"]).mean()
        print(f"{components:10} {policy:14} {len(model.role_ids_):>5} {ari:6.3f} {ari_short:7.3f} {flips:6.3f} "
              f"{tp / max(m['role_changed'].sum(), 1):9.3f} {tp / max(real.sum(), 1):7.3f} "
              f"{time.perf_counter() - start:7.1f}")


if __name__ == "__main__":
    main(*sys.argv[1:])
