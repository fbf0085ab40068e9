"""The report folder: a small front page, and every player and team page in chunks loaded on demand.

Layout of a run's output (``docs/outputs.md``, *The report*)::

    report.html              the front page (review, earlier seasons, outlook, roles, method, data):
                             static HTML, readable without JavaScript; its size does not grow with
                             the league (tables are cut to their strongest rows and say so)
    report-data/index.js     every player and team: name, id, team, for the search box, and which
                             chunk holds each page (loaded with the front page)
    report-data/p<N>.js      page documents of players, in name order, about CHUNK_BYTES each
    report-data/t<N>.js      page documents of teams, in code order

Each data file is a ``<script>`` the front page adds when a page of it is asked for
(``report.html#p-123``): it calls ``DRIFT.pages(kind, n, {anchor: document, ...})``. Scripts load
from ``file://`` with no server and no network, so the folder opens anywhere by double-clicking
``report.html``; only the pages asked for are read, and the front page stays the same size however
many players the pool holds.

A *page document* is JSON: ``{"kind": "player" | "team", "title", "sub", "blocks": [...]}``;
a block is one of

``["h3", text]``, ``["h4", text]``
    headings;
``["p", [cells]]``
    a line of cells (:mod:`drift.report._cells`);
``["note", text]``
    a muted note; ``"#key"`` names a note of :data:`NOTES` (sent once, not once per page);
``["table", columns, rows]``
    a sortable table that scrolls inside its box; ``columns`` names a list of :data:`COLUMNS`,
    each row is a list of cells;
``["grid", [blocks], [blocks]]``
    two columns (one on a phone);
``["details", summary, [blocks]]``
    a collapsed block;
``["map", points, alt]``
    a player's path on the role map (:func:`drift.report._sketch.path_points`);
``["mix", [[season, players, [[role, width %, text], ...]], ...]]``
    a team's role mix by season, with a legend naming every role.
"""

from __future__ import annotations

import json

__all__ = ["COLUMNS", "NOTES", "CHUNK_BYTES", "DATA_DIR", "shared", "write_pages"]

#: folder of the page chunks, beside report.html
DATA_DIR = "report-data"
#: a chunk closes once it holds about this many bytes of JSON (a few tenths of a second to read)
CHUNK_BYTES = 400_000

#: column headings of the page tables, by name
COLUMNS = {
    "timeline": ["season", "role (membership)", "team", "games", "minutes", "move into this season"],
    "profile": ["feature", "this season", "role average", "percentile within the role"],
    "pmoves": ["seasons", "teams", "role from → to", "status", "how far", "what moved most", "minutes"],
    "tmoves": ["player", "seasons", "teams", "role from → to", "status", "how far", "what moved most", "minutes"],
    "poutlook": ["after season", "likeliest role", "keeps his role", "changes role", "chances",
                 "typical miss", "seasons behind it"],
    "roster": ["player", "role (membership)", "games", "minutes", "move into this season"],
    "movement": ["player", "arrived / left", "from or to", "role", "move between the two seasons"],
}

#: notes every page of a kind shows, sent once
NOTES = {
    "timeline": "Membership: how strongly the season belongs to its role (the model's probability); games and "
                "minutes are the sample behind the season; stints: each qualifying stint's team and role in a "
                "traded season. A season \"not placed\" fell below the games or minutes-per-game filters.",
    "profile": "Bold: the features that define the role; the others are where this season differs most from the "
               "role's average. Percentile: share of the role's reference player-seasons below this value.",
    "pp": "What moved most: each feature's change in its own units; pp = percentage points (a share from 34% "
          "to 37% is +3.0 pp). Hover \"how far\" for the figures.",
    "outlook": "Chances learned from how often this data's returning players kept or changed role: a 70% chance "
               "of keeping his role means 3 players in 10 like him changed. Typical miss: how far such forecasts "
               "of a player's place among the roles missed on past seasons (role-map units; the CSV's "
               "position_spread). Trades, injuries and coaching changes to come are not known to it.",
    "movement": "Arrivals are placed in the later season (role shown for it), departures in the earlier one; the "
                "status is the player's move between the two seasons. Who arrived or left is judged on every "
                "season row, placed or not: \"stayed\" marks a player on the roster in both seasons but placed "
                "in only one (below the games or minutes filters in the other), not counted as an arrival or "
                "departure.",
    "caution": "Playstyle, not worth. Small samples stay uncertain; teammates, coaching, injuries and role "
               "assignments are unseen. Decisions about people need far more than this page.",
}


def shared(b) -> str:
    """The JSON the front page carries for the page script: roles (id -> [name, css class]), column
    headings, notes and the data folder; safe inside a ``<script>`` element."""
    roles = {rid: [name, b.role(rid)["css"]] for rid, name in b.names.items()}
    text = json.dumps({"roles": roles, "columns": COLUMNS, "notes": NOTES, "data": DATA_DIR},
                      ensure_ascii=False, separators=(",", ":"))
    return _script_safe(text)


def _script_safe(text: str) -> str:
    # "<" cannot close a script element and "&" starts no entity: JSON reads the escapes back as characters
    return text.replace("<", "\\u003c").replace(">", "\\u003e").replace("&", "\\u0026")


def _chunks(docs):
    """Split ``[(anchor, json text), ...]`` into consecutive runs of about :data:`CHUNK_BYTES`."""
    runs, run, size = [], [], 0
    for anchor, text in docs:
        run.append((anchor, text))
        size += len(text)
        if size >= CHUNK_BYTES:
            runs.append(run)
            run, size = [], 0
    if run:
        runs.append(run)
    return runs


def write_pages(folder, *, players, teams, b, analysis) -> list:
    """Write ``report-data/`` into ``folder``: the index and the page chunks. Returns the files written.

    ``players`` and ``teams`` map anchors to page documents; players go in name order (then id), teams
    in code order, so a name's neighbours share its chunk.
    """
    from pathlib import Path

    data = Path(folder) / DATA_DIR
    data.mkdir(exist_ok=True)
    pl = analysis.placements
    last = pl.sort_values("season", kind="stable").drop_duplicates("player_id", keep="last")
    people = sorted(zip(last["player"].astype(str).tolist(), [str(p) for p in last["player_id"]],
                        last["team"].astype(str).tolist(), last["player_id"].tolist()))
    written, index = [], {"players": [], "pstarts": [], "teams": [], "tstarts": []}
    dump = json.JSONEncoder(ensure_ascii=False, separators=(",", ":")).encode
    player_docs = [(b.player_anchor[pid], dump(players[b.player_anchor[pid]])) for _, _, _, pid in people]
    entries = {b.player_anchor[pid]: [name, sid, team] + ([] if b.player_anchor[pid] == "p-" + sid
                                                          else [b.player_anchor[pid]])
               for name, sid, team, pid in people}
    team_docs = [(anchor, dump(teams[anchor])) for anchor in b.team_anchor.values()]
    team_entries = {anchor: [code] + ([] if anchor == f"t-{code}" else [anchor]) for code, anchor in b.team_anchor.items()}
    for kind, docs, table, starts, rows in (("p", player_docs, entries, "pstarts", "players"),
                                           ("t", team_docs, team_entries, "tstarts", "teams")):
        for n, run in enumerate(_chunks(docs)):
            index[starts].append(len(index[rows]))
            index[rows] += [table[anchor] for anchor, _ in run]
            body = ",".join(f"{dump(anchor)}:{text}" for anchor, text in run)
            name = f"{kind}{n}.js"
            (data / name).write_text(f'DRIFT.pages("{kind}",{n},{{{body}}});\n', encoding="utf-8")
            written.append(f"{DATA_DIR}/{name}")
    (data / "index.js").write_text(f"DRIFT.index({dump(index)});\n", encoding="utf-8")
    return [f"{DATA_DIR}/index.js", *written]
