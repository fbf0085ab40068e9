"""Readable numbers and words for the report: percentages, significant digits, plain-word strength.

Pure functions of plain values; the templates only print what these return.
"""

from __future__ import annotations

import math
import re

__all__ = ["sig", "percent", "membership", "membership_between", "BETWEEN_BELOW", "strength", "feature_value", "slug", "figures_title", "filter_words", "p_text"]


def _missing(v) -> bool:
    return v is None or v != v  # NaN is the one value unequal to itself


def sig(v, digits=3) -> str:
    """``v`` to ``digits`` significant digits, without scientific notation for ordinary sizes."""
    if v is None or v != v:
        return ""
    v = float(v)
    if v == 0:
        return "0"
    decimals = digits - 1 - math.floor(math.log10(abs(v)))
    return f"{v:,.{decimals if decimals > 0 else 0}f}"


def percent(v, digits=2) -> str:
    """A share or rate in [0, 1] as a percentage with ``digits`` significant digits (0.339 -> "34%")."""
    if _missing(v):
        return ""
    return f"{sig(100 * float(v), digits)}%"


#: below this membership a season reads "between <role> and <second role>", not as one role's number
BETWEEN_BELOW = 0.6


def membership_between(p, role_name, second_p, second_name) -> str:
    """A season's membership: its number, or "between X and Y (p / q)" below :data:`BETWEEN_BELOW`."""
    if _missing(p) or p >= BETWEEN_BELOW or _missing(second_p):
        return membership(p)
    return f"between {role_name} and {second_name} ({membership(p)} / {membership(second_p)})"


def membership(p) -> str:
    """A membership probability; above 99% it reads ">99%", never a flat "100%"."""
    if _missing(p):
        return ""
    if p >= 0.99:
        return ">99%"
    if p < 0.01:
        return "<1%"
    return f"{100 * p:.0f}%"


# z of the one-sided normal equivalent of the move's p-value; the status itself (p < alpha) decides
# whether a move is beyond noise, the words only grade how far.
_GRADES = ((6.0, "far beyond noise"), (3.5, "well beyond noise"), (0.0, "beyond noise"))


def strength(p_value, z, alpha) -> str:
    """The evidence of a move in plain words: "within noise" unless p < alpha, then graded by z."""
    if _missing(p_value):
        return ""
    if p_value >= alpha:
        # z 1.645 is p = 0.05: suggestive, not beyond the chosen level
        return "near the noise limit" if (not _missing(z) and z >= 1.645) else "within noise"
    return next(words for cut, words in _GRADES if z >= cut)


def _value_kind(name) -> str:
    if name.startswith("ppp_"):
        return "ppp"
    if name.startswith("share_") or name in {"ts_pct", "efg_pct"} or name.endswith("_rate"):
        return "share"
    if name.endswith("_pct"):  # percentages already on a 0-100 scale
        return "pct"
    return "plain"


_KINDS: dict = {}


def feature_value(name, v) -> str:
    """A feature in its own units: shares and 0-1 shooting figures as %, rates as printed, ppp to 2 dp."""
    if v is None or v != v:
        return ""
    kind = _KINDS.get(name) or _KINDS.setdefault(name, _value_kind(name))
    if kind == "ppp":
        return f"{v:.2f}"
    if kind == "share":
        return percent(v, 3)
    if kind == "pct":
        return f"{sig(v, 3)}%"
    return sig(v, 3)


_UNSAFE = re.compile(r"[^A-Za-z0-9_-]")


def slug(prefix: str, key) -> str:
    """A safe, unique HTML id for a player or team id (other characters hex-encoded)."""
    return prefix + _UNSAFE.sub(lambda m: f".{ord(m.group()):x}", str(key))


def figures_title(distance, noise, z, p_value) -> str:
    """The figures behind a move's words, for hover text."""
    return (f"distance {sig(distance, 3)} (noise alone: {sig(noise, 3)}), z {sig(z, 3)}, "
            f"p {p_text(p_value)}")


def p_text(p) -> str:
    """A p-value readable at any size: "p 0.034", "p 1.2e-05", "< 1e-10" (never 0.0000…00012)."""
    if _missing(p):
        return ""
    p = float(p)
    if p < 1e-10:
        return "< 1e-10"
    if p < 1e-3:
        return f"{p:.1e}"
    return sig(p, 2)


def filter_words(row, config) -> str:
    """Why a season row was left out, in numbers: "9.1 minutes per game < 10" (and/or games).

    ``row`` is a record of the excluded table (games, minutes_per_game, reason_code); the limits
    come from ``config.intake``; codes without a number read as ``drift.constants.reason_text``.
    """
    from drift.constants import reason_text

    intake = config.intake
    parts = []
    for code in str(row.get("reason_code", "")).split("+"):
        if code == "few_games":
            parts.append(f"{float(row['games']):g} games < {intake.min_games:g}")
        elif code == "few_minutes":
            parts.append(f"{float(row['minutes_per_game']):.1f} minutes per game < {intake.min_minutes_per_game:g}")
        elif code:
            parts.append(reason_text(code))
    return " and ".join(parts)
