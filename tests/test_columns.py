"""Column names: families, play types, drift's own columns, descriptors, config rules."""

from __future__ import annotations

import pytest

from drift.config import Config
from drift.errors import ConfigError
from drift.intake._columns import normalise, understand_columns


def _read(names, config=None):
    return {r.source: r for r in understand_columns(names, config or Config())}


@pytest.mark.parametrize("name, family, play", [
    ("ISO_FREQ", "share", "isolation"), ("iso_freq", "share", "isolation"), ("freq_iso", "share", "isolation"),
    ("IsoFreq", "share", "isolation"), ("PRBALLHANDLER_FREQ", "share", "pnr_handler"),
    ("PNR_BH_PPP", "efficiency", "pnr_handler"), ("spot_up_poss_pct", "share", "spot_up"),
    ("PRRollMan_PPP", "efficiency", "roll_man"), ("ppp_post_up", "efficiency", "post_up"),
    ("share_handoff", "share", "handoff"), ("Transition Frequency", "share", "transition"),
    ("OFFSCREEN_PPP", "efficiency", "off_screen"), ("CUT_POSS", "possessions", "cut"),
])
def test_play_type_columns_in_many_spellings(name, family, play):
    r = _read([name])[name]
    assert (r.family, r.play_type) == (family, play)
    if family == "share":
        assert r.name == f"share_{play}" and r.role == "feature"
    elif family == "efficiency":
        assert r.name == f"ppp_{play}"
    else:
        assert r.role == "sample"  # a play type's possession count is a sample, not a feature


@pytest.mark.parametrize("name, ours, family", [
    ("USG_PCT", "usage_pct", "rate"), ("OREB_PCT", "orb_pct", "rate"), ("TS_PCT", "ts_pct", "shooting"),
    ("FG3A_RATE", "three_pa_rate", "shooting"), ("FTA_RATE", "ft_rate", "shooting"),
    ("Hustle_Pct", "hustle_pct", "rate"), ("corner3_percent", "corner3_pct", "rate"),
])
def test_rates_get_drifts_names(name, ours, family):
    r = _read([name])[name]
    assert (r.role, r.name, r.family) == ("feature", ours, family)


@pytest.mark.parametrize("name", ["PLAYER_ID", "GP", "MIN", "TEAM_ABBREVIATION", "PLAYER_NAME", "Season"])
def test_drifts_own_columns_by_common_spelling(name):
    assert _read([name])[name].role == "standard"


@pytest.mark.parametrize("name, what", [
    ("TEAM_ID", "an id"), ("PERSON_ID", "an id"), ("AGE", "age"), ("HEIGHT", "height"),
    ("PLAYER_WEIGHT", "weight"), ("DRAFT_YEAR", "draft"), ("EXP", "experience"), ("SALARY", "salary"),
    ("JERSEY_NUM", "jersey"), ("POSITION", "position"), ("ISO_PERCENTILE", "rank"),
])
def test_columns_that_describe_the_player_are_left_out_with_a_note(name, what):
    r = _read([name])[name]
    assert r.role == "ignored" and what in r.note


def test_counts_are_ignored_and_unknown_numbers_flagged():
    got = _read(["PTS", "FGA", "hustle_index"])
    assert got["PTS"].role == "ignored" and "count" in got["PTS"].note
    assert got["hustle_index"].role == "unknown" and got["hustle_index"].how.startswith("default")


def test_config_rules_map_patterns_and_single_columns_and_rename():
    config = Config(read={"*_SCORE": "ignore", "DRV_F": "share:drive", "DRV_EFF": "efficiency:drive",
                          "HUSTLE": "shooting"},
                    rename={"usage_pct": "usg"}, play_types={"HO": "handoff"})
    got = _read(["ISO_SCORE", "DRV_F", "DRV_EFF", "HUSTLE", "USG_PCT", "HO_FREQ"], config)
    assert got["ISO_SCORE"].role == "ignored"
    assert (got["DRV_F"].name, got["DRV_F"].family) == ("share_drive", "share")
    assert (got["DRV_EFF"].name, got["DRV_EFF"].play_type) == ("ppp_drive", "drive")
    assert got["HUSTLE"].family == "shooting"
    assert got["USG_PCT"].name == "usg"
    assert got["HO_FREQ"].name == "share_handoff"


def test_config_rules_are_validated():
    with pytest.raises(ConfigError, match="share:isolation"):
        Config(read={"X": "share"})
    with pytest.raises(ConfigError, match="per_game"):
        Config(units={"minutes": "percent"})
    with pytest.raises(ConfigError, match="keeps its form"):
        Config(rename={"share_isolation": "iso"})


def test_normalise():
    assert normalise("PRBallHandler Freq") == "pr_ball_handler_freq"
    assert normalise(" ISO-PPP ") == "iso_ppp"


#: spellings clubs and vendors use for play types (common practice, no source), each checked in the
#: three measure forms: frequency (a share), points per possession (an efficiency), possessions (a sample)
PLAY_SPELLINGS = [
    ("roller", "roll_man"), ("pnr_roller", "roll_man"), ("PNR_Roller", "roll_man"), ("PRRoller", "roll_man"),
    ("pr_roller", "roll_man"), ("PnrRollMan", "roll_man"), ("pick_and_roll_roller", "roll_man"),
    ("screen_off", "off_screen"), ("Screen_Off", "off_screen"), ("offscreen", "off_screen"),
    ("off_screen", "off_screen"), ("OffBallScreen", "off_screen"), ("coming_off_screens", "off_screen"),
    ("hand_off", "handoff"), ("HandOff", "handoff"), ("hand_offs", "handoff"), ("DHO", "handoff"),
    ("dribble_handoff", "handoff"), ("pnr_handler", "pnr_handler"), ("PR_Handler", "pnr_handler"),
    ("pick_and_roll_handler", "pnr_handler"), ("isolations", "isolation"), ("post_play", "post_up"),
    ("fast_breaks", "transition"), ("put_backs", "putback"),
]


@pytest.mark.parametrize("spelling, play", PLAY_SPELLINGS)
@pytest.mark.parametrize("measure, family", [("freq", "share"), ("ppp", "efficiency"), ("poss", "possessions")])
def test_play_type_spellings_in_every_measure_form(spelling, play, measure, family):
    for name in (f"{spelling}_{measure}", f"{measure}_{spelling}", f"{spelling.upper()}_{measure.upper()}"):
        r = _read([name])[name]
        assert (r.family, r.play_type) == (family, play), name
        if family == "share":
            assert r.name == f"share_{play}"
        elif family == "efficiency":
            assert r.name == f"ppp_{play}"
        else:
            assert r.role == "sample"


def test_wider_spellings_leave_rates_alone():
    got = _read(["OREB_PCT", "off_reb_pct", "TOV_PCT", "USG_PCT", "roll_pct"])
    assert got["OREB_PCT"].name == "orb_pct" and got["off_reb_pct"].name == "orb_pct"
    assert got["TOV_PCT"].name == "tov_pct" and got["USG_PCT"].name == "usage_pct"
    assert got["roll_pct"].name == "share_roll_man"  # 'pct' is one of the share spellings
