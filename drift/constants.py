"""Facts drift states in one place: thresholds, restart counts, the role-id format, rule texts.

Each is used by several stages; changing one here changes it everywhere (and a
change to a text saved in the model file or written to an output changes those
bytes too).
"""

from __future__ import annotations

__all__ = ["DISTRIBUTION", "STABLE_JACCARD", "KMEANS_RESTARTS", "STANDARD_COLUMNS", "NOISE_POLICIES",
           "COMPONENT_RULES", "role_id", "role_number", "INTAKE_RULES_TEXT", "MISSING_ACTIONS",
           "FILTER_REASONS", "reason_text"]

#: drift's name on the package index (pyproject.toml's project name): "drift" there is an
#: unrelated project; the command and the import package are still ``drift``
DISTRIBUTION = "role-drift"

#: a role reproduces on resamples when its mean bootstrap Jaccard overlap reaches this
#: (common practice, no source: Hennig's 0.6 "pattern, not noise" reading of stability)
STABLE_JACCARD = 0.6

#: K-means restarts for every final fit (the model's roles, each season's role drift)
KMEANS_RESTARTS = 10

#: drift's own column names: identity and sample-size columns, never features.
STANDARD_COLUMNS = (
    "player_id", "player", "season", "team", "games", "minutes", "possessions", "stint",
)
#: formats a run's tables can be written in (``drift run --format``)
TABLE_FORMATS = ("csv", "parquet")
NOISE_POLICIES = ("shrink", "weight", "shrink+weight", "none", "shrink+restandardise")
COMPONENT_RULES = ("parallel", "elbow", "variance")


def role_id(index: int) -> str:
    """The id of the role at 0-based position ``index`` in a fresh fit: R1, R2, ..."""
    return f"R{index + 1}"


def role_number(rid: str):
    """The number of a role id made by :func:`role_id` (None for a user's own id)."""
    return int(rid[1:]) if rid[:1] == "R" and rid[1:].isdigit() else None


#: the fixed intake rules as the model file records them
INTAKE_RULES_TEXT = {
    "shares_missing": "not used: 0",
    "efficiency_missing": "no sample: pool mean",
    "other_missing": "pool mean",
    "stint_rule": "games, minutes, possessions summed; features averaged with sample weights",
}

#: what is done to a missing value of each feature family (the missing-value table)
MISSING_ACTIONS = {
    "share": "play type not used: share set to 0",
    "efficiency": "no possessions of this play type: pool mean (no sample to shrink)",
    "rate": "missing: pool mean",
    "shooting": "missing: pool mean",
}

#: filter reason code -> short wording for summaries (excluded.csv's ``reason`` keeps the numbers);
#: a row failing several filters has the codes joined by "+"
FILTER_REASONS = {
    "few_games": "too few games",
    "few_minutes": "too few minutes per game",
    "no_earlier_season": "no earlier qualifying season in the --against data",
}


def reason_text(code: str) -> str:
    """Short wording of a (possibly "+"-joined) filter reason code, e.g. for the report's summary."""
    return " and ".join(FILTER_REASONS.get(c, c) for c in str(code).split("+"))
