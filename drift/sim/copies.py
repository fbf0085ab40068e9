"""A large league made cheaply: an analysis copied ``k`` times under new player ids, names and teams.

For scale checks of the report and the outputs (``benchmarks/report_scale.py``, the browser test
of a 10^5-row league), where fitting a real pool of that size would take minutes. Every copy keeps
the demo's seasons, roles and figures; its players get new ids (``M0003-7``) and names
(``Liodric Mormere 7``), and its teams a suffix per group of copies (``IVR3``), so a pool of
``k`` copies has ``k`` times the players, moves and trades and ``teams`` times the teams. Nothing
is refitted: the model and its diagnostics are the original's.
"""

from __future__ import annotations

__all__ = ["copies"]


def copies(analysis, k, *, teams=1):
    """``analysis`` (an :class:`drift.api.Analysis`) with every player-keyed table repeated ``k`` times.

    Copy ``i`` renames players ``<id>-<i>`` / ``<name> <i>`` and teams ``<code><i % teams>`` (when
    ``teams`` > 1), consistently across placements, moves, stints, comparables, the outlook and the
    prepared season rows, so pages, links and rosters agree.
    """
    import dataclasses

    import pandas as pd

    team_cols = ("team", "team_from", "team_to", "team_first", "team_last", "comp_team")

    def grow(frame, *id_cols):
        if frame is None or not len(frame):
            return frame
        parts = []
        for i in range(k):
            part = frame.copy()
            for col in id_cols:
                if col in part:
                    part[col] = part[col].astype(str) + f"-{i}"
            for col in ("player", "comp_player"):
                if col in part:
                    part[col] = part[col].astype(str) + f" {i}"
            if teams > 1:
                for col in team_cols:
                    if col in part:
                        part[col] = part[col].astype(str).str.split("/").map(
                            lambda codes, g=i % teams: "/".join(f"{c}{g}" for c in codes))
            parts.append(part)
        return pd.concat(parts, ignore_index=True)

    prepared = analysis.prepared
    if prepared is not None:
        prepared = dataclasses.replace(prepared, kept=grow(prepared.kept, "player_id"),
                                       excluded=grow(prepared.excluded, "player_id"),
                                       seasons=grow(prepared.seasons, "player_id"))
    return dataclasses.replace(
        analysis, prepared=prepared, placements=grow(analysis.placements, "player_id"),
        moves=grow(analysis.moves, "player_id"), stints=grow(analysis.stints, "player_id"),
        comparables=grow(analysis.comparables, "player_id", "comp_player_id"),
        outlook=grow(analysis.outlook, "player_id"))
