"""Intake: read season tables into one tidy table of player-season-team rows.

Stage output (:class:`RawSeasons`): one row per row of the input files with
drift's standard column names, float features, and where each row came from
(``source_file``, ``source_row``; rows are numbered as a spreadsheet shows
them, the header being row 1).
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from pathlib import Path

from .config import REQUIRED_COLUMNS, STANDARD_COLUMNS, Config
from .errors import InputError

__all__ = ["RawSeasons", "read_seasons", "SUPPORTED_SUFFIXES"]

SUPPORTED_SUFFIXES = (".csv", ".xlsx", ".parquet")
_SEASON_IN_NAME = re.compile(r"(\d{4}(?:[-_]\d{2,4})?)")
_NUMERIC = ("games", "minutes", "possessions", "stint")


@dataclass(frozen=True)
class RawSeasons:
    """Rows as read. ``table`` columns: standard columns present, features, source_file, source_row."""

    table: object  # pandas.DataFrame
    features: tuple
    files: tuple
    ignored_columns: tuple


def _files_of(paths) -> list[Path]:
    files = []
    for p in paths:
        p = Path(p)
        if not p.exists():
            raise InputError("path not found; give a season file or a folder of them", file=p)
        if p.is_dir():
            found = sorted(f for f in p.iterdir() if f.is_file() and f.suffix.lower() in SUPPORTED_SUFFIXES)
            if not found:
                raise InputError(
                    f"folder holds no season files ({', '.join(SUPPORTED_SUFFIXES)})", file=p)
            files.extend(found)
        elif p.suffix.lower() in SUPPORTED_SUFFIXES:
            files.append(p)
        else:
            raise InputError(
                f"unsupported file type '{p.suffix}'; use one of {', '.join(SUPPORTED_SUFFIXES)}", file=p)
    return files


def _read_one(path: Path):
    import pandas as pd

    suffix = path.suffix.lower()
    try:
        if suffix == ".csv":
            frame = pd.read_csv(path, dtype=str, keep_default_na=False, na_values=[""],
                                skipinitialspace=True)
        elif suffix == ".xlsx":
            frame = pd.read_excel(path, dtype=object)
        else:
            try:
                frame = pd.read_parquet(path)
            except ImportError:
                raise InputError("reading Parquet needs pyarrow: pip install 'drift[parquet]'",
                                 file=path) from None
    except InputError:
        raise
    except pd.errors.EmptyDataError:
        raise InputError("file is empty; remove it or add its season's rows", file=path) from None
    except Exception as exc:  # any reader failure is the user's file, not our bug
        reason = str(exc).splitlines()[0] if str(exc) else type(exc).__name__
        raise InputError(f"cannot read file ({reason}); check it opens and is not corrupt",
                         file=path) from None
    frame.columns = [str(c).strip() for c in frame.columns]
    return frame


def _season_from_name(path: Path) -> str:
    match = _SEASON_IN_NAME.search(path.stem)
    return match.group(1) if match else path.stem


def _to_numeric(frame, column: str, path: Path):
    import numpy as np
    import pandas as pd

    values = frame[column]
    as_text = values.astype("string").str.strip()
    numbers = pd.to_numeric(as_text, errors="coerce").astype(float)
    bad = as_text.notna() & numbers.isna()
    if bad.any():
        i = int(np.flatnonzero(bad.to_numpy())[0])
        raise InputError(
            f"value {as_text.iloc[i]!r} is not a number; this column must be numeric "
            "(leave the cell empty for a missing value)",
            file=path, row=i + 2, column=column)
    infinite = np.isinf(numbers.to_numpy())
    if infinite.any():
        i = int(np.flatnonzero(infinite)[0])
        raise InputError(f"value {as_text.iloc[i]!r} is infinite; give a finite number or leave it empty",
                         file=path, row=i + 2, column=column)
    return numbers


def _numeric_share(series) -> float:
    import pandas as pd

    text = series.astype("string").str.strip().dropna()
    if text.empty:
        return 1.0
    return float(pd.to_numeric(text, errors="coerce").notna().mean())


def _standardise(frame, path: Path, config: Config):
    rename = {theirs: ours for ours, theirs in config.columns.items() if theirs in frame.columns}
    frame = frame.rename(columns=rename)
    if "season" not in frame.columns:
        frame["season"] = _season_from_name(path)
    missing = [c for c in REQUIRED_COLUMNS if c not in frame.columns]
    if missing:
        hint = ", ".join(f'{m} = "..."' for m in missing)
        found = ", ".join(list(frame.columns)[:12]) + (", ..." if len(frame.columns) > 12 else "")
        raise InputError(
            f"missing required column(s) {missing}; found {found}. "
            f"Rename them or map them in the config's [columns] table ({hint})", file=path)
    if frame.empty:
        raise InputError("file has a header but no rows; remove it or add its season's rows", file=path)
    for column in ("player_id", "season", "team", "player"):
        if column in frame.columns:
            text = frame[column].astype("string").str.strip()
            text = text.mask(text == "")
            if column != "player" and text.isna().any():
                i = int(text.isna().to_numpy().argmax())
                raise InputError("value is empty; every row needs one", file=path, row=i + 2, column=column)
            frame[column] = text
    if "player" not in frame.columns:
        frame["player"] = frame["player_id"]
    frame["player"] = frame["player"].fillna(frame["player_id"])
    for column in _NUMERIC:
        if column in frame.columns:
            frame[column] = _to_numeric(frame, column, path)
    for column in ("games", "minutes"):
        values = frame[column]
        bad = values.isna() | (values < 0)
        if bad.any():
            i = int(bad.to_numpy().argmax())
            shown = "empty" if values.isna().iloc[i] else f"{values.iloc[i]:g}"
            raise InputError(f"value {shown} is not allowed; {column} must be a number >= 0",
                             file=path, row=i + 2, column=column)
    frame["source_file"] = str(path)
    frame["source_row"] = range(2, len(frame) + 2)
    return frame


def _feature_columns(frame, path: Path, config: Config):
    candidates = [c for c in frame.columns
                  if c not in STANDARD_COLUMNS and c not in ("source_file", "source_row")]
    if config.features is not None:
        missing = [f for f in config.features if f not in frame.columns]
        if missing:
            raise InputError(f"config lists feature(s) {missing} that this file lacks", file=path)
        return list(config.features), []
    features, ignored = [], []
    for c in candidates:
        if c in config.exclude:
            continue
        # a column that is mostly numbers is a feature with a typo; a text column is not a feature
        (features if _numeric_share(frame[c]) >= 0.5 else ignored).append(c)
    return features, ignored


def read_seasons(paths, config: Config | None = None) -> RawSeasons:
    """Read season files into one table of player-season-team rows.

    Parameters
    ----------
    paths : path or list of paths
        Season files (``.csv``, ``.xlsx``, ``.parquet``) and/or folders of them.
        The season comes from a ``season`` column, else from the file name.
    config : Config, optional
        Column mapping and feature selection.

    Returns
    -------
    RawSeasons

    Raises
    ------
    InputError
        With the file, row and column of the first problem found.
    """
    import pandas as pd

    config = config or Config()
    if isinstance(paths, (str, Path)):
        paths = [paths]
    files = _files_of(paths)
    frames, feature_sets, ignored_all = [], {}, set()
    for path in files:
        frame = _standardise(_read_one(path), path, config)
        features, ignored = _feature_columns(frame, path, config)
        for f in features:
            frame[f] = _to_numeric(frame, f, path)
        ignored_all.update(ignored)
        feature_sets[path] = features
        frames.append(frame)
    all_features = list(dict.fromkeys(f for fs in feature_sets.values() for f in fs))
    if not all_features:
        raise InputError("no numeric feature columns found; see README 'Input tables'", file=files[0])
    for path, features in feature_sets.items():
        lacking = [f for f in all_features if f not in features]
        if lacking:
            others = next(p for p, fs in feature_sets.items() if lacking[0] in fs)
            raise InputError(
                f"lacks feature column(s) {lacking} that {others.name} has; every season needs "
                "the same features (add them, or list the shared ones under [intake] features)",
                file=path)
    keep = [c for c in STANDARD_COLUMNS if any(c in f.columns for f in frames)]
    table = pd.concat([f[[c for c in keep if c in f.columns] + all_features + ["source_file", "source_row"]]
                       for f in frames], ignore_index=True)
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
    return RawSeasons(table=table, features=tuple(all_features), files=tuple(str(f) for f in files),
                      ignored_columns=tuple(sorted(ignored_all)))
