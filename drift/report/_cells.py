"""Cells of the page documents: the small JSON vocabulary the report's script lays out.

Player and team pages are not HTML: each is a *page document* (see :mod:`drift.report._bundle`),
a list of blocks whose table cells are plain strings and numbers or one of these short lists.
Python formats every word and number; the script only places them.

========================  ===============================================================
cell                      shown as
========================  ===============================================================
``"text"`` / ``12``       text (a number is right-aligned)
``["r", id]``             role chip with the role's name (names travel once, in the page)
``["r", id, "61%"]``      role chip and its membership
``["rr", a, pa, b, pb]``  "a pa → b pb": a move's roles, each named
``["s", status]``         status chip (changed, unsettled, shifted, steady, ...)
``["a", text, anchor]``   link to a page ("" anchor: plain text)
``["w", text, title]``    words with the figures on hover
``["t", text, tag]``      text with a small tag after it ("traded", "skips a season")
``["n", text]``           muted note
``["b", text]``           bold
``["bar", pct, text]``    a percentile bar and its number
========================  ===============================================================
"""

from __future__ import annotations

import functools

__all__ = ["move_cells", "pair_labels", "MOVE_COLUMNS", "membership_texts", "minutes_texts", "drivers_texts", "label"]

#: columns of a move table on a page; "player" is dropped on a player's own page
MOVE_COLUMNS = ("player", "seasons", "teams", "role from → to", "status", "how far", "what moved most", "minutes")


@functools.cache
def label(feature: str) -> str:
    """The feature's plain-language name, cached (a page set asks for the same few thousands of times)."""
    from drift.model.describe import feature_label

    return feature_label(feature)


def membership_texts(probs) -> list:
    """:func:`drift.report._fmt.membership` over an array, formatted once per distinct percent."""
    from drift.report._fmt import membership

    return [membership(p) for p in probs]


def minutes_texts(values) -> list:
    return [f"{v:,.0f}" for v in values]


def drivers_texts(moves) -> list:
    """"spot-up share +3.0 pp, ..." for every row of a moves table (each feature's change in its own units)."""
    from drift.report._moves import _change_text

    names = [moves[f"driver_{i}"].tolist() for i in (1, 2, 3) if f"driver_{i}" in moves]
    changes = [moves[f"driver_{i}_change"].tolist() for i in (1, 2, 3) if f"driver_{i}" in moves]
    out = []
    for k in range(len(moves)):
        out.append(", ".join(f"{label(n[k])} {_change_text(n[k], c[k])}" for n, c in zip(names, changes)
                             if isinstance(n[k], str)))
    return out


def _stint(n) -> str:
    try:
        return str(int(n))
    except (TypeError, ValueError):
        return str(n or "")


def pair_labels(moves, season_index) -> list:
    """:func:`drift.report._moves.pair_label` of every row, column by column: [(pair, note), ...]."""
    a, z = moves["season_from"].astype(str).tolist(), moves["season_to"].astype(str).tolist()
    kinds = moves["kind"].tolist() if "kind" in moves else ["consecutive"] * len(a)
    s_from = moves["stint_from"].tolist() if "stint_from" in moves else [None] * len(a)
    s_to = moves["stint_to"].tolist() if "stint_to" in moves else [None] * len(a)
    out = []
    for x, y, kind, i, j in zip(a, z, kinds, s_from, s_to):
        if kind == "stint":
            out.append((f"{x} stint {_stint(i)} → {_stint(j)}", "mid-season trade"))
        elif kind == "requested":
            out.append((f"{x} → {y}", "requested comparison"))
        else:
            gap = season_index.get(y, 0) - season_index.get(x, 0)
            out.append((f"{x} → {y}", "skips a season" if gap == 2 else f"skips {gap - 1} seasons" if gap > 2 else ""))
    return out


def move_cells(moves, b, *, player=True) -> list:
    """One row of cells per move (columns :data:`MOVE_COLUMNS`), in the order given.

    ``b`` is the report's :class:`~drift.report.context.Basis`; pairs, words and figures read as on
    the front page (:func:`drift.report._moves.move_rows`), formatted column by column.
    """
    from drift.report._fmt import figures_title, strength

    if not len(moves):
        return []
    pairs = pair_labels(moves, b.season_index)
    t_from, t_to = moves["team_from"].astype(str).tolist(), moves["team_to"].astype(str).tolist()
    p_from, p_to = membership_texts(moves["prob_from"]), membership_texts(moves["prob_to"])
    m_from, m_to = minutes_texts(moves["minutes_from"]), minutes_texts(moves["minutes_to"])
    drivers = drivers_texts(moves)
    rows = []
    for i, (pid, name, traded, r_from, r_to, status, p, z, dist, noise) in enumerate(zip(
            moves["player_id"].tolist(), moves["player"].tolist(), moves["traded"].tolist(),
            moves["role_from"].tolist(), moves["role_to"].tolist(), moves["status"].tolist(),
            moves["p_value"].tolist(), moves["z"].tolist(), moves["distance"].tolist(),
            moves["noise_distance"].tolist())):
        pair, note = pairs[i]
        teams = f"{t_from[i]} → {t_to[i]}" if t_from[i] != t_to[i] else t_to[i]
        row = [["a", str(name), b.player_anchor.get(pid, "")]] if player else []
        row += [["t", pair, note] if note else pair, ["t", teams, "traded"] if traded else teams,
                ["rr", r_from, p_from[i], r_to, p_to[i]], ["s", status],
                ["w", strength(p, z, b.alpha), figures_title(dist, noise, z, p)], drivers[i],
                f"{m_from[i]} / {m_to[i]}"]
        rows.append(row)
    return rows
