"""Accuracy of the defaults on fresh held-out leagues: role count, moves, memberships, namings.

    python benchmarks/held_out.py [--leagues 40] [--start 3000] [--seeds 0 1 2]
                                  [--unlisted-every 4] [--out benchmarks/results/held_out]

Leagues come from ``drift.sim.family.stress_family`` (from ``FRESH_START`` = 3000 they
were never used to choose anything): in turn twelve roles, one or two rare roles (3% of
players), rosters of seven, twelve seasons, and plain family leagues; feature columns
spelled ``drift`` or ``club`` in turn. Every league runs with the default settings (the
CLI's), once per seed, and is scored against its truth with ``recovery``:

* the role count: exact, within one, and whether it differs between seeds;
* role changes at alpha 0.01 (precision, recall, F1), by naming;
* leagues with no real change: the share of pairs beyond noise at alpha 0.01 and the
  share flagged as changed;
* memberships: every placement's shown membership (``role_prob``) in bins, against the
  share whose role is their true role (roles matched to the truth by the Hungarian
  algorithm, so a role the truth does not have counts as wrong);
* both namings read alike: the league is also read in the other naming and the prepared
  tables compared (identical tables give identical results, the fit being deterministic);
* every ``--unlisted-every``-th league is also run with two play types under vendor codes no
  spelling table knows (``unlisted``), to measure reliability from the data alone, and
  the features the fit named as near-zero reliability are recorded.

Bootstrap stability is a reported diagnostic that decides nothing; it runs with 3
resamples here (``n_bootstrap``) to save time, which changes no count, role or move.
One math-library thread; results go to ``OUT.jsonl`` (one line per league, so an
interrupted run resumes), ``OUT.json`` and ``OUT.md``.
"""

from __future__ import annotations

import argparse
import dataclasses
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
from scipy.optimize import linear_sum_assignment  # noqa: E402
from threadpoolctl import threadpool_limits  # noqa: E402

from drift.api import prepare  # noqa: E402
from drift.config import Config  # noqa: E402
from drift.errors import UnreliableFeatureWarning  # noqa: E402
from drift.model import ModelSettings, RoleModel  # noqa: E402
from drift.sim.family import FRESH_START, recovery, season_truth, simulate_league, stress_family  # noqa: E402

BINS = (0.0, 0.5, 0.6, 0.7, 0.8, 0.9, 0.99, 1.0001)
N_BOOT = 3


def _moves(model, kept):
    from drift.measure.moves import pair_moves
    from drift.model.noise import consecutive_pairs

    placements = model.place(kept)
    i1, i2 = consecutive_pairs(kept)
    return placements, pair_moves(model, kept, placements, i1, i2, alpha=0.01, kind="consecutive")


def _prepared(spec, folder):
    league = simulate_league(spec)
    league.write(folder)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        prepared = prepare(folder, Config(columns=league.columns))
    return league, prepared


def _fit(prepared, seed):
    settings = dataclasses.replace(ModelSettings(), seed=seed, n_bootstrap=N_BOOT)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        model = RoleModel.from_settings(settings).fit(prepared.kept, features=prepared.features)
    unreliable = [str(w.message) for w in caught if issubclass(w.category, UnreliableFeatureWarning)]
    return model, unreliable


def _membership(placements, truth):
    placed = placements.merge(truth, on=["player_id", "season"])
    table = pd.crosstab(placed["role"], placed["true_role"])
    rows, cols = linear_sum_assignment(-table.to_numpy())
    match = {table.index[r]: table.columns[c] for r, c in zip(rows, cols)}
    right = (placed["role"].map(match) == placed["true_role"]).to_numpy()
    prob = placed["role_prob"].to_numpy(float)
    probs = placed[[c for c in placed.columns if c.startswith("prob_")]].to_numpy(float)
    ids = np.array([c[len("prob_"):] for c in placed.columns if c.startswith("prob_")])
    top = ids[probs.argmax(axis=1)]
    return {"prob": prob.round(5).tolist(), "right": right.astype(int).tolist(),
            "role_not_top": float((top != placed["role"].to_numpy()).mean())}


def _run(prepared, truth, seed):
    model, unreliable = _fit(prepared, seed)
    placements, moves = _moves(model, prepared.kept)
    return model, {**recovery(placements, moves, truth), "unreliable_warning": unreliable}, placements


def _same_reading(a, b) -> bool:
    """Do two namings of one league prepare to the same table (same features, same values)?"""
    if sorted(a.features) != sorted(b.features):
        return False
    cols = ["player_id", "season", "minutes", *sorted(a.features)]
    x = a.kept[cols].sort_values(["player_id", "season"]).reset_index(drop=True)
    y = b.kept[cols].sort_values(["player_id", "season"]).reset_index(drop=True)
    return bool(x.equals(y))


def run_league(case, spec, seeds, workdir, unlisted: bool):
    start = time.process_time()
    folder = Path(workdir) / f"l{spec.seed}"
    league, prepared = _prepared(spec, folder)
    truth = season_truth(league)
    other = "club" if spec.feature_naming == "drift" else "drift"
    _, prepared_other = _prepared(dataclasses.replace(spec, feature_naming=other), Path(workdir) / f"o{spec.seed}")
    out = {"league": spec.seed, "case": case, "naming": spec.feature_naming, "true_roles": spec.n_roles,
           "n_pool": int(len(prepared.kept)), "spec": dataclasses.asdict(spec),
           "namings_read_alike": _same_reading(prepared, prepared_other), "seeds": {}}
    for seed in seeds:
        model, scores, placements = _run(prepared, truth, seed)
        diag = model.role_diagnostics_
        entry = {"k": len(model.role_ids_), **{k: v for k, v in scores.items() if k != "n_roles"},
                 "refined": [int(k) for k in diag.loc[diag["gap_refined"].astype(bool), "k"]]
                 if "gap_refined" in diag else []}
        if seed == seeds[0]:
            entry["membership"] = _membership(placements, truth)
        out["seeds"][str(seed)] = entry
    if unlisted:
        _, prepared_u = _prepared(dataclasses.replace(spec, feature_naming="unlisted"), Path(workdir) / f"u{spec.seed}")
        _, scores, _ = _run(prepared_u, truth, seeds[0])
        out["unlisted"] = {k: v for k, v in scores.items()}
    out["cpu_seconds"] = time.process_time() - start
    return out


def summarise(results, seeds):
    first = str(seeds[0])
    rows = [{"league": r["league"], "case": r["case"], "naming": r["naming"], "true": r["true_roles"],
             **{f"k_{s}": r["seeds"][str(s)]["k"] for s in seeds}, **r["seeds"][first]} for r in results]
    frame = pd.DataFrame(rows)
    k, true = frame[f"k_{first}"].to_numpy(), frame["true"].to_numpy()
    flips = frame[[f"k_{s}" for s in seeds]].nunique(axis=1).to_numpy() > 1
    changes = frame["n_changes"] > 0

    def count_block(sel):
        return {"leagues": int(sel.sum()), "exact": float((k[sel] == true[sel]).mean()),
                "within_one": float((abs(k[sel] - true[sel]) <= 1).mean()),
                "under": float((k[sel] < true[sel]).mean()), "over": float((k[sel] > true[sel]).mean()),
                "k_same_across_seeds": float((~flips[sel]).mean())}

    summary = {"leagues": len(frame), "seeds": seeds, "count": count_block(np.ones(len(frame), bool)),
               "count_by_case": {c: count_block((frame["case"] == c).to_numpy()) for c in frame["case"].unique()},
               "moves_by_naming": {}, "namings_read_alike": int(sum(r["namings_read_alike"] for r in results))}
    for naming in sorted(frame["naming"].unique()):
        sel = (frame["naming"] == naming) & changes
        summary["moves_by_naming"][naming] = {
            "leagues": int(sel.sum()), "precision": float(frame.loc[sel, "precision"].mean()),
            "recall": float(frame.loc[sel, "recall"].mean()), "f1": float(frame.loc[sel, "f1"].mean()),
            "f1_min": float(frame.loc[sel, "f1"].min())}
    none = ~changes
    summary["no_change"] = {"leagues": int(none.sum()),
                            "beyond_0.01": float(frame.loc[none, "beyond_0.01"].mean()),
                            "flagged": float(frame.loc[none, "false_flag"].mean())}
    summary["all_pairs_beyond_0.01_without_change"] = float(frame["beyond_0.01"].mean())
    prob = np.concatenate([r["seeds"][first]["membership"]["prob"] for r in results])
    right = np.concatenate([r["seeds"][first]["membership"]["right"] for r in results])
    exact = np.concatenate([np.full(len(r["seeds"][first]["membership"]["prob"]),
                                    r["seeds"][first]["k"] == r["true_roles"]) for r in results])
    summary["membership"] = _bins(prob, right)
    summary["membership_exact_k"] = _bins(prob[exact], right[exact])
    summary["role_not_top"] = float(np.mean([r["seeds"][first]["membership"]["role_not_top"] for r in results]))
    unl = [r for r in results if "unlisted" in r]
    if unl:
        summary["unlisted"] = {
            "leagues": len(unl),
            "exact": float(np.mean([r["unlisted"]["n_roles"] == r["true_roles"] for r in unl])),
            "exact_same_leagues_named": float(np.mean([r["seeds"][first]["k"] == r["true_roles"] for r in unl])),
            "f1": float(np.nanmean([r["unlisted"]["f1"] for r in unl])),
            "f1_same_leagues_named": float(np.nanmean([r["seeds"][first]["f1"] for r in unl])),
            "beyond_0.01": float(np.nanmean([r["unlisted"]["beyond_0.01"] for r in unl])),
            "warned_leagues": int(sum(bool(r["unlisted"]["unreliable_warning"]) for r in unl)),
            "warned_ppp_playtype": int(sum(any("type7_ppp" in w or "type8_ppp" in w
                                               for w in r["unlisted"]["unreliable_warning"]) for r in unl)),
        }
    return summary


def _bins(prob, right):
    cut = pd.cut(prob, BINS, right=False)
    table = pd.DataFrame({"bin": cut, "prob": prob, "right": right}).groupby("bin", observed=True).agg(
        n=("right", "size"), shown=("prob", "mean"), observed=("right", "mean")).reset_index()
    return [{"bin": str(b), "n": int(n), "shown": float(s), "observed": float(o)}
            for b, n, s, o in table.itertuples(index=False)]


def markdown(s):
    c = s["count"]
    lines = [f"**{s['leagues']} fresh held-out leagues, default settings, seeds {s['seeds']}**", "",
             "| leagues | exact k | within one | under | over | k same across seeds |", "|---|---|---|---|---|---|",
             f"| all ({c['leagues']}) | {c['exact']:.0%} | {c['within_one']:.0%} | {c['under']:.0%} | "
             f"{c['over']:.0%} | {c['k_same_across_seeds']:.0%} |"]
    for case, b in s["count_by_case"].items():
        lines.append(f"| {case} ({b['leagues']}) | {b['exact']:.0%} | {b['within_one']:.0%} | {b['under']:.0%} | "
                     f"{b['over']:.0%} | {b['k_same_across_seeds']:.0%} |")
    lines += ["", "| naming | leagues with real changes | precision | recall | F1 | lowest F1 |", "|---|---|---|---|---|---|"]
    for naming, m in s["moves_by_naming"].items():
        lines.append(f"| {naming} | {m['leagues']} | {m['precision']:.3f} | {m['recall']:.3f} | {m['f1']:.3f} | "
                     f"{m['f1_min']:.3f} |")
    n = s["no_change"]
    lines += ["", f"Leagues with no real change ({n['leagues']}): {n['beyond_0.01']:.2%} of pairs beyond noise at "
              f"alpha 0.01, {n['flagged']:.2%} flagged as role changes. Pairs without a real change in every "
              f"league: {s['all_pairs_beyond_0.01_without_change']:.2%} beyond noise at alpha 0.01.",
              f"Both namings prepared identical tables in {s['namings_read_alike']} of {s['leagues']} leagues. "
              f"The role column is not the role of highest membership in {s['role_not_top']:.2%} of placements.",
              "", "| shown membership | placements | mean shown | share in that role | placements (k exact) | "
              "share (k exact) |", "|---|---|---|---|---|---|"]
    exact = {b["bin"]: b for b in s["membership_exact_k"]}
    for b in s["membership"]:
        e = exact.get(b["bin"], {"n": 0, "observed": float("nan")})
        lines.append(f"| {b['bin']} | {b['n']} | {b['shown']:.3f} | {b['observed']:.3f} | {e['n']} | "
                     f"{e['observed']:.3f} |")
    if "unlisted" in s:
        u = s["unlisted"]
        lines += ["", f"Two play types under codes no spelling table knows ({u['leagues']} leagues): exact k "
                  f"{u['exact']:.0%} (same leagues, named: {u['exact_same_leagues_named']:.0%}), F1 {u['f1']:.3f} "
                  f"(named: {u['f1_same_leagues_named']:.3f}), no-change pairs beyond noise at 0.01: "
                  f"{u['beyond_0.01']:.2%}; a near-zero-reliability warning in {u['warned_leagues']} leagues, "
                  f"naming an unlisted points-per-possession column in {u['warned_ppp_playtype']}."]
    return "\n".join(lines)


def main(argv=None):
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--leagues", type=int, default=40)
    parser.add_argument("--start", type=int, default=FRESH_START)
    parser.add_argument("--seeds", type=int, nargs="+", default=[0, 1, 2])
    parser.add_argument("--unlisted-every", type=int, default=4)
    parser.add_argument("--out", default="benchmarks/results/held_out")
    args = parser.parse_args(argv)
    out = Path(args.out)
    out.parent.mkdir(parents=True, exist_ok=True)
    path = out.with_suffix(".jsonl")
    done = {}
    if path.exists():
        for line in path.read_text().splitlines():
            res = json.loads(line)
            done[res["league"]] = res
    results = []
    with threadpool_limits(limits=1), tempfile.TemporaryDirectory() as workdir:
        for i, (case, spec) in enumerate(stress_family(args.leagues, start=args.start)):
            res = done.get(spec.seed)
            if res is None:
                res = run_league(case, spec, args.seeds, workdir, unlisted=i % args.unlisted_every == 0)
                with path.open("a") as fh:
                    fh.write(json.dumps(res) + "\n")
                ks = [res["seeds"][str(s)]["k"] for s in args.seeds]
                print(f"league {spec.seed} ({case}, {spec.n_roles} roles): k {ks}, "
                      f"F1 {res['seeds'][str(args.seeds[0])]['f1']:.3f}, {res['cpu_seconds']:.0f} s", flush=True)
            results.append(res)
    summary = summarise(results, args.seeds)
    out.with_suffix(".json").write_text(json.dumps(summary, indent=1) + "\n")
    text = markdown(summary)
    out.with_suffix(".md").write_text(text + "\n")
    print(text)


if __name__ == "__main__":
    sys.exit(main())
