"""Units, checked rather than assumed.

Per table (:func:`table_units`):

* **Play-type shares** are fractions of the player's possessions. A table whose
  typical (median) share is above 1, or typed as ``"15%"``, is in percent and is
  divided by 100. A row whose shares add up to more than 1.03 (in the unit read) is
  refused, never rescaled: shares adding up to 3 are neither fractions nor percent
  but columns that are not shares of one whole. When shares look complete (median
  row sum near 1), rows summing below 0.9 are warned about.
* **Minutes and possessions** are season totals. A table whose minutes never pass
  60 while its median player has 10 or more games holds minutes per game: they
  are multiplied by games (possessions likewise, below 40). With fewer games it
  cannot be told, so it is refused unless ``[intake.units]`` says which. A table
  whose values are per game but for a few (nine in ten at most 60) has impossible
  cells: they are refused, naming the first.
* **Games** must be whole numbers (an average is refused).
* **Rates** (``*_pct``, ``*_rate``): a table is in percent when its typical value,
  or one value in ten, passes the largest the rate can hold as a fraction (1; 1.5 for
  true shooting and effective field-goal percentage, 5 for the free-throw rate;
  :mod:`drift.intake._ranges`), else in fractions, so one broken cell does not turn a
  column of fractions into percent (it is refused by its range). A rate drift does
  not know is in percent when any value passes 1.

Across tables (:func:`harmonise_rates`): every season of a rate must share one unit;
a minority in the other unit is converted when its median lands within a factor 3
of the rest, and refused otherwise. ``[intake.units]`` (drift name -> ``percent``,
``fraction``, ``total``, ``per_game``) settles any case by hand.
"""

from __future__ import annotations

from drift.errors import InputError

__all__ = ["table_units", "harmonise_rates", "UNIT_WORDS"]

UNIT_WORDS = ("percent", "fraction", "total", "per_game")
_SHARE_SUM_MAX = 1.03
_PER_GAME_MINUTES_MAX = 60.0
_PER_GAME_POSSESSIONS_MAX = 40.0
_GAMES_FOR_TELLING = 10


def _share_units(frame, shares, where, first_row, how, units):
    import numpy as np

    notes = []
    if not shares:
        return notes
    values = frame[shares].to_numpy(float)
    if np.nanmin(values, initial=0.0) < 0:
        r, c = np.argwhere(values < 0)[0]
        raise InputError(f"share {values[r, c]:g} is negative; a play-type share is between 0 and 1",
                         file=where, row=first_row + int(r), column=shares[c])
    said = {units.get(s) for s in shares} - {None}
    percent = "percent" in said or any(how.get(s) == "percent strings" for s in shares)
    sums = np.nansum(values, axis=1)
    if not said and not percent and np.nanmax(values, initial=0.0) > 1.0:
        used = values[np.isfinite(values) & (values > 0)]
        # a typical share above 1 is percent; fractions with a few cells above 1 are not made percent
        # by rows that add up to far more than one whole (that is refused below, never rescaled)
        percent = np.median(used) > 1.0
        if not percent and not np.median(sums[sums > 0]) > _SHARE_SUM_MAX:
            r, c = np.argwhere(values > 1.0)[0]
            raise InputError(
                f"share {values[r, c]:g} is above 1 while this file's other shares are fractions; fix the "
                "cell, or if the file is in percent say so: [intake.units] "
                f"{shares[c]} = \"percent\"", file=where, row=first_row + int(r), column=shares[c])
    if percent:
        if np.nanmax(values, initial=0.0) > 100.0:
            r, c = np.argwhere(values > 100.0)[0]
            raise InputError(f"share {values[r, c]:g} is above 100; give shares as fractions or percent",
                             file=where, row=first_row + int(r), column=shares[c])
        values = values / 100.0
        frame[shares] = values
        notes.append("play-type shares in percent (0-100), divided by 100")
        sums = np.nansum(values, axis=1)
    over = np.flatnonzero(sums > _SHARE_SUM_MAX)
    if len(over):
        listed = ", ".join(f"row {first_row + i} ({sums[i] * (100 if percent else 1):.2f}"
                           f"{'%' if percent else ''})" for i in over[:5])
        unit = "percent" if percent else "fractions"
        raise InputError(f"play-type shares add up to more than 1 in {len(over)} row(s): {listed}, read as {unit}; "
                         "each row's shares are parts of one whole, so drift refuses them rather than rescale "
                         "(check the unit, or a column read as a share that is not one, under [intake.read])",
                         file=where, row=first_row + int(over[0]))
    used = sums[np.isfinite(values).any(axis=1)]
    if len(used) and abs(np.median(used) - 1.0) < 0.03:
        low = np.flatnonzero((sums < 0.9) & np.isfinite(values).any(axis=1))
        if len(low):
            notes.append(f"warning: {len(low)} row(s) whose play-type shares add up to less than "
                         f"0.9 (row {first_row + low[0]}: {sums[low[0]]:.2f}); shares of missing play types "
                         "are read as 0")
    return notes


def _per_game(frame, column, limit, where, units, first_row):
    import numpy as np

    if column not in frame.columns:
        return None
    said = units.get(column)
    values = frame[column].to_numpy(float)
    games = frame["games"].to_numpy(float)
    if said == "total":
        return None
    small = np.nanmax(values, initial=0.0) <= limit
    told = np.nanmedian(games) >= _GAMES_FOR_TELLING
    finite = values[np.isfinite(values)]
    looks_per_game = said is None and told and len(finite) > 0 and np.percentile(finite, 90) <= limit
    if not small and looks_per_game:
        i = int(np.flatnonzero(values > limit)[0])
        raise InputError(
            f"value {values[i]:g} is impossible per game, and the column's values are per game (nine in ten "
            f"at most {limit:g}); fix the cell, or if they are season totals say so: [intake.units] "
            f'{column} = "total"', file=where, row=first_row + i, column=column)
    if said != "per_game" and not small:
        return None
    if said != "per_game" and not told:
        raise InputError(
            f"cannot tell whether {column} are season totals or per game (none above {limit:g}, median "
            f"games {np.nanmedian(games):g}); say it in the config: [intake.units] {column} = "
            '"total" or "per_game"', file=where, column=column)
    frame[column] = values * games
    return f"{column} per game, multiplied by games to season totals"


def _looks_percent(values, name):
    """A rate column in percent: any value above 1 for a rate drift does not know; for a recognised
    one, a typical value, or one in ten, above the most it can hold as a fraction (a fraction column
    with a broken cell stays in fractions, and the cell is refused by its range)."""
    import numpy as np

    from drift.intake._ranges import RATE_RANGES, fraction_max

    finite = np.abs(values[np.isfinite(values)])
    if not len(finite):
        return False
    top = fraction_max(name)
    if name not in RATE_RANGES:
        return bool(finite.max() > top)
    return bool(np.median(finite) > top or np.mean(finite > top) >= 0.1)


def table_units(frame, features, families, where, *, first_row=2, how=None, units=None, canonical=None):
    """Check and convert one table's units in place; returns (notes, rate units, converted).

    ``features``/``families``: drift names and families of the table's features;
    ``how``: drift name -> how its text was parsed (``"percent strings"`` ...);
    ``units``: the config's ``[intake.units]``; ``canonical``: feature -> the drift name it was
    recognised as (before ``[intake.rename]``). ``converted``: drift name -> the unit the
    table gave it in, for every column converted (``"per game"``, ``"percent"``).
    """
    import numpy as np

    how, units, canonical = how or {}, units or {}, canonical or {}
    games = frame["games"].to_numpy(float)
    fractional = np.flatnonzero(np.isfinite(games) & (np.mod(games, 1.0) != 0))
    if len(fractional):
        i = int(fractional[0])
        raise InputError(f"value {games[i]:g} is not a whole number; games must be a count of games "
                         "(is this an average?)", file=where, row=first_row + i, column="games")
    shares = [f for f, fam in zip(features, families) if fam == "share"]
    notes = _share_units(frame, shares, where, first_row, how, units)
    converted = {s: "percent" for s in shares} if any("divided by 100" in n for n in notes) else {}
    for column, limit in (("minutes", _PER_GAME_MINUTES_MAX), ("possessions", _PER_GAME_POSSESSIONS_MAX)):
        note = _per_game(frame, column, limit, where, units, first_row)
        if note:
            notes.append(note)
            converted[column] = "per game"
    rate_units = {}
    for f, fam in zip(features, families):
        if fam in ("rate", "shooting"):
            values = frame[f].to_numpy(float)
            if f in units:
                rate_units[f] = units[f]
            elif how.get(f) == "percent strings" or _looks_percent(values, canonical.get(f, f)):
                rate_units[f] = "percent"
            else:
                rate_units[f] = "fraction"
    return notes, rate_units, converted


def harmonise_rates(tables):
    """Bring every table's rate columns to one unit per feature.

    Parameters
    ----------
    tables : list of (frame, where, rate_units)

    Returns
    -------
    units : dict feature -> unit used
    notes : list of str
    converted : dict (where, feature) -> the unit that table gave it in, for each conversion
    """
    import numpy as np

    features = list(dict.fromkeys(f for _, _, ru in tables for f in ru))
    units, notes, converted_from = {}, [], {}
    for f in features:
        seen = [(frame, where, ru[f]) for frame, where, ru in tables if f in ru]
        kinds = [u for _, _, u in seen]
        target = max(("percent", "fraction"), key=lambda u: (kinds.count(u), u == "fraction"))
        units[f] = target
        others = [(frame, where) for frame, where, u in seen if u != target]
        if not others:
            continue
        ref = np.nanmedian(np.concatenate([fr[f].to_numpy(float) for fr, _, u in seen if u == target]))
        factor = 100.0 if target == "percent" else 0.01
        for frame, where in others:
            converted = frame[f].to_numpy(float) * factor
            med = np.nanmedian(converted)
            if not (np.isfinite(med) and ref > 0 and med > 0 and 1 / 3 <= med / ref <= 3):
                raise InputError(
                    f"is in {'fractions' if target == 'percent' else 'percent'} here but in {target} in "
                    f"other seasons, and its values (median {np.nanmedian(frame[f]):g}) do not say which "
                    f"is right; give every season one unit, or set [intake.units] {f} = \"{target}\"",
                    file=where, column=f)
            frame[f] = converted
            converted_from[(where, f)] = "fraction" if target == "percent" else "percent"
            notes.append(f"{where}: {f} in {'fractions' if target == 'percent' else 'percent'}, "
                         f"converted to {target} like the other seasons")
    return units, notes, converted_from
