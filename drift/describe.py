"""Readable role descriptions from a role's most distinctive features."""

from __future__ import annotations

__all__ = ["feature_label", "describe_role", "name_role"]

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
