"""Run settings: defaults, the TOML config file, and command-line overrides.

A config file has up to five tables; every key is optional::

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
    components = "parallel"      # "parallel", "elbow", "variance", a count, or a fraction
    roles = "auto"               # or a number
    noise_policy = "shrink"      # "shrink", "weight", "shrink+weight", "none"
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

from .errors import ConfigError

__all__ = ["Config", "load_config", "STANDARD_COLUMNS", "NOISE_POLICIES", "COMPONENT_RULES"]

#: drift's own column names: identity and sample-size columns, never features.
STANDARD_COLUMNS = (
    "player_id", "player", "season", "team", "games", "minutes", "possessions", "stint",
)
REQUIRED_COLUMNS = ("player_id", "season", "team", "games", "minutes")
NOISE_POLICIES = ("shrink", "weight", "shrink+weight", "none")
COMPONENT_RULES = ("parallel", "elbow", "variance")


@dataclass(frozen=True)
class Config:
    """Every setting of a run. Build with :func:`load_config` or directly.

    ``components`` is a rule name, an ``int`` count or a ``float`` fraction of
    variance in (0, 1); ``roles`` is ``"auto"`` or an ``int``.
    """

    columns: dict = field(default_factory=dict)
    total_marker: str | None = "TOT"
    features: tuple | None = None
    exclude: tuple = ()
    sheet: str | None = None
    read: dict = field(default_factory=dict)
    units: dict = field(default_factory=dict)
    rename: dict = field(default_factory=dict)
    play_types: dict = field(default_factory=dict)
    min_games: int = 20
    min_minutes_per_game: float = 10.0
    min_stint_games: int = 10
    reference: tuple | None = None
    components: object = "parallel"
    variance_threshold: float = 0.80
    roles: object = "auto"
    max_roles: int = 10
    noise_policy: str = "shrink"
    seed: int = 0
    alpha: float = 0.01
    compare: tuple | None = None
    role_names: dict = field(default_factory=dict)

    def __post_init__(self):
        if self.min_games < 0:
            raise ConfigError(f"min_games={self.min_games} must be >= 0")
        if self.min_minutes_per_game < 0:
            raise ConfigError(
                f"min_minutes_per_game={self.min_minutes_per_game} must be >= 0")
        if self.noise_policy not in NOISE_POLICIES:
            raise ConfigError(
                f"noise_policy={self.noise_policy!r} is not one of {', '.join(NOISE_POLICIES)}")
        c = self.components
        if isinstance(c, bool) or not (
            c in COMPONENT_RULES
            or (isinstance(c, int) and c >= 1)
            or (isinstance(c, float) and 0 < c < 1)
        ):
            raise ConfigError(
                f"components={c!r} must be one of {', '.join(COMPONENT_RULES)}, "
                "a count >= 1 or a fraction between 0 and 1")
        r = self.roles
        if not (r == "auto" or (isinstance(r, int) and not isinstance(r, bool) and r >= 1)):
            raise ConfigError(f"roles={r!r} must be 'auto' or a whole number >= 1")
        if not 0 < self.alpha < 1:
            raise ConfigError(f"alpha={self.alpha} must be between 0 and 1")
        if self.compare is not None and len(self.compare) != 2:
            raise ConfigError(f"compare needs exactly two seasons, got {list(self.compare)}")
        _check_intake_rules(self)
        unknown = set(self.columns) - set(STANDARD_COLUMNS)
        if unknown:
            raise ConfigError(
                f"[columns] has unknown drift names {sorted(unknown)}; "
                f"allowed: {', '.join(STANDARD_COLUMNS)}")

    def replace(self, **changes) -> "Config":
        """A copy with the given settings changed; ``None`` values are ignored."""
        return dataclasses.replace(self, **{k: v for k, v in changes.items() if v is not None})


def _check_intake_rules(config):
    """Validate the column-reading rules of [intake] (see drift.columns, drift.units)."""
    from .columns import parse_read_rule, understand_columns
    from .units import UNIT_WORDS

    for pattern, spec in config.read.items():
        try:
            parse_read_rule(spec)
        except ValueError as exc:
            raise ConfigError(f"[intake.read] {pattern!r}: {exc}") from None
    for name, unit in config.units.items():
        allowed = ("total", "per_game") if name in ("minutes", "possessions") else ("percent", "fraction")
        if unit not in allowed or unit not in UNIT_WORDS:
            raise ConfigError(f"[intake.units] {name} = {unit!r}: give one of {', '.join(allowed)}")
    for old, new in config.rename.items():
        if not str(new).strip():
            raise ConfigError(f"[intake.rename] {old} = {new!r}: give a name")
        before = understand_columns([old], Config())[0]
        after = understand_columns([new], Config())[0]
        if {before.family, after.family} & {"share", "efficiency"} and (before.family, before.play_type) != (
                after.family, after.play_type):
            raise ConfigError(f"[intake.rename] {old} = {new!r}: a play-type feature keeps its form "
                              f"(share_<type> or ppp_<type>) so its sample stays linked; rename the play type "
                              "under [intake] play_types instead")
    if config.sheet is not None and not str(config.sheet).strip():
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
            values["columns"] = {str(k): str(v) for k, v in body.items()}
            continue
        allowed = _SECTIONS[section]
        for key, value in body.items():
            if key not in allowed:
                raise ConfigError(
                    f"{path}: unknown key '{key}' in [{section}]; allowed: {', '.join(sorted(allowed))}")
            if section == "roles":
                values["role_names"] = {str(k): str(v) for k, v in value.items()}
            elif key in ("read", "units", "rename", "play_types"):
                if not isinstance(value, dict):
                    raise ConfigError(f"{path}: [{section}] {key} must be a table like [intake.{key}]")
                values[key] = {str(k): str(v) for k, v in value.items()}
            elif key in ("features", "exclude", "reference", "compare"):
                values[key] = tuple(str(v) for v in value)
            else:
                values[key] = value
    try:
        return Config(**values)
    except ConfigError as exc:
        raise ConfigError(f"{path}: {exc}") from None
    except TypeError as exc:
        raise ConfigError(f"{path}: {exc}") from None
