"""Column understanding: what each column of an export is, read from its name.

Names are compared after *normalising*: camelCase split, lower case, every run of
characters other than letters and digits turned into one ``_`` (``ISO_FREQ``,
``iso-freq``, ``IsoFreq`` all become ``iso_freq``). The rules, in order (the first
that applies wins; :func:`understand_columns`):

1. ``[columns]`` in the config: a column mapped to one of drift's own names.
2. ``[intake.read]`` in the config: a column name or a pattern (``*`` and ``?``
   wildcards, case-insensitive) mapped to ``"share:<play>"``, ``"efficiency:<play>"``,
   ``"possessions:<play>"``, ``"rate"``, ``"shooting"`` or ``"ignore"``.
3. ``[intake] features`` / ``exclude`` (by the export's name or drift's name).
4. drift's own names and their common spellings (:data:`STANDARD_NAMES`).
5. Columns that describe the player, not his play (:data:`DESCRIPTOR_WORDS`): ignored.
6. Play-type columns: a play type (:data:`PLAY_TYPES`, or ``[intake] play_types``)
   joined to a measure (:data:`MEASURES`) before or after it: ``iso_freq``,
   ``freq_iso``, ``ISO_PPP``, ``spot_up_poss_pct``, ``PRBallHandler_Freq``.
7. Known rates and shooting columns (:data:`RATE_NAMES`), then any name ending or
   starting with ``pct``/``percent``/``rate``/``freq``: a rate.
8. Box-score counts (:data:`COUNT_WORDS`): ignored (drift compares rates).
9. Anything else that holds numbers: a rate, with a warning that no rule named it.

Features get drift's names (``share_<play>``, ``ppp_<play>``, known rates by
their drift name, other rates by their normalised name) unless ``[intake.rename]``
renames them, so an efficiency is always linked to its play type's share.
"""

from __future__ import annotations

import fnmatch
import re
from dataclasses import dataclass

__all__ = ["PLAY_TYPES", "MEASURES", "STANDARD_NAMES", "RATE_NAMES", "DESCRIPTOR_WORDS", "COUNT_WORDS",
           "ColumnReading", "normalise", "understand_columns", "parse_read_rule", "SPEC_KINDS"]

#: play type -> its spellings (normalised, and with the underscores removed)
PLAY_TYPES = {
    "isolation": ("iso", "isolation", "isos", "isolations"),
    "pnr_handler": ("pnr_handler", "prballhandler", "pr_ball_handler", "pnr_bh", "pr_bh", "prbh", "pnrbh",
                    "ball_handler", "pick_and_roll_ball_handler", "pnr_ball_handler", "p_r_ball_handler",
                    "pr_handler", "pnr_ball", "pick_and_roll_handler", "pick_roll_handler", "pnr_ballhandler",
                    "handler"),
    "roll_man": ("roll_man", "prrollman", "pr_roll_man", "pnr_roll", "pnr_rm", "pr_rm", "pnr_roll_man",
                 "rollman", "roller", "pick_and_roll_roll_man", "pnr_roller", "pr_roller", "p_r_roller",
                 "pnr_rollman", "pick_and_roll_roller", "pick_roll_roller", "roll", "rolls"),
    "post_up": ("post_up", "postup", "post", "post_ups", "post_play", "post_plays"),
    "spot_up": ("spot_up", "spotup", "spot", "spot_ups", "catch_and_shoot_spot_up"),
    "transition": ("transition", "trans", "fast_break", "transitions", "fast_breaks"),
    "cut": ("cut", "cuts", "cutter", "cutting"),
    "off_screen": ("off_screen", "offscreen", "off_screens", "screen_off", "screens_off", "off_ball_screen",
                   "off_ball_screens", "coming_off_screen", "coming_off_screens"),
    "handoff": ("handoff", "hand_off", "dho", "handoffs", "hand_offs", "dribble_handoff", "dribble_hand_off",
                "dhos"),
    "putback": ("putback", "putbacks", "put_back", "put_backs", "offrebound", "off_rebound", "oreb_putback"),
    "misc": ("misc", "miscellaneous", "other"),
}
#: measure -> its spellings, as a suffix (``iso_freq``) or a prefix (``freq_iso``)
MEASURES = {
    "share": ("freq", "frequency", "share", "poss_pct", "pct_poss", "freq_pct", "poss_share", "usage_share",
              "frequency_pct", "poss_percent", "pct"),
    "efficiency": ("ppp", "pts_per_poss", "points_per_poss", "points_per_possession", "ppposs", "p_p_p"),
    "possessions": ("poss", "possessions", "n_poss", "poss_count"),
}
#: drift's own columns -> spellings recognised without a [columns] entry
STANDARD_NAMES = {
    "player_id": ("player_id", "playerid"),
    "player": ("player", "player_name", "name", "playername"),
    "season": ("season",),
    "team": ("team", "team_abbreviation", "team_abbr", "tm", "team_code"),
    "games": ("games", "gp", "g", "games_played"),
    "minutes": ("minutes", "min", "mp", "mins", "minutes_played"),
    "possessions": ("possessions", "poss", "finishing_possessions"),
    "stint": ("stint",),
}
#: drift's rate and shooting names -> their spellings
RATE_NAMES = {
    "usage_pct": ("usage_pct", "usg_pct", "usg", "usage", "usg_percent", "usage_rate", "usg_rate"),
    "ast_pct": ("ast_pct", "assist_pct", "ast_percent", "ast_rate"),
    "orb_pct": ("orb_pct", "oreb_pct", "off_reb_pct", "orb_percent"),
    "drb_pct": ("drb_pct", "dreb_pct", "def_reb_pct", "drb_percent"),
    "trb_pct": ("trb_pct", "reb_pct", "treb_pct"),
    "tov_pct": ("tov_pct", "to_pct", "tov_percent", "tov_rate", "turnover_pct"),
    "stl_pct": ("stl_pct", "steal_pct", "stl_percent"),
    "blk_pct": ("blk_pct", "block_pct", "blk_percent"),
    "ts_pct": ("ts_pct", "true_shooting", "ts_percent", "true_shooting_pct"),
    "efg_pct": ("efg_pct", "efg_percent"),
    "three_pa_rate": ("three_pa_rate", "fg3a_rate", "3pa_rate", "3par", "three_rate", "three_point_rate",
                      "fg3a_freq", "3pa_freq", "three_pa_freq"),
    "ft_rate": ("ft_rate", "fta_rate", "ftr", "free_throw_rate"),
}
_SHOOTING = {"ts_pct", "efg_pct", "three_pa_rate", "ft_rate"}
#: words that make a column describe the player rather than his play
DESCRIPTOR_WORDS = {
    "id": "an id", "key": "an id", "code": "a code", "age": "age", "height": "height", "ht": "height",
    "weight": "weight", "wt": "weight", "draft": "draft information", "exp": "experience",
    "experience": "experience", "yrs": "experience", "years": "experience", "salary": "salary",
    "contract": "contract", "jersey": "jersey number", "number": "jersey number", "num": "jersey number",
    "no": "jersey number", "position": "position", "pos": "position", "birth": "birth date",
    "birthdate": "birth date", "dob": "birth date", "born": "birth date", "country": "country",
    "nationality": "country", "college": "school", "school": "school", "wingspan": "wingspan",
    "reach": "reach", "rank": "a rank", "percentile": "a percentile rank", "nickname": "a name",
    "city": "a name", "hand": "handedness", "handedness": "handedness",
}
#: box-score counts and records: not rates, so not features unless mapped
COUNT_WORDS = {"pts", "points", "reb", "rebounds", "ast", "assists", "fgm", "fga", "fg3m", "fg3a", "ftm", "fta",
               "oreb", "dreb", "tov", "stl", "blk", "pf", "w", "l", "wins", "losses", "plus_minus",
               "pm", "fgmx", "score", "gs", "games_started", "dd2", "td3", "fouls"}
_RATE_WORDS = ("pct", "percent", "rate", "freq", "frequency", "pctg")
SPEC_KINDS = ("share", "efficiency", "possessions", "rate", "shooting", "ignore")


@dataclass(frozen=True)
class ColumnReading:
    """How one column of an export was understood.

    ``role``: ``standard`` (one of drift's own columns), ``feature``, ``sample``
    (a play type's possession count), or ``ignored``. ``name`` is drift's name for
    it (empty when ignored); ``family`` one of share, efficiency, rate, shooting
    for a feature; ``how`` the rule that decided; ``note`` why it is ignored or
    what to check.
    """

    source: str
    role: str
    name: str = ""
    family: str = ""
    play_type: str = ""
    how: str = ""
    note: str = ""


def normalise(name) -> str:
    """``'PRBallHandler Freq'`` -> ``'pr_ball_handler_freq'``."""
    text = re.sub(r"(?<=[a-zA-Z0-9])(?=[A-Z][a-z])", "_", str(name).strip())
    text = re.sub(r"(?<=[a-z])(?=[A-Z])", "_", text)
    return re.sub(r"[^a-z0-9]+", "_", text.lower()).strip("_")


def _play_lookup(extra) -> dict:
    table = {}
    for play, spellings in PLAY_TYPES.items():
        for s in spellings + (play,):
            table[s] = play
            table[s.replace("_", "")] = play
    for spelling, play in (extra or {}).items():
        key = normalise(spelling)
        table[key] = table[key.replace("_", "")] = normalise(play)
    return table


def _split_play(norm: str, plays: dict):
    """(measure, play, measure spelling) when the name is a play type joined to a measure."""
    options = sorted(((m, s) for m, ss in MEASURES.items() for s in ss), key=lambda ms: -len(ms[1]))
    for measure, spelling in options:
        for part in (norm[: -len(spelling) - 1] if norm.endswith("_" + spelling) else None,
                     norm[len(spelling) + 1:] if norm.startswith(spelling + "_") else None):
            if part and (part in plays or part.replace("_", "") in plays):
                return measure, plays.get(part, plays.get(part.replace("_", ""))), spelling
    return None


def parse_read_rule(spec: str):
    """``"share:isolation"`` -> ("share", "isolation"); ``"rate"`` -> ("rate", ""). ValueError if malformed."""
    kind, _, play = str(spec).partition(":")
    kind, play = kind.strip().lower(), normalise(play)
    if kind not in SPEC_KINDS:
        raise ValueError(f"{spec!r}: give one of {', '.join(SPEC_KINDS)} (share, efficiency and possessions "
                         "take a play type: 'share:isolation')")
    if kind in ("share", "efficiency", "possessions") and not play:
        raise ValueError(f"{spec!r}: {kind} needs its play type, like '{kind}:isolation'")
    if kind not in ("share", "efficiency", "possessions") and play:
        raise ValueError(f"{spec!r}: only share, efficiency and possessions take a play type")
    return kind, play


def _feature(source, kind, play, how, name=None) -> ColumnReading:
    if kind == "possessions":
        return ColumnReading(source, "sample", f"poss_{play}", "possessions", play, how,
                             "possessions of one play type: a sample size, not a feature")
    if kind in ("share", "efficiency"):
        name = f"{'share' if kind == 'share' else 'ppp'}_{play}"
    return ColumnReading(source, "feature", name or normalise(source), kind, play, how)


def _by_rule(column, norm, rules):
    for pattern, spec in rules.items():
        wild = any(ch in pattern for ch in "*?[")
        if column == pattern or (not wild and norm == normalise(pattern)) or (
                wild and fnmatch.fnmatch(column.lower(), pattern.lower())):
            kind, play = parse_read_rule(spec)
            how = f"config [intake.read] {pattern!r}"
            if kind == "ignore":
                return ColumnReading(column, "ignored", how=how, note="ignored by the config")
            return _feature(column, kind, play, how, name=None)
    return None


def _by_name(column, norm, plays):
    tokens = norm.split("_")
    for ours, spellings in STANDARD_NAMES.items():
        if norm in spellings:
            return ColumnReading(column, "standard", ours, how=f"name ({norm!r} is drift's {ours})")
    found = _split_play(norm, plays)
    if found:
        measure, play, spelling = found
        form = f"<type>_{spelling}" if norm.endswith(spelling) else f"{spelling}_<type>"
        return _feature(column, measure, play, f"name pattern {form!r}")
    describes = [DESCRIPTOR_WORDS[t] for t in tokens if t in DESCRIPTOR_WORDS]
    if describes or norm.endswith("id"):
        what = describes[0] if describes else "an id"
        return ColumnReading(column, "ignored", how=f"name ({what})",
                             note=f"describes the player ({what}), not his play")
    for ours, spellings in RATE_NAMES.items():
        if norm in spellings:
            return ColumnReading(column, "feature", ours, "shooting" if ours in _SHOOTING else "rate",
                                 how=f"name ({norm!r} is {ours})")
    if tokens[0] in plays and len(tokens) > 1:
        return ColumnReading(column, "ignored", how="name (play-type statistic)",
                             note=f"a {plays[tokens[0]]} statistic drift does not use; map it under "
                                  "[intake.read] to use it")
    if tokens[-1] in _RATE_WORDS or tokens[0] in _RATE_WORDS:
        family = "shooting" if ("fg" in norm or tokens[-1] == "rate") else "rate"
        name = re.sub(r"_(percent|pctg)$", "_pct", norm)
        note = ("could be a play type's frequency: if so add the play type under [intake] play_types"
                if tokens[-1] in ("freq", "frequency") else "")
        return ColumnReading(column, "feature", name, family, how=f"name pattern ('{tokens[-1]}' word)",
                             note=note)
    if norm in COUNT_WORDS or (tokens[-1] in COUNT_WORDS and len(tokens) <= 2):
        return ColumnReading(column, "ignored", how="name (box-score count)",
                             note="a count, not a rate: drift compares rates; map it under [intake.read] "
                                  "to use it")
    return None


def _apply_lists(reading, exclude, chosen):
    """``[intake] exclude`` drops features; ``[intake] features`` keeps exactly the listed ones."""
    column, names = reading.source, {reading.source, reading.name}
    if reading.role in ("feature", "unknown"):
        if names & exclude:
            return ColumnReading(column, "ignored", how="config [intake] exclude", note="excluded by the config")
        if chosen is not None and not names & chosen:
            return ColumnReading(column, "ignored", how="config [intake] features",
                                 note="not in the config's feature list")
    elif reading.role == "ignored" and chosen is not None and names & chosen:
        return ColumnReading(column, "feature", column if column in chosen else normalise(column), "rate",
                             how="config [intake] features")
    return reading


def understand_columns(columns, config) -> list:
    """Read every column name; returns one :class:`ColumnReading` per column, in order.

    Columns no rule names come back with role ``"unknown"``: the caller decides from
    their values (numbers: a rate by default, with a warning; text: ignored).
    """
    mapped = {theirs: ours for ours, theirs in config.columns.items()}
    rules = dict(getattr(config, "read", {}) or {})
    plays = _play_lookup(getattr(config, "play_types", {}) or {})
    exclude = set(config.exclude)
    chosen = set(config.features) if config.features is not None else None
    out = []
    for column in columns:
        column = str(column)
        norm = normalise(column)
        if column in mapped:
            out.append(ColumnReading(column, "standard", mapped[column], how="config [columns]"))
            continue
        reading = _by_rule(column, norm, rules)
        if reading is None:
            reading = _by_name(column, norm, plays)
            if reading is not None and reading.role == "standard" and reading.name in mapped.values():
                reading = ColumnReading(column, "ignored", how="name",
                                        note=f"another column is mapped to {reading.name} in [columns]")
        if reading is None:
            reading = ColumnReading(column, "unknown", normalise(column) or column, "rate",
                                    how="default (numeric column, no name rule)")
        out.append(_apply_lists(reading, exclude, chosen))
    renames = dict(getattr(config, "rename", {}) or {})
    return [ColumnReading(r.source, r.role, renames[r.name], r.family, r.play_type, r.how + "; renamed", r.note)
            if r.role in ("feature", "unknown") and r.name in renames else r for r in out]
