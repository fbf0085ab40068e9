"""Run settings: three typed parts, one validator per field, and the TOML file.

``Config`` is built from parts: :class:`IntakePolicy` (columns, features, filters),
:class:`ModelSettings` (the reference model's settings, saved in the model file
as they are) and :class:`MoveSettings`; plus the reference seasons. The CLI, the
TOML loader and the model file all build the parts through the same validators,
so a value refused in one place is refused everywhere: wrong types, NaN and
infinities, and values out of range are errors, never clamped.

A config file has up to six tables; every key is optional::

    [columns]            # drift's name = the column name in your export
    player_id = "PLAYER_ID"
    minutes = "MP"

    [intake]
    total_marker = "TOT"         # team value of a combined row for a traded player
    features = ["share_spotup"]  # use exactly these features ...
    exclude = ["age"]            # ... or every numeric column but these
    sheet = "Players"            # the Excel sheet to read (default: the one with the columns)
    play_types = { DRV = "drive" }   # more play-type spellings

    [intake.read]                # column or pattern -> what it is
    "*_PERCENTILE" = "ignore"
    "HUSTLE" = "rate"
    "DRV_F" = "share:drive"

    [intake.units]               # drift name -> unit, when drift cannot tell
    minutes = "per_game"

    [intake.rename]              # drift's feature name -> yours
    usage_pct = "usg"

    [filters]
    min_games = 20
    min_minutes_per_game = 10.0
    min_stint_games = 10

    [model]
    reference = ["2021-22", "2022-23"]
    components = "variance"      # "variance" (90%), "parallel", "elbow", a count, or a fraction
    roles = "auto"               # or a number >= 2
    max_roles = 14
    noise_policy = "shrink"      # "shrink", "weight", "shrink+weight", "none", "shrink+restandardise"
    seed = 0

    [moves]
    alpha = 0.01
    compare = ["2021-22", "2024-25"]

    [roles.names]
    R3 = "Spot-up wing"
"""

from __future__ import annotations

import dataclasses
import tomllib
from dataclasses import dataclass, field
from pathlib import Path

from . import settings_rules as rules
from .errors import ConfigError

__all__ = ["Config", "IntakePolicy", "ModelSettings", "MoveSettings", "load_config",
           "STANDARD_COLUMNS", "NOISE_POLICIES", "COMPONENT_RULES"]

STANDARD_COLUMNS = rules.STANDARD_COLUMNS
REQUIRED_COLUMNS = ("player_id", "season", "team", "games", "minutes")
NOISE_POLICIES = rules.NOISE_POLICIES
COMPONENT_RULES = rules.COMPONENT_RULES


class _Part:
    """Validation and plain-dict conversion shared by the parts."""

    _rules: dict = {}

    def __post_init__(self):
        for f in dataclasses.fields(self):
            object.__setattr__(self, f.name, self._rules[f.name](f.name, getattr(self, f.name)))

    def to_dict(self) -> dict:
        return {f.name: _plain(getattr(self, f.name)) for f in dataclasses.fields(self)}

    @classmethod
    def from_dict(cls, body: dict):
        return cls(**body)


@dataclass(frozen=True)
class IntakePolicy(_Part):
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
    min_games: float = 20
    min_minutes_per_game: float = 10.0
    min_stint_games: float = 10

    _rules = {
        "columns": rules.columns, "total_marker": rules.optional_text,
        "features": rules.optional_names, "exclude": rules.names, "sheet": rules.optional_text,
        "read": rules.text_map, "units": rules.text_map, "rename": rules.text_map,
        "play_types": rules.text_map,
        "min_games": rules.non_negative, "min_minutes_per_game": rules.non_negative,
        "min_stint_games": rules.non_negative,
    }

    def __post_init__(self):
        super().__post_init__()
        _check_intake_rules(self)

    #: what the model file records about the intake (the filters, the marker and the rules)
    _MODEL_FILE_KEYS = ("min_games", "min_minutes_per_game", "total_marker")

    def to_model_file(self) -> dict:
        """The intake as the model file records it: the filters, the marker and the fixed rules."""
        from .constants import INTAKE_RULES_TEXT

        return {"min_games": self.min_games, "min_minutes_per_game": self.min_minutes_per_game,
                "total_marker": self.total_marker, **INTAKE_RULES_TEXT,
                "min_stint_games": self.min_stint_games}

    @classmethod
    def from_model_file(cls, body: dict, *, where="model"):
        """Rebuild from :meth:`to_model_file` output (the rule texts are descriptive only)."""
        from .constants import INTAKE_RULES_TEXT
        from .errors import DriftError, ModelFileError

        known = set(cls._MODEL_FILE_KEYS) | set(INTAKE_RULES_TEXT) | {"min_stint_games"}
        unknown = sorted(set(body) - known)
        if unknown:
            raise ModelFileError(f"{where}: unknown setting(s) {unknown}; known: {sorted(known)}")
        try:
            return cls(**{k: v for k, v in body.items() if k not in INTAKE_RULES_TEXT})
        except DriftError as exc:
            raise ModelFileError(f"{where}: {exc}") from None


@dataclass(frozen=True)
class ModelSettings(_Part):
    """The reference model's settings (see :class:`drift.model.RoleModel`)."""

    components: object = "variance"
    variance_threshold: float = 0.90
    roles: object = "auto"
    max_roles: int = 14
    noise_policy: str = "shrink"
    seed: int = 0
    n_init: int = rules.KMEANS_RESTARTS
    n_bootstrap: int = 20
    role_names: dict = field(default_factory=dict)

    _rules = {
        "components": rules.components, "variance_threshold": rules.fraction_closed,
        "roles": rules.roles, "max_roles": rules.count_from(2), "noise_policy": rules.noise_policy,
        "seed": rules.seed, "n_init": rules.count_from(1),
        "n_bootstrap": rules.count_from(1), "role_names": rules.text_map,
    }


@dataclass(frozen=True)
class MoveSettings(_Part):
    """How moves are judged: the level for "beyond noise" and an extra season pair."""

    alpha: float = 0.01
    compare: tuple | None = None

    _rules = {"alpha": rules.fraction_open, "compare": rules.compare}


_PARTS = {"intake": IntakePolicy, "model": ModelSettings, "moves": MoveSettings}
_OWNER = {f.name: part for part, kind in _PARTS.items() for f in dataclasses.fields(kind)}


@dataclass(frozen=True, init=False)
class Config:
    """Every setting of a run: ``intake``, ``model`` and ``moves`` parts and the ``reference`` seasons.

    Build it from parts, ``Config(intake=IntakePolicy(...))``, or flat,
    ``Config(min_games=15, roles=6, compare=("2021-22", "2023-24"))``: each flat
    name goes to the part that owns it. Every part's field is also readable
    flat (``config.min_games``).
    """

    intake: IntakePolicy
    model: ModelSettings
    moves: MoveSettings
    reference: tuple | None

    def __init__(self, *, intake=None, model=None, moves=None, reference=None, **flat):
        unknown = sorted(set(flat) - set(_OWNER))
        if unknown:
            raise ConfigError(f"unknown setting(s) {unknown}; allowed: {', '.join(sorted(_OWNER))}")
        given = {"intake": intake, "model": model, "moves": moves}
        for name, kind in _PARTS.items():
            part = given[name] if given[name] is not None else kind()
            if not isinstance(part, kind):
                raise ConfigError(f"{name} must be a {kind.__name__}, got {type(part).__name__}")
            changes = {k: v for k, v in flat.items() if _OWNER[k] == name}
            object.__setattr__(self, name, dataclasses.replace(part, **changes) if changes else part)
        object.__setattr__(self, "reference", rules.optional_names("reference", reference))

    def __getattr__(self, name):
        part = _OWNER.get(name)
        if part is None:
            raise AttributeError(f"'Config' has no setting {name!r}")
        return getattr(object.__getattribute__(self, part), name)

    def replace(self, **changes) -> "Config":
        """A copy with the given settings changed; ``None`` means "not given" and changes nothing."""
        changes = {k: v for k, v in changes.items() if v is not None}
        parts = {name: getattr(self, name) for name in _PARTS}
        reference = changes.pop("reference", self.reference)
        for key in ("intake", "model", "moves"):
            if key in changes:
                parts[key] = changes.pop(key)
        return Config(**parts, reference=reference, **changes)


def _check_intake_rules(policy):
    """Validate the column-reading rules of [intake] (see drift.columns, drift.units)."""
    from .columns import parse_read_rule, understand_columns
    from .units import UNIT_WORDS

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
        before = understand_columns([old], Config())[0]
        after = understand_columns([new], Config())[0]
        if {before.family, after.family} & {"share", "efficiency"} and (before.family, before.play_type) != (
                after.family, after.play_type):
            raise ConfigError(f"[intake.rename] {old} = {new!r}: a play-type feature keeps its form "
                              f"(share_<type> or ppp_<type>) so its sample stays linked; rename the play type "
                              "under [intake] play_types instead")
    if policy.sheet is not None and not str(policy.sheet).strip():
        raise ConfigError("[intake] sheet must name a sheet")


_SECTIONS = {
    "columns": None,
    "intake": {"total_marker", "features", "exclude", "sheet", "read", "units", "rename", "play_types"},
    "filters": {"min_games", "min_minutes_per_game", "min_stint_games"},
    "model": {"reference", "components", "variance_threshold", "roles", "max_roles",
              "noise_policy", "seed"},
    "moves": {"alpha", "compare"},
    "roles": {"names"},
}


def load_config(path=None) -> Config:
    """Read a TOML config file; ``None`` gives the defaults.

    Raises
    ------
    ConfigError
        The file is missing, is not TOML, or has an unknown table, key or value.
    """
    if path is None:
        return Config()
    path = Path(path)
    try:
        raw = tomllib.loads(path.read_text(encoding="utf-8"))
    except FileNotFoundError:
        raise ConfigError(f"{path}: config file not found") from None
    except IsADirectoryError:
        raise ConfigError(f"{path}: is a folder; give the config file") from None
    except (tomllib.TOMLDecodeError, UnicodeDecodeError) as exc:
        raise ConfigError(f"{path}: not valid TOML ({exc}); see README 'Config file'") from None
    values = {}
    for section, body in raw.items():
        if section not in _SECTIONS:
            raise ConfigError(
                f"{path}: unknown table [{section}]; allowed: {', '.join(_SECTIONS)}")
        if not isinstance(body, dict):
            raise ConfigError(f"{path}: '{section}' must be a table like [{section}]")
        if section == "columns":
            values["columns"] = body
            continue
        allowed = _SECTIONS[section]
        for key, value in body.items():
            if key not in allowed:
                raise ConfigError(
                    f"{path}: unknown key '{key}' in [{section}]; allowed: {', '.join(sorted(allowed))}")
            if key in ("read", "units", "rename", "play_types") and not isinstance(value, dict):
                raise ConfigError(f"{path}: [{section}] {key} must be a table like [intake.{key}]")
            values["role_names" if section == "roles" else key] = value
    try:
        return Config(**values)
    except ConfigError as exc:
        raise ConfigError(f"{path}: {exc}") from None


def _plain(value):
    if isinstance(value, dict):
        return dict(value)
    if isinstance(value, tuple):
        return list(value)
    return value
