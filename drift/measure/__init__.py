"""Measuring change: moves between seasons, role drift, comparables and the in-season check.

In
    A fitted :class:`drift.model.RoleModel`, placed player-seasons and the pairs
    of seasons to compare (:class:`MoveSettings`).
Out
    DataFrames: moves (distance, p, z, status, drivers) with the noise a move of
    that sample would show; per-season role centres (role drift); each placement's
    nearest reference player-seasons; and each partial season judged against the
    player's latest full season (in-season check).
"""

from drift.measure.comparables import run_comparables
from drift.measure.inseason import check_partial
from drift.measure.moves import MOVE_STATUSES, pair_moves, requested_pairs, stint_pairs
from drift.measure.role_drift import drift_headlines, role_drift
from drift.measure.settings import MoveSettings

__all__ = ["MoveSettings", "pair_moves", "requested_pairs", "stint_pairs", "MOVE_STATUSES", "role_drift",
           "drift_headlines", "run_comparables", "check_partial"]
