"""The Meridian Hoops League: a fictional league generated from a fixed seed.

Every team, player and number here is invented by this code. Players have a
true role (one of seven archetypes), a personal style around it, a small
yearly drift, and sometimes a real role change (more often after a trade or a
development summer). Observed stats are drawn from the truth with noise that
shrinks with sample size: play-type shares are multinomial over the
player's finishing possessions, points per possession average over the
possessions of that play type, rates and shooting wobble with 1/sqrt(sample).

``python -m drift.sim.demo demo_seasons`` rewrites the committed demo files.
"""

from __future__ import annotations

from dataclasses import dataclass

__all__ = ["PLAY_TYPES", "ARCHETYPES", "generate_league", "write_league", "DemoLeague"]

PLAY_TYPES = ("isolation", "pnr_handler", "roll_man", "post_up", "spot_up",
              "transition", "cut", "off_screen", "handoff", "putback")
RATES = ("usage_pct", "ast_pct", "orb_pct", "drb_pct", "tov_pct", "stl_pct", "blk_pct")
SHOOTING = ("ts_pct", "three_pa_rate", "ft_rate")

#: archetype -> (play-type shares in PLAY_TYPES order, RATES, SHOOTING)
ARCHETYPES = {
    "lead_creator":     ((.18, .40, .00, .03, .10, .12, .03, .04, .08, .02),
                         (29, 33, 2.0, 11, 12.5, 1.6, 0.6), (.575, .36, .32)),
    "handoff_guard":    ((.09, .22, .00, .02, .27, .15, .05, .08, .10, .02),
                         (21, 20, 2.2, 12, 11.5, 1.7, 0.7), (.565, .44, .22)),
    "spot_up_wing":     ((.03, .03, .00, .02, .50, .16, .10, .08, .06, .02),
                         (15, 8, 2.5, 12, 9.0, 1.4, 0.8), (.580, .64, .13)),
    "transition_wing":  ((.15, .07, .01, .04, .16, .27, .19, .03, .05, .03),
                         (21, 12, 4.8, 13, 11.5, 1.8, 1.0), (.560, .26, .40)),
    "rim_runner":       ((.00, .00, .37, .07, .03, .10, .23, .00, .02, .18),
                         (15, 7, 12.0, 22, 13.0, 1.1, 3.8), (.645, .02, .42)),
    "post_hub":         ((.03, .00, .13, .38, .08, .08, .12, .00, .04, .14),
                         (24, 14, 9.5, 23, 12.5, 1.0, 2.2), (.555, .08, .34)),
    "pick_and_pop_big": ((.02, .00, .16, .11, .37, .08, .10, .03, .06, .07),
                         (17, 10, 6.0, 20, 10.0, 1.0, 1.8), (.585, .50, .20)),
}
_BASE_PPP = (0.90, 0.88, 1.15, 0.92, 1.00, 1.12, 1.25, 0.98, 0.92, 1.10)
#: plausible real changes of role (a summer of development, a new coach, a trade)
_TRANSITIONS = {
    "spot_up_wing": ("handoff_guard", "transition_wing"),
    "handoff_guard": ("lead_creator", "spot_up_wing"),
    "lead_creator": ("handoff_guard",),
    "transition_wing": ("spot_up_wing", "handoff_guard"),
    "rim_runner": ("post_hub", "pick_and_pop_big"),
    "post_hub": ("pick_and_pop_big", "rim_runner"),
    "pick_and_pop_big": ("post_hub", "spot_up_wing"),
}
_NEIGHBOUR = {"lead_creator": "handoff_guard", "handoff_guard": "spot_up_wing",
              "spot_up_wing": "transition_wing", "transition_wing": "handoff_guard",
              "rim_runner": "post_hub", "post_hub": "pick_and_pop_big", "pick_and_pop_big": "spot_up_wing"}
_RATE_NOISE = (1.4, 2.4, 0.9, 1.4, 1.4, 0.30, 0.35)  # sd at 1,500 minutes

_TEAMS = (
    ("HAR", "Harborview Lanterns"), ("CED", "Cedar Falls Owls"), ("MRS", "Marsh Point Herons"),
    ("QRY", "Quarry Hill Masons"), ("TID", "Tidewater Skiffs"), ("ALD", "Alder Ridge Foxes"),
    ("BRN", "Brinmoor Kestrels"), ("CPS", "Copperstone Drovers"), ("DUN", "Dunmore Pilots"),
    ("ELM", "Elmhurst Wardens"), ("FEN", "Fenwick Badgers"), ("GLS", "Glasswater Sirens"),
    ("HOL", "Hollow Creek Rams"), ("IVR", "Ivory Bay Gulls"), ("JUN", "Juniper Flats Coyotes"),
    ("KNL", "Knollwood Lynx"), ("LNT", "Lantern Row Forge"), ("MSA", "Mesa Verde Comets"),
    ("NTH", "Northgate Anchors"), ("OAK", "Oakmere Drifters"),
)
_FIRST = ("Ar", "Bel", "Cor", "Dav", "El", "Fen", "Jor", "Kas", "Lio", "Mav", "Nol", "Or",
          "Ras", "Sel", "Tav", "Vor", "Wes", "Zan", "Ib", "Quen")
_FIRST_END = ("ren", "lio", "mar", "dric", "sen", "tho", "vin", "ric", "lan", "dor", "ek", "iel")
_LAST = ("Ost", "Var", "Kel", "Bram", "Dun", "Hask", "Mor", "Quill", "Rend", "Strat", "Tov",
         "Wick", "Pell", "Garr", "Lusk", "Frae", "Yarr", "Cobb")
_LAST_END = ("ley", "ford", "mere", "wick", "ton", "holt", "gard", "ell", "sby", "rowe", "vik", "ane")
SEASONS = ("2019-20", "2020-21", "2021-22", "2022-23", "2023-24", "2024-25")


@dataclass(frozen=True)
class DemoLeague:
    """Generated league: ``rows`` as written to the season files, ``truth`` beside them."""

    rows: object   # DataFrame, one row per player-season-team (stint)
    truth: object  # DataFrame: player_id, season, team, stint, true_role, changed, between
    roles: object  # DataFrame: archetype definitions in feature units
    partial_season: str | None = None  # label of a season played only in part (see partial_games)


class _Player:
    def __init__(self, pid, name, role, rng, between):
        self.pid, self.name, self.role = pid, name, role
        self.between = between
        self.skill = rng.normal(0.0, 0.05, len(PLAY_TYPES))
        self._restyle(rng)

    def _restyle(self, rng):
        import numpy as np

        shares, rates, shoot = (np.array(x, float) for x in ARCHETYPES[self.role])
        if self.between:
            s2, r2, h2 = (np.array(x, float) for x in ARCHETYPES[_NEIGHBOUR[self.role]])
            shares, rates, shoot = (0.57 * a + 0.43 * b for a, b in ((shares, s2), (rates, r2), (shoot, h2)))
        self.shares = rng.dirichlet(shares * 120 + 0.05)
        self.rates = rates * np.exp(rng.normal(0, 0.08, len(rates)))
        self.shoot = shoot + rng.normal(0, [0.015, 0.035, 0.035])

    def age_one_season(self, rng):
        import numpy as np

        self.shares = rng.dirichlet(self.shares * 600 + 0.02)
        self.rates = self.rates * np.exp(rng.normal(0, 0.025, len(self.rates)))
        self.shoot = self.shoot + rng.normal(0, [0.006, 0.012, 0.012])

    def change_role(self, rng):
        self.role = str(rng.choice(_TRANSITIONS[self.role]))
        self.between = False
        self._restyle(rng)


#: league-wide trend in three-point rate per season, and the extra for spot-up wings
THREE_RATE_TREND = 0.008
SPOT_UP_EXTRA_TREND = 0.012


def _observe(player, games, minutes, rng, season_index=0):
    """Box line of one stint drawn from the player's truth (plus the league's three-point trend)."""
    import numpy as np

    usage = player.rates[0]
    poss = max(int(round(minutes * 2.05 * usage / 100)), 1)
    counts = rng.multinomial(poss, player.shares)
    shares = counts / poss
    ppp_true = np.array(_BASE_PPP) + player.skill
    with np.errstate(divide="ignore", invalid="ignore"):
        ppp = ppp_true + rng.normal(0, 1.05, len(PLAY_TYPES)) / np.sqrt(counts)
    ppp = np.where(counts > 0, np.clip(ppp, 0, 3), np.nan)
    scale = np.sqrt(1500.0 / minutes)
    rates = np.clip(player.rates + rng.normal(0, _RATE_NOISE) * scale, 0, None)
    fga = max(poss * 0.85, 1.0)
    ts, three, ftr = player.shoot
    trend = THREE_RATE_TREND + (SPOT_UP_EXTRA_TREND if player.role == "spot_up_wing" else 0.0)
    three = float(np.clip(three + trend * season_index, 0, 0.95))
    shoot = (
        float(np.clip(ts + rng.normal(0, 0.55 / np.sqrt(fga)), 0.30, 0.85)),
        np.clip(three + rng.normal(0, np.sqrt(max(three * (1 - three), 0.01) / fga)), 0, 1),
        max(ftr + rng.normal(0, np.sqrt(0.35 / fga)), 0),
    )
    row = {"games": int(games), "minutes": int(round(minutes)), "possessions": poss}
    row.update({f"share_{t}": round(float(s), 4) for t, s in zip(PLAY_TYPES, shares)})
    row.update({f"ppp_{t}": (None if np.isnan(v) else round(float(v), 3)) for t, v in zip(PLAY_TYPES, ppp)})
    row.update({k: round(float(v), 2) for k, v in zip(RATES, rates)})
    row.update({k: round(float(v), 4) for k, v in zip(SHOOTING, shoot)})
    return row


def _name(rng, used):
    while True:
        name = (f"{rng.choice(_FIRST)}{rng.choice(_FIRST_END)} "
                f"{rng.choice(_LAST)}{rng.choice(_LAST_END)}")
        if name not in used:
            used.add(name)
            return name


def _minutes_for(tier, rng):
    if tier == 0:
        games, mpg = rng.integers(58, 83), rng.uniform(27, 36)
    elif tier == 1:
        games, mpg = rng.integers(40, 82), rng.uniform(15, 27)
    else:
        games, mpg = rng.integers(12, 70), rng.uniform(6.5, 17)
    return int(games), float(games * mpg)


def _offseason(rng, rosters, last_team, new_player, *, roster, trade_rate, change_rate):
    """Departures, then off-season trades, then rookies fill the gaps; summer role changes."""
    teams = list(rosters)
    for t in teams:
        rosters[t] = [p for p in rosters[t] if rng.random() > 0.09]
    movers = [(t, p) for t in teams for p in rosters[t] if rng.random() < trade_rate]
    for t, p in movers:
        rosters[t].remove(p)
    for t, p in movers:
        dest = [u for u in teams if u != t and len(rosters[u]) < roster]
        (rosters[str(rng.choice(dest))] if dest else rosters[t]).append(p)
    for t in teams:
        while len(rosters[t]) < roster:
            rosters[t].append(new_player())
        for p in rosters[t]:
            if p.pid in last_team:
                p.age_one_season(rng)
                p.changed = False
                moved = last_team[p.pid] != t
                if rng.random() < change_rate * (3 if moved else 1):
                    p.change_role(rng)
                    p.changed = True


def _midseason_trade(rng, t, p, tier, rosters, last_team, rows, truth, season, s_index):
    """One mid-season trade: two stints, the second possibly in a new role."""
    teams = list(rosters)
    games, minutes = _minutes_for(tier, rng)
    split = rng.uniform(0.3, 0.7)
    dest = str(rng.choice([u for u in teams if u != t]))
    changed = bool(getattr(p, "changed", False))
    first_role = p.role
    for stint, (team, frac) in enumerate(((t, split), (dest, 1 - split)), start=1):
        if stint == 2 and rng.random() < 0.3:
            p.change_role(rng)
        g = max(int(round(games * frac)), 1)
        rows.append({"player_id": p.pid, "player": p.name, "team": team, "season": season,
                     **_observe(p, g, minutes * frac, rng, s_index)})
        truth.append({"player_id": p.pid, "season": season, "team": team, "stint": stint,
                      "true_role": p.role, "changed": changed if stint == 1 else p.role != first_role,
                      "between": p.between, "changed_midseason": p.role != first_role})
    rosters[t].remove(p)
    rosters[dest].append(p)
    last_team[p.pid] = dest


def _team_season(rng, t, roster, season, s_index, rows, truth, last_team, *, midseason_rate,
                 partial_games):
    """One team's season rows; returns the players traded mid-season (played in two stints)."""
    midseason = []
    order = rng.permutation(len(roster))
    for rank, i in enumerate(order):
        p = roster[i]
        tier = 0 if rank < 5 else 1 if rank < 11 else 2
        games, minutes = _minutes_for(tier, rng)
        changed = bool(getattr(p, "changed", False))
        if rng.random() < midseason_rate and games >= 30 and partial_games is None:
            midseason.append((t, p, tier))
            continue
        if partial_games is not None and games > partial_games:
            games, minutes = partial_games, minutes * partial_games / games
        rows.append({"player_id": p.pid, "player": p.name, "team": t, "season": season,
                     **_observe(p, games, minutes, rng, s_index)})
        truth.append({"player_id": p.pid, "season": season, "team": t, "stint": 0,
                      "true_role": p.role, "changed": changed, "between": p.between,
                      "changed_midseason": False})
        last_team[p.pid] = t
    return midseason


def generate_league(seed: int = 2024, *, seasons=SEASONS, n_teams: int = 20, roster: int = 20,
                    change_rate: float = 0.06, trade_rate: float = 0.12,
                    midseason_rate: float = 0.04, between_rate: float = 0.15,
                    partial_games: int | None = None) -> DemoLeague:
    """Generate the fictional league.

    Parameters
    ----------
    seed : int
        Everything follows from it.
    seasons : sequence of str
    n_teams, roster : int
        League size; about 85% of a roster qualifies under the default filters.
    change_rate : float
        Chance a returning player's true role changes over a summer (tripled after a trade).
    trade_rate, midseason_rate : float
        Chance of an off-season move, and of a mid-season trade (two stints).
    between_rate : float
        Share of players whose style sits between two roles.
    partial_games : int, optional
        Also play the first ``partial_games`` games of the season after the last
        (same players, same minutes per game, no mid-season trades): the league
        before it is unchanged, so a partial season can be checked against it.

    Returns
    -------
    DemoLeague
    """
    import numpy as np
    import pandas as pd

    rng = np.random.default_rng(seed)
    partial_season = None
    if partial_games is not None:
        partial_season = _next_season(seasons[-1])
        seasons = (*seasons, partial_season)
    teams = [code for code, _ in _TEAMS[:n_teams]]
    role_names = list(ARCHETYPES)
    role_p = np.array([0.10, 0.16, 0.22, 0.16, 0.13, 0.10, 0.13])
    used, players, next_id = set(), {}, [1]

    def new_player():
        pid = f"M{next_id[0]:04d}"
        next_id[0] += 1
        role = str(rng.choice(role_names, p=role_p))
        p = _Player(pid, _name(rng, used), role, rng, bool(rng.random() < between_rate))
        players[pid] = p
        return p

    rosters = {t: [new_player() for _ in range(roster)] for t in teams}
    rows, truth = [], []
    last_team = {}  # player -> team he ended the previous season with
    for s_index, season in enumerate(seasons):
        if s_index > 0:
            _offseason(rng, rosters, last_team, new_player, roster=roster, trade_rate=trade_rate,
                       change_rate=change_rate)
        last_team = {}
        midseason = []
        partial = partial_games if season == partial_season else None
        for t in teams:
            midseason += _team_season(rng, t, rosters[t], season, s_index, rows, truth, last_team,
                                      midseason_rate=midseason_rate, partial_games=partial)
        for t, p, tier in midseason:
            _midseason_trade(rng, t, p, tier, rosters, last_team, rows, truth, season, s_index)
        for t in teams:  # trades leave uneven rosters; trim the longest back to size
            while len(rosters[t]) > roster:
                rosters[t].pop(int(rng.integers(len(rosters[t]))))
    frame = pd.DataFrame(rows)
    roles = pd.DataFrame(
        [{"role": r, **{f"share_{t}": v for t, v in zip(PLAY_TYPES, a[0])},
          **dict(zip(RATES, a[1])), **dict(zip(SHOOTING, a[2]))} for r, a in ARCHETYPES.items()])
    return DemoLeague(rows=frame, truth=pd.DataFrame(truth), roles=roles, partial_season=partial_season)


def _next_season(label: str) -> str:
    """"2024-25" -> "2025-26"; "2024" -> "2025"."""
    head, _, tail = label.partition("-")
    if not tail:
        return str(int(head) + 1)
    return f"{int(head) + 1}-{(int(tail) + 1) % 10 ** len(tail):0{len(tail)}d}"


def write_league(folder, league: DemoLeague | None = None) -> list:
    """Write one CSV per season into ``folder`` (season in the file name) and the truth beside it.

    A partial season goes to ``folder/partial/`` so that a run on ``folder`` leaves it out.
    """
    from pathlib import Path

    league = league or generate_league()
    folder = Path(folder)
    (folder / "truth").mkdir(parents=True, exist_ok=True)
    if league.partial_season is not None:
        (folder / "partial").mkdir(exist_ok=True)
    written = []
    for season, block in league.rows.groupby("season", sort=True):
        path = folder / ("partial" if season == league.partial_season else "") / f"{season}.csv"
        block.drop(columns="season").to_csv(path, index=False)
        written.append(path)
    league.truth.to_csv(folder / "truth" / "truth.csv", index=False)
    league.roles.to_csv(folder / "truth" / "archetypes.csv", index=False)
    return written


if __name__ == "__main__":  # pragma: no cover
    import sys

    for p in write_league(sys.argv[1] if len(sys.argv) > 1 else "demo_seasons"):
        print(p)
