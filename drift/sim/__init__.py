"""Invented leagues with known truth: the demo league, the simulated family and the self-check.

In
    A seed (the demo), a :class:`LeagueSpec` (the family), a user's prepared
    data and fitted model (the self-check), or an analysis to copy into a large
    league for scale checks (:func:`copies`).
Out
    Fictional season tables with their true roles and changes, and scores of a
    drift run against that truth. Nothing here describes a real player or team.
"""

__all__ = ["DemoLeague", "generate_league", "write_league", "LeagueSpec", "SimLeague", "family",
           "simulate_league", "recovery", "SelfCheck", "self_check", "copies"]

_WHERE = {"DemoLeague": "demo", "generate_league": "demo", "write_league": "demo", "LeagueSpec": "family",
          "SimLeague": "family", "family": "family", "simulate_league": "family", "recovery": "family",
          "SelfCheck": "selfcheck", "self_check": "selfcheck", "copies": "copies"}


def __getattr__(name):
    # loaded on first use, so `python -m drift.sim.demo` runs the module once, not twice
    import importlib

    if name in _WHERE:
        return getattr(importlib.import_module(f"drift.sim.{_WHERE[name]}"), name)
    raise AttributeError(f"module 'drift.sim' has no attribute {name!r}")
