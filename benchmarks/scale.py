"""How drift scales: every stage timed against the bare numeric pipeline on the same data.

For each size (player-season rows) and file format it generates a fictional league
(:mod:`scale_league`), then runs, each in a fresh Python process (so imports and
peak memory are counted as a user sees them), back to back:

* ``bare``: the naive pooled script -- pandas read, fill missing values, the
  filters, StandardScaler, PCA, KMeans, predict every row, compare each
  player's labels with his previous season;
* ``drift``: ``drift.api.run`` with fixed roles and components, report included,
  every stage timed through the progress callback;
* ``auto`` (``--auto``): the same with automatic components and roles;
* ``place``: ``drift.api.place_files`` of every row with the fitted model, and
  ``bare-place``: reading the same file and the raw numpy product
  (standardise, project, distances to the centroids, nearest).

It writes ``scale.json`` and ``scale.md`` (tables) into ``--out``. Speed is
reported as ratios measured in the same run, so a busy machine affects both sides.

    python benchmarks/scale.py --rows 1000 10000 100000 --formats parquet csv
    python benchmarks/scale.py --rows 1000000 --formats parquet --auto
"""

from __future__ import annotations

import argparse
import json
import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROLES, COMPONENTS = 7, 8


def _peak_mb():
    import resource

    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024


def child_bare(data, fmt, out):
    """The naive pooled script; prints its stage times."""
    t = {}
    start = time.perf_counter()
    import pandas as pd
    from sklearn.cluster import KMeans
    from sklearn.decomposition import PCA
    from sklearn.preprocessing import StandardScaler

    t["import"] = time.perf_counter() - start
    mark = time.perf_counter()
    files = sorted(Path(data).glob(f"*.{fmt}"))
    if fmt == "parquet":
        frame = pd.concat([pd.read_parquet(f) for f in files], ignore_index=True)
    else:
        frame = pd.concat([pd.read_csv(f).assign(season=f.stem) for f in files], ignore_index=True)
    t["read"] = time.perf_counter() - mark
    mark = time.perf_counter()
    feats = [c for c in frame.columns if c.startswith(("share_", "ppp_")) or c.endswith(("_pct", "_rate"))]
    frame = frame[(frame["games"] >= 20) & (frame["minutes"] >= 10 * frame["games"])]
    x = frame[feats].fillna(frame[feats].mean()).to_numpy()
    t["prepare"] = time.perf_counter() - mark
    mark = time.perf_counter()
    z = StandardScaler().fit_transform(x)
    scores = PCA(n_components=COMPONENTS, random_state=0).fit_transform(z)
    t["fit"] = time.perf_counter() - mark
    mark = time.perf_counter()
    km = KMeans(n_clusters=ROLES, random_state=0).fit(scores)
    t["kmeans"] = time.perf_counter() - mark
    mark = time.perf_counter()
    labels = km.predict(scores)
    table = pd.DataFrame({"player_id": frame["player_id"].to_numpy(), "season": frame["season"].to_numpy(),
                          "role": labels}).sort_values(["player_id", "season"], kind="stable")
    same = table["player_id"].to_numpy()[1:] == table["player_id"].to_numpy()[:-1]
    changed = same & (table["role"].to_numpy()[1:] != table["role"].to_numpy()[:-1])
    table.to_csv(Path(out) / "labels.csv", index=False)
    t["predict_compare_write"] = time.perf_counter() - mark
    t["total"] = time.perf_counter() - start
    return {"stages": t, "cpu": {"total": time.process_time()}, "rows": int(len(frame)),
            "changed": int(changed.sum()), "peak_mb": _peak_mb()}


class _CpuStages:
    """Progress callback recording each stage's CPU seconds (less sensitive to a busy machine)."""

    def __init__(self):
        self.cpu, self._start = {}, {}

    def __call__(self, event):
        if not event.done:
            self._start[event.stage] = time.process_time()
        else:
            used = time.process_time() - self._start.pop(event.stage)
            self.cpu[event.stage] = self.cpu.get(event.stage, 0.0) + used
            print(f"{event.stage}: {event.rows} rows, {event.elapsed:.2f} s", file=sys.stderr, flush=True)


def _stage_times(st, cpu, imported, start):
    stages = {"import": imported}
    for name, _, seconds in st.times:
        stages[name] = stages.get(name, 0.0) + seconds
    stages["total"] = time.perf_counter() - start
    return stages, {**cpu.cpu, "total": time.process_time()}


def child_drift(data, fmt, out, auto):
    start = time.perf_counter()
    from drift.api import run
    from drift.config import Config
    from drift.progress import Stages

    imported = time.perf_counter() - start
    cpu = _CpuStages()
    st = Stages(cpu)
    config = Config().replace(roles="auto" if auto else ROLES, components=None if auto else COMPONENTS)
    files = sorted(Path(data).glob(f"*.{fmt}"))
    analysis = run(files, Path(out) / "run", config, progress=st)
    stages, cpu_s = _stage_times(st, cpu, imported, start)
    report = Path(out) / "run" / "report.html"
    return {"stages": stages, "cpu": cpu_s, "rows": int(len(analysis.placements)), "peak_mb": _peak_mb(),
            "roles": len(analysis.model.role_ids_), "components": int(analysis.model.components_.shape[0]),
            "report_mb": report.stat().st_size / 2 ** 20,
            "outputs_mb": sum(p.stat().st_size for p in (Path(out) / "run").iterdir()) / 2 ** 20}


def child_place(data, fmt, out, model):
    start = time.perf_counter()
    from drift.api import place_files
    from drift.progress import Stages

    imported = time.perf_counter() - start
    cpu = _CpuStages()
    st = Stages(cpu)
    placed = place_files(model, sorted(Path(data).glob(f"*.{fmt}")), Path(out) / "placed.csv", progress=st)
    stages, cpu_s = _stage_times(st, cpu, imported, start)
    return {"stages": stages, "cpu": cpu_s, "rows": int(len(placed.placements)), "peak_mb": _peak_mb()}


def child_bare_place(data, fmt, out, model):
    start = time.perf_counter()
    import numpy as np
    import pandas as pd

    t = {"import": time.perf_counter() - start}
    m = json.loads(Path(model).read_text())
    mark = time.perf_counter()
    files = sorted(Path(data).glob(f"*.{fmt}"))
    reader = pd.read_parquet if fmt == "parquet" else pd.read_csv
    frame = pd.concat([reader(f) for f in files], ignore_index=True)
    t["read"] = time.perf_counter() - mark
    x = np.nan_to_num(frame[m["features"]].to_numpy(float))
    mark = time.perf_counter()
    load = np.asarray(m["components"]) * (np.asarray(m["weights"]) / np.asarray(m["scaler_scale"]))
    centre = np.asarray(m["scaler_mean"]) + np.asarray(m["pca_mean"]) * np.asarray(m["scaler_scale"]) / np.asarray(m["weights"])
    scores = (x - centre) @ load.T
    cents = np.asarray([r["centroid_components"] for r in m["roles"]])
    d2 = (scores ** 2).sum(1)[:, None] - 2 * scores @ cents.T + (cents ** 2).sum(1)[None]
    nearest = d2.argmin(axis=1)
    t["product"] = time.perf_counter() - mark
    t["total"] = time.perf_counter() - start
    return {"stages": t, "cpu": {"total": time.process_time()}, "rows": int(len(nearest)), "peak_mb": _peak_mb()}


CHILDREN = {"bare": child_bare, "drift": child_drift, "place": child_place, "bare-place": child_bare_place}


def _spawn(kind, data, fmt, out, extra=()):
    env = dict(os.environ, PYTHONPATH=str(HERE.parent))
    cmd = [sys.executable, str(Path(__file__).resolve()), "--child", kind, str(data), fmt, str(out), *extra]
    done = subprocess.run(cmd, stdout=subprocess.PIPE, text=True, env=env, check=False)
    if done.returncode != 0:
        raise RuntimeError(f"{kind} failed (its messages are above)")
    return json.loads(done.stdout.strip().splitlines()[-1])


def measure(rows, fmt, *, auto, place, seed=0):
    from scale_league import make_league, write_league

    with tempfile.TemporaryDirectory(prefix="drift-scale-") as tmp:
        tmp = Path(tmp)
        mark = time.perf_counter()
        league = make_league(rows, seed=seed)
        write_league(league, tmp / "data", fmt)
        del league
        result = {"rows_generated": rows, "format": fmt, "generate_s": time.perf_counter() - mark,
                  "load_before": os.getloadavg()[0]}
        (tmp / "b").mkdir()
        (tmp / "d").mkdir()
        result["bare"] = _spawn("bare", tmp / "data", fmt, tmp / "b")
        result["drift"] = _spawn("drift", tmp / "data", fmt, tmp / "d", ["fixed"])
        if auto:
            (tmp / "a").mkdir()
            result["auto"] = _spawn("drift", tmp / "data", fmt, tmp / "a", ["auto"])
        if place:
            model = tmp / "d" / "run" / "model.json"
            result["place"] = _spawn("place", tmp / "data", fmt, tmp / "d", [str(model)])
            result["bare_place"] = _spawn("bare-place", tmp / "data", fmt, tmp / "d", [str(model)])
        result["load_after"] = os.getloadavg()[0]
    return result


#: the core stages of a run (read, fit, place, moves), compared with the whole bare script
CORE = ("read", "combine stints", "fit reference model", "place", "moves")


def _ratio(r, key, what):
    if key not in r:
        return "- | -"
    wall = r[key]["stages"]["total"] / r["bare"]["stages"]["total"]
    cpu = r[key]["cpu"]["total"] / r["bare"]["cpu"]["total"]
    return f"{r[key][what]['total']:.1f} | {wall:.2f} / {cpu:.2f}"


def markdown(results) -> str:
    lines = ["| rows placed | format | bare script s (CPU s) | drift fixed s | ratio wall / CPU | "
             "drift auto s | ratio wall / CPU | peak MB bare / fixed / auto | place s | "
             "bare read + product s | report MB |",
             "|---|---|---|---|---|---|---|---|---|---|---|"]
    for r in results:
        b = r["bare"]
        peaks = " / ".join(f"{r[k]['peak_mb']:.0f}" if k in r else "-" for k in ("bare", "drift", "auto"))
        place = (f"{r['place']['stages']['total']:.1f} | "
                 f"{r['bare_place']['stages']['read'] + r['bare_place']['stages']['product']:.1f}"
                 if "place" in r else "- | -")
        lines.append(f"| {r['drift']['rows']:,} | {r['format']} | {b['stages']['total']:.1f} "
                     f"({b['cpu']['total']:.1f}) | {_ratio(r, 'drift', 'stages')} | "
                     f"{_ratio(r, 'auto', 'stages')} | {peaks} | {place} | {r['drift']['report_mb']:.1f} |")
    stage_names = []
    for r in results:
        for name in r["drift"]["stages"]:
            if name not in stage_names and name != "total":
                stage_names.append(name)
    lines += ["", "drift fixed, CPU seconds by stage (wall seconds in brackets):", "",
              "| stage | " + " | ".join(f"{r['drift']['rows']:,} {r['format']}" for r in results) + " |",
              "|---|" + "---|" * len(results)]
    for name in stage_names:
        cells = [f"{r['drift']['cpu'].get(name, 0):.2f} ({r['drift']['stages'].get(name, 0):.2f})"
                 for r in results]
        lines.append(f"| {name} | " + " | ".join(cells) + " |")
    lines += ["", "Core stages (" + ", ".join(CORE) + ") against the whole bare script, wall: "
              + "; ".join(f"{r['drift']['rows']:,}: {_core(r):.2f}x" for r in results) + ".",
              "", "Growth: time of each stage at this size over the previous size, with the growth of the rows "
              "(linear work grows as the rows do):", ""]
    for prev, r in zip(results, results[1:]):
        grow_rows = r["drift"]["rows"] / max(prev["drift"]["rows"], 1)
        worst = max(((r["drift"]["stages"][s] / max(prev["drift"]["stages"].get(s, 0), 0.05), s)
                     for s in r["drift"]["stages"] if s not in ("total", "import")), default=(0, "-"))
        lines.append(f"- {prev['drift']['rows']:,} -> {r['drift']['rows']:,} rows (x{grow_rows:.1f}): whole run "
                     f"x{r['drift']['stages']['total'] / prev['drift']['stages']['total']:.1f}; steepest stage "
                     f"{worst[1]} x{worst[0]:.1f}")
    loads = ", ".join(f"{r['load_before']:.2f}/{r['load_after']:.2f}" for r in results if "load_before" in r)
    lines += ["", f"1-minute load average before/after each size: {loads} (a quiet 2-core machine reads "
              "below 1 before a size starts; the benchmark itself adds about 1)."]
    return "\n".join(lines) + "\n"


def _core(r):
    stages = r["drift"]["stages"]
    return sum(stages.get(s, 0) for s in CORE) / r["bare"]["stages"]["total"]


def help_seconds(repeats=5):
    """Best wall time of ``python -m drift --help`` in a fresh process."""
    env = dict(os.environ, PYTHONPATH=str(HERE.parent))
    best = float("inf")
    for _ in range(repeats):
        mark = time.perf_counter()
        subprocess.run([sys.executable, "-m", "drift", "--help"], capture_output=True, env=env, check=True)
        best = min(best, time.perf_counter() - mark)
    return best


def main(argv=None):
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("--rows", type=int, nargs="+", default=[1000, 10000, 100000])
    parser.add_argument("--formats", nargs="+", default=["parquet", "csv"], choices=["parquet", "csv"])
    parser.add_argument("--auto", action="store_true", help="also time automatic selection")
    parser.add_argument("--no-place", action="store_true", help="skip drift place")
    parser.add_argument("--out", default=str(HERE / "results"))
    parser.add_argument("--child", nargs="+", help=argparse.SUPPRESS)
    args = parser.parse_args(argv)
    if args.child:
        kind, data, fmt, out, *extra = args.child
        if kind == "drift":
            res = child_drift(data, fmt, out, auto=extra[0] == "auto")
        elif kind in ("place", "bare-place"):
            res = CHILDREN[kind](data, fmt, out, extra[0])
        else:
            res = child_bare(data, fmt, out)
        print(json.dumps(res))
        return
    sys.path.insert(0, str(HERE))
    out = Path(args.out)
    out.mkdir(parents=True, exist_ok=True)
    results = []
    help_s = help_seconds()
    print(f"drift --help: {help_s:.3f} s (best of 5, fresh processes)", flush=True)
    for rows in args.rows:
        for fmt in args.formats:
            res = measure(rows, fmt, auto=args.auto, place=not args.no_place)
            res["help_s"] = help_s
            results.append(res)
            print(f"{rows:>9,} {fmt:8} bare {res['bare']['stages']['total']:7.1f} s  "
                  f"drift {res['drift']['stages']['total']:7.1f} s  peak {res['drift']['peak_mb']:.0f} MB",
                  flush=True)
            (out / "scale.json").write_text(json.dumps(results, indent=1) + "\n")
            (out / "scale.md").write_text(markdown(results))
    print(markdown(results))


if __name__ == "__main__":
    main()
