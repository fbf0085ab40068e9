"""Choose the component and role-count defaults by measurement on the simulated-league family.

    python benchmarks/role_count.py [--leagues 60] [--held-out 20] [--seeds 0 1 2]
                                    [--out benchmarks/results/role_count] [--reps NAME ...]

For every league of ``drift.sim.family.family`` (and, separately, the held-out
leagues from ``HELD_OUT_START``) and every representation (component rule and
noise policy), the reference model is fitted with ``roles="auto"`` once per seed;
its per-k diagnostics give the k every role rule would choose (gap consensus,
gap global, single gap, the former vote, silhouette, Calinski-Harabasz), plus the
true count. The pipeline is then run at each chosen k (one fit per k, seed 0,
cached) and scored against the truth with ``drift.sim.family.recovery``: exact
count, within one, ARI, role-change precision / recall / F1, no-change false
flags, beyond-noise rates of no-change pairs at alpha 0.01 and 0.05 (overall and
by quartile of the smaller of the two seasons' minutes), and how often the pick
differs between seeds.

Results go to ``OUT.jsonl`` (one line per league, so an interrupted run resumes),
``OUT.json`` (the summary) and ``OUT.md`` (the tables quoted in the README). Runs
on one math-library thread; about a minute of CPU per league with three seeds
and two representations.
"""

from __future__ import annotations

import argparse
import json
import os
import sys
import tempfile
import time
import warnings
from pathlib import Path

for _var in ("OMP_NUM_THREADS", "OPENBLAS_NUM_THREADS", "MKL_NUM_THREADS"):
    os.environ.setdefault(_var, "1")

import numpy as np  # noqa: E402
import pandas as pd  # noqa: E402
from threadpoolctl import threadpool_limits  # noqa: E402

from drift.api import prepare  # noqa: E402
from drift.config import Config  # noqa: E402
from drift.model import RoleModel  # noqa: E402
from drift.sim.family import HELD_OUT_START, family, recovery, season_truth, simulate_league  # noqa: E402

#: representation name -> RoleModel settings (the component rule and the noise policy)
REPRESENTATIONS = {
    "former": dict(components="parallel", noise_policy="shrink+restandardise"),
    "pool-sd, 90%": dict(components=0.9, noise_policy="shrink"),
    "pool-sd, parallel": dict(components="parallel", noise_policy="shrink"),
}
#: run by default (the screening of the third on 9 leagues: 33% exact, 78% within one)
DEFAULT_REPS = ("pool-sd, 90%", "former")
RULES = ("gap", "gap_global", "gap_single", "vote", "silhouette", "calinski_harabasz", "true")
DEFAULT = ("pool-sd, 90%", "gap")
FORMER = ("former", "vote")
N_BOOT = 3  # stability is a reported diagnostic; the benchmark only needs it for the former vote


def _picks(model):
    diag = model.role_diagnostics_
    return {c[len("pick_"):]: int(diag.loc[diag[c], "k"].iloc[0]) for c in diag.columns
            if c.startswith("pick_") and diag[c].any()}


def _moves(model, kept):
    """Placements and consecutive-season moves (what ``drift.api.analyse`` does for them)."""
    from drift.measure.moves import pair_moves
    from drift.model.noise import consecutive_pairs as consecutive_season_pairs

    placements = model.place(kept)
    i1, i2 = consecutive_season_pairs(kept)
    return placements, pair_moves(model, kept, placements, i1, i2, alpha=0.01, kind="consecutive")


def _quartile_rates(moves, truth, alphas=(0.01, 0.05)):
    """Beyond-noise rate of no-change pairs by quartile of the smaller minutes of the two seasons."""
    t = truth[["player_id", "season", "true_role"]]
    m = moves[moves["kind"] == "consecutive"]
    m = m.merge(t.rename(columns={"season": "season_from", "true_role": "a"}), on=["player_id", "season_from"])
    m = m.merge(t.rename(columns={"season": "season_to", "true_role": "b"}), on=["player_id", "season_to"])
    m = m[m["a"] == m["b"]]
    low = np.minimum(m["minutes_from"], m["minutes_to"]).to_numpy(float)
    q = pd.qcut(low, 4, labels=False, duplicates="drop")
    out = {}
    for alpha in alphas:
        flags = m["p_value"].to_numpy() < alpha
        out[f"beyond_{alpha:g}_by_quartile"] = [float(flags[q == i].mean()) if (q == i).any() else None
                                                for i in range(4)]
    return out


def run_league(spec, seeds, reps, workdir, former_seeds=None):
    """All measurements for one league (a JSON-ready dict)."""
    league = simulate_league(spec)
    folder = Path(workdir) / f"league_{spec.seed}"
    league.write(folder)
    config = Config(columns=league.columns)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        prepared = prepare(folder, config)
    truth = season_truth(league)
    pool = prepared.kept
    result = {"league": spec.seed, "true_roles": spec.n_roles, "n_pool": int(len(pool)),
              "spec": {k: getattr(spec, k) for k in spec.__dataclass_fields__}, "reps": {}}
    for rep in reps:
        settings = REPRESENTATIONS[rep]
        picks, q = {}, None
        start = time.process_time()
        rep_seeds = former_seeds if (rep == FORMER[0] and former_seeds) else seeds
        for seed in rep_seeds:
            with warnings.catch_warnings():
                warnings.simplefilter("ignore")
                model = RoleModel(**settings, roles="auto", max_roles=14, seed=seed,
                                  n_bootstrap=N_BOOT).fit(pool, features=prepared.features)
            picks[seed] = {**_picks(model), "true": spec.n_roles}
            q = int(model.components_.shape[0])
        select_seconds = (time.process_time() - start) / len(rep_seeds)
        scored = {}
        for k in sorted({k for p in picks.values() for k in p.values()}):
            with warnings.catch_warnings():
                warnings.simplefilter("ignore")
                model = RoleModel(**settings, roles=int(k), seed=0, n_bootstrap=2).fit(
                    pool, features=prepared.features)
                placements, moves = _moves(model, pool)
            scored[int(k)] = {**recovery(placements, moves, truth), **_quartile_rates(moves, truth)}
        result["reps"][rep] = {"q": q, "picks": {str(s): p for s, p in picks.items()},
                               "scores": {str(k): v for k, v in scored.items()},
                               "select_seconds": select_seconds}
    return result


def summarise(results, seeds):
    """Per (representation, rule): rates over leagues x seeds, means of the scores."""
    rows = []
    reps = sorted({r for res in results for r in res["reps"]}, key=list(REPRESENTATIONS).index)
    for rep in reps:
        for rule in RULES:
            ks, rec, flips = [], [], []
            for res in results:
                if rep not in res["reps"]:
                    continue
                entry = res["reps"][rep]
                chosen = [entry["picks"][str(s)][rule] for s in seeds if str(s) in entry["picks"]]
                if len(chosen) > 1:
                    flips.append(len(set(chosen)) > 1)
                for k in chosen:
                    ks.append((k, res["true_roles"]))
                    rec.append(entry["scores"][str(k)])
            if not ks:
                continue
            k, true = np.array(ks).T
            frame = pd.DataFrame(rec)
            # a league without real changes has no role-change precision, recall or F1 (a single
            # false flag would score 0); its false flags are counted in false_flag
            frame.loc[frame["n_changes"] == 0, ["precision", "recall", "f1"]] = np.nan
            q1 = np.array([r["beyond_0.01_by_quartile"] for r in rec], float)
            q5 = np.array([r["beyond_0.05_by_quartile"] for r in rec], float)
            rows.append({
                "representation": rep, "rule": rule, "runs": int(len(k)),
                "exact": float((k == true).mean()), "within_one": float((abs(k - true) <= 1).mean()),
                "under": float((k < true).mean()), "over": float((k > true).mean()),
                "ari": float(frame["ari"].mean()), "precision": float(frame["precision"].mean()),
                "recall": float(frame["recall"].mean()), "f1": float(frame["f1"].mean()),
                "false_flag": float(frame["false_flag"].mean()),
                "beyond_0.01": float(frame["beyond_0.01"].mean()),
                "beyond_0.05": float(frame["beyond_0.05"].mean()),
                "beyond_0.01_by_quartile": np.nanmean(q1, axis=0).round(4).tolist(),
                "beyond_0.05_by_quartile": np.nanmean(q5, axis=0).round(4).tolist(),
                "seed_flips": float(np.mean(flips)) if flips else None,
            })
    return rows


def markdown(rows, title):
    lines = [f"**{title}**", "",
             "| representation | rule | exact | within one | ARI | precision | recall | F1 | "
             "no-change flagged | k differs by seed |",
             "|---|---|---|---|---|---|---|---|---|---|"]
    for r in rows:
        bold = (r["representation"], r["rule"]) == DEFAULT
        cells = [r["representation"], r["rule"].replace("_", " "), f"{r['exact']:.0%}",
                 f"{r['within_one']:.0%}", f"{r['ari']:.3f}", f"{r['precision']:.3f}",
                 f"{r['recall']:.3f}", f"{r['f1']:.3f}", f"{r['false_flag']:.2%}",
                 f"{r['seed_flips']:.0%}" if r["rule"] != "true" and r["seed_flips"] is not None else "-"]
        if bold:
            cells = [f"**{c}**" for c in cells]
        lines.append("| " + " | ".join(cells) + " |")
    noise = [r for r in rows if r["rule"] == "true"]
    if noise:
        lines += ["", "Beyond-noise rate of players with no real change (true count), overall and by "
                  "quartile of the smaller minutes of the two seasons:", "",
                  "| representation | alpha | overall | Q1 | Q2 | Q3 | Q4 |", "|---|---|---|---|---|---|---|"]
        for r in noise:
            for alpha in (0.01, 0.05):
                qs = " | ".join(f"{v:.3f}" for v in r[f"beyond_{alpha:g}_by_quartile"])
                lines.append(f"| {r['representation']} | {alpha:g} | {r[f'beyond_{alpha:g}']:.3f} | {qs} |")
    return "\n".join(lines)


def _run_set(specs, seeds, reps, path, workdir, former_seeds=None):
    done = {}
    if path.exists():
        for line in path.read_text().splitlines():
            res = json.loads(line)
            done[res["league"]] = res
    out = []
    for spec in specs:
        res = done.get(spec.seed)
        if res is None or not set(reps) <= set(res["reps"]):
            start = time.perf_counter()
            res = run_league(spec, seeds, reps, workdir, former_seeds)
            with path.open("a") as fh:
                fh.write(json.dumps(res) + "\n")
            picks = {r: res["reps"][r]["picks"][str(seeds[0])].get("gap") for r in reps}
            print(f"league {spec.seed}: {spec.n_roles} roles, gap picks {picks}, "
                  f"{time.perf_counter() - start:.0f} s", flush=True)
        out.append(res)
    return out


def main(argv=None):
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--leagues", type=int, default=60)
    parser.add_argument("--start", type=int, default=0, help="first family index (to split a run)")
    parser.add_argument("--held-out", type=int, default=20)
    parser.add_argument("--seeds", type=int, nargs="+", default=[0, 1, 2])
    parser.add_argument("--held-out-start", type=int, default=HELD_OUT_START,
                        help="first held-out family index (to split a run)")
    parser.add_argument("--held-out-seeds", type=int, nargs="+", default=None,
                        help="seeds for the held-out leagues (default: --seeds)")
    parser.add_argument("--former-seeds", type=int, nargs="+", default=None,
                        help="seeds for the former defaults (default: --seeds)")
    parser.add_argument("--reps", nargs="+", default=list(DEFAULT_REPS))
    parser.add_argument("--out", default="benchmarks/results/role_count")
    args = parser.parse_args(argv)
    out = Path(args.out)
    out.parent.mkdir(parents=True, exist_ok=True)
    with threadpool_limits(limits=1), tempfile.TemporaryDirectory() as workdir:
        chosen = _run_set(family(args.leagues, start=args.start), args.seeds, args.reps, out.with_suffix(".jsonl"), workdir,
                          args.former_seeds)
        held_reps = [r for r in args.reps if r in (DEFAULT[0], FORMER[0])]
        held_seeds = args.held_out_seeds or args.seeds
        held = _run_set(family(args.held_out, start=args.held_out_start), held_seeds, held_reps,
                        Path(f"{out}_held_out.jsonl"), workdir, args.former_seeds)
    summary = {"family": summarise(chosen, args.seeds), "held_out": summarise(held, held_seeds),
               "leagues": args.leagues, "held_out_leagues": args.held_out, "seeds": args.seeds,
               "held_out_seeds": held_seeds, "former_seeds": args.former_seeds}
    out.with_suffix(".json").write_text(json.dumps(summary, indent=1) + "\n")
    text = "\n\n".join([
        markdown(summary["family"], f"Family: {args.leagues} leagues x seeds {args.seeds} (used to choose)"),
        markdown(summary["held_out"], f"Held out: {args.held_out} leagues x seeds {held_seeds} (not used to choose)"),
    ])
    out.with_suffix(".md").write_text(text + "\n")
    print(text)


if __name__ == "__main__":
    sys.exit(main())
