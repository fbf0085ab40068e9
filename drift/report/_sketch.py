"""Small hand-written SVGs for the player pages: one shared role-map background, one path per player.

The background (role centres and axis names) is drawn once as an SVG ``<symbol>``; each player's
path ``<use>``-s it, so hundreds of player pages stay small.
"""

from __future__ import annotations

from dataclasses import dataclass

__all__ = ["MapFrame", "map_frame", "map_symbol", "player_path"]

_W, _H, _PAD = 320, 220, 18


@dataclass(frozen=True)
class MapFrame:
    """Where component scores land on the small map: x/y ranges and the axis names."""

    x0: float
    x1: float
    y0: float
    y1: float
    x_label: str
    y_label: str

    def xy(self, pc1, pc2):
        x = _PAD + (pc1 - self.x0) / (self.x1 - self.x0) * (_W - 2 * _PAD)
        y = _H - _PAD - (pc2 - self.y0) / (self.y1 - self.y0) * (_H - 2 * _PAD)
        return min(max(x, 2.0), _W - 2.0), min(max(y, 2.0), _H - 2.0)


def map_frame(pool_scores, centroids, x_label, y_label) -> MapFrame:
    """Ranges covering the centres and the middle 98% of the pool on the first two components."""
    import numpy as np

    pts = np.vstack([np.quantile(pool_scores, [0.01, 0.99], axis=0), centroids])
    lo, hi = pts.min(axis=0), pts.max(axis=0)
    span = np.where(hi - lo > 0, hi - lo, 1.0)
    lo, hi = lo - 0.05 * span, hi + 0.05 * span
    return MapFrame(float(lo[0]), float(hi[0]), float(lo[1]), float(hi[1]), x_label, y_label)


def map_symbol(frame: MapFrame, centroids, role_ids, colours) -> str:
    """The shared ``<svg>`` holding the role-map background as ``<symbol id="rolemap">``."""
    from markupsafe import escape

    parts = [f'<rect x="0" y="0" width="{_W}" height="{_H}" fill="#fff" stroke="#d5d9dc"/>']
    for rid, c in zip(role_ids, centroids):
        x, y = frame.xy(c[0], c[1])
        parts.append(f'<circle cx="{x:.1f}" cy="{y:.1f}" r="13" fill="{colours[rid]}" fill-opacity="0.28" '
                     f'stroke="{colours[rid]}"/><text x="{x:.1f}" y="{y + 3.5:.1f}" text-anchor="middle" '
                     f'font-size="10" fill="#222">{escape(rid)}</text>')
    parts.append(f'<text x="{_W / 2:.0f}" y="{_H - 4}" text-anchor="middle" font-size="8.5" fill="#555">'
                 f'{escape(frame.x_label)}</text>')
    parts.append(f'<text transform="translate(9 {_H / 2:.0f}) rotate(-90)" text-anchor="middle" font-size="8.5" '
                 f'fill="#555">{escape(frame.y_label)}</text>')
    return (f'<svg class="sprite" width="0" height="0" aria-hidden="true"><symbol id="rolemap" '
            f'viewBox="0 0 {_W} {_H}">{"".join(parts)}</symbol></svg>')


def player_path(frame: MapFrame, seasons, pc1, pc2, roles, name) -> str:
    """One player's seasons on the role map, joined in order, each labelled with its season's end year."""
    from markupsafe import escape

    pts = [frame.xy(a, b) for a, b in zip(pc1, pc2)]
    line = " ".join(f"{x:.1f},{y:.1f}" for x, y in pts)
    marks = []
    for i, ((x, y), season, role) in enumerate(zip(pts, seasons, roles)):
        last = i == len(pts) - 1
        marks.append(f'<circle cx="{x:.1f}" cy="{y:.1f}" r="{4.5 if last else 3}" fill="{"#111" if last else "#fff"}" '
                     f'stroke="#111"><title>{escape(season)}: {escape(role)}</title></circle>'
                     f'<text x="{x + 5:.1f}" y="{y - 4:.1f}" font-size="8" fill="#111">{escape(str(season)[-2:])}</text>')
    alt = (f"{name}'s seasons on the role map: " +
           ", ".join(f"{s} in {r}" for s, r in zip(seasons, roles)))
    return (f'<svg class="path" viewBox="0 0 {_W} {_H}" role="img" aria-label="{escape(alt)}">'
            f'<title>{escape(alt)}</title><use href="#rolemap"/>'
            f'<polyline points="{line}" fill="none" stroke="#111" stroke-width="1.2"/>{"".join(marks)}</svg>')
