"""The public Python API: the stages wired together.

``prepare`` reads and filters; ``fit_model`` fits the reference model; ``analyse``
places, measures moves and role drift; ``run`` does all of it and writes the
outputs; ``place_files`` places seasons with a saved model.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import TYPE_CHECKING

from drift.config import Config
from drift.errors import InputError
from drift.intake.preflight import check_distinct, check_regular, check_settings
from drift.intake.prepare import Prepared, _as_list, _data_files, prepare, reference_pool
from drift.placing import check_files, place, place_files
from drift.progress import stages
from drift.threads import thread_limited

if TYPE_CHECKING:  # pragma: no cover - annotations only; nothing heavy loads at import
    import pandas as pd

    from drift.model import Alignment, RoleModel
    from drift.outlook import Backtest
    from drift.sim import SelfCheck

__all__ = ["check", "Prepared", "Analysis", "prepare", "fit_model", "analyse", "run", "place", "place_files",
           "check_files", "write_outputs"]


@dataclass(frozen=True)
class Analysis:
    """Everything a run produces (each a DataFrame, except ``model``)."""

    model: RoleModel
    placements: pd.DataFrame
    moves: pd.DataFrame
    stints: pd.DataFrame
    role_drift: pd.DataFrame
    comparables: pd.DataFrame
    alignment: Alignment | None = None
    prepared: Prepared | None = None
    config: Config = field(default_factory=Config)
    #: next-season outlook of every player placed in the latest season (columns:
    #: drift.outlook.OUTLOOK_COLUMNS, then prob_<role>, exp_pc<j>); None with too few returning players
    outlook: pd.DataFrame | None = None
    #: drift.outlook.Backtest (per-season scores and calibration tables), or None
    backtest: Backtest | None = None
    #: drift.sim.SelfCheck with ``run(..., self_check=N)``, else None
    self_check: SelfCheck | None = None

    @property
    def n_changed(self) -> int:
        """Moves judged a role change beyond noise."""
        return int((self.moves["status"] == "changed").sum()) if len(self.moves) else 0

    def summary(self) -> str:
        """One line: player-seasons placed, roles, role changes beyond noise (the CLI prints it)."""
        return (f"placed {len(self.placements)} player-seasons in {len(self.model.role_ids_)} roles; "
                f"{self.n_changed} role changes beyond noise")

    #: role changes a notebook summary lists (the largest first); every one is in ``moves``
    SHOWN_CHANGES = 8

    @property
    def warnings(self) -> tuple:
        """What deserves a look: roles that do not reproduce, values set to the pool mean, intake notes."""
        said = list(self.model._weak_roles())
        if self.prepared is not None:
            missing = self.prepared.missing
            filled = missing[missing["family"].isin(["rate", "shooting"]) & (missing["missing"] > 0)]
            said += [f"{f}: {n} missing value(s) set to the pool mean" for f, n in zip(filled["feature"],
                                                                                    filled["missing"])]
            notes = list(self.prepared.reading.notes) if self.prepared.reading is not None else []
            said += notes[:5] + ([f"... and {len(notes) - 5} more intake notes"] if len(notes) > 5 else [])
        return tuple(said)

    def _role_rows(self):
        model, placed = self.model, self.placements
        latest = placed["season"].max() if len(placed) else None
        counts = placed["role"].value_counts()
        recent = placed.loc[placed["season"] == latest, "role"].value_counts()
        return latest, [(rid, name, int(size), int(counts.get(rid, 0)), int(recent.get(rid, 0)))
                        for rid, name, size in zip(model.role_ids_, model.role_names_, model.role_sizes_)]

    def _change_rows(self):
        names = dict(zip(self.model.role_ids_, self.model.role_names_))
        if not len(self.moves):
            return []
        changed = self.moves[self.moves["status"] == "changed"]
        top = changed.sort_values("z", ascending=False, kind="stable").head(self.SHOWN_CHANGES)
        return [(r["player"], f"{r['season_from']} to {r['season_to']}", r["team_to"],
                 f"{r['role_from']} {names.get(r['role_from'], '')} to {r['role_to']} {names.get(r['role_to'], '')}",
                 f"{r['z']:.1f}") for r in top.to_dict(orient="records")]

    def __repr__(self) -> str:
        from drift.messages import text_summary

        said = self.warnings
        roles = ", ".join(f"{rid} {name} ({placed:,})" for rid, name, _, placed, _ in self._role_rows()[1])
        return text_summary("Analysis", self.summary(), parts=[
            ("roles (player-seasons placed)", roles),
            ("warnings", f"{len(said)}, the first: {said[0]}" if said else "none")])

    def _repr_html_(self) -> str:
        from drift.messages import html_summary

        latest, roles = self._role_rows()
        changes = self._change_rows()
        return html_summary("drift Analysis", self.summary(), tables=[
            ("Roles", ("role", "name", "pool size", "placed", f"placed in {latest}"), roles),
            (f"Role changes beyond noise: {self.n_changed:,}" + (f" (the {len(changes)} largest by z)" if changes
                                                                 else ""),
             ("player", "seasons", "team", "role", "z"), changes)],
            lists=[("Warnings", self.warnings)])


@thread_limited(fitting=True)
def fit_model(prepared: Prepared, config: Config | None = None, *, progress=None):
    """Fit the reference model on the pool chosen by ``config.reference``."""
    from drift.model import RoleModel

    config = config or Config()
    check_settings(prepared, config)
    pool = reference_pool(prepared, config.reference)
    model = RoleModel.from_settings(config.model)
    with stages(progress).stage("fit reference model", len(pool)):
        return model.fit(pool, features=prepared.features, intake=config.intake)


@thread_limited(fitting=True)
def analyse(prepared: Prepared, model, config: Config | None = None, *, alignment=None,
            progress=None) -> Analysis:
    """Place every qualifying season and stint, measure moves, role drift and comparables."""
    import pandas as pd

    from drift.measure.comparables import run_comparables
    from drift.measure.moves import pair_moves, requested_pairs, stint_pairs
    from drift.measure.role_drift import role_drift
    from drift.model.noise import consecutive_pairs
    from drift.outlook.backtest import season_outlook

    config = config or Config()
    st = stages(progress)
    kept = prepared.kept
    with st.stage("place", len(kept)):
        placements = model.place(kept)
        for extra in ("team_first", "team_last", "n_stints"):
            if extra in kept.columns:
                placements[extra] = kept[extra].to_numpy()
    i1, i2 = consecutive_pairs(kept)
    with st.stage("moves", len(i1)):
        kept_processed = model.processed(kept)  # shared by every season-pair measurement below
        moves = [pair_moves(model, kept, placements, i1, i2, alpha=config.alpha, kind="consecutive",
                            processed=kept_processed)]
        if config.compare:
            check_settings(prepared, config)
            j1, j2 = requested_pairs(kept, *config.compare)
            moves.append(pair_moves(model, kept, placements, j1, j2, alpha=config.alpha, kind="requested",
                                    processed=kept_processed))
        moves = pd.concat(moves, ignore_index=True)
    stints = prepared.stints
    with st.stage("stints", len(stints)):
        if len(stints):
            stint_place = model.place(stints)
            stint_place["stint"] = stints["stint"].to_numpy()
            s1, s2 = stint_pairs(stints)
            stint_moves = pair_moves(model, stints.reset_index(drop=True), stint_place, s1, s2,
                                     alpha=config.alpha, kind="stint")
        else:
            stint_moves = pd.DataFrame()
    with st.stage("comparables", len(placements)):
        comps = run_comparables(model, placements, moves)
    with st.stage("role drift", len(kept)):
        drift = role_drift(model, kept, seed=config.seed)
    with st.stage("outlook", len(placements)):
        outlook, backtest = season_outlook(placements, model)
    return Analysis(model=model, placements=placements, moves=moves, stints=stint_moves,
                    role_drift=drift, comparables=comps, alignment=alignment,
                    prepared=prepared, config=config, outlook=outlook, backtest=backtest)


#: every table a run may write into its output folder, as CSV (``name.csv``) or Parquet (``name.parquet``)
OUTPUT_TABLES = ("placements", "moves", "excluded", "stints", "role_drift", "comparables", "features", "alignment",
                 "outlook", "backtest", "backtest_calibration", "self_check")
#: every file or folder a run may write into its output folder (besides the marker)
OUTPUT_FILES = ("model.json", *(f"{t}.{ext}" for ext in ("csv", "parquet") for t in OUTPUT_TABLES),
                "report.html", "report-data")


def write_outputs(analysis: Analysis, folder, *, progress=None, table_format="csv"):
    """Write every output file of a run into ``folder`` (see docs/outputs.md).

    Tables are CSV (text cells neutralised for spreadsheets, :mod:`drift.output.tables`) or, with
    ``table_format="parquet"``, Parquet with the same columns and values; each role id has its
    role's name beside it. The report is ``report.html`` with its ``report-data/`` folder.
    """
    from drift.output.tables import with_role_names, write_table
    from drift.report import write_report
    from drift.settings_rules import table_format as format_rule

    table_format = format_rule("table_format", table_format)
    folder = Path(folder)
    st = stages(progress)
    analysis.model.save(folder / "model.json")
    names = dict(zip(analysis.model.role_ids_, analysis.model.role_names_))
    tables = [("placements", analysis.placements), ("moves", analysis.moves),
              ("excluded", analysis.prepared.excluded), ("stints", analysis.stints),
              ("role_drift", analysis.role_drift), ("comparables", analysis.comparables),
              ("features", analysis.prepared.reading.feature_table(analysis.model.noise_))]
    if analysis.alignment is not None:
        tables.append(("alignment", analysis.alignment.table))
    if analysis.self_check is not None:
        tables.append(("self_check", analysis.self_check.runs))
    if analysis.outlook is not None:
        tables += [("outlook", analysis.outlook), ("backtest", analysis.backtest.seasons),
                   ("backtest_calibration", analysis.backtest.calibration)]
    with st.stage("write tables", sum(len(t) for _, t in tables)):
        for name, table in tables:
            write_table(with_role_names(table, names), folder / name, table_format=table_format)
    with st.stage("report", len(analysis.placements)):
        write_report(analysis, folder, ext=table_format)


def check(data, config: Config | None = None):
    """Dry run of :func:`run` (intake and filters, no fit): a :class:`drift.intake.dry_run.DataCheck`.

    ``data`` as for :func:`run`: paths, a DataFrame, a mapping of them, an Arrow table or a Database.
    """
    from drift.intake.dry_run import check_data
    check_regular(_as_list(data))
    check_distinct(_data_files(data))
    return check_data(lambda: prepare(data, config), config or Config(), check_settings)


@thread_limited(fitting=True)
def run(data, out, config: Config | None = None, *, previous=None, inputs=(),
        progress=None, self_check: int = 0, table_format: str = "csv") -> Analysis:
    """The whole job: read, fit, place, measure, and write ``out`` atomically.

    Parameters
    ----------
    data : path, list of paths, DataFrame, mapping of name -> DataFrame, Arrow table or Database
        Season files or folders, or the seasons in memory or in a database (docs/sources.md).
    out : path
        Output folder; replaced only when the run succeeds.
    config : Config, optional
    previous : path, optional
        A previous ``model.json`` whose role ids, names and descriptions are carried over.
    inputs : paths, optional
        Other files the output must not touch (the CLI passes the config file).
    progress : callable or drift.progress.Stages, optional
        Receives a :class:`drift.progress.StageEvent` as each stage starts and ends.
    self_check : int
        Simulations of leagues like this one to rerun (:func:`drift.sim.selfcheck.self_check`);
        0 (default) runs none. Each costs about one fit.
    table_format : {"csv", "parquet"}
        Format of the tables (default CSV); Parquet needs pyarrow (the extra ``parquet``).

    Everything that can be checked is checked before fitting: the output folder (writable,
    not an input, drift's own if it exists), the seasons named in ``config`` and the
    previous model (valid, sharing features with the data).

    Returns
    -------
    Analysis
    """
    from drift.model import RoleModel
    from drift.model.align import align_models, relabel
    from drift.output.folders import atomic_folder, check_output_folder

    from drift.output.tables import check_parquet
    from drift.settings_rules import table_format as format_rule

    config = config or Config()
    table_format = format_rule("table_format", table_format)
    if table_format == "parquet":
        check_parquet()
    st = stages(progress)
    guarded = [*_as_list(data), previous, *inputs]
    check_regular(guarded)
    check_distinct(_data_files(data))
    check_output_folder(out, kind="run", inputs=guarded, names=OUTPUT_FILES)
    prev = RoleModel.load(previous) if previous else None
    prepared = prepare(data, config, progress=st)
    check_settings(prepared, config)
    if prev is not None and not set(prev.features_) & set(prepared.features):
        raise InputError(f"--previous model {previous} shares no feature with the data; it cannot "
                         "carry role ids, give a model fitted on the same kind of export")
    model = fit_model(prepared, config, progress=st)
    alignment = None
    if prev is not None:
        alignment = align_models(prev, model)
        model = relabel(model, prev, alignment, keep_names=dict(config.role_names))
    analysis = analyse(prepared, model, config, alignment=alignment, progress=st)
    if self_check:
        from drift.sim.selfcheck import self_check as run_self_check

        with st.stage("self-check", int(self_check)):
            analysis = replace(analysis, self_check=run_self_check(
                prepared, model, config, n_sims=int(self_check), seed=config.seed))
    with atomic_folder(out, kind="run", inputs=guarded) as tmp:
        write_outputs(analysis, tmp, progress=st, table_format=table_format)
    return analysis


