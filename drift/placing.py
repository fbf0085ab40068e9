"""Placing new files with a saved model: ``drift place`` and the in-season check."""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

from drift.config import Config
from drift.intake.preflight import check_distinct, check_placements_finite, check_regular
from drift.intake.prepare import _as_list, _data_files, prepare
from drift.progress import stages
from drift.settings_rules import count_from
from drift.threads import thread_limited

if TYPE_CHECKING:  # pragma: no cover - annotations only; pandas loads on first use
    import pandas as pd

#: games in a full regular season, the in-season check's horizon (common practice, no source: an
#: 82-game schedule); ``drift place --season-games`` changes it for other leagues
SEASON_GAMES = 82

__all__ = ["SEASON_GAMES", "place", "place_files", "check_files", "Placed", "Checked", "INSEASON_MIN_GAMES", "INSEASON_FILES"]


@dataclass(frozen=True)
class Placed:
    """What :func:`place_files` wrote: ``placements`` to ``path``; ``excluded`` (the rows the
    filters left out, with ``reason`` and ``reason_code``; header only when none) to ``excluded_path``."""

    placements: pd.DataFrame
    excluded: pd.DataFrame
    path: Path
    excluded_path: Path

    def summary(self) -> str:
        """One line: what was placed and written (the CLI prints it)."""
        note = ""
        if len(self.excluded):
            note = f"; {len(self.excluded)} excluded by the filters, listed in {self.excluded_path}"
        return f"placed {len(self.placements)} player-seasons; wrote {self.path}{note}"

    def _role_rows(self):
        placed = self.placements
        if not len(placed):
            return []
        counts = placed.groupby(["role", "role_name"], sort=True).size()
        return [(role, name, int(n)) for (role, name), n in counts.items()]

    def __repr__(self) -> str:
        from drift.messages import text_summary

        roles = ", ".join(f"{r} {name} ({n:,})" for r, name, n in self._role_rows())
        return text_summary("Placed", self.summary(), parts=[("roles", roles or "none")])

    def _repr_html_(self) -> str:
        from drift.messages import html_summary

        return html_summary("drift Placed", self.summary(), tables=[
            ("Roles", ("role", "name", "player-seasons"), self._role_rows()),
            ("Excluded by the filters", ("reason", "player-seasons"), _reasons(self.excluded))])


def _reasons(excluded):
    """(reason, count) rows of an excluded table, most frequent first."""
    if not len(excluded):
        return []
    return [(reason, int(n)) for reason, n in excluded["reason"].value_counts().items()]


@dataclass(frozen=True)
class Checked:
    """What :func:`check_files` found: ``checks`` (one row per checked player) and ``excluded``
    (partial rows not checked, with ``reason`` and ``reason_code``)."""

    checks: pd.DataFrame
    excluded: pd.DataFrame
    out: Path | None = None

    def summary(self) -> str:
        """One line: players checked and how many moved beyond noise (the CLI prints it)."""
        counts = self.checks["status"].value_counts()
        shown = ", ".join(f"{int(counts[s])} {s}" for s in ("changed", "shifted", "too early") if s in counts)
        page = f"; page: {self.out}/inseason.html" if self.out is not None else ""
        return f"checked {len(self.checks)} players against their last season ({shown or 'none beyond noise'}){page}"

    #: rows of the strongest evidence a notebook summary lists; every one is in ``checks``
    SHOWN_CHECKS = 8

    def _check_rows(self):
        top = self.checks[self.checks["status"].isin(["changed", "shifted"])].head(self.SHOWN_CHECKS)
        return [(r["player"], r["team_to"], f"{r['role_from']} to {r['role_to']}", int(r["games_to"]),
                 r["status"], f"{r['z']:.1f}") for r in top.to_dict(orient="records")]

    def __repr__(self) -> str:
        from drift.messages import text_summary

        return text_summary("Checked", self.summary(), parts=[("not checked", f"{len(self.excluded):,} rows")])

    def _repr_html_(self) -> str:
        from drift.messages import html_summary

        counts = self.checks["status"].value_counts()
        rows = self._check_rows()
        return html_summary("drift Checked", self.summary(), tables=[
            ("Players by status", ("status", "players"), [(s, int(n)) for s, n in counts.items()]),
            ("Moves beyond noise so far" + (f" (the {len(rows)} strongest)" if rows else ""),
             ("player", "team", "role", "games", "status", "z"), rows),
            ("Not checked", ("reason", "rows"), _reasons(self.excluded))])


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
    """Place season files (or a DataFrame, a mapping of them, an Arrow table, a Database) with a saved
    model and write one CSV.

    The model's features must all be present, and no others. The filters are
    the model's own (saved at fit time) unless ``min_games`` or
    ``min_minutes_per_game`` are given (a partial season wants fewer games);
    ``config`` supplies the column mapping.

    ``progress`` receives stage events as in :func:`run`.

    Rows the filters exclude are written beside ``out`` as ``<stem>_excluded.csv`` (always,
    header only when none). Neither may be an input (model, data, ``inputs``) nor lie in an
    input folder, an existing file is replaced only if drift wrote it, and a file an output
    folder's marker lists (another output's file) is refused (checked before any work).

    Returns
    -------
    Placed
    """
    from drift.model import RoleModel
    from drift.output.folders import atomic_file, check_output_file
    from drift.output.tables import with_role_names, write_csv

    st = stages(progress)
    out = Path(out)
    excluded_path = out.with_name(f"{out.stem}_excluded.csv")
    guarded = [model_path, *_as_list(files), *inputs]
    check_regular(guarded)
    check_distinct(_data_files(files))
    check_output_file(out, inputs=guarded)
    check_output_file(excluded_path, inputs=guarded, header=("player_id", "reason"), what="the excluded list")
    model = RoleModel.load(model_path)
    config = _model_config(model, config).replace(min_games=min_games,
                                                  min_minutes_per_game=min_minutes_per_game)
    prepared = prepare(files, config, progress=st)
    model.check_features(prepared.features)
    with st.stage("place", len(prepared.kept)):
        placements = model.place(prepared.kept)
        check_placements_finite(placements, model_path)
    with st.stage("write placements", len(placements)), atomic_file(out, inputs=guarded) as tmp:
        write_csv(with_role_names(placements, dict(zip(model.role_ids_, model.role_names_))), tmp)
    # always written (header only when nothing is excluded): a list left by an earlier placement
    # beside new placements would describe other rows
    with atomic_file(excluded_path, inputs=guarded, header=("player_id", "reason"),
                     what="the excluded list") as tmp:
        write_csv(prepared.excluded, tmp)
    return Placed(placements, prepared.excluded, out, excluded_path)


#: games a partial season needs to be checked (fewer say nothing; "too early" covers the rest)
INSEASON_MIN_GAMES = 5


#: every file the in-season check may write into its output folder (besides the marker)
INSEASON_FILES = ("inseason.csv", "inseason_excluded.csv", "inseason.html")


def check_files(model_path, partial, against, out, config: Config | None = None, *, min_games=None,
                min_minutes_per_game=None, alpha=None, season_games=SEASON_GAMES, inputs=()):
    """The in-season check: partial-season files against full seasons, written to a folder.

    Parameters
    ----------
    model_path : path
        A ``model.json``.
    partial, against : path, list of paths, DataFrame, mapping of name -> DataFrame, Arrow table or Database
        The season under way, and earlier full seasons (files or folders, or tables: docs/sources.md).
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
    Checked
        The checks (see docs/cli.md, "In-season check") and the rows not checked.
    """
    import pandas as pd

    from drift.constants import FILTER_REASONS
    from drift.measure.inseason import check_partial
    from drift.model import RoleModel
    from drift.output.folders import atomic_folder, check_output_folder
    from drift.output.tables import with_role_names, write_csv
    from drift.report.inseason_page import write_page

    guarded = [model_path, *_as_list(partial), *_as_list(against), *inputs]
    check_regular(guarded)
    check_distinct([*_data_files(partial), *_data_files(against)])
    check_output_folder(out, kind="inseason", inputs=guarded, names=INSEASON_FILES)
    model = RoleModel.load(model_path)
    # alpha and season_games go through the settings' own validators, like every other setting
    base = _model_config(model, config).replace(alpha=alpha)
    season_games = count_from(1)("season_games", season_games)
    part_config = base.replace(
        min_games=min_games if min_games is not None else INSEASON_MIN_GAMES,
        min_minutes_per_game=min_minutes_per_game)
    part = prepare(partial, part_config)
    full = prepare(against, base)
    for prepared in (part, full):
        model.check_features(prepared.features)
    alpha = base.alpha
    checks, unmatched = check_partial(model, part.kept, full.kept, alpha=alpha, season_games=season_games)
    unmatched = unmatched.assign(reason=FILTER_REASONS["no_earlier_season"], reason_code="no_earlier_season")
    columns = [c for c in part.excluded.columns if c in unmatched.columns]
    excluded = pd.concat([part.excluded, unmatched[columns]], ignore_index=True)
    names = dict(zip(model.role_ids_, model.role_names_))
    with atomic_folder(out, kind="inseason", inputs=guarded) as tmp:
        write_csv(with_role_names(checks, names), tmp / "inseason.csv")
        write_csv(excluded, tmp / "inseason_excluded.csv")
        write_page(checks, model, tmp / "inseason.html", alpha=alpha, season_games=season_games,
                   n_excluded=len(excluded))
    return Checked(checks, excluded, Path(out))


#: the public name (``drift.place``): place season files with a saved model
place = place_files
