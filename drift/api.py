"""The public Python API: the stages wired together.

``prepare`` reads and filters; ``fit_model`` fits the reference model; ``analyse``
places, measures moves and role drift; ``run`` does all of it and writes the
outputs; ``place_files`` places seasons with a saved model.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass, field
from pathlib import Path

from .config import Config
from .errors import InputError
from .preflight import check_settings
from .progress import stages
from .threads import thread_limited

__all__ = ["check", "Prepared", "Analysis", "prepare", "fit_model", "analyse", "run", "place_files", "check_files",
           "write_outputs"]


@dataclass(frozen=True)
class Prepared:
    """Intake and filters done.

    ``seasons``: every combined player-season; ``kept``: those passing the filters;
    ``excluded``: the others with a reason; ``stints``: qualifying stints of traded
    players; ``missing``: per-feature counts of missing values and what was done;
    ``reading``: how each column was read, units, conversions (:class:`~drift.intake.IntakeReading`).
    """

    seasons: object
    kept: object
    excluded: object
    stints: object
    features: tuple
    missing: object
    files: tuple
    ignored_columns: tuple
    reading: object = None


@dataclass(frozen=True)
class Analysis:
    """Everything a run produces (each a DataFrame, except ``model``)."""

    model: object
    placements: object
    moves: object
    stints: object
    role_drift: object
    comparables: object
    alignment: object = None
    prepared: Prepared | None = None
    config: Config = field(default_factory=Config)
    #: next-season outlook of every player placed in the latest season (columns:
    #: drift.outlook.OUTLOOK_COLUMNS, then prob_<role>, exp_pc<j>); None with too few returning players
    outlook: object = None
    #: drift.outlook.Backtest (per-season scores and calibration table), or None
    backtest: object = None


def _missing_table(seasons, spec, filled):
    import pandas as pd

    rows = []
    for name, fam in zip(spec.names, spec.families):
        n = int(filled.get(name, 0)) if fam == "share" else int(seasons[name].isna().sum())
        if fam == "share":
            action = "play type not used: share set to 0"
        elif fam == "efficiency":
            action = "no possessions of this play type: pool mean (no sample to shrink)"
        else:
            action = "missing: pool mean"
        rows.append({"feature": name, "family": fam, "missing": n, "action": action})
    return pd.DataFrame(rows)


def prepare(data, config: Config | None = None, *, progress=None) -> Prepared:
    """Read season files, combine stints, fill unused shares and apply the filters.

    Parameters
    ----------
    data : path or list of paths
    config : Config, optional

    Returns
    -------
    Prepared
    """
    from .combine import combine_stints
    from .features import apply_filters, feature_spec, fill_unused_shares
    from .intake import read_seasons

    config = config or Config()
    st = stages(progress)
    with st.stage("read"):
        raw = read_seasons(data, config)
    spec = feature_spec(raw.features)
    with st.stage("combine stints", len(raw.table)):
        seasons, stints = combine_stints(raw.table, spec, total_marker=config.total_marker)
        seasons, filled = fill_unused_shares(seasons, spec)
    missing = _missing_table(seasons, spec, filled)
    filled_with_mean = missing[(missing["family"].isin(["rate", "shooting"])) & (missing["missing"] > 0)]
    if len(filled_with_mean):
        import warnings

        from .errors import DataQualityWarning

        listed = ", ".join(f"{f} ({n})" for f, n in zip(filled_with_mean["feature"], filled_with_mean["missing"]))
        warnings.warn(f"missing values set to the pool mean: {listed}; check the export if these should "
                      "have values", DataQualityWarning, stacklevel=2)
    kept, excluded = apply_filters(seasons, min_games=config.min_games,
                                   min_minutes_per_game=config.min_minutes_per_game)
    stints, _ = fill_unused_shares(stints, spec)
    stints, _ = apply_filters(stints, min_games=config.min_stint_games,
                              min_minutes_per_game=config.min_minutes_per_game)
    if kept.empty:
        raise InputError(
            f"no player-season passes the filters (min_games={config.min_games}, "
            f"min_minutes_per_game={config.min_minutes_per_game}); lower them with "
            "--min-games / --min-minutes", file=raw.files[0])
    for frame in (kept, seasons, stints):
        frame.attrs["features"] = raw.features
    return Prepared(seasons=seasons, kept=kept, excluded=excluded, stints=stints,
                    features=raw.features, missing=missing, files=raw.files,
                    ignored_columns=raw.ignored_columns, reading=raw.reading)


def reference_pool(prepared: Prepared, reference=None):
    """The qualifying rows of the reference seasons (all seasons when ``reference`` is None)."""
    kept = prepared.kept
    if not reference:
        return kept
    available = sorted(kept["season"].unique())
    unknown = [s for s in reference if s not in available]
    if unknown:
        raise InputError(f"reference season(s) {unknown} are not in the data; available: {available}")
    pool = kept[kept["season"].isin(reference)].reset_index(drop=True)
    pool.attrs["features"] = prepared.features
    return pool


@thread_limited(fitting=True)
def fit_model(prepared: Prepared, config: Config | None = None, *, progress=None):
    """Fit the reference model on the pool chosen by ``config.reference``."""
    from .model import RoleModel

    config = config or Config()
    check_settings(prepared, config)
    pool = reference_pool(prepared, config.reference)
    model = RoleModel.from_settings(config.model)
    try:
        with stages(progress).stage("fit reference model", len(pool)):
            return model.fit(pool, features=prepared.features, intake=config.intake)
    except ValueError as exc:
        raise InputError(str(exc)) from None


@thread_limited(fitting=True)
def analyse(prepared: Prepared, model, config: Config | None = None, *, alignment=None,
            progress=None) -> Analysis:
    """Place every qualifying season and stint, measure moves, role drift and comparables."""
    import pandas as pd

    from .comparables import run_comparables
    from .moves import consecutive_season_pairs, pair_moves, requested_pairs, stint_pairs
    from .outlook import season_outlook
    from .roledrift import role_drift

    config = config or Config()
    st = stages(progress)
    kept = prepared.kept
    with st.stage("place", len(kept)):
        placements = model.place(kept)
        for extra in ("team_first", "team_last", "n_stints"):
            if extra in kept.columns:
                placements[extra] = kept[extra].to_numpy()
    i1, i2 = consecutive_season_pairs(kept)
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


#: every file a run may write into its output folder (besides the marker)
OUTPUT_FILES = ("model.json", "placements.csv", "moves.csv", "excluded.csv", "stints.csv",
                "role_drift.csv", "comparables.csv", "features.csv", "alignment.csv", "outlook.csv",
                "backtest.csv", "backtest_calibration.csv", "report.html")


def write_outputs(analysis: Analysis, folder, *, progress=None):
    """Write every output file of a run into ``folder`` (see README, "Outputs").

    CSV text cells are neutralised for spreadsheets (:mod:`drift.safecsv`).
    """
    from .report import write_report
    from .safecsv import write_csv

    folder = Path(folder)
    st = stages(progress)
    analysis.model.save(folder / "model.json")
    tables = [("placements.csv", analysis.placements), ("moves.csv", analysis.moves),
              ("excluded.csv", analysis.prepared.excluded), ("stints.csv", analysis.stints),
              ("role_drift.csv", analysis.role_drift), ("comparables.csv", analysis.comparables),
              ("features.csv", analysis.prepared.reading.feature_table(analysis.model.noise_))]
    if analysis.alignment is not None:
        tables.append(("alignment.csv", analysis.alignment.table))
    if analysis.outlook is not None:
        tables += [("outlook.csv", analysis.outlook), ("backtest.csv", analysis.backtest.seasons),
                   ("backtest_calibration.csv", analysis.backtest.calibration)]
    with st.stage("write tables", sum(len(t) for _, t in tables)):
        for name, table in tables:
            write_csv(table, folder / name)
    with st.stage("report", len(analysis.placements)):
        write_report(analysis, folder / "report.html")


def check(data, config: Config | None = None):
    """Dry run of :func:`run` (intake and filters, no fit): a :class:`drift.datacheck.DataCheck`."""
    from .datacheck import check_data
    return check_data(lambda: prepare(data, config), config or Config(), check_settings)


def _as_list(data):
    return [data] if isinstance(data, (str, Path)) else list(data)


@thread_limited(fitting=True)
def run(data, out, config: Config | None = None, *, previous=None, inputs=(),
        progress=None) -> Analysis:
    """The whole job: read, fit, place, measure, and write ``out`` atomically.

    Parameters
    ----------
    data : path or list of paths
        Season files or folders.
    out : path
        Output folder; replaced only when the run succeeds.
    config : Config, optional
    previous : path, optional
        A previous ``model.json`` whose role ids, names and descriptions are carried over.
    inputs : paths, optional
        Other files the output must not touch (the CLI passes the config file).
    progress : callable or drift.progress.Stages, optional
        Receives a :class:`drift.progress.StageEvent` as each stage starts and ends.

    Everything that can be checked is checked before fitting: the output folder (writable,
    not an input, drift's own if it exists), the seasons named in ``config`` and the
    previous model (valid, sharing features with the data).

    Returns
    -------
    Analysis
    """
    from .align import align_models, relabel
    from .model import RoleModel
    from .outputs import atomic_folder, check_output_folder

    config = config or Config()
    st = stages(progress)
    guarded = [*_as_list(data), previous, *inputs]
    check_output_folder(out, inputs=guarded, names=OUTPUT_FILES)
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
    with atomic_folder(out, inputs=guarded) as tmp:
        write_outputs(analysis, tmp, progress=st)
    return analysis


def _model_config(model, config):
    """``config`` with the model's own intake rules (filters, total marker) as saved in it.

    The caller's reading rules (columns, features, sheet, ...) are kept: they describe the new files.
    """
    config = config or Config()
    saved = model.intake_
    intake = dataclasses.replace(config.intake, min_games=saved.min_games,
                                 min_minutes_per_game=saved.min_minutes_per_game,
                                 min_stint_games=saved.min_stint_games, total_marker=saved.total_marker)
    return config.replace(intake=intake)


@thread_limited(fitting=False)
def place_files(model_path, files, out, config: Config | None = None, *, min_games=None,
                min_minutes_per_game=None, inputs=(), progress=None):
    """Place season files with a saved model and write one CSV.

    The model's features must all be present, and no others. The filters are
    the model's own (saved at fit time) unless ``min_games`` or
    ``min_minutes_per_game`` are given (a partial season wants fewer games);
    ``config`` supplies the column mapping.

    ``progress`` receives stage events as in :func:`run`.

    Rows the filters exclude are written beside ``out`` as ``<stem>_excluded.csv``. Neither
    may be an input (model, data, ``inputs``) nor lie in an input folder, and an existing
    file is replaced only if drift wrote it (checked before any work).

    Returns
    -------
    DataFrame
        The placements written; ``.attrs["excluded"]`` holds the excluded rows.
    """
    from .model import RoleModel
    from .outputs import atomic_file, check_output_file
    from .safecsv import write_csv

    st = stages(progress)
    out = Path(out)
    excluded_path = out.with_name(f"{out.stem}_excluded.csv")
    guarded = [model_path, *_as_list(files), *inputs]
    check_output_file(out, inputs=guarded)
    check_output_file(excluded_path, inputs=guarded, header=("player_id", "reason"))
    model = RoleModel.load(model_path)
    config = _model_config(model, config).replace(min_games=min_games,
                                                  min_minutes_per_game=min_minutes_per_game)
    prepared = prepare(files, config, progress=st)
    model.check_features(prepared.features)
    with st.stage("place", len(prepared.kept)):
        placements = model.place(prepared.kept)
    with st.stage("write placements", len(placements)), atomic_file(out, inputs=guarded) as tmp:
        write_csv(placements, tmp)
    if len(prepared.excluded):
        with atomic_file(excluded_path, inputs=guarded, header=("player_id", "reason"),
                         what="the excluded list") as tmp:
            write_csv(prepared.excluded, tmp)
    placements.attrs["excluded"] = prepared.excluded
    return placements


#: games a partial season needs to be checked (fewer say nothing; "too early" covers the rest)
INSEASON_MIN_GAMES = 5


#: every file the in-season check may write into its output folder (besides the marker)
INSEASON_FILES = ("inseason.csv", "inseason_excluded.csv", "inseason.html")


def check_files(model_path, partial, against, out, config: Config | None = None, *, min_games=None,
                min_minutes_per_game=None, alpha=None, season_games=82, inputs=()):
    """The in-season check: partial-season files against full seasons, written to a folder.

    Parameters
    ----------
    model_path : path
        A ``model.json``.
    partial, against : path or list of paths
        The season under way, and earlier full seasons (files or folders).
    out : path
        Folder for ``inseason.csv``, ``inseason.html`` and ``inseason_excluded.csv``.
    min_games, min_minutes_per_game : optional
        Filters of the partial season (default 5 games and the model's minutes per game);
        the full seasons use the model's filters.
    alpha : float, optional
        Level for "beyond noise" (default ``config.alpha``).
    season_games : int
        Games in a full season (horizon of ``games_to_conclusive``).
    inputs : paths, optional
        Other files the output must not touch (the CLI passes the config file).

    Returns
    -------
    DataFrame
        The checks (see README, "In-season check"); ``.attrs["excluded"]`` the rows not checked.
    """
    import pandas as pd

    from .inseason import check_partial
    from .inseason_page import write_page
    from .model import RoleModel
    from .outputs import atomic_folder, check_output_folder
    from .safecsv import write_csv

    guarded = [model_path, *_as_list(partial), *_as_list(against), *inputs]
    check_output_folder(out, inputs=guarded, names=INSEASON_FILES)
    model = RoleModel.load(model_path)
    base = _model_config(model, config)
    part_config = base.replace(
        min_games=min_games if min_games is not None else INSEASON_MIN_GAMES,
        min_minutes_per_game=min_minutes_per_game)
    part = prepare(partial, part_config)
    full = prepare(against, base)
    for prepared in (part, full):
        model.check_features(prepared.features)
    alpha = alpha if alpha is not None else base.alpha
    checks, unmatched = check_partial(model, part.kept, full.kept, alpha=alpha, season_games=season_games)
    excluded = pd.concat([part.excluded, unmatched.assign(reason="no earlier qualifying season in the "
                                                                 "--against data")[
        [c for c in part.excluded.columns if c in unmatched.columns] + ["reason"]]], ignore_index=True)
    with atomic_folder(out, inputs=guarded) as tmp:
        write_csv(checks, tmp / "inseason.csv")
        write_csv(excluded, tmp / "inseason_excluded.csv")
        write_page(checks, model, tmp / "inseason.html", alpha=alpha, season_games=season_games,
                   n_excluded=len(excluded))
    checks.attrs["excluded"] = excluded
    return checks

