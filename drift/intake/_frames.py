"""Season tables that are not files: DataFrames, Arrow tables and databases, as :class:`RawTable` s.

Everything the file readers make is a :class:`~drift.intake._rawtables.RawTable`; this module
makes the same objects from tables already in memory, so every rule, check and message after
reading is shared. What ``data`` may be, besides paths:

* a pandas DataFrame: one long table (a row per player, season and team, with a season
  column), called ``seasons`` in messages (``DataFrame 'seasons', row 14, column 'games': ...``);
* a mapping of name -> DataFrame: each name plays the part of a file name, so a season in it
  (``{"2024-25": frame}``) is the season of its rows and a frame under another name needs a
  season column, exactly as for files;
* any table that converts to pandas through Arrow, alone or as a mapping's value: an object
  with ``to_pandas()`` (a pyarrow Table, ...) or the Arrow PyCapsule stream interface
  (``__arrow_c_stream__``; read with pyarrow);
* a :class:`~drift.intake._database.Database` (a table or a query; see that module).

Rows are numbered from 0 as ``frame.iloc`` counts them (a database result from 1). Named index
levels (``frame.set_index("season")``) are read as columns. The caller's frame is never changed.
"""

from __future__ import annotations

from collections.abc import Mapping

from drift.errors import InputError
from drift.intake._rawtables import RawTable, refuse_duplicates, season_label

__all__ = ["SINGLE_NAME", "is_table", "source_tables", "source_paths", "frame_table"]

#: the name a lone DataFrame goes by in messages (a mapping names its frames itself)
SINGLE_NAME = "seasons"


def is_table(obj) -> bool:
    """True for a pandas DataFrame or an object that converts to one through Arrow."""
    import sys

    pandas = sys.modules.get("pandas")  # a DataFrame exists only once pandas is loaded: no import here
    if pandas is not None and isinstance(obj, pandas.DataFrame):
        return True
    if isinstance(obj, (str, bytes)) or hasattr(obj, "__fspath__"):
        return False
    return callable(getattr(obj, "to_pandas", None)) or hasattr(obj, "__arrow_c_stream__")


def _is_database(obj) -> bool:
    """A source that reads itself (:class:`~drift.intake._database.Database`: ``tables()``, ``paths()``).

    Known by a class marker, not an import: the database module builds on this one.
    """
    return bool(getattr(type(obj), "_drift_source", False))


def _is_source(data) -> bool:
    return is_table(data) or _is_database(data) or (isinstance(data, Mapping) and not hasattr(data, "__fspath__"))


def source_paths(data):
    """The files a source reads (a database's file and query file), or None when ``data`` are paths.

    The caller guards these (an output may not overwrite them); a DataFrame reads no file.
    """
    if _is_database(data):
        return data.paths()
    if _is_source(data):
        return []
    if isinstance(data, (list, tuple)) and any(is_table(d) or _is_database(d) or isinstance(d, Mapping)
                                               for d in data):
        _refuse_mix(data)
    return None


def _refuse_mix(data):
    kinds = sorted({"a database" if _is_database(d) else "a table" if is_table(d) or isinstance(d, Mapping)
                    else "a path" for d in data})
    raise InputError(f"the data mix {' and '.join(kinds)}; give paths, or one DataFrame, or a mapping of "
                     "name -> DataFrame, or one database, not a list of them")


def source_tables(data):
    """(names, RawTables) for a DataFrame, a mapping of them, an Arrow table or a database.

    Returns None when ``data`` are paths (the file readers' work).
    """
    if source_paths(data) is None:
        return None
    if _is_database(data):
        tables = data.tables()
    elif isinstance(data, Mapping):
        if not data:
            raise InputError("the mapping of tables is empty; give at least one season's DataFrame")
        tables = [frame_table(value, f"{_kind(value)} {str(key).strip()!r}", season_name=str(key).strip())
                  for key, value in data.items()]
    else:
        tables = [frame_table(data, f"{_kind(data)} {SINGLE_NAME!r}", no_season=_NO_SEASON)]
    return tuple(t.where for t in tables), tables


_NO_SEASON = ("there is no season column; add one, or pass a mapping of season -> DataFrame "
              "({'2024-25': frame, ...})")


def _kind(obj) -> str:
    """What a table is called in messages: ``DataFrame``, or its type (``Table`` for pyarrow's)."""
    import sys

    pandas = sys.modules.get("pandas")
    if not is_table(obj) or (pandas is not None and isinstance(obj, pandas.DataFrame)):
        return "DataFrame"
    return type(obj).__name__


def _to_pandas(obj, where):
    """A pandas DataFrame from ``obj`` (itself, ``to_pandas()`` or the Arrow stream interface)."""
    import pandas as pd

    if isinstance(obj, pd.DataFrame):
        return obj
    try:
        if callable(getattr(obj, "to_pandas", None)):
            frame = obj.to_pandas()
        else:
            try:
                import pyarrow as pa
            except ImportError:
                from drift.constants import DISTRIBUTION

                raise InputError(f"reading an Arrow table needs pyarrow: pip install pyarrow (or "
                                 f"'{DISTRIBUTION}[parquet]')", file=where) from None
            frame = pa.table(obj).to_pandas()
    except InputError:
        raise
    except Exception as exc:  # the caller's object failed to convert: its data, not our bug
        reason = str(exc).splitlines()[0] if str(exc) else type(exc).__name__
        raise InputError(f"cannot be converted to a pandas DataFrame ({reason})", file=where) from None
    if not isinstance(frame, pd.DataFrame):
        raise InputError(f"to_pandas() gave a {type(frame).__name__}, not a DataFrame; give a table",
                         file=where)
    return frame


def frame_table(obj, where, *, season_name=None, no_season=None, first_row=0):
    """One in-memory table as a :class:`RawTable`.

    ``where`` names it in messages. ``season_name``: a name that may hold the season of its rows
    (a mapping's key, a database table's name), read by the rules for file names; ``no_season``:
    what to say when neither that name nor a column gives the season. ``first_row``: the number
    of its first row (0: as ``iloc`` counts).
    """
    import pandas as pd

    if not is_table(obj):
        raise InputError(f"is a {type(obj).__name__}, not a DataFrame or a table that converts to one",
                         file=where)
    frame = _to_pandas(obj, where)
    if isinstance(frame.columns, pd.MultiIndex):
        raise InputError("has several header levels (MultiIndex columns); flatten them to one name per "
                         "column", file=where)
    # a season or player id kept in the index is data: named levels become columns
    named = [n for n in frame.index.names if n is not None and str(n) not in map(str, frame.columns)]
    frame = frame.reset_index(level=named) if named else frame.copy(deep=False)  # never the caller's frame
    refuse_duplicates([str(c) for c in frame.columns], where)
    frame.columns = [str(c).strip() for c in frame.columns]
    if len(frame.columns) == 0:
        raise InputError("has no columns; give the season's rows with drift's columns (docs/input.md)",
                         file=where)
    if frame.empty:
        raise InputError("has columns but no rows; give the season's rows", file=where)
    frame = frame.reset_index(drop=True)
    label, problem = season_label(season_name) if season_name is not None else (
        None, no_season or "there is no season column; add one")
    if season_name is not None and problem is not None:
        problem = problem.replace("name the file like 2024-25.csv", "name it like 2024-25")
    return RawTable(frame, where, first_row, label, problem)
