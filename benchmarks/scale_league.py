"""A fictional league of any size, generated in a few vectorised numpy passes (for benchmarks/scale.py).

Every player has a latent role (seven invented playstyle profiles over ten play
types, seven rates and three shooting figures: the demo league's 30 feature
columns), plays ``seasons`` seasons, and moves to another role between two
seasons with probability ``change``. Sample sizes vary so some seasons are
excluded by the filters and a few players are traded mid-season (one row per
stint). No row is built in a Python loop, so 10^6 player-seasons take seconds.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

PLAY_TYPES = ("isolation", "pnr_handler", "roll_man", "post_up", "spot_up", "transition", "cut",
              "off_screen", "handoff", "putback")
RATES = ("usage_pct", "ast_pct", "orb_pct", "drb_pct", "tov_pct", "stl_pct", "blk_pct")
SHOOTING = ("ts_pct", "three_pa_rate", "ft_rate")
FEATURES = tuple(f"share_{t}" for t in PLAY_TYPES) + tuple(f"ppp_{t}" for t in PLAY_TYPES) + RATES + SHOOTING

# invented role profiles: play-type weights, then rate and shooting means
_SHARES = np.array([
    [8, 30, 1, 2, 20, 14, 5, 6, 10, 1],    # pick-and-roll lead guard
    [3, 6, 2, 1, 48, 12, 8, 12, 6, 1],     # spot-up wing
    [1, 1, 30, 8, 6, 10, 24, 1, 3, 16],    # rim-running big
    [4, 2, 10, 38, 10, 6, 14, 1, 3, 12],   # post-up big
    [14, 16, 1, 4, 22, 16, 6, 12, 8, 1],   # isolation and pick-and-roll scorer
    [2, 4, 8, 6, 30, 18, 18, 4, 4, 6],     # spot-up and cutting forward
    [2, 3, 14, 6, 30, 8, 14, 2, 4, 17],    # pick-and-pop big
], float)
_OTHER = np.array([
    # usage ast orb drb tov stl blk | ts 3pa ft
    [27, 32, 2, 11, 14, 1.6, 0.5, 0.56, 0.38, 0.30],
    [18, 10, 3, 12, 9, 1.4, 0.6, 0.59, 0.55, 0.18],
    [17, 7, 12, 24, 11, 1.0, 3.5, 0.64, 0.02, 0.40],
    [24, 12, 9, 20, 12, 1.0, 2.0, 0.56, 0.08, 0.38],
    [29, 20, 3, 12, 12, 1.5, 0.5, 0.57, 0.42, 0.28],
    [16, 16, 5, 15, 12, 2.0, 1.0, 0.56, 0.40, 0.22],
    [19, 9, 8, 21, 9, 1.0, 2.2, 0.59, 0.42, 0.24],
])
_OTHER_SD = np.array([3.0, 4.0, 1.5, 3.0, 2.0, 0.4, 0.5, 0.03, 0.08, 0.07])


def make_league(rows: int, *, seasons: int = 6, change: float = 0.1, seed: int = 0) -> pd.DataFrame:
    """About ``rows`` player-season rows (stint rows included) with a ``season`` column."""
    rng = np.random.default_rng(seed)
    n_players = max(1, -(-rows // seasons))
    n = n_players * seasons
    player = np.repeat(np.arange(n_players), seasons)
    season_no = np.tile(np.arange(seasons), n_players)
    # latent role: a start role, then a change with probability ``change`` each season
    k = len(_SHARES)
    start = rng.integers(0, k, n_players)
    steps = (rng.random((n_players, seasons)) < change) * rng.integers(1, k, (n_players, seasons))
    steps[:, 0] = 0
    role = ((start[:, None] + np.cumsum(steps, axis=1)) % k).ravel()
    games = rng.integers(8, 83, n)
    minutes = np.round(games * rng.uniform(6, 36, n)).astype(int)
    possessions = np.round(minutes * rng.uniform(0.25, 0.55, n)).astype(int)
    # play-type shares: the role's weights with gamma noise (sample-size dependent), normalised
    shape = _SHARES[role] * np.sqrt(possessions / 200.0 + 1.0)[:, None] + 0.05
    share = rng.gamma(shape)
    share /= share.sum(axis=1, keepdims=True)
    share = np.round(share, 4)
    ppp = np.round(rng.normal(0.98, 0.12, (n, len(PLAY_TYPES)))
                   + rng.normal(0, 0.6, (n, len(PLAY_TYPES))) / np.sqrt(1 + share * possessions[:, None]), 3)
    ppp[share == 0] = np.nan
    other = _OTHER[role] + rng.standard_normal((n, len(_OTHER_SD))) * _OTHER_SD
    other = np.round(np.clip(other, 0, None), 4)
    frame = pd.DataFrame(np.hstack([share, ppp, other]), columns=list(FEATURES))
    # text columns: one string per distinct value, then a take (no per-row formatting)
    frame.insert(0, "player_id", _labels("S{:07d}", n_players)[player])
    frame.insert(1, "player", _labels("Player {}", n_players)[player])
    frame.insert(2, "season", _labels("{}", 2000 + seasons)[2000 + season_no])
    frame.insert(3, "team", _labels("T{:02d}", 40)[rng.integers(0, 30, n)])
    frame.insert(4, "games", games)
    frame.insert(5, "minutes", minutes)
    frame.insert(6, "possessions", possessions)
    return _with_trades(frame, rng)


def _labels(pattern, count):
    return np.array([pattern.format(i) for i in range(count)], dtype=object)


def _with_trades(frame, rng, share=0.02):
    """Split about ``share`` of the rows into two stints with other teams (a mid-season trade)."""
    traded = rng.random(len(frame)) < share
    if not traded.any():
        return frame
    first = frame[traded].copy()
    second = first.copy()
    cut = rng.uniform(0.3, 0.7, len(first))
    for col in ("games", "minutes", "possessions"):
        first[col] = np.maximum(1, np.round(first[col] * cut)).astype(int)
        second[col] = np.maximum(1, frame.loc[traded, col].to_numpy() - first[col].to_numpy())
    second["team"] = _labels("T{:02d}", 40)[rng.integers(30, 40, len(second))]
    # the new team uses him a little differently: small changes in every rate and share
    shares = [c for c in FEATURES if c.startswith("share_")]
    others = [c for c in FEATURES if not c.startswith("share_")]
    bumped = second[shares].to_numpy() * rng.uniform(0.9, 1.1, (len(second), len(shares)))
    second[shares] = np.floor(bumped / bumped.sum(axis=1, keepdims=True) * 1e4) / 1e4  # still sum <= 1
    second[others] = np.round(second[others].to_numpy() * rng.uniform(0.95, 1.05, (len(second), len(others))), 4)
    first["stint"], second["stint"] = 1, 2
    kept = frame[~traded].copy()
    kept["stint"] = 1
    return pd.concat([kept, first, second], ignore_index=True)


def write_league(frame: pd.DataFrame, folder, fmt: str) -> list:
    """Write the league as one file per season (``csv``) or one long Parquet file."""
    from pathlib import Path

    folder = Path(folder)
    folder.mkdir(parents=True, exist_ok=True)
    if fmt == "parquet":
        path = folder / "league.parquet"
        frame.to_parquet(path, index=False)
        return [path]
    paths = []
    for season, part in frame.groupby("season", sort=True):
        path = folder / f"{season}.csv"
        part.drop(columns="season").to_csv(path, index=False)
        paths.append(path)
    return paths
