"""Intake, stints, unused shares and filters: the :class:`Prepared` tables every later stage uses."""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from drift.errors import InputError
from drift.intake.policy import IntakePolicy, intake_policy
from drift.progress import stages

__all__ = ["Prepared", "prepare", "reference_pool"]


@dataclass(frozen=True)
class Prepared:
    """Intake and filters done.

    ``seasons``: every combined player-season; ``kept``: those passing the filters;
    ``excluded``: the others with a reason; ``stints``: qualifying stints of traded
    players; ``missing``: per-feature counts of missing values and what was done;
    ``reading``: how each column was read, units, conversions (:class:`~drift.intake.IntakeReading`);
    ``combined``: the rows found to be a traded player's season total, used as his season
    (:data:`drift.intake._stints.COMBINED_FIELDS`: player, season, team, where, and ``how``:
    ``marker``, ``sum`` or ``label``).
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
    combined: object = None


def _missing_table(seasons, spec, filled):
    import pandas as pd

    from drift.constants import MISSING_ACTIONS

    rows = []
    for name, fam in zip(spec.names, spec.families):
        n = int(filled.get(name, 0)) if fam == "share" else int(seasons[name].isna().sum())
        rows.append({"feature": name, "family": fam, "missing": n, "action": MISSING_ACTIONS[fam]})
    return pd.DataFrame(rows)


def prepare(data, config: IntakePolicy | None = None, *, progress=None) -> Prepared:
    """Read season files, combine stints, fill unused shares and apply the filters.

    Parameters
    ----------
    data : path, list of paths, DataFrame, mapping of name -> DataFrame, Arrow table or Database
        Season files or folders, or tables in memory or in a database (docs/sources.md).
    config : Config or IntakePolicy, optional
        Only the intake part is used.

    Returns
    -------
    Prepared
    """
    from drift.intake.read import read_seasons

    config = intake_policy(config)
    st = stages(progress)
    with st.stage("read"):
        raw = read_seasons(data, config)
    try:
        return _prepare_read(raw, config, st)
    except InputError as exc:  # drift check still shows how the columns were read
        exc.columns = raw.reading.columns
        raise


def _combined(raw, config):
    """The combined rows, and the reading with a note saying how many were found and how."""
    import dataclasses
    import warnings

    from drift.errors import DataQualityWarning
    from drift.intake._stints import describe_combined, find_combined

    found = find_combined(raw.table, total_marker=config.total_marker)
    said = describe_combined(found, config.total_marker)
    if not said:
        return found, raw.reading
    if (found["how"] != "marker").any():
        warnings.warn(f"{said}; `drift check` lists them (set [intake] total_marker if your export marks them)",
                      DataQualityWarning, stacklevel=3)
    return found, dataclasses.replace(raw.reading, notes=raw.reading.notes + (said,))


def _prepare_read(raw, config, st):
    from drift.intake._stints import combine_stints
    from drift.intake.features import apply_filters, feature_spec, fill_unused_shares

    spec = feature_spec(raw.features)
    with st.stage("combine stints", len(raw.table)):
        combined, reading = _combined(raw, config)
        seasons, stints = combine_stints(raw.table, spec, combined=combined)
        seasons, filled = fill_unused_shares(seasons, spec)
    missing = _missing_table(seasons, spec, filled)
    filled_with_mean = missing[(missing["family"].isin(["rate", "shooting"])) & (missing["missing"] > 0)]
    if len(filled_with_mean):
        import warnings

        from drift.errors import DataQualityWarning

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
    return Prepared(seasons=seasons, kept=kept, excluded=excluded, stints=stints,
                    features=raw.features, missing=missing, files=raw.files,
                    ignored_columns=raw.ignored_columns, reading=reading, combined=combined)


def reference_pool(prepared: Prepared, reference=None):
    """The qualifying rows of the reference seasons (all seasons when ``reference`` is None)."""
    kept = prepared.kept
    if not reference:
        return kept
    available = sorted(kept["season"].unique())
    unknown = [s for s in reference if s not in available]
    if unknown:
        raise InputError(f"reference season(s) {unknown} are not in the data; available: {available}")
    return kept[kept["season"].isin(reference)].reset_index(drop=True)


def _data_files(data):
    """The season files and folders given as ``data`` (none for tables and databases): what
    :func:`~drift.intake.preflight.check_distinct` checks, as each is read as a whole."""
    from drift.intake._frames import source_paths

    return [] if source_paths(data) is not None else _as_list(data)


def _as_list(data):
    """The paths ``data`` reads, to guard and check: the files given, a database's file, none for a DataFrame."""
    from drift.intake._frames import source_paths

    paths = source_paths(data)
    if paths is not None:
        return paths
    return [data] if isinstance(data, (str, Path)) else list(data)
