"""Feature families, sample-size exposure, and the sample filters.

Families are read from column names:

* ``share_<type>`` -- share of a player's finishing possessions of one play type;
  a missing share means the play type was not used and becomes 0.
* ``ppp_<type>`` -- points per possession on that play type; its sample is the
  player's possessions times ``share_<type>``, so it is empty (no sample) when unused.
* ``ts_pct``, ``three_pa_rate``, ``ft_rate`` and other ``*_rate`` or ``*_fg*`` names -- shooting profile.
* anything else -- rates (usage, assist, rebound, turnover, steal, block percentages).
"""

from __future__ import annotations

from dataclasses import dataclass

__all__ = ["FeatureSpec", "feature_spec", "exposure_matrix", "sample_base", "safe_scale", "apply_filters",
           "fill_unused_shares", "FAMILIES"]

FAMILIES = ("share", "efficiency", "rate", "shooting")
_SHOOTING = {"ts_pct", "efg_pct", "three_pa_rate", "ft_rate", "three_pct", "rim_rate"}


@dataclass(frozen=True)
class FeatureSpec:
    """Features in model order, each one's family, and the share behind each efficiency."""

    names: tuple
    families: tuple
    share_of: dict  # efficiency feature -> its share feature (absent when the share is not given)

    def family(self, name: str) -> str:
        return self.families[self.names.index(name)]


def _family(name: str) -> str:
    if name.startswith("share_"):
        return "share"
    if name.startswith("ppp_"):
        return "efficiency"
    if name in _SHOOTING or name.endswith("_rate") or "fg" in name:
        return "shooting"
    return "rate"


def feature_spec(names) -> FeatureSpec:
    """Classify feature names into families and pair efficiencies with their shares."""
    names = tuple(names)
    families = tuple(_family(n) for n in names)
    share_of = {}
    for n, fam in zip(names, families):
        if fam == "efficiency":
            share = "share_" + n[len("ppp_"):]
            if share in names:
                share_of[n] = share
    return FeatureSpec(names=names, families=families, share_of=share_of)


def sample_base(table, *, floor=None):
    """Sample size of each row, shape (n,): possessions when every row has them, else minutes.

    ``floor`` (e.g. 1.0) keeps a zero sample from dividing by zero.
    """
    import numpy as np

    if "possessions" in table.columns and table["possessions"].notna().all():
        base = table["possessions"].to_numpy(float)
    else:
        base = table["minutes"].to_numpy(float)
    return base if floor is None else np.maximum(base, floor)


def safe_scale(scale, mean=0.0):
    """Standard deviations safe to divide by: a flat one (zero up to rounding) becomes 1.

    A feature with no spread carries nothing; unit scale keeps it harmless.
    """
    import numpy as np

    scale = np.asarray(scale, float)
    flat = scale <= 1e-9 * np.maximum(1.0, np.abs(mean))
    return np.where(flat, 1.0, scale)


def exposure_matrix(table, spec: FeatureSpec):
    """Sample size behind every value, shape (n_rows, n_features).

    Minutes for every feature (possessions when the table has them for every
    row); an efficiency's sample is that times its play type's share. A missing
    value has exposure 0.
    """
    import numpy as np

    base = sample_base(table)
    out = np.empty((len(table), len(spec.names)))
    for j, name in enumerate(spec.names):
        e = base.copy()
        share = spec.share_of.get(name)
        if share is not None:
            e = e * np.nan_to_num(table[share].to_numpy(float), nan=0.0)
        e[table[name].isna().to_numpy()] = 0.0
        out[:, j] = e
    return out


def apply_filters(seasons, *, min_games: float, min_minutes_per_game: float):
    """Split season rows into qualifying and excluded ones.

    Returns
    -------
    kept : DataFrame
    excluded : DataFrame
        The excluded rows' identity, games, minutes, a ``reason`` (with the numbers) and a
        ``reason_code`` (``few_games``, ``few_minutes`` or both joined by "+"; wording in
        :data:`drift.constants.FILTER_REASONS`).
    """
    import numpy as np

    games = seasons["games"].to_numpy(float)
    mpg = np.divide(seasons["minutes"].to_numpy(float), games,
                    out=np.zeros(len(seasons)), where=games > 0)
    reasons = np.full(len(seasons), "", dtype=object)
    few_games = games < min_games
    few_minutes = mpg < min_minutes_per_game
    reasons[few_games] = [f"games {g:g} < min_games {min_games:g}" for g in games[few_games]]
    for i in np.flatnonzero(few_minutes):
        why = f"minutes per game {mpg[i]:.1f} < min_minutes_per_game {min_minutes_per_game:g}"
        reasons[i] = f"{reasons[i]}; {why}" if reasons[i] else why
    bad = reasons != ""
    codes = np.where(few_games & few_minutes, "few_games+few_minutes",
                     np.where(few_games, "few_games", "few_minutes"))
    cols = [c for c in ("player_id", "player", "season", "team", "games", "minutes") if c in seasons]
    excluded = seasons.loc[bad, cols].copy()
    excluded["minutes_per_game"] = np.round(mpg[bad], 2)
    excluded["reason"] = reasons[bad]
    excluded["reason_code"] = codes[bad]
    return seasons.loc[~bad].reset_index(drop=True), excluded.reset_index(drop=True)


def fill_unused_shares(table, spec: FeatureSpec):
    """Missing play-type shares mean "not used": set them to 0.

    Returns
    -------
    table : DataFrame (a copy)
    counts : dict
        Feature -> number of values filled.
    """
    table = table.copy()
    counts = {}
    for name, fam in zip(spec.names, spec.families):
        if fam == "share":
            n = int(table[name].isna().sum())
            if n:
                table[name] = table[name].fillna(0.0)
                counts[name] = n
    return table, counts
