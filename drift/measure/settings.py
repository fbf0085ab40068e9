"""How moves are judged: :class:`MoveSettings`, one validator per field."""

from __future__ import annotations

from dataclasses import dataclass

from drift import settings_rules as rules
from drift.settings_rules import SettingsPart

__all__ = ["MoveSettings"]


@dataclass(frozen=True)
class MoveSettings(SettingsPart):
    """How moves are judged: the level for "beyond noise" and an extra season pair."""

    alpha: float = 0.01
    compare: tuple | None = None

    _rules = {"alpha": rules.fraction_open, "compare": rules.compare}
