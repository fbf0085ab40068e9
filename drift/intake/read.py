"""Intake: read season tables into one tidy table of player-season-team rows.

Each file is read by :mod:`drift.readers` (CSV shape checks, Excel sheets and
header rows), each column name is understood by :mod:`drift.intake._columns`, each
column's cells are parsed once by :mod:`drift.cells`, and units are checked by
:mod:`drift.intake._units`. Nothing is dropped or converted without a line saying so in
:attr:`RawSeasons.notes`, and every column's reading is in :attr:`RawSeasons.columns`.

Stage output (:class:`RawSeasons`): one row per row of the input files with
drift's standard column names, float features, and where each row came from
(``source_file``, ``source_row``; rows are numbered as a spreadsheet shows
them, the header being row 1 of a CSV).
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from drift.errors import InputError
from drift.intake.policy import REQUIRED_COLUMNS, STANDARD_COLUMNS, IntakePolicy, intake_policy

__all__ = ["RawSeasons", "IntakeReading", "read_seasons", "SUPPORTED_SUFFIXES", "COLUMN_TABLE_FIELDS"]

SUPPORTED_SUFFIXES = (".csv", ".tsv", ".xlsx", ".xlsm", ".xls", ".parquet")
_TEXT = ("player_id", "player", "season", "team")
_NUMERIC = ("games", "minutes", "possessions", "stint")
#: columns of :attr:`RawSeasons.columns`
COLUMN_TABLE_FIELDS = ("file", "column", "role", "drift_name", "family", "play_type", "unit", "how", "note")


@dataclass(frozen=True)
class IntakeReading:
    """How an export was read.

    ``columns``: one row per file and column with :data:`COLUMN_TABLE_FIELDS` (how it
    was understood); ``notes``: conversions and warnings, one line each; ``units``:
    feature -> unit; ``sources``: one row per file (or sheet) read: ``file, seasons, rows,
    read_as`` (how the file was read: ``"text, semicolon-separated, Windows-1252"``).
    """

    columns: object
    notes: tuple
    units: dict
    sources: object

    def summary(self):
        """One row per export column and reading (:func:`drift.intake._column_table.column_summary`)."""
        from drift.intake._column_table import column_summary

        return column_summary(self.columns)

    def feature_table(self, noise):
        """``features.csv``: the model's per-feature noise table with how each feature was read."""
        from drift.intake._column_table import feature_table

        return feature_table(noise, self.columns)


@dataclass(frozen=True)
class RawSeasons:
    """Rows as read.

    ``table``: standard columns present, features, source_file, source_row.
    ``features``: feature names in order. ``files``: the files read.
    ``ignored_columns``: export columns not used (any reason). ``reading``: how each
    column was understood, conversions and units (:class:`IntakeReading`).
    """

    table: object  # pandas.DataFrame
    features: tuple
    files: tuple
    ignored_columns: tuple
    reading: IntakeReading | None = None


def _plan(config):
    from drift.intake._columns import understand_columns

    def text_columns(names):
        return {r.source for r in understand_columns(names, config) if r.role == "standard" and r.name in _TEXT}

    def recognise(names):
        return {r.name for r in understand_columns(names, config) if r.role == "standard"}

    return text_columns, recognise


def _season(frame, table, where):
    from drift.intake._cells import text_column
    from drift.intake._readers import normalise_season

    if "season" not in frame.columns:
        if table.name_season is None:
            raise InputError(table.name_problem, file=where)
        frame["season"] = table.name_season
        return
    seasons = text_column(frame["season"]).map(lambda s: s if s is None or s != s else normalise_season(s))
    frame["season"] = seasons
    if table.name_season is not None:
        differs = seasons.notna() & (seasons != table.name_season)
        if differs.any():
            i = int(differs.to_numpy().argmax())
            raise InputError(
                f"season {seasons.iloc[i]!r} disagrees with the season {table.name_season!r} in the file "
                "name; fix the column or the file name (or rename the file without a season)",
                file=where, row=table.first_row + i, column="season")


def _numbers(frame, readings, table, where, notes):
    """Parse every numeric column once; unknown columns that hold text are ignored."""
    from drift.intake._cells import numeric_column
    from drift.intake._columns import ColumnReading

    how, out = {}, []
    for r in readings:
        wanted = r.role in ("feature", "unknown") or (r.role == "standard" and r.name in _NUMERIC)
        if not wanted:
            out.append(r)
            continue
        try:
            values, parsed = numeric_column(frame[r.name], where={"file": where, "column": r.source},
                                            first_row=table.first_row)
        except InputError:
            text = frame[r.name].astype("string").str.strip()
            numeric = text.str.fullmatch(r"[-+]?[\d.,]+%?").mean() if text.notna().any() else 1.0
            if r.role != "unknown" or numeric >= 0.5:
                raise
            out.append(ColumnReading(r.source, "ignored", how="values (text)", note="text, not numbers"))
            frame.drop(columns=r.name, inplace=True)
            continue
        frame[r.name] = values
        if parsed:
            how[r.name] = parsed
            notes.append((where, f"{r.source}: {parsed} parsed as numbers"))
        out.append(ColumnReading(r.source, "feature", r.name, r.family, r.play_type, r.how, r.note)
                   if r.role == "unknown" else r)
    return out, how


def _identity(frame, where, first_row):
    from drift.intake._cells import text_column

    for column in ("player_id", "team", "player"):
        if column in frame.columns:
            text = text_column(frame[column])
            if column != "player" and text.isna().any():
                i = int(text.isna().to_numpy().argmax())
                raise InputError("value is empty; every row needs one", file=where, row=first_row + i,
                                 column=column)
            frame[column] = text
    if "player" not in frame.columns:
        frame["player"] = frame["player_id"]
    frame["player"] = frame["player"].fillna(frame["player_id"])


def _read_table(table, config, notes, seen):
    """One raw table -> (frame with drift names, readings, rate units, converted units).

    ``seen`` gets (where, readings) as soon as the columns are understood, so a refusal
    further on can still show how the columns were read (``drift check``).
    """
    from drift.intake._names import in_export_words
    from drift.intake._columns import understand_columns

    where, frame = table.where, table.frame
    if frame.empty and len(frame.columns) == 0:
        raise InputError("file is empty; remove it or add its season's rows", file=where)
    readings = understand_columns(list(frame.columns), config)
    seen.append((where, readings))
    try:
        return _read_columns(table, readings, config, notes, seen)
    except InputError as exc:
        raise in_export_words(exc, seen[-1][1]) from None


def _read_columns(table, readings, config, notes, seen):
    from drift.intake import _ranges
    from drift.intake._names import refuse_clashes, require_columns
    from drift.intake._units import table_units

    where, frame = table.where, table.frame
    refuse_clashes(readings, where)
    require_columns(readings, frame, table, config)
    if frame.empty:
        raise InputError("file has a header but no rows; remove it or add its season's rows", file=where)
    used = [r for r in readings if r.role in ("standard", "feature", "unknown")]
    frame = frame[[r.source for r in used]].copy()
    frame.columns = [r.name for r in used]
    readings, how = _numbers(frame, readings, table, where, notes)
    seen[-1] = (where, readings)
    _identity(frame, where, table.first_row)
    _season(frame, table, where)
    _ranges.check_present(frame, where, table.first_row)
    _refuse_lone_efficiency(readings, where)
    feats = [r for r in readings if r.role == "feature"]
    notes.extend((where, n) for n in table.said)
    table_notes, rate_units, converted = table_units(
        frame, [r.name for r in feats], [r.family for r in feats], where, first_row=table.first_row, how=how,
        units=dict(config.units), canonical=_canonical(config))
    notes.extend((where, n) for n in table_notes)
    _ranges.check_counts(frame, where, table.first_row, converted)
    _ranges.check_efficiencies(frame, [r.name for r in feats if r.family == "efficiency"], where, table.first_row)
    frame["source_file"] = where
    frame["source_row"] = range(table.first_row, table.first_row + len(frame))
    return frame, readings, rate_units, converted


def _canonical(config):
    """Feature name -> the drift name its column was recognised as, before ``[intake.rename]``."""
    return {new: old for old, new in dict(config.rename).items()}


def _refuse_lone_efficiency(readings, where):
    shares = {r.play_type for r in readings if r.role == "feature" and r.family == "share"}
    for r in readings:
        if r.role == "feature" and r.family == "efficiency" and r.play_type not in shares:
            raise InputError(
                f"points per possession of {r.play_type} has no {r.play_type} frequency column, so its sample "
                f"is unknown; add the frequency column or leave the efficiency out ([intake] exclude = "
                f"[\"{r.source}\"])", file=where, column=r.source)


def _feature_order(per_table, config):
    names = list(dict.fromkeys(r.name for _, rs in per_table for r in rs if r.role == "feature"))
    if config.features is not None:
        order = {n: i for i, n in enumerate(config.features)}
        sources = {r.name: r.source for _, rs in per_table for r in rs if r.role == "feature"}
        names.sort(key=lambda n: order.get(n, order.get(sources.get(n), len(order))))
        missing = [f for f in config.features if f not in names and f not in sources.values()]
        if missing:
            raise InputError(f"config lists feature(s) {missing} that the data lacks", file=per_table[0][0])
    return names


def _raw_tables(data, config):
    """(sources, RawTables): files through the file readers; DataFrames, Arrow tables and databases
    through the source layer (:mod:`drift.intake._frames`), which makes the same RawTables."""
    from drift.intake._frames import source_tables
    from drift.intake._readers import read_tables

    given = source_tables(data)
    if given is not None:
        return given
    from drift.intake._readers import season_files

    files = season_files([data] if isinstance(data, (str, Path)) else data, SUPPORTED_SUFFIXES)
    text_columns, recognise = _plan(config)
    required = [c for c in REQUIRED_COLUMNS if c != "season"]
    return files, (table for path in files for table in read_tables(
        path, text_columns=text_columns, recognise=recognise, required=required, sheet=config.sheet,
        csv=dict(config.csv)))


def read_seasons(paths, config: IntakePolicy | None = None) -> RawSeasons:
    """Read season files into one table of player-season-team rows.

    Parameters
    ----------
    paths : path, list of paths, DataFrame, mapping of name -> DataFrame, Arrow table or Database
        Season files (``.csv``, ``.tsv``, ``.xlsx``, ``.xls``, ``.parquet``) and/or folders of them, or tables
        already in memory or in a database (:mod:`drift.intake._frames`). The season comes
        from a ``season`` column, else from the file (or sheet, mapping key, table) name.
    config : Config or IntakePolicy, optional
        Column map, name rules, sheet and units (see docs/input.md, "Config file").

    Returns
    -------
    RawSeasons

    Raises
    ------
    InputError
        With the file, row and column of the first problem found. Its ``columns`` attribute
        holds how the columns read before the problem were understood (:data:`COLUMN_TABLE_FIELDS`;
        ``drift check`` shows it), or None when no column was read.
    """
    from drift.intake._column_table import column_table

    config = intake_policy(config)
    seen, converted = [], {}
    try:
        files, tables = _raw_tables(paths, config)
        return _read_all(files, tables, config, seen, converted)
    except InputError as exc:
        exc.columns = column_table(seen, {}, converted) if seen else None
        raise


def _read_all(files, tables, config, seen, converted):
    frames, per_table, rate_units, notes, forms = [], [], [], [], {}
    for table in tables:
        frame, readings, units, table_converted = _read_table(table, config, notes, seen)
        converted.update({(table.where, name): unit for name, unit in table_converted.items()})
        frames.append(frame)
        per_table.append((table.where, readings))
        rate_units.append((frame, table.where, units))
        forms[table.where] = table.form
    names = {r.source for _, rs in per_table for r in rs}
    unused = [f"{ours} = {theirs!r}" for ours, theirs in config.columns.items() if theirs not in names]
    if unused:
        raise InputError(f"the config's [columns] entry {unused[0]} matches no column of the data; fix or "
                         "remove it", file=files[0])
    all_features = _feature_order(per_table, config)
    if not all_features:
        raise InputError("no numeric feature columns found; see docs/input.md", file=files[0])
    _refuse_lacking(frames, per_table, all_features)
    units = _harmonise(rate_units, per_table, notes, converted, config)
    return _assemble(files, frames, per_table, all_features, units, notes, converted, forms)


def _refuse_lacking(frames, per_table, all_features):
    from drift.intake._names import export_name

    for (where, _), frame in zip(per_table, frames):
        lacking = [f for f in all_features if f not in frame.columns]
        if lacking:
            others, readings = next((w, rs) for (w, rs), fr in zip(per_table, frames) if lacking[0] in fr.columns)
            named = [f"{export_name(readings, f) or f} ({f})" if export_name(readings, f) not in (None, f) else f
                     for f in lacking]
            raise InputError(
                f"lacks feature column(s) {', '.join(named)} that {Path(others).name} has; every season needs "
                "the same features (add them, or list the shared ones under [intake] features)", file=where)


def _harmonise(rate_units, per_table, notes, converted, config):
    """One unit per rate across tables, then every recognised rate checked against its range."""
    from drift.intake import _ranges
    from drift.intake._names import in_export_words
    from drift.intake._units import harmonise_rates

    readings_of = dict(per_table)
    try:
        units, unit_notes, rate_converted = harmonise_rates(rate_units)
    except InputError as exc:
        raise in_export_words(exc, readings_of.get(str(exc.file), ())) from None
    converted.update(rate_converted)
    notes.extend((None, n) for n in unit_notes)
    canonical = _canonical(config)
    for frame, where, table_units in rate_units:
        try:
            _ranges.check_rates(frame, list(table_units), units, where, int(frame["source_row"].iloc[0]),
                                canonical=canonical)
        except InputError as exc:
            raise in_export_words(exc, readings_of[where]) from None
    return units


def _assemble(files, frames, per_table, all_features, units, notes, converted, forms):
    import pandas as pd

    from drift.intake._column_table import column_table, emit_notes

    keep = [c for c in STANDARD_COLUMNS if any(c in f.columns for f in frames)]
    table = pd.concat([f[[c for c in keep if c in f.columns] + all_features + ["source_file", "source_row"]]
                       for f in frames], ignore_index=True)
    _refuse_repeats(table)
    columns = column_table(per_table, units, converted)
    emit_notes(notes, columns)
    ignored = sorted(set(columns.loc[columns["role"].isin(["ignored", "sample"]), "column"]))
    sources = table.groupby("source_file", sort=False).agg(
        seasons=("season", lambda s: ", ".join(sorted(set(s)))), rows=("player_id", "size")).reset_index()
    sources = sources.rename(columns={"source_file": "file"})
    sources["read_as"] = sources["file"].map(forms).fillna("")
    return RawSeasons(table=table, features=tuple(all_features), files=tuple(str(f) for f in files),
                      ignored_columns=tuple(ignored), reading=IntakeReading(
                          columns=columns, notes=tuple(n if w is None else f"{w}: {n}" for w, n in notes),
                          units=units, sources=sources))


def _refuse_repeats(table):
    key = ["player_id", "season", "team"] + (["stint"] if "stint" in table.columns else [])
    dup = table.duplicated(key, keep=False)
    if dup.any():
        rows = table[dup].head(2)
        first, second = rows.iloc[0], rows.iloc[1]
        raise InputError(
            f"player_id {first['player_id']!r} appears twice for season {first['season']!r} and team "
            f"{first['team']!r} (also {Path(second['source_file']).name} row {second['source_row']}); "
            "keep one row per player, season and team",
            file=first["source_file"], row=int(first["source_row"]))
