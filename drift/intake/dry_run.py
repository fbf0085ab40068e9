"""``drift check``: read everything, apply the filters, fit nothing, and say what was understood.

:func:`check_data` returns a :class:`DataCheck`; :func:`format_check` prints it as
plain-text tables: files and seasons, how each column was read, units, player-seasons
kept and excluded by reason, every warning, and whether a run would work.
"""

from __future__ import annotations

from dataclasses import dataclass, field

__all__ = ["DataCheck", "check_data", "format_check"]


@dataclass(frozen=True)
class DataCheck:
    """What a dry run found.

    ``prepared``: the :class:`~drift.api.Prepared` data (None when intake refused it);
    ``columns``: one row per export column and reading (see
    :func:`drift.intake._column_table.column_summary`), also when intake refused the data
    (then the columns read before the problem; None if none was); ``seasons``: per season the files,
    rows, player-seasons, kept and excluded; ``excluded_by_reason``: counts;
    ``warnings``: every warning raised; ``problems``: why a run would not work
    (empty when it would).
    """

    prepared: object = None
    columns: object = None
    seasons: object = None
    excluded_by_reason: object = None
    warnings: tuple = ()
    problems: tuple = ()
    features: tuple = field(default_factory=tuple)

    @property
    def ok(self) -> bool:
        """True when ``drift run`` with the same data and config would get past intake and filters."""
        return not self.problems

    def summary(self) -> str:
        """One line: passed with what would be fitted, or failed with the first reason."""
        if not self.ok:
            more = f" (and {len(self.problems) - 1} more)" if len(self.problems) > 1 else ""
            return f"check failed: {self.problems[0]}{more}"
        p = self.prepared
        return (f"check passed: {len(p.kept):,} of {len(p.seasons):,} player-seasons pass the filters "
                f"({len(self.seasons)} season(s), {len(self.features)} features, "
                f"{len(p.reading.sources)} table(s) read)")

    def __repr__(self) -> str:
        from drift.messages import text_summary

        seasons = None
        if self.seasons is not None:
            seasons = ", ".join(f"{s} ({k:,} kept)" for s, k in zip(self.seasons["season"], self.seasons["kept"]))
        return text_summary("DataCheck", self.summary(), parts=[
            ("seasons", seasons),
            ("warnings", f"{len(self.warnings)}, the first: {self.warnings[0]}" if self.warnings else "none")])

    def _repr_html_(self) -> str:
        from drift.messages import html_summary

        tables = []
        if self.seasons is not None:
            tables.append(("Seasons", ("season", "player-seasons", "kept", "excluded", "read from"),
                           [tuple(r) for r in self.seasons[["season", "player_seasons", "kept", "excluded",
                                                            "files"]].itertuples(index=False)]))
        if self.excluded_by_reason is not None:
            tables.append(("Excluded by the filters", ("reason", "player-seasons"),
                           [tuple(r) for r in self.excluded_by_reason[["reason", "n"]].itertuples(index=False)]))
        return html_summary("drift DataCheck", self.summary(), tables=tables,
                            lists=[("Problems", self.problems), ("Warnings", self.warnings)])


def _reason_kind(code: str, config) -> str:
    """A filter reason code (see :data:`drift.constants.FILTER_REASONS`) with its threshold."""
    words = {"few_games": f"games < {config.min_games:g}",
             "few_minutes": f"minutes per game < {config.min_minutes_per_game:g}"}
    return " and ".join(words.get(c, c) for c in code.split("+"))


def _season_table(prepared):
    import pandas as pd

    seasons = prepared.seasons
    rows = []
    sources = prepared.reading.sources
    for season in sorted(seasons["season"].unique()):
        files = [f for f, s in zip(sources["file"], sources["seasons"]) if season in s.split(", ")]
        kept = int((prepared.kept["season"] == season).sum())
        total = int((seasons["season"] == season).sum())
        rows.append({"season": season, "player_seasons": total, "kept": kept, "excluded": total - kept,
                     "files": ", ".join(files)})
    return pd.DataFrame(rows)


def _run_problems(prepared, config, check_seasons):
    from drift.errors import DriftError

    problems = []
    try:
        check_seasons(prepared, config)
    except DriftError as exc:
        problems.append(str(exc))
    pool = prepared.kept
    if config.reference:
        pool = pool[pool["season"].isin(config.reference)]
    k_min = config.roles if isinstance(config.roles, int) else 2
    need = max(10, 3 * k_min)
    if len(pool) < need:
        problems.append(f"the pool has {len(pool)} player-seasons; at least {need} are needed (add seasons or "
                        "lower the filters)")
    if len(prepared.features) < 2:
        problems.append(f"only {len(prepared.features)} feature(s); roles need at least two")
    return problems


def check_data(prepare, config, check_seasons) -> DataCheck:
    """Dry run of a ``drift run``: intake and filters, no fitting (called by :func:`drift.api.check`).

    Parameters
    ----------
    prepare : callable
        Reads and filters the data, returning a :class:`~drift.api.Prepared`.
    config : Config
    check_seasons : callable
        ``(prepared, config)``; raises when seasons named in the config are missing.

    Returns
    -------
    DataCheck
        ``ok`` is False with ``problems`` when a run would stop; intake errors are
        caught and become the problem.
    """
    import warnings

    from drift.errors import DriftError, DriftWarning
    from drift.intake._column_table import column_summary

    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", DriftWarning)
        try:
            prepared = prepare()
        except DriftError as exc:
            said = tuple(str(w.message) for w in caught if issubclass(w.category, DriftWarning))
            read = getattr(exc, "columns", None)  # how the columns read before the problem were understood
            return DataCheck(columns=column_summary(read) if read is not None else None, warnings=said,
                             problems=(str(exc),))
    said = tuple(dict.fromkeys(str(w.message) for w in caught if issubclass(w.category, DriftWarning)))
    excluded = prepared.excluded
    by_reason = (excluded["reason_code"].map(lambda code: _reason_kind(code, config)).value_counts().rename_axis("reason").reset_index(name="n")
                 if len(excluded) else None)
    return DataCheck(prepared=prepared, columns=column_summary(prepared.reading.columns), seasons=_season_table(prepared),
                     excluded_by_reason=by_reason, warnings=said, problems=tuple(_run_problems(prepared, config, check_seasons)),
                     features=prepared.features)


def _text_table(frame, columns, headers, limit=None):
    rows = [[("" if v is None or v != v else str(v)) for v in r] for r in frame[columns].itertuples(index=False)]
    if limit is not None and len(rows) > limit:
        rows = rows[:limit] + [[f"... {len(rows) - limit} more"] + [""] * (len(columns) - 1)]
    widths = [max([len(h)] + [len(r[i]) for r in rows]) for i, h in enumerate(headers)]
    line = "  ".join(h.ljust(w) for h, w in zip(headers, widths)).rstrip()
    out = [line, "  ".join("-" * w for w in widths)]
    out += ["  ".join(v.ljust(w) for v, w in zip(r, widths)).rstrip() for r in rows]
    return "\n".join("  " + x for x in out)


def _columns_part(columns) -> str:
    cols = columns.copy()
    cols["read as"] = [(n if r == "standard" else f"{r}: {n}" if n else r)
                       for r, n in zip(cols["role"], cols["drift_name"])]
    cols["why"] = [note or how for note, how in zip(cols["note"], cols["how"])]
    return "\nColumns (how each was read; 'files' = in how many tables)\n" + _text_table(
        cols, ["column", "read as", "family", "play_type", "unit", "files", "why"],
        ["column", "read as", "family", "play type", "unit", "files", "rule / note"])


def _combined_part(prepared) -> str:
    found = prepared.combined
    if found is None or not len(found):
        return "\nCombined rows (a traded player's season total): none found"
    counts = found["how"].value_counts()
    words = {"marker": "by the team marker", "sum": "as the sum of his other rows",
             "label": "by a team of no players of its own"}
    how = ", ".join(f"{int(counts[k])} {w}" for k, w in words.items() if k in counts)
    shown = found.assign(file=found["source_file"], row=found["source_row"], found=found["how"].map(words))
    return (f"\nCombined rows: {len(found)} ({how}), each a traded player's season total, used as his season; "
            "his stints are not added again\n"
            + _text_table(shown, ["file", "row", "player_id", "season", "team", "found"],
                          ["file", "row", "player_id", "season", "team", "found"], limit=20))


def format_check(check: DataCheck) -> str:
    """The dry run as readable plain-text tables (what ``drift check`` prints)."""
    parts = []
    if check.prepared is not None:
        p = check.prepared
        n_files = len(p.reading.sources)
        parts.append(f"Read {n_files} table(s), {len(check.seasons)} season(s), {len(p.seasons)} player-seasons "
                     f"({len(p.kept)} kept, {len(p.excluded)} excluded), {len(p.features)} features.")
        parts.append("\nSeasons\n" + _text_table(check.seasons, ["season", "player_seasons", "kept", "excluded",
                                                              "files"],
                                                 ["season", "player-seasons", "kept", "excluded", "files"]))
        sources = p.reading.sources
        if "read_as" in sources.columns:
            parts.append("\nFiles (how each was read)\n" + _text_table(
                sources, ["file", "read_as", "seasons", "rows"], ["file", "read as", "seasons", "rows"]))
        parts.append(_combined_part(p))
    if check.columns is not None:
        if check.prepared is None:
            parts.append("Read so far (the problem below stopped the reading)")
        parts.append(_columns_part(check.columns))
    if check.prepared is not None:
        if check.excluded_by_reason is not None:
            parts.append("\nExcluded player-seasons by reason\n" + _text_table(
                check.excluded_by_reason, ["reason", "n"], ["reason", "player-seasons"]))
        else:
            parts.append("\nExcluded player-seasons: none")
    parts.append("\nWarnings" + ("".join(f"\n  - {w}" for w in check.warnings) if check.warnings else ": none"))
    if check.ok:
        parts.append(f"\nA run would work: {len(check.prepared.kept)} player-seasons pass the filters.")
    else:
        parts.append("\nA run would not work:" + "".join(f"\n  - {p}" for p in check.problems))
    return "\n".join(parts).lstrip("\n")
