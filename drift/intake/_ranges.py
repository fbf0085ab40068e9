"""Plausibility ranges: values no season of basketball can hold are refused, never used.

Every range below is the trade's common practice or follows from a stat's definition (no
published source; stated as such in docs/input.md). They are wide on purpose: a value outside
is a broken cell, a unit mistake or a column read as something it is not, never a great season.
Each refusal names the file, the row, the export's column (with drift's name), the value and
the range.

* **Games**: whole numbers from 0 to :data:`MAX_GAMES` (no league's season, playoffs included,
  comes near 120 games).
* **Minutes**: none without a game, and at most :data:`MAX_MINUTES_PER_GAME` per game over
  three games or more (a 48-minute game plus overtimes; no season averages more), at most
  :data:`MAX_MINUTES_ONE_GAME` over one or two (the longest games on record, six overtimes).
* **Possessions**: at most :data:`POSSESSIONS_PER_MINUTE` ``[1]`` per minute (a team plays
  about 2.1 possessions a minute; 3 leaves room for the fastest pace); from
  :data:`LOW_POSSESSIONS_FROM` minutes, at least ``[0]`` per minute (a usage rate near 2 %:
  no regular ever uses fewer).
* **Points per possession** (``ppp_*``): 0 to 4 (one possession scores at most four points).
* **Rates** (:data:`RATE_RANGES`, in percent; a fraction-unit column is checked against the
  range / 100): usage, assist, rebound, turnover, steal and block rates and the three-point
  attempt rate 0-100; true shooting and effective field-goal percentage 0-150 (1.5 points per
  shot is every shot a made three); free-throw rate 0-500 (free throws per field-goal attempt,
  about 0-1 for a season). Rates whose denominators are estimates (usage, assist, rebound,
  steal, block) can leave their range in a few minutes of play, so they are checked on rows
  with at least :data:`RATE_CHECK_MINUTES` minutes (a game's worth); the free-throw rate,
  which a handful of shots can push anywhere, from :data:`LOW_POSSESSIONS_FROM` minutes.

Play-type shares are checked with their units (:mod:`drift.intake._units`).
"""

from __future__ import annotations

from drift.errors import InputError

__all__ = ["MAX_GAMES", "MAX_MINUTES_PER_GAME", "MAX_MINUTES_ONE_GAME", "POSSESSIONS_PER_MINUTE", "LOW_POSSESSIONS_FROM", "PPP_RANGE",
           "RATE_RANGES", "RATE_CHECK_MINUTES", "check_present", "check_counts", "check_efficiencies", "check_rates",
           "fraction_max"]

MAX_GAMES = 120
MAX_MINUTES_PER_GAME = 60.0
MAX_MINUTES_ONE_GAME = 75.0
POSSESSIONS_PER_MINUTE = (0.04, 3.0)
LOW_POSSESSIONS_FROM = 250.0
PPP_RANGE = (0.0, 4.0)
RATE_CHECK_MINUTES = 48.0
#: drift's name -> (low, high in percent, what it is, checked on rows with at least this many minutes)
RATE_RANGES = {
    "usage_pct": (0.0, 100.0, "a usage rate", RATE_CHECK_MINUTES),
    "ast_pct": (0.0, 100.0, "an assist rate", RATE_CHECK_MINUTES),
    "orb_pct": (0.0, 100.0, "an offensive rebound rate", RATE_CHECK_MINUTES),
    "drb_pct": (0.0, 100.0, "a defensive rebound rate", RATE_CHECK_MINUTES),
    "trb_pct": (0.0, 100.0, "a rebound rate", RATE_CHECK_MINUTES),
    "stl_pct": (0.0, 100.0, "a steal rate", RATE_CHECK_MINUTES),
    "blk_pct": (0.0, 100.0, "a block rate", RATE_CHECK_MINUTES),
    "tov_pct": (0.0, 100.0, "a turnover rate", 0.0),  # exact shares of events: any sample
    "three_pa_rate": (0.0, 100.0, "a three-point attempt rate", 0.0),
    "ts_pct": (0.0, 150.0, "a true shooting percentage", 0.0),
    "efg_pct": (0.0, 150.0, "an effective field-goal percentage", 0.0),
    "ft_rate": (0.0, 500.0, "a free-throw rate", LOW_POSSESSIONS_FROM),
}


def fraction_max(name: str) -> float:
    """The largest value a recognised rate can hold in fraction units (1 for an unknown rate)."""
    found = RATE_RANGES.get(name)
    return found[1] / 100.0 if found else 1.0


def _refuse(values, bad, what, where, first_row, column, extra=""):
    """Refuse the first bad row, showing ``values`` (the cell as written: per game where it was)."""
    import numpy as np

    idx = np.flatnonzero(bad)
    i = int(idx[0])
    more = f" (and {len(idx) - 1} more row(s))" if len(idx) > 1 else ""
    raise InputError(f"value {values[i]:g} is impossible: {what}{more}{extra}; fix the cell (the range is common "
                     "practice, see docs/input.md)", file=where, row=first_row + i, column=column)


def _as_written(values, games, column, converted):
    """The cells as the export wrote them: per game again for a column converted to season totals."""
    import numpy as np

    if converted.get(column) != "per game":
        return values
    return np.divide(values, games, out=np.zeros_like(values), where=games > 0)


def check_present(frame, where, first_row):
    """Games and minutes: every row has them, >= 0 (before units are read)."""
    import numpy as np

    for column in ("games", "minutes"):
        values = frame[column].to_numpy(float)
        bad = np.isnan(values) | (values < 0)
        if bad.any():
            i = int(np.flatnonzero(bad)[0])
            shown = "empty" if np.isnan(values[i]) else f"{values[i]:g}"
            raise InputError(f"value {shown} is not allowed; {column} must be a number >= 0",
                             file=where, row=first_row + i, column=column)


def check_counts(frame, where, first_row, converted):
    """Games, minutes and possessions within the ranges above (after units are read).

    ``converted``: drift name -> the unit it was given in (``"per game"``), for the message.
    """
    import numpy as np

    games, minutes = frame["games"].to_numpy(float), frame["minutes"].to_numpy(float)
    if (games > MAX_GAMES).any():
        _refuse(games, games > MAX_GAMES, f"games must lie between 0 and {MAX_GAMES} in a season", where,
                first_row, "games")
    per_game = np.divide(minutes, games, out=np.zeros_like(minutes), where=games > 0)
    note = " (minutes were read per game and multiplied by games)" if "minutes" in converted else ""
    shown = _as_written(minutes, games, "minutes", converted)
    if ((games == 0) & (minutes > 0)).any():
        _refuse(shown, (games == 0) & (minutes > 0), "minutes without a game played", where, first_row,
                "minutes", note)
    limit = np.where(games >= 3, MAX_MINUTES_PER_GAME, MAX_MINUTES_ONE_GAME)
    if (per_game > limit).any():
        bad = per_game > limit
        i = int(np.flatnonzero(bad)[0])
        _refuse(shown, bad, f"{per_game[i]:.1f} minutes per game over {games[i]:g} games, above "
                f"{limit[i]:g}", where, first_row, "minutes", note)
    if "possessions" in frame.columns:
        _check_possessions(frame["possessions"].to_numpy(float), minutes, games, where, first_row, converted)


def _check_possessions(poss, minutes, games, where, first_row, converted):
    import numpy as np

    low, high = POSSESSIONS_PER_MINUTE
    note = " (possessions were read per game and multiplied by games)" if "possessions" in converted else ""
    finite = np.isfinite(poss)
    shown = _as_written(poss, games, "possessions", converted)
    if (finite & (poss < 0)).any():
        _refuse(shown, finite & (poss < 0), "possessions cannot be negative", where, first_row, "possessions")
    rate = np.divide(poss, minutes, out=np.full_like(poss, np.nan), where=minutes > 0)
    over = finite & (((minutes == 0) & (poss > 0)) | ((minutes >= RATE_CHECK_MINUTES) & (rate > high)))
    if over.any():
        _refuse(shown, over, f"more than {high:g} possessions per minute played", where, first_row, "possessions",
                note)
    under = finite & (minutes >= LOW_POSSESSIONS_FROM) & (rate < low)
    if under.any():
        i = int(np.flatnonzero(under)[0])
        hint = note or ' (if the column is per game, say so: [intake.units] possessions = "per_game")'
        _refuse(shown, under, f"{rate[i]:.3f} possessions per minute beside {minutes[i]:g} minutes, below {low:g} "
                "(a usage rate near 2 %)", where, first_row, "possessions", hint)


def check_efficiencies(frame, names, where, first_row):
    """Points per possession of every play type within :data:`PPP_RANGE`."""
    import numpy as np

    low, high = PPP_RANGE
    for name in names:
        values = frame[name].to_numpy(float)
        bad = np.isfinite(values) & ((values < low) | (values > high))
        if bad.any():
            hint = " (points per 100 possessions? give points per possession)" if np.nanmedian(values) > 20 else ""
            _refuse(values, bad, f"points per possession lie between {low:g} and {high:g}", where, first_row,
                    name, hint)


def check_rates(frame, names, units, where, first_row, *, canonical):
    """Every recognised rate (:data:`RATE_RANGES`) within its range in the unit it was read in.

    ``canonical``: feature name -> the drift name its column was recognised as (before renames).
    """
    import numpy as np

    minutes = frame["minutes"].to_numpy(float)
    for name in names:
        known = RATE_RANGES.get(canonical.get(name, name))
        if known is None or name not in units:
            continue
        low, high, what, from_minutes = known
        scale = 1.0 if units[name] == "percent" else 0.01
        values = frame[name].to_numpy(float)
        checked = np.isfinite(values) & (minutes >= from_minutes)
        bad = checked & ((values < low * scale) | (values > high * scale))
        if bad.any():
            unit = "percent" if units[name] == "percent" else "fractions"
            _refuse(values, bad, f"{what} lies between {low * scale:g} and {high * scale:g} (read in {unit})",
                    where, first_row, name)
