"""Is role membership calibrated? Measured on simulated leagues with known roles.

    python benchmarks/membership.py [--leagues 12] [--out benchmarks/results/membership]

For leagues of ``drift.sim.family.family`` (fitted at their true role count, so the
question is the probabilities and not the count), every placement's shown
membership (``role_prob``, the probability of its nearest role) is binned; in
each bin, the share of placements whose nearest role is their true role (roles
matched to the truth by the Hungarian algorithm on the overlap table). A
calibrated membership has 70-80% right among placements shown at 70-80%. Also:
the share of placements shown at >= 99%, overall and for seasons under 800
minutes.
"""

from __future__ import annotations

import argparse
import json
import os
import tempfile
import warnings
from pathlib import Path

for _var in ("OMP_NUM_THREADS", "OPENBLAS_NUM_THREADS", "MKL_NUM_THREADS"):
    os.environ.setdefault(_var, "1")

import pandas as pd  # noqa: E402
from scipy.optimize import linear_sum_assignment  # noqa: E402
from threadpoolctl import threadpool_limits  # noqa: E402

from drift.api import prepare  # noqa: E402
from drift.config import Config  # noqa: E402
from drift.model import RoleModel  # noqa: E402
from drift.sim.family import family, season_truth, simulate_league  # noqa: E402

BINS = (0.0, 0.5, 0.6, 0.7, 0.8, 0.9, 0.99, 1.0001)


def league_rows(spec, workdir):
    league = simulate_league(spec)
    folder = Path(workdir) / f"m{spec.seed}"
    league.write(folder)
    config = Config(columns=league.columns)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        prepared = prepare(folder, config)
        model = RoleModel(roles=spec.n_roles, n_bootstrap=2).fit(prepared.kept, features=prepared.features)
    placed = model.place(prepared.kept).merge(season_truth(league), on=["player_id", "season"])
    table = pd.crosstab(placed["role"], placed["true_role"])
    rows, cols = linear_sum_assignment(-table.to_numpy())
    match = {table.index[r]: table.columns[c] for r, c in zip(rows, cols)}
    placed["right"] = placed["role"].map(match) == placed["true_role"]
    return placed[["role_prob", "right", "minutes"]].assign(league=spec.seed)


def main(argv=None):
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--leagues", type=int, default=12)
    parser.add_argument("--out", default="benchmarks/results/membership")
    args = parser.parse_args(argv)
    with threadpool_limits(limits=1), tempfile.TemporaryDirectory() as workdir:
        rows = pd.concat([league_rows(s, workdir) for s in family(args.leagues)], ignore_index=True)
    rows["bin"] = pd.cut(rows["role_prob"], BINS, right=False)
    table = rows.groupby("bin", observed=True).agg(placements=("right", "size"), right=("right", "mean"),
                                                   shown=("role_prob", "mean")).reset_index()
    short = rows[rows["minutes"] < 800]
    summary = {"leagues": args.leagues, "placements": int(len(rows)),
               "share_at_99": float((rows["role_prob"] >= 0.99).mean()),
               "share_at_99_under_800_minutes": float((short["role_prob"] >= 0.99).mean()),
               "bins": [{"bin": str(b), "placements": int(n), "shown": float(s), "right": float(r)}
                        for b, n, r, s in table[["bin", "placements", "right", "shown"]].itertuples(index=False)]}
    lines = [f"Membership on {args.leagues} family leagues at their true role count ({len(rows)} placements):", "",
             "| shown membership | placements | mean shown | share in that role |", "|---|---|---|---|"]
    for b in summary["bins"]:
        lines.append(f"| {b['bin']} | {b['placements']} | {b['shown']:.3f} | {b['right']:.3f} |")
    lines += ["", f"Shown at >= 99%: {summary['share_at_99']:.1%} of placements, "
              f"{summary['share_at_99_under_800_minutes']:.1%} of seasons under 800 minutes."]
    out = Path(args.out)
    out.parent.mkdir(parents=True, exist_ok=True)
    out.with_suffix(".json").write_text(json.dumps(summary, indent=1) + "\n")
    out.with_suffix(".md").write_text("\n".join(lines) + "\n")
    print("\n".join(lines))


if __name__ == "__main__":
    main()
