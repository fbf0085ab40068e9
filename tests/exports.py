"""Test helper: the demo league written as a team's real export would look.

Upper-case names, play types as ``<TYPE>_FREQ`` / ``<TYPE>_PPP`` in the export's
own abbreviations, a team id and an age column, one workbook per season whose
first sheet is a notes sheet and whose data sheet has a title row above the header.
"""

from __future__ import annotations

from pathlib import Path

import pandas as pd

PLAY_CODES = {"isolation": "ISO", "pnr_handler": "PRBALLHANDLER", "roll_man": "PRROLLMAN", "post_up": "POSTUP",
              "spot_up": "SPOTUP", "transition": "TRANSITION", "cut": "CUT", "off_screen": "OFFSCREEN",
              "handoff": "HANDOFF", "putback": "PUTBACK"}
RATE_CODES = {"usage_pct": "USG_PCT", "ast_pct": "AST_PCT", "orb_pct": "OREB_PCT", "drb_pct": "DREB_PCT",
              "tov_pct": "TOV_PCT", "stl_pct": "STL_PCT", "blk_pct": "BLK_PCT", "ts_pct": "TS_PCT",
              "three_pa_rate": "FG3A_RATE", "ft_rate": "FTA_RATE"}
#: the [columns] map such an export needs (the README shows the same)
COLUMN_MAP = {"player_id": "PERSON_KEY", "player": "FULL_NAME", "team": "CLUB", "games": "GMS",
              "minutes": "MINS_TOTAL"}


def export_name(column: str) -> str:
    """The export's name for one of the demo's columns."""
    if column in COLUMN_MAP:
        return COLUMN_MAP[column]
    if column.startswith("share_"):
        return f"{PLAY_CODES[column[6:]]}_FREQ"
    if column.startswith("ppp_"):
        return f"{PLAY_CODES[column[4:]]}_PPP"
    return RATE_CODES.get(column, column.upper())


def write_export(demo_folder, out) -> list:
    """One workbook per demo season in ``out``: a notes sheet, then the data under a title row."""
    out = Path(out)
    out.mkdir(parents=True, exist_ok=True)
    paths = []
    for csv in sorted(Path(demo_folder).glob("*.csv")):
        frame = pd.read_csv(csv, dtype={"player_id": str})
        frame.insert(1, "TEAM_ID", 900 + frame["team"].map(lambda t: sum(map(ord, t))))
        frame.insert(2, "AGE", 19 + frame.index % 17)
        frame.columns = [export_name(c) if c not in ("TEAM_ID", "AGE") else c for c in frame.columns]
        path = out / f"club_export_{csv.stem}.xlsx"
        notes = pd.DataFrame({"Notes": ["Season export for the staff", "Minutes are season totals",
                                        "Play types: frequency and points per possession"]})
        with pd.ExcelWriter(path) as writer:
            notes.to_excel(writer, sheet_name="Notes", index=False)
            pd.DataFrame({f"Player season {csv.stem}": []}).to_excel(writer, sheet_name="Players", index=False)
            frame.to_excel(writer, sheet_name="Players", index=False, startrow=2)
        paths.append(path)
    return paths


# --- small invented club exports, written the way other tools write them ------------------------

#: drift's name -> the column name a small club export uses
SMALL_NAMES = {"player_id": "PLAYER_ID", "player": "PLAYER_NAME", "team": "TEAM_ABBREVIATION", "games": "GP",
               "minutes": "MIN", "possessions": "POSS", "share_spot_up": "SPOTUP_FREQ",
               "share_isolation": "ISO_FREQ", "ppp_spot_up": "SPOTUP_PPP", "usage_pct": "USG_PCT",
               "orb_pct": "OREB_PCT", "drb_pct": "DREB_PCT", "stl_pct": "STL_PCT", "ts_pct": "TS_PCT"}
_TEAMS = ("ALD", "BRN", "CED", "DUN")
_FIRST = ("Rémy", "Søren", "Tavvin", "Orren", "Kassen", "Belmar", "Wesric", "Elek", "Davtho", "Cormar")
_LAST = ("Varton", "Quillell", "Garrsby", "Haskwick", "Stratholt", "Fraegard", "Peñalta", "Tovwick")


def _player_row(rng, pid, season, team, games, mpg):
    minutes = round(games * mpg)
    spot = rng.uniform(0.15, 0.5)
    iso = rng.uniform(0.02, 0.2)
    return {"player_id": pid, "player": f"{_FIRST[int(pid[1:]) % 10]} {_LAST[int(pid[1:]) % 8]}",
            "season": season, "team": team, "games": games, "minutes": minutes,
            "possessions": round(minutes * rng.uniform(0.25, 0.55)), "share_spot_up": round(spot, 4),
            "share_isolation": round(iso, 4), "ppp_spot_up": round(rng.uniform(0.8, 1.25), 3),
            "usage_pct": round(rng.uniform(10, 30), 2), "orb_pct": round(rng.uniform(1, 12), 2),
            "drb_pct": round(rng.uniform(8, 28), 2), "stl_pct": round(rng.uniform(0.5, 3), 2),
            "ts_pct": round(rng.uniform(0.48, 0.64), 4)}


def small_league(seasons=("2022-23", "2023-24"), per_team=6, traded=3, three_teams=0, seed=0):
    """An invented league, one row per player, season and team (a stint).

    ``traded`` players per season play for two teams, ``three_teams`` more for three; the
    rest play a whole season for one. Names are invented (some with accents).
    """
    import numpy as np

    rng = np.random.default_rng(seed)
    rows = []
    for season in seasons:
        n = 0
        for team in _TEAMS:
            for _ in range(per_team):
                rows.append(_player_row(rng, f"P{n:03d}", season, team, int(rng.integers(40, 80)),
                                        rng.uniform(12, 34)))
                n += 1
        for k in range(traded + three_teams):
            stints = 2 if k < traded else 3
            mpg = rng.uniform(14, 30)
            for j in range(stints):
                rows.append(_player_row(rng, f"T{k:03d}", season, _TEAMS[(k + j) % len(_TEAMS)],
                                        int(rng.integers(12, 30)), mpg))
    return pd.DataFrame(rows)


def with_combined_rows(table, marker="TOT"):
    """``table`` with a season-total row before each traded player's stints, as many exports write it.

    ``marker``: the total row's team, or ``"{n}TM"`` for ``2TM``/``3TM`` by the number of teams.
    Games, minutes and possessions add up; every other number is the minutes-weighted mean.
    """
    out = []
    for (_, _), rows in table.groupby(["season", "player_id"], sort=False):
        if len(rows) > 1:
            total = rows.iloc[0].copy()
            total["team"] = marker.format(n=len(rows))
            for column in ("games", "minutes", "possessions"):
                total[column] = rows[column].sum()
            weights = rows["minutes"] / rows["minutes"].sum()
            for column in rows.columns:
                if column not in ("player_id", "player", "season", "team", "games", "minutes", "possessions"):
                    total[column] = round(float((rows[column] * weights).sum()), 4)
            out.append(total.to_frame().T)
        out.append(rows)
    return pd.concat(out, ignore_index=True)


def export_frame(table, names=None):
    """``table`` with the export's column names (:data:`SMALL_NAMES` by default), season column dropped."""
    names = SMALL_NAMES if names is None else names
    return table.drop(columns="season").rename(columns=names)


def write_text_export(table, folder, *, separator=",", encoding="utf-8", line_end="\n", decimal=".",
                      final_line_break=True, names=None):
    """One text file per season in ``folder``, as another tool would write it; returns the paths.

    ``encoding`` may be ``"utf-8-sig"`` (a byte-order mark), ``"utf-16"``, ``"utf-16-le"`` (no mark)
    or ``"cp1252"``; ``decimal=","`` writes decimal commas (with ``;`` as separator, as European
    spreadsheets do).
    """
    from pathlib import Path

    folder = Path(folder)
    folder.mkdir(parents=True, exist_ok=True)
    paths = []
    for season, block in table.groupby("season", sort=True):
        text = export_frame(block, names).to_csv(index=False, sep=separator, lineterminator=line_end,
                                                 decimal=decimal)
        if not final_line_break:
            text = text.rstrip("\r\n")
        path = folder / f"{season}.csv"
        path.write_bytes(text.encode(encoding))
        paths.append(path)
    return paths
