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
