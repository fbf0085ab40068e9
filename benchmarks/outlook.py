"""In-season check and preseason outlook, measured on simulated leagues with known truth.

In-season: for six demo-generator leagues with seeds other than the demo's, the six
full seasons fit the model and the seventh season is played for 10, 20 and 40
games (same players, same minutes per game). Each partial season is checked
against the player's latest earlier qualifying season; a real change is a true
role that differs between the two. Reported: the share of players with no real
change that are beyond noise (false flags; nominal = alpha) and called
*changed*, and the share of real changes called *changed* (recall) and *too early*.

Outlook: each league's backtest (:func:`drift.outlook.backtest.backtest`) on the six
demo seeds and ten held-out leagues of :mod:`drift.sim.family` (4 to 12 roles,
blends, change rates from none to 12%), pooled: log loss and Brier score beside
the naive "same role as last season", and the calibration tables.

    python benchmarks/outlook.py            # 6 demo seeds, 10 family leagues (a few CPU minutes)
    python benchmarks/outlook.py --quick    # 1 demo seed, 2 family leagues
"""

from __future__ import annotations

import argparse
import tempfile
from pathlib import Path

import numpy as np
import pandas as pd
from threadpoolctl import threadpool_limits

from drift.api import fit_model, prepare
from drift.config import Config
from drift.measure.inseason import check_partial
from drift.outlook.backtest import backtest
from drift.sim.demo import generate_league, write_league

ALPHA = 0.01
GAMES = (10, 20, 40)


def _true_change(checks, truth):
    last = (truth.sort_values(["player_id", "season", "stint"])
            .groupby(["player_id", "season"])["true_role"].last().reset_index())
    x = checks.merge(last.rename(columns={"season": "season_from", "true_role": "r0"}),
                     on=["player_id", "season_from"])
    x = x.merge(last.rename(columns={"season": "season_to", "true_role": "r1"}), on=["player_id", "season_to"])
    return x.assign(real=x["r0"] != x["r1"])


def inseason(seed, folder):
    """Rows of the in-season table for one league seed."""
    write_league(folder, generate_league(seed, partial_games=GAMES[0]))
    prepared = prepare(folder)
    model = fit_model(prepared)
    rows = []
    for games in GAMES:
        league = generate_league(seed, partial_games=games)
        part_dir = folder / f"partial{games}"
        part_dir.mkdir()
        block = league.rows[league.rows["season"] == league.partial_season]
        block.drop(columns="season").to_csv(part_dir / f"{league.partial_season}.csv", index=False)
        part = prepare(part_dir, Config(min_games=5))
        checks, _ = check_partial(model, part.kept, prepared.kept, alpha=ALPHA, season_games=82)
        x = _true_change(checks, league.truth)
        still, moved = x[~x["real"]], x[x["real"]]
        rows.append({"seed": seed, "games": games, "no_change": len(still), "real_changes": len(moved),
                     "false_flags": int((still["p_value"] < ALPHA).sum()),
                     "false_changed": int((still["status"] == "changed").sum()),
                     "found": int((moved["status"] == "changed").sum()),
                     "beyond": int((moved["p_value"] < ALPHA).sum()),
                     "too_early_real": int((moved["status"] == "too early").sum()),
                     "too_early_all": int((x["status"] == "too early").sum()), "checked": len(x),
                     "null_scale": float(checks["null_scale"].iloc[0])})
    return model, prepared, rows


def outlook_scores(model, prepared):
    placements = model.place(prepared.kept)
    return backtest(placements, model)


def main(argv=None):
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--quick", action="store_true")
    args = parser.parse_args(argv)
    seeds = (11,) if args.quick else (11, 12, 13, 14, 15, 16)
    n_family = 2 if args.quick else 10
    in_rows, back_rows, probs = [], [], []
    with threadpool_limits(limits=1), tempfile.TemporaryDirectory() as tmp:
        for seed in seeds:
            model, prepared, rows = inseason(seed, Path(tmp) / f"demo{seed}")
            in_rows += rows
            bt = outlook_scores(model, prepared)
            back_rows.append(bt.seasons.assign(league=f"demo seed {seed}"))
            probs.append(bt)
        from drift.sim.family import HELD_OUT_START, family, simulate_league

        for spec in family(n_family, start=HELD_OUT_START):
            league = simulate_league(spec)
            folder = Path(tmp) / f"family{spec.seed}"
            league.write(folder)
            config = Config(columns=league.columns)
            prepared = prepare(folder, config)
            model = fit_model(prepared, config)
            bt = outlook_scores(model, prepared)
            back_rows.append(bt.seasons.assign(league=f"family {spec.seed} ({spec.n_roles} roles)"))
            probs.append(bt)
    report_inseason(pd.DataFrame(in_rows))
    report_outlook(pd.concat(back_rows, ignore_index=True), probs)


def report_inseason(t):
    s = t.groupby("games").sum(numeric_only=True)
    print("\nIn-season check (alpha = 0.01), pooled over seeds", sorted(t["seed"].unique()))
    print("| games | players with no real change | beyond noise (false flags) | called changed | "
          "real changes | beyond noise | called changed (recall) | too early |")
    print("|---|---|---|---|---|---|---|---|")
    for games, r in s.iterrows():
        print(f"| {games} | {int(r['no_change'])} | {r['false_flags'] / r['no_change']:.3f} | "
              f"{r['false_changed'] / r['no_change']:.3f} | {int(r['real_changes'])} | "
              f"{r['beyond'] / r['real_changes']:.3f} | {r['found'] / r['real_changes']:.3f} | "
              f"{r['too_early_real'] / r['real_changes']:.3f} |")
    print("null scale by games:", t.groupby("games")["null_scale"].mean().round(3).to_dict())


def _pooled(cal):
    return cal.assign(p=cal["predicted"] * cal["n"], o=cal["observed"] * cal["n"])


def report_outlook(b, backtests):
    print("\nOutlook backtest (per league, all scored seasons pooled; naive = same role as last season "
          "at the earlier seasons' stay rate, oracle = at the scored season's)")
    allrows = b[b["season"] == "all"]
    print(allrows[["league", "n_test", "log_loss", "naive_log_loss", "oracle_log_loss", "brier", "naive_brier",
                   "accuracy"]].round(3).to_string(index=False))
    w = allrows["n_test"].to_numpy(float)
    for col in ("log_loss", "naive_log_loss", "oracle_log_loss", "brier", "naive_brier"):
        print(f"pooled {col}: {np.average(allrows[col], weights=w):.3f}")
    print(f"outlook better than naive log loss in {(allrows['log_loss'] < allrows['naive_log_loss']).sum()} "
          f"of {len(allrows)} leagues")
    cal = pd.concat([bt.calibration for bt in backtests])
    bins = _pooled(cal[cal["kind"] == "role chance"]).groupby(["bin_low", "bin_high"], as_index=False)[
        ["n", "p", "o"]].sum()
    bins = bins.assign(predicted=bins["p"] / bins["n"], observed=bins["o"] / bins["n"])
    bins["gap"] = bins["observed"] - bins["predicted"]
    print("\nRole chances in bins of 0.1, all leagues pooled")
    print(bins[["bin_low", "bin_high", "n", "predicted", "observed", "gap"]].round(3).to_string(index=False))
    print(f"largest |gap| over bins with 100+ chances: {bins.loc[bins['n'] >= 100, 'gap'].abs().max():.3f}")
    dec = cal[cal["kind"] == "change decile"].copy()
    # deciles of each league's own players; pooled by decile rank across leagues
    dec["decile"] = np.tile(np.arange(10), len(dec) // 10)
    d = _pooled(dec).groupby("decile", as_index=False)[["n", "p", "o"]].sum()
    d = d.assign(predicted=d["p"] / d["n"], observed=d["o"] / d["n"])
    d["gap"] = d["observed"] - d["predicted"]
    print("\nChance of changing role, by decile (each league's players in ten groups), pooled")
    print(d[["decile", "n", "predicted", "observed", "gap"]].round(3).to_string(index=False))
    print(f"largest |gap| over deciles: {d['gap'].abs().max():.3f}")


if __name__ == "__main__":
    main()
