"""A family of simulated leagues with known truth, shared by tests and benchmarks.

The demo league (:mod:`drift.sim.demo`) is one league with seven roles. Rules that
only ever meet it get tuned to it. This module draws leagues that differ in
everything a rule could depend on: the number of latent roles (4 to 12, taken
from a library of plausible playstyle profiles and perturbed per league), how
strongly players blend two roles, roster size, number of seasons, sample sizes
(season length), the share of real role changes (including none), whether
possessions are given, and the column names of the export. Every league has
its truth beside the data: each player-season's true role, the role it blends
with and how much, and whether the role really changed since last season.

Everything is invented: profiles, teams, names and numbers come from this code.
Observed stats come from :func:`drift.sim.demo._observe` (multinomial play-type
shares over finishing possessions, points per possession averaged over the
possessions of each play type, rates and shooting with noise shrinking as
1/sqrt(sample)), so the family and the demo share one observation model.

Use::

    from drift.sim.family import family, simulate_league
    for spec in family(60):   # the family used to choose defaults
        simulate_league(spec).write("some/folder")   # season CSVs + truth/truth.csv

``family(n, start=1000)`` gives leagues that were never used to choose anything
(the held-out set of ``benchmarks/role_count.py``).

The role profiles and the simulated player live in :mod:`drift.sim._roles`
(``PROFILES`` is re-exported here); this module draws the league around them.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from drift.sim._roles import PROFILES, SimPlayer, league_profiles, nearest_other
from drift.sim._scoring import recovery, season_truth

__all__ = ["PROFILES", "LeagueSpec", "SimLeague", "family", "simulate_league", "season_truth",
           "recovery", "NAMINGS", "FEATURE_NAMINGS", "HELD_OUT_START", "STRESS_CASES", "stress_family",
           "FRESH_START", "feature_columns"]

#: first family index of the held-out leagues (never used to choose a default)
HELD_OUT_START = 1000
#: first index of the fresh held-out stress leagues of issue 17 (measured once, never used to choose)
FRESH_START = 3000

#: column naming variants: drift name -> export name ("standard" keeps drift's names)
NAMINGS = {
    "standard": {},
    "export": {"player_id": "PLAYER_ID", "player": "PLAYER_NAME", "team": "TEAM_ABBR",
               "games": "GP", "minutes": "MIN", "possessions": "POSS"},
    "short": {"player_id": "pid", "player": "name", "team": "tm", "games": "g", "minutes": "mp",
              "possessions": "poss"},
}


#: how the export spells the feature columns. ``drift``: drift's own names; ``club``: the
#: spellings a club export might use (``PNR_Roller_Freq``, ``Screen_Off_PPP``, ``USG_PCT``,
#: ...), all in drift's spelling tables; ``unlisted``: the same, but two play types under
#: vendor codes no table knows (``PlayType7``, ``PlayType8``), so their columns are read
#: as plain rates with minutes as their sample and only the data can tell their reliability.
_CLUB_PLAYS = {"isolation": "Isolation", "pnr_handler": "PR_Handler", "roll_man": "PNR_Roller",
               "post_up": "PostUp", "spot_up": "SpotUp", "transition": "Transition", "cut": "Cut",
               "off_screen": "Screen_Off", "handoff": "Hand_Off", "putback": "Putbacks"}
_CLUB_RATES = {"usage_pct": "USG_PCT", "ast_pct": "AST_PCT", "orb_pct": "OREB_PCT", "drb_pct": "DREB_PCT",
               "tov_pct": "TOV_PCT", "stl_pct": "STL_PCT", "blk_pct": "BLK_PCT", "ts_pct": "TS_PCT",
               "three_pa_rate": "FG3A_RATE", "ft_rate": "FTA_RATE"}
FEATURE_NAMINGS = {
    "drift": {},
    "club": {**{f"share_{k}": f"{v}_Freq" for k, v in _CLUB_PLAYS.items()},
             **{f"ppp_{k}": f"{v}_PPP" for k, v in _CLUB_PLAYS.items()}, **_CLUB_RATES},
    "unlisted": {**{f"share_{k}": f"{v}_Freq" for k, v in _CLUB_PLAYS.items()},
                 **{f"ppp_{k}": f"{v}_PPP" for k, v in _CLUB_PLAYS.items()}, **_CLUB_RATES,
                 "share_roll_man": "PlayType7_Freq", "ppp_roll_man": "PlayType7_PPP",
                 "share_off_screen": "PlayType8_Freq", "ppp_off_screen": "PlayType8_PPP"},
}


def feature_columns(naming: str) -> dict:
    """drift feature name -> the export's column name under a :data:`FEATURE_NAMINGS` key."""
    return dict(FEATURE_NAMINGS[naming])


@dataclass(frozen=True)
class LeagueSpec:
    """Parameters of one simulated league.

    Parameters
    ----------
    n_roles : int
        Latent roles, 4 to 12 (profiles drawn from :data:`PROFILES`, perturbed).
    blend : float
        Largest weight a blended player puts on his second role (0 = pure roles).
    blend_share : float
        Share of players who blend two roles.
    n_teams, roster : int
        League size (teams up to 20).
    n_seasons : int
    sample : float
        Season length: games and minutes are multiplied by it (0.5 = half seasons).
    change_rate : float
        Chance a returning player's true role changes over a summer (0 = none ever).
    trade_rate, midseason_rate : float
        Off-season moves and mid-season trades (two stints; roles do not change mid-season).
    possessions : bool
        Whether the export has a possessions column.
    naming : str
        A key of :data:`NAMINGS`.
    profile_jitter : float
        How far each league's role profiles are perturbed from the library's.
    spread : float
        Personal style around the role (1 = the demo league's; larger overlaps roles more).
    seed : int
    rare_roles : int
        Roles made rare: each drawn by ``rare_share`` of newcomers and of real role changes
        (0 = the league's drawn mix, as before).
    rare_share : float
    feature_naming : str
        A key of :data:`FEATURE_NAMINGS` (how the feature columns are spelled).
    """

    n_roles: int = 7
    blend: float = 0.35
    blend_share: float = 0.25
    n_teams: int = 15
    roster: int = 20
    n_seasons: int = 6
    sample: float = 1.0
    change_rate: float = 0.06
    trade_rate: float = 0.12
    midseason_rate: float = 0.03
    possessions: bool = True
    naming: str = "standard"
    profile_jitter: float = 0.12
    spread: float = 1.0
    seed: int = 0
    rare_roles: int = 0
    rare_share: float = 0.03
    feature_naming: str = "drift"

    def __post_init__(self):
        if not 0 <= self.rare_roles < self.n_roles or not 0 < self.rare_share * max(self.rare_roles, 1) < 0.5:
            raise ValueError(f"rare_roles={self.rare_roles} x rare_share={self.rare_share} must leave most "
                             "roles and most players common")
        if self.feature_naming not in FEATURE_NAMINGS:
            raise ValueError(f"feature_naming={self.feature_naming!r} is not one of {', '.join(FEATURE_NAMINGS)}")
        if not 2 <= self.n_roles <= len(PROFILES):
            raise ValueError(f"n_roles={self.n_roles} must be between 2 and {len(PROFILES)}")
        if not 0 <= self.blend < 0.5:
            raise ValueError(f"blend={self.blend} must be in [0, 0.5): the main role keeps the majority")
        if self.naming not in NAMINGS:
            raise ValueError(f"naming={self.naming!r} is not one of {', '.join(NAMINGS)}")
        if not 1 <= self.n_teams <= 20:
            raise ValueError(f"n_teams={self.n_teams} must be between 1 and 20")


@dataclass(frozen=True)
class SimLeague:
    """A simulated league: ``rows`` (one per stint, columns named per ``spec.naming``),
    ``truth`` (one per row: player_id, season, team, stint, true_role, changed,
    blend_role, blend_weight), ``profiles`` (the league's role profiles in feature
    units) and ``columns`` (the ``[columns]`` mapping drift needs for this naming).
    """

    spec: LeagueSpec
    rows: object
    truth: object
    profiles: object
    columns: dict = field(default_factory=dict)

    def write(self, folder) -> list:
        """One CSV per season (season in the file name) and ``truth/truth.csv`` beside them."""
        from pathlib import Path

        folder = Path(folder)
        (folder / "truth").mkdir(parents=True, exist_ok=True)
        written = []
        for season, block in self.rows.groupby("season", sort=True):
            path = folder / f"{season}.csv"
            block.drop(columns="season").to_csv(path, index=False)
            written.append(path)
        self.truth.to_csv(folder / "truth" / "truth.csv", index=False)
        self.profiles.to_csv(folder / "truth" / "profiles.csv", index=False)
        return written


def family(n: int, *, start: int = 0) -> list:
    """The specs of leagues ``start .. start + n - 1`` of the family (deterministic).

    Each index draws its own parameters: 4-12 roles, blend 0-0.45 on 10-40% of
    players, 12-17 teams of 15-21 players, 4-6 seasons, season length 0.6-1.1,
    real-change rate 0-0.12 (a fifth of leagues have none), possessions given in
    three leagues of four, one of the column namings, and personal style
    0.8-1.5 times the demo league's.
    """
    import numpy as np

    specs = []
    for index in range(start, start + n):
        rng = np.random.default_rng([7919, index])
        specs.append(LeagueSpec(
            n_roles=int(rng.integers(4, 13)),
            blend=float(rng.uniform(0.0, 0.45)),
            blend_share=float(rng.uniform(0.1, 0.4)),
            n_teams=int(rng.integers(12, 18)),
            roster=int(rng.integers(15, 22)),
            n_seasons=int(rng.integers(4, 7)),
            sample=float(rng.uniform(0.6, 1.1)),
            change_rate=0.0 if rng.random() < 0.2 else float(rng.uniform(0.02, 0.12)),
            possessions=bool(rng.random() < 0.75),
            naming=str(rng.choice(list(NAMINGS))),
            spread=float(rng.uniform(0.8, 1.5)),
            seed=int(index),
        ))
    return specs


#: the stress cases of :func:`stress_family`, in turn: case -> the spec fields it sets
STRESS_CASES = {
    "12 roles": {"n_roles": 12},
    "rare roles": {"rare_roles": None},  # 1 or 2, drawn
    "short rosters": {"roster": 7},
    "12 seasons": {"n_seasons": 12},
    "plain": {},
}


def stress_family(n: int, *, start: int = FRESH_START) -> list:
    """Leagues of the family's kind that stress the role count, each with its case.

    Index i draws a :func:`family`-like spec (its own generator), then applies the case
    ``list(STRESS_CASES)[i % 5]``: twelve roles, one or two rare roles (3% of players),
    rosters of seven, twelve seasons, or none; feature columns spelled ``drift`` or ``club``
    in turn (``(i // 5) % 2``). Returns a list of (case, LeagueSpec).
    """
    import dataclasses

    import numpy as np

    out = []
    for index in range(start, start + n):
        base = family(1, start=index)[0]
        case = list(STRESS_CASES)[index % len(STRESS_CASES)]
        fields = dict(STRESS_CASES[case])
        if "rare_roles" in fields:
            rng = np.random.default_rng([7919, index, 17])
            fields["rare_roles"] = int(rng.integers(1, 3))
            fields["n_roles"] = max(base.n_roles, 5)
        fields["feature_naming"] = ("drift", "club")[(index // len(STRESS_CASES)) % 2]
        out.append((case, dataclasses.replace(base, **fields)))
    return out


class _LeagueDraw:
    """One league being drawn: its generator, roles, teams and seasons, and the rows so far.

    The steps run in a fixed order on one generator, so a seed always gives the same league.
    """

    def __init__(self, spec):
        import numpy as np

        from drift.sim.demo import _TEAMS

        self.spec = spec
        self.rng = np.random.default_rng([spec.seed, 31337])
        self.profiles = league_profiles(spec, self.rng)
        self.partner = nearest_other(self.profiles)
        self.role_names = list(self.profiles)
        self.role_p = self.rng.dirichlet(np.full(len(self.role_names), 8.0))
        if spec.rare_roles:  # the roles the mix made smallest become rare (no extra draws)
            rare = np.argsort(self.role_p, kind="stable")[:spec.rare_roles]
            common = np.setdiff1d(np.arange(len(self.role_p)), rare)
            self.role_p[common] *= (1 - spec.rare_share * spec.rare_roles) / self.role_p[common].sum()
            self.role_p[rare] = spec.rare_share
        self.teams = [code for code, _ in _TEAMS[:spec.n_teams]]
        self.seasons = [f"{2014 + i}-{(15 + i) % 100:02d}" for i in range(spec.n_seasons)]
        self.used, self.next_id = set(), 1
        self.rows, self.truth = [], []

    def new_player(self):
        """A newcomer: a fresh id and name, a role drawn from the league's mix, maybe a blend."""
        from drift.sim.demo import _name

        spec, rng = self.spec, self.rng
        pid = f"S{self.next_id:05d}"
        self.next_id += 1
        weight = float(rng.uniform(0, spec.blend)) if rng.random() < spec.blend_share else 0.0
        return SimPlayer(pid, _name(rng, self.used), str(rng.choice(self.role_names, p=self.role_p)), rng,
                         self.profiles, self.partner, weight, spread=spec.spread)

    def observe(self, p, games, minutes, team, season, stint, s_index):
        """One stint's observed row and its truth row."""
        from drift.sim.demo import _observe

        games = max(int(round(games * self.spec.sample)), 1)
        self.rows.append({"player_id": p.pid, "player": p.name, "team": team, "season": season,
                          **_observe(p, games, max(minutes * self.spec.sample, 1.0), self.rng, s_index)})
        self.truth.append({"player_id": p.pid, "season": season, "team": team, "stint": stint,
                           "true_role": p.role, "changed": p.changed,
                           "blend_role": self.partner[p.role] if p.blend_weight > 0 else "",
                           "blend_weight": round(p.blend_weight, 3)})

    def offseason(self, rosters, last_team):
        """Departures, trades and newcomers; returning players age and may change role."""
        spec, rng, teams = self.spec, self.rng, self.teams
        for t in teams:
            rosters[t] = [p for p in rosters[t] if rng.random() > 0.09]
        movers = [(t, p) for t in teams for p in rosters[t] if rng.random() < spec.trade_rate]
        for t, p in movers:
            rosters[t].remove(p)
            dest = [u for u in teams if u != t and len(rosters[u]) < spec.roster] or [t]
            rosters[str(rng.choice(dest))].append(p)
        for t in teams:
            while len(rosters[t]) < spec.roster:
                rosters[t].append(self.new_player())
            for p in rosters[t]:
                p.changed = False
                if p.pid in last_team:
                    p.age_one_season(rng)
                    moved = last_team[p.pid] != t
                    if rng.random() < spec.change_rate * (2 if moved else 1):
                        # with rare roles, a change lands by the league's mix (else they fill up)
                        p.change_role(rng, self.role_p if spec.rare_roles else None, self.role_names)
                        p.changed = True

    def play_season(self, rosters, season, s_index) -> dict:
        """Observe every player's season (two stints when traded mid-season); player -> last team."""
        from drift.sim.demo import _minutes_for

        spec, rng, teams = self.spec, self.rng, self.teams
        last_team, traded = {}, []
        for t in teams:
            for rank, i in enumerate(rng.permutation(len(rosters[t]))):
                p = rosters[t][i]
                games, minutes = _minutes_for(0 if rank < 5 else 1 if rank < 11 else 2, rng)
                if rng.random() < spec.midseason_rate and games >= 30 and len(teams) > 1:
                    split = rng.uniform(0.3, 0.7)
                    dest = str(rng.choice([u for u in teams if u != t]))
                    for stint, (team, frac) in enumerate(((t, split), (dest, 1 - split)), start=1):
                        self.observe(p, games * frac, minutes * frac, team, season, stint, s_index)
                    last_team[p.pid] = dest
                    traded.append((t, dest, p))
                else:
                    self.observe(p, games, minutes, t, season, 0, s_index)
                    last_team[p.pid] = t
        for t, dest, p in traded:
            rosters[t].remove(p)
            rosters[dest].append(p)
        for t in teams:  # trades leave uneven rosters; trim the longest back to size
            while len(rosters[t]) > spec.roster:
                rosters[t].pop(int(rng.integers(len(rosters[t]))))
        return last_team

    def league(self) -> SimLeague:
        """The rows under the spec's column names, the truth, and the league's role profiles."""
        import pandas as pd

        from drift.sim.demo import PLAY_TYPES, RATES, SHOOTING

        spec = self.spec
        frame = pd.DataFrame(self.rows)
        if not spec.possessions:
            frame = frame.drop(columns="possessions")
        naming = NAMINGS[spec.naming]
        frame = frame.rename(columns={**naming, **FEATURE_NAMINGS[spec.feature_naming]})
        prof = pd.DataFrame([{"role": r, **{f"share_{t}": v for t, v in zip(PLAY_TYPES, s)},
                              **dict(zip(RATES, rt)), **dict(zip(SHOOTING, h))}
                             for r, (s, rt, h) in self.profiles.items()])
        columns = {k: v for k, v in naming.items() if v in frame.columns}
        return SimLeague(spec=spec, rows=frame, truth=pd.DataFrame(self.truth), profiles=prof, columns=columns)


def simulate_league(spec: LeagueSpec | None = None) -> SimLeague:
    """Draw one league of the family.

    Parameters
    ----------
    spec : LeagueSpec, optional
        The league's parameters (default: ``LeagueSpec()``); the same spec always
        gives the same league.

    Returns
    -------
    SimLeague
    """
    draw = _LeagueDraw(spec or LeagueSpec())
    rosters = {t: [draw.new_player() for _ in range(draw.spec.roster)] for t in draw.teams}
    last_team = {}
    for s_index, season in enumerate(draw.seasons):
        if s_index > 0:
            draw.offseason(rosters, last_team)
        last_team = draw.play_season(rosters, season, s_index)
    return draw.league()
