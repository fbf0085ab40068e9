"""How season files are read and which rows qualify: :class:`IntakePolicy`, one validator per field."""

from __future__ import annotations

from dataclasses import dataclass, field

from drift import settings_rules as rules
from drift.errors import ConfigError
from drift.settings_rules import SettingsPart

__all__ = ["IntakePolicy", "REQUIRED_COLUMNS", "STANDARD_COLUMNS", "intake_policy"]

STANDARD_COLUMNS = rules.STANDARD_COLUMNS
REQUIRED_COLUMNS = ("player_id", "season", "team", "games", "minutes")


@dataclass(frozen=True)
class IntakePolicy(SettingsPart):
    """How season files are read and which rows qualify."""

    columns: dict = field(default_factory=dict)
    total_marker: str | None = "TOT"
    features: tuple | None = None
    exclude: tuple = ()
    sheet: str | None = None
    read: dict = field(default_factory=dict)
    units: dict = field(default_factory=dict)
    rename: dict = field(default_factory=dict)
    play_types: dict = field(default_factory=dict)
    csv: dict = field(default_factory=dict)
    min_games: int = 20
    min_minutes_per_game: float = 10.0
    min_stint_games: int = 10

    _rules = {
        "columns": rules.columns, "total_marker": rules.optional_text,
        "features": rules.optional_names, "exclude": rules.names, "sheet": rules.optional_text,
        "read": rules.text_map, "units": rules.text_map, "rename": rules.text_map,
        "play_types": rules.text_map, "csv": rules.csv_format,
        "min_games": rules.count_from(0), "min_minutes_per_game": rules.non_negative,
        "min_stint_games": rules.count_from(0),
    }

    def __post_init__(self):
        super().__post_init__()
        _check_intake_rules(self)

    #: what the model file records about the intake (the filters, the marker and the rules)
    _MODEL_FILE_KEYS = ("min_games", "min_minutes_per_game", "total_marker")

    def to_model_file(self) -> dict:
        """The intake as the model file records it: the filters, the marker and the fixed rules."""
        from drift.constants import INTAKE_RULES_TEXT

        return {"min_games": self.min_games, "min_minutes_per_game": self.min_minutes_per_game,
                "total_marker": self.total_marker, **INTAKE_RULES_TEXT,
                "min_stint_games": self.min_stint_games}

    @classmethod
    def from_model_file(cls, body: dict, *, where="model"):
        """Rebuild from :meth:`to_model_file` output (the rule texts are descriptive only)."""
        from drift.constants import INTAKE_RULES_TEXT
        from drift.errors import DriftError, ModelFileError

        known = set(cls._MODEL_FILE_KEYS) | set(INTAKE_RULES_TEXT) | {"min_stint_games"}
        unknown = sorted(set(body) - known)
        if unknown:
            raise ModelFileError(f"{where}: unknown setting(s) {unknown}; known: {sorted(known)}")
        try:
            return cls(**{k: v for k, v in body.items() if k not in INTAKE_RULES_TEXT})
        except DriftError as exc:
            raise ModelFileError(f"{where}: {exc}") from None



def _check_intake_rules(policy):
    """Validate the column-reading rules of [intake] (see drift.intake._columns, drift.intake._units)."""
    from drift.intake._columns import parse_read_rule, understand_columns
    from drift.intake._units import UNIT_WORDS

    for pattern, spec in policy.read.items():
        try:
            parse_read_rule(spec)
        except ValueError as exc:
            raise ConfigError(f"[intake.read] {pattern!r}: {exc}") from None
    for name, unit in policy.units.items():
        allowed = ("total", "per_game") if name in ("minutes", "possessions") else ("percent", "fraction")
        if unit not in allowed or unit not in UNIT_WORDS:
            raise ConfigError(f"[intake.units] {name} = {unit!r}: give one of {', '.join(allowed)}")
    for old, new in policy.rename.items():
        if not str(new).strip():
            raise ConfigError(f"[intake.rename] {old} = {new!r}: give a name")
        before = understand_columns([old], IntakePolicy())[0]
        after = understand_columns([new], IntakePolicy())[0]
        if {before.family, after.family} & {"share", "efficiency"} and (before.family, before.play_type) != (
                after.family, after.play_type):
            raise ConfigError(f"[intake.rename] {old} = {new!r}: a play-type feature keeps its form "
                              f"(share_<type> or ppp_<type>) so its sample stays linked; rename the play type "
                              "under [intake] play_types instead")
    if policy.sheet is not None and not str(policy.sheet).strip():
        raise ConfigError("[intake] sheet must name a sheet")


def intake_policy(settings=None) -> IntakePolicy:
    """The intake part of ``settings``: a :class:`drift.config.Config`, an :class:`IntakePolicy` or ``None``."""
    if settings is None:
        return IntakePolicy()
    if isinstance(settings, IntakePolicy):
        return settings
    part = getattr(settings, "intake", None)
    if isinstance(part, IntakePolicy):
        return part
    raise TypeError(f"expected a Config or an IntakePolicy, got {type(settings).__name__}")
