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

    [intake.csv]                 # text files, when drift's detection is wrong
    separator = ";"              # ",", ";", "tab" or "|"
    encoding = "windows-1252"    # any encoding Python knows

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
from dataclasses import dataclass
from pathlib import Path

from drift import settings_rules as rules
from drift.errors import ConfigError
from drift.intake.policy import REQUIRED_COLUMNS, STANDARD_COLUMNS, IntakePolicy
from drift.measure.settings import MoveSettings
from drift.model.settings import COMPONENT_RULES, NOISE_POLICIES, ModelSettings

__all__ = ["Config", "IntakePolicy", "ModelSettings", "MoveSettings", "load_config",
           "STANDARD_COLUMNS", "REQUIRED_COLUMNS", "NOISE_POLICIES", "COMPONENT_RULES"]



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


_SECTIONS = {
    "columns": None,
    "intake": {"total_marker", "features", "exclude", "sheet", "read", "units", "rename", "play_types", "csv"},
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
        # utf-8-sig: a config saved by an editor that writes a byte-order mark reads like any other
        raw = tomllib.loads(path.read_text(encoding="utf-8-sig"))
    except FileNotFoundError:
        raise ConfigError(f"{path}: config file not found") from None
    except IsADirectoryError:
        raise ConfigError(f"{path}: is a folder; give the config file") from None
    except (tomllib.TOMLDecodeError, UnicodeDecodeError) as exc:
        raise ConfigError(f"{path}: not valid TOML ({exc}); see docs/input.md, 'Config file'") from None
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
            if key in ("read", "units", "rename", "play_types", "csv") and not isinstance(value, dict):
                raise ConfigError(f"{path}: [{section}] {key} must be a table like [intake.{key}]")
            values["role_names" if section == "roles" else key] = value
    try:
        return Config(**values)
    except ConfigError as exc:
        raise ConfigError(f"{path}: {exc}") from None
