"""What intake understood, as tables and warnings.

:func:`column_table` gives one row per file and column (fields in
:data:`drift.intake.COLUMN_TABLE_FIELDS`); :func:`column_summary` folds it to one
row per export column, as ``drift check``, ``features.csv`` and the report show it;
:func:`emit_notes` turns intake's notes into :class:`~drift.errors.DataQualityWarning` s,
one per kind of note with the files it concerns.
"""

from __future__ import annotations

__all__ = ["column_table", "column_summary", "feature_table", "emit_notes"]

_UNIT_OF = {"share": "fraction", "efficiency": "points per possession", "possessions": "possessions"}


def column_table(per_table, units, converted=None):
    """One row per (file, column): role, drift name, family, play type, unit, how, note.

    ``converted``: (file, drift name) -> the unit that file gave the column in, for each
    conversion; the unit then reads ``"per game -> season total"``, the unit after conversion last.
    """
    import pandas as pd

    converted = converted or {}
    rows = []
    for where, readings in per_table:
        for r in readings:
            unit = ""
            if r.role == "standard" and r.name in ("minutes", "games", "possessions"):
                unit = "season total"
            elif r.role in ("feature", "sample"):
                unit = units.get(r.name, _UNIT_OF.get(r.family, ""))
            if unit and (where, r.name) in converted:
                unit = f"{converted[(where, r.name)]} -> {unit}"
            rows.append({"file": where, "column": r.source, "role": r.role, "drift_name": r.name,
                         "family": r.family, "play_type": r.play_type, "unit": unit, "how": r.how,
                         "note": r.note})
    return pd.DataFrame(rows, columns=["file", "column", "role", "drift_name", "family", "play_type", "unit",
                                       "how", "note"])


def column_summary(columns):
    """One row per export column and reading, with the number of files it was read that way in."""
    keys = ["column", "role", "drift_name", "family", "play_type", "unit", "how", "note"]
    if columns is None or len(columns) == 0:
        import pandas as pd

        return pd.DataFrame(columns=keys + ["files"])
    out = columns.groupby(keys, sort=False, dropna=False).size().reset_index(name="files")
    order = {"standard": 0, "feature": 1, "sample": 2, "ignored": 3}
    return out.sort_values("role", key=lambda s: s.map(order), kind="stable").reset_index(drop=True)


def feature_table(noise, columns):
    """The noise table (index: feature) with ``play_type, unit, source_column, detected_by`` after ``family``.

    A feature read from differently named columns in different files lists each name, joined by ``|``.
    """
    table = noise.reset_index()
    feats = columns[columns["role"] == "feature"] if columns is not None else None
    if feats is None or len(feats) == 0:
        return table
    joined = feats.groupby("drift_name", sort=False).agg(
        play_type=("play_type", "first"), unit=("unit", "first"),
        source_column=("column", lambda c: "|".join(dict.fromkeys(c))),
        detected_by=("how", lambda h: "|".join(dict.fromkeys(h))))
    joined = joined.reindex(table["feature"]).fillna("").reset_index(drop=True)
    at = list(table.columns).index("family") + 1 if "family" in table.columns else 1
    for offset, name in enumerate(joined.columns):
        table.insert(at + offset, name, joined[name].to_numpy())
    return table


def emit_notes(notes, columns):
    """Warn once per kind of note (conversions, odd rows) and for columns read by default."""
    import warnings

    from drift.errors import DataQualityWarning

    grouped = {}
    for where, text in notes:
        grouped.setdefault(text, []).append(where)
    for text, wheres in grouped.items():
        places = [w for w in wheres if w is not None]
        shown = f" ({', '.join(places[:3])}{', ...' if len(places) > 3 else ''})" if places else ""
        warnings.warn(f"{text.removeprefix('warning: ')}{shown}", DataQualityWarning, stacklevel=3)
    default = columns[columns["how"].str.startswith("default") & (columns["role"] == "feature")]
    if len(default):
        names = ", ".join(dict.fromkeys(default["column"]))
        warnings.warn(f"column(s) {names} match no name rule and are used as rate features; if they are not "
                      "playstyle rates, list them under [intake] exclude (or say what they are under "
                      "[intake.read])", DataQualityWarning, stacklevel=3)
