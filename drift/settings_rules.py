"""One validator per kind of setting: ``rule(name, value)`` returns the value or raises ConfigError.

Used by every part of :class:`drift.config.Config`, so the CLI, the TOML file and
the model file refuse the same values with the same words. Values out of range
are refused, never clamped; NaN and infinities are refused.
"""

from __future__ import annotations

import dataclasses
import math
from numbers import Integral, Real

from drift.constants import COMPONENT_RULES, KMEANS_RESTARTS, NOISE_POLICIES, STANDARD_COLUMNS, TABLE_FORMATS
from drift.errors import ConfigError

__all__ = ["non_negative", "count_from", "seed", "MAX_SEED", "fraction_open", "fraction_closed", "components", "roles",
           "noise_policy", "table_format", "optional_text", "names", "optional_names", "compare", "text_map",
           "columns", "csv_format", "CSV_SEPARATORS", "KMEANS_RESTARTS", "STANDARD_COLUMNS", "NOISE_POLICIES",
           "COMPONENT_RULES"]


def _is_int(value) -> bool:
    return isinstance(value, Integral) and not isinstance(value, bool)


def _is_number(value) -> bool:
    return isinstance(value, Real) and not isinstance(value, bool) and math.isfinite(value)


def _fail(name, value, need):
    raise ConfigError(f"{name}={value!r} must be {need}")


def non_negative(name, value):
    if not _is_number(value) or value < 0:
        _fail(name, value, "a finite number >= 0")
    return value


def count_from(low: int):
    def rule(name, value):
        if not _is_int(value) or value < low:
            _fail(name, value, f"a whole number >= {low}")
        return int(value)
    return rule


#: random seeds are handed to numpy and scikit-learn, which take 0 <= seed < 2**32
MAX_SEED = 2**32 - 1


def seed(name, value):
    if not _is_int(value) or not 0 <= value <= MAX_SEED:
        _fail(name, value, f"a whole number from 0 to {MAX_SEED}")
    return int(value)


def fraction_open(name, value):
    if not _is_number(value) or not 0 < value < 1:
        _fail(name, value, "a number between 0 and 1 (both excluded)")
    return value


def fraction_closed(name, value):
    if not _is_number(value) or not 0 < value <= 1:
        _fail(name, value, "a number in (0, 1]")
    return value


def components(name, value):
    ok = (value in COMPONENT_RULES if isinstance(value, str)
          else (_is_int(value) and value >= 1)
          or (isinstance(value, float) and math.isfinite(value) and 0 < value < 1))
    if not ok:
        _fail(name, value, f"one of {', '.join(COMPONENT_RULES)}, a count >= 1 "
                           "or a fraction between 0 and 1")
    return int(value) if _is_int(value) else value


def roles(name, value):
    if value == "auto":
        return value
    if not _is_int(value) or value < 2:
        _fail(name, value, "'auto' or a whole number >= 2 (one role separates nothing)")
    return int(value)


def noise_policy(name, value):
    if value not in NOISE_POLICIES:
        _fail(name, value, f"one of {', '.join(NOISE_POLICIES)}")
    return value


def table_format(name, value):
    if value not in TABLE_FORMATS:
        _fail(name, value, f"one of {', '.join(TABLE_FORMATS)}")
    return value


def optional_text(name, value):
    if value is not None and (not isinstance(value, str) or not value):
        _fail(name, value, "non-empty text")
    return value


def names(name, value):
    """A list of names; one name given as text is taken as a list of one."""
    if isinstance(value, str):
        value = (value,)
    if not isinstance(value, (list, tuple)) or not all(isinstance(v, str) and v for v in value):
        _fail(name, value, "a list of names")
    return tuple(value)


def optional_names(name, value):
    if value is None:
        return None
    value = names(name, value)
    if not value:
        _fail(name, list(value), "a non-empty list of names (or left out)")
    return value


def compare(name, value):
    if value is None:
        return None
    value = names(name, value)
    if len(value) != 2:
        raise ConfigError(f"{name} needs exactly two seasons, got {list(value)}")
    if value[0] == value[1]:
        raise ConfigError(f"{name} needs two different seasons, got {list(value)}")
    return value


def text_map(name, value):
    if not isinstance(value, dict) or not all(isinstance(k, str) and isinstance(v, str)
                                              for k, v in value.items()):
        _fail(name, value, "a table of text values")
    return dict(value)


def columns(name, value):
    value = text_map(name, value)
    unknown = set(value) - set(STANDARD_COLUMNS)
    if unknown:
        raise ConfigError(f"[columns] has unknown drift names {sorted(unknown)}; "
                          f"allowed: {', '.join(STANDARD_COLUMNS)}")
    return value


#: separators a text file may use, by the words the config may give them
CSV_SEPARATORS = {",": ",", ";": ";", "\t": "\t", "|": "|", "comma": ",", "semicolon": ";", "tab": "\t",
                  "bar": "|", "pipe": "|"}


def csv_format(name, value):
    """``[intake.csv]``: ``separator`` (comma, semicolon, tab or bar) and ``encoding`` (a codec Python knows).

    Either may be left out (drift detects it). The separator comes back as its character.
    """
    import codecs

    value = text_map(name, value)
    unknown = sorted(set(value) - {"separator", "encoding"})
    if unknown:
        raise ConfigError(f"[intake.csv] has unknown key(s) {unknown}; allowed: encoding, separator")
    if "separator" in value:
        sep = CSV_SEPARATORS.get(value["separator"], CSV_SEPARATORS.get(value["separator"].strip().lower()))
        if sep is None:
            raise ConfigError(f"[intake.csv] separator={value['separator']!r} must be one of ',', ';', '\\t' "
                              "(or 'tab'), '|'")
        value["separator"] = sep
    if "encoding" in value:
        try:
            codecs.lookup(value["encoding"])
        except LookupError:
            raise ConfigError(f"[intake.csv] encoding={value['encoding']!r} is not an encoding Python knows; "
                              "give one like 'utf-8', 'utf-16', 'windows-1252' or 'latin-1'") from None
    return value


class SettingsPart:
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



def _plain(value):
    if isinstance(value, dict):
        return dict(value)
    if isinstance(value, tuple):
        return list(value)
    return value
