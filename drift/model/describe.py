"""Readable role names and descriptions from a role's most distinctive features.

A role's *name* is what a coach would call it ("pick-and-roll playmaker",
"rim-running big", "spot-up wing") when its profile supports one of the
:data:`ROLE_VOCABULARY` entries; otherwise it is its two strongest features
("cutting heavy, high steal rate"). Its *description* always lists the three
features that set it apart, so the name can be checked against the numbers.
:func:`name_roles` names all roles at once so that no two share a name.
"""

from __future__ import annotations

__all__ = ["feature_label", "describe_role", "name_role", "name_roles", "ROLE_VOCABULARY", "NAME_MIN_SCORE"]

#: role name -> (feature, weight) pairs in pool SDs; the first feature is the defining one.
#: Names are drift's own: the play type or statistic the role leans on most, then where it plays
#: (guard, wing, big) or what it does, so a name reads as its recipe. They deliberately copy no
#: published archetype or position system (tests/test_describe.py checks the ones we replaced).
ROLE_VOCABULARY = {
    "pick-and-roll playmaker": (("share_pnr_handler", 1.0), ("usage_pct", 1.0), ("ast_pct", 1.0)),
    "handoff guard": (("share_pnr_handler", 0.5), ("share_handoff", 1.0), ("share_spot_up", 0.5),
                      ("ast_pct", 0.5), ("drb_pct", -0.5)),
    "isolation scorer": (("share_isolation", 1.0), ("usage_pct", 0.7), ("share_pnr_handler", -0.3)),
    "spot-up wing": (("share_spot_up", 1.0), ("three_pa_rate", 1.0), ("usage_pct", -0.5), ("drb_pct", -0.5)),
    "pick-and-pop big": (("drb_pct", 1.0), ("share_spot_up", 1.0), ("three_pa_rate", 1.0), ("share_roll_man", 0.5),
                         ("share_transition", -0.5)),
    "rim-running big": (("share_roll_man", 1.0), ("blk_pct", 0.5), ("orb_pct", 0.5), ("three_pa_rate", -0.5)),
    "post-up big": (("share_post_up", 1.0), ("drb_pct", 0.5), ("usage_pct", 0.3)),
    "transition attacker": (("share_transition", 1.0), ("share_cut", 0.5), ("ft_rate", 0.5),
                            ("share_isolation", 0.5)),
    "screen-running shooter": (("share_off_screen", 1.0), ("share_handoff", 0.5), ("three_pa_rate", 0.5)),
    "putback big": (("share_putback", 1.0), ("orb_pct", 1.0), ("share_cut", 0.5)),
    "off-ball cutter": (("share_cut", 1.0), ("ts_pct", 0.5)),
    "shot-blocking big": (("blk_pct", 1.0), ("drb_pct", 0.5)),
    "ball-hawking wing": (("stl_pct", 1.0), ("usage_pct", -0.5), ("share_spot_up", 0.3)),
}
#: a role takes a vocabulary name only when its weighted profile is this far above the pool (SDs);
#: half an SD on average over the defining features (common practice, no source; checked on the
#: demo league's truth in tests/test_describe.py)
NAME_MIN_SCORE = 0.5

_PLAY_LABELS = {
    "isolation": "isolation", "pnr_handler": "pick-and-roll ball handler", "roll_man": "roll man",
    "post_up": "post-up", "spot_up": "spot-up", "transition": "transition", "cut": "cutting",
    "off_screen": "off-screen", "handoff": "handoff", "putback": "putback",
}
_LABELS = {
    "usage_pct": "usage", "ast_pct": "assist rate", "orb_pct": "offensive rebounding",
    "drb_pct": "defensive rebounding", "tov_pct": "turnover rate", "stl_pct": "steal rate",
    "blk_pct": "block rate", "ts_pct": "true shooting", "three_pa_rate": "three-point rate",
    "ft_rate": "free-throw rate",
}


def feature_label(name: str) -> str:
    """Plain-language name of a feature (``share_spot_up`` -> "spot-up share")."""
    for prefix, kind in (("share_", "share"), ("ppp_", "efficiency")):
        if name.startswith(prefix):
            play = name[len(prefix):]
            return f"{_PLAY_LABELS.get(play, play.replace('_', ' '))} {kind}"
    return _LABELS.get(name, name.replace("_", " "))


def _phrase(name: str, z: float) -> str:
    high = z > 0
    if name.startswith("share_"):
        play = _PLAY_LABELS.get(name[6:], name[6:].replace("_", " "))
        return f"{play} heavy" if high else f"little {play}"
    if name.startswith("ppp_"):
        play = _PLAY_LABELS.get(name[4:], name[4:].replace("_", " "))
        return f"efficient {play}" if high else f"inefficient {play}"
    return f"{'high' if high else 'low'} {feature_label(name)}"


def describe_role(z_by_feature, *, n: int = 3) -> str:
    """Describe a role by its ``n`` largest standardised differences from the pool mean.

    Parameters
    ----------
    z_by_feature : mapping feature -> centroid minus pool mean, in pool SDs
    """
    ranked = sorted(z_by_feature.items(), key=lambda kv: (-abs(kv[1]), kv[0]))[:n]
    return ", ".join(_phrase(name, z) for name, z in ranked)


def name_role(z_by_feature, *, n: int = 2) -> str:
    """A short name from the ``n`` features the role is most *above* the pool on.

    What a role does a lot of names it better than what it rarely does; when
    fewer than ``n`` features are above the pool, the largest deficits fill in.
    """
    ranked = sorted(z_by_feature.items(), key=lambda kv: (-kv[1], kv[0]))
    chosen = [kv for kv in ranked if kv[1] > 0][:n]
    if len(chosen) < n:
        chosen += sorted(z_by_feature.items(), key=lambda kv: (kv[1], kv[0]))[: n - len(chosen)]
    return ", ".join(_phrase(name, z) for name, z in chosen)


def _score(z_by_feature, recipe) -> float:
    """Weighted mean of the role's SDs over the recipe's features; -inf without the defining one."""
    first = recipe[0][0]
    if first not in z_by_feature or z_by_feature[first] <= 0.5:
        return float("-inf")
    present = [(z_by_feature[f], w) for f, w in recipe if f in z_by_feature]
    return sum(z * w for z, w in present) / sum(abs(w) for _, w in present)


def name_roles(z_roles, *, given=None) -> list:
    """Names for all roles at once, none repeating another.

    Parameters
    ----------
    z_roles : list of mapping feature -> centre minus pool mean, in pool SDs
    given : list of (str or None), optional
        Names the user set (kept as they are, and never reused).

    Returns
    -------
    list of str
        The :data:`ROLE_VOCABULARY` name that fits each role best when its score
        reaches :data:`NAME_MIN_SCORE` (one role per name, best total fit by the
        Hungarian algorithm), else :func:`name_role`; repeats get a distinguishing
        feature added.
    """
    import numpy as np
    from scipy.optimize import linear_sum_assignment

    given = list(given) if given is not None else [None] * len(z_roles)
    vocab = [v for v in ROLE_VOCABULARY if v not in given]
    scores = np.array([[_score(z, ROLE_VOCABULARY[v]) for v in vocab] for z in z_roles]).reshape(len(z_roles), -1)
    names = [g for g in given]
    free = [i for i, g in enumerate(given) if g is None]
    if vocab and free:
        cost = np.where(np.isfinite(scores[free]), -scores[free], 1e6)
        for r, c in zip(*linear_sum_assignment(cost)):
            if scores[free[r], c] >= NAME_MIN_SCORE:
                names[free[r]] = vocab[c]
    for i in free:
        if names[i] is None:
            names[i] = name_role(z_roles[i])
    return _distinct(names, z_roles, set(i for i, g in enumerate(given) if g is not None))


def _distinct(names, z_roles, fixed):
    """Add a role's next most distinctive feature to a name another role already has."""
    for _ in range(len(names)):
        seen = {}
        for i, n in enumerate(names):
            seen.setdefault(n.lower(), []).append(i)
        clashes = [i for idx in seen.values() if len(idx) > 1 for i in idx[1:] if i not in fixed]
        if not clashes:
            return names
        for i in clashes:
            extra = [kv for kv in sorted(z_roles[i].items(), key=lambda kv: (-abs(kv[1]), kv[0]))
                     if _phrase(*kv) not in names[i]]
            names[i] = f"{names[i]} ({_phrase(*extra[0])})" if extra else f"{names[i]} ({i + 1})"
    return names
