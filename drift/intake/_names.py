"""Messages in the export's own words: its column names beside drift's, and the nearest names.

Intake works on drift's names (``drb_pct``, ``share_spot_up``) once a table's columns are
understood, but a user looks for ``DREB_PCT`` or ``SPOTUP_FRQ`` in the file.
:func:`in_export_words` rewrites an :class:`~drift.errors.InputError` to name the export's
column with drift's name beside it; :func:`did_you_mean` finds, for a required column that
is missing, the export's columns whose names come closest to any of its spellings
(``TEAM_ABREVIATION`` for ``team``).
"""

from __future__ import annotations

from drift.errors import InputError

__all__ = ["did_you_mean", "in_export_words", "export_name", "refuse_clashes", "require_columns"]

#: how alike (difflib's ratio, 0-1) an export's name must be to a spelling to be suggested
_CLOSE = 0.75


def _closest(wanted, names, taken):
    import difflib

    from drift.intake._columns import STANDARD_NAMES, normalise

    spellings = STANDARD_NAMES.get(wanted, (wanted,))
    scored = []
    for name in names:
        if name in taken:
            continue
        norm = normalise(name)
        score = max(difflib.SequenceMatcher(None, norm, s).ratio() for s in spellings)
        if score >= _CLOSE:
            scored.append((-score, name))
    return [name for _, name in sorted(scored)[:2]]


def did_you_mean(missing, names, taken=()):
    """(``"did you mean TEAM_ABREVIATION (for team)?"``, ``'team = "TEAM_ABREVIATION"'``), or ``("", "")``.

    ``names``: the export's column names; ``taken``: those already read as one of drift's columns.
    """
    hints, maps = [], []
    for wanted in missing:
        close = _closest(wanted, names, set(taken))
        if close:
            hints.append(f"{' or '.join(close)} (for {wanted})")
            maps.append(f'{wanted} = "{close[0]}"')
    if not hints:
        return "", ""
    return f"did you mean {', '.join(hints)}?", ", ".join(maps)


def export_name(readings, name):
    """The export's column read as drift's ``name`` in one table, or None."""
    for r in readings:
        if r.name == name and r.role in ("standard", "feature", "unknown", "sample"):
            return r.source
    return None


def in_export_words(exc: InputError, readings) -> InputError:
    """``exc`` naming the export's column, with drift's name beside it when they differ."""
    column = getattr(exc, "column", None)
    if column is None or getattr(exc, "read_as", None):
        return exc
    source = export_name(readings, column)
    if source is not None:
        drift_name = column
    else:
        drift_name = next((r.name for r in readings if r.source == column and r.name), None)
        source = column
    if drift_name is None or drift_name == source:
        return exc
    return InputError(exc.message, file=exc.file, row=exc.row, column=source, read_as=drift_name)


def refuse_clashes(readings, where):
    """Refuse two columns that would be read as the same thing."""
    by_name = {}
    for r in readings:
        if r.role in ("standard", "feature", "unknown"):
            by_name.setdefault(r.name, []).append(r.source)
    for name, sources in by_name.items():
        if len(sources) > 1:
            raise InputError(
                f"columns {sources} would all be read as {name!r}; keep one, or say which is which in the "
                "config ([columns] for drift's own columns, [intake.read] or [intake] exclude for features)",
                file=where)


def require_columns(readings, frame, table, config):
    """Refuse a table lacking one of drift's required columns, naming the closest columns it has."""
    from drift.intake.policy import REQUIRED_COLUMNS

    where = table.where
    present = {r.name for r in readings if r.role == "standard"}
    missing = [c for c in REQUIRED_COLUMNS if c not in present and not (c == "season" and table.name_season)]
    if missing == ["season"]:
        raise InputError(table.name_problem, file=where)
    unmatched = [c for c in missing if c in config.columns]
    cols = [str(c) for c in frame.columns]
    if unmatched:
        import difflib

        c = unmatched[0]
        close = difflib.get_close_matches(config.columns[c], cols, n=2, cutoff=_CLOSE)
        close = f"; did you mean {' or '.join(close)}?" if close else ""
        raise InputError(f"the config's [columns] maps {c} to {config.columns[c]!r}, but this file has no "
                         f"such column{close}; fix the name in [columns] (columns here: {', '.join(cols[:12])})",
                         file=where)
    if missing:
        found = ", ".join(cols[:12]) + (", ..." if len(cols) > 12 else "")
        close, mapping = did_you_mean(missing, cols, taken={r.source for r in readings if r.role == "standard"})
        if close:
            raise InputError(f"missing required column(s) {missing}; {close} If so, rename it or map it in the "
                             f"config: [columns] {mapping} (found {found})", file=where)
        separator = ""
        if len(cols) == 1 and any(sep in cols[0] for sep in ";:|\t,"):
            separator = ("; the header reads as one column: if the file uses another separator, name it in the "
                         "config: [intake.csv] separator")
        hint = ", ".join(f'{m} = "..."' for m in missing)
        raise InputError(
            f"missing required column(s) {missing}{separator}; found {found}. "
            f"Rename them or map them in the config's [columns] table ({hint})", file=where)
