"""Invented leagues with known truth: the demo league, the simulated family and the self-check.

In
    A seed (the demo), a :class:`LeagueSpec` (the family), or a user's prepared
    data and fitted model (the self-check).
Out
    Fictional season tables with their true roles and changes, and scores of a
    drift run against that truth. Nothing here describes a real player or team.
"""

from drift.sim.demo import DemoLeague, generate_league, write_league
from drift.sim.family import LeagueSpec, SimLeague, family, recovery, simulate_league
from drift.sim.selfcheck import SelfCheck, self_check

__all__ = ["DemoLeague", "generate_league", "write_league", "LeagueSpec", "SimLeague", "family",
           "simulate_league", "recovery", "SelfCheck", "self_check"]
