"""Small hand-written SVGs for the player pages: one shared role-map background, one path per player.

The background (role centres and axis names) is drawn once as an SVG ``<symbol>`` in the front
page; each player's path (:func:`path_points`, drawn by the page script) ``<use>``-s it, so a page
carries only its own points.
"""

from __future__ import annotations

from dataclasses import dataclass

__all__ = ["MapFrame", "map_frame", "map_symbol", "path_points"]

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

    def xy_many(self, pc1, pc2):
        """:meth:`xy` of whole arrays: (x list, y list), rounded to 0.1."""
        import numpy as np

        x = _PAD + (np.asarray(pc1, float) - self.x0) / (self.x1 - self.x0) * (_W - 2 * _PAD)
        y = _H - _PAD - (np.asarray(pc2, float) - self.y0) / (self.y1 - self.y0) * (_H - 2 * _PAD)
        return (np.round(np.clip(x, 2.0, _W - 2.0), 1).tolist(), np.round(np.clip(y, 2.0, _H - 2.0), 1).tolist())


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


#: where a season's label may sit around its marker (dx, dy of the text's left baseline), nearest first
_SPOTS = ((5, -4), (5, 10), (-15, -4), (-15, 10), (-5, -8), (-5, 16), (9, 3), (-19, 3),
          (5, -14), (-15, -14), (5, 20), (-15, 20), (15, -9), (-25, -9), (15, 15), (-25, 15))
_LABEL_W, _LABEL_H = 11.0, 8.0


def _place_labels(pts):
    """Label positions that keep every season's label apart from the others and from the markers.

    Greedy, in season order: the nearest free spot around the marker; when all are taken (many
    seasons on one spot) the label goes in a column beside the marker, with a leader line.
    """
    placed, out = [], []
    for x, y in pts:
        spot = None
        for dx, dy in _SPOTS:
            x0, y1 = x + dx, y + dy
            x1, y0 = x0 + _LABEL_W, y1 - _LABEL_H
            if x0 < 1 or x1 > _W - 1 or y0 < 1 or y1 > _H - 1:
                continue
            clear = True
            for b in placed:
                if x0 < b[2] and b[0] < x1 and y0 < b[3] and b[1] < y1:
                    clear = False
                    break
            if clear:
                for px, py in pts:
                    if x0 - 2 < px < x1 + 2 and y0 - 2 < py < y1 + 2:
                        clear = False
                        break
            if clear:
                spot = (x0, y1)
                break
        if spot is None:  # crowded: stack below the lowest label near this marker
            near = [b[3] for b in placed if abs(b[0] - x) < 40 and abs(b[1] - y) < 60]
            spot = (min(x + 12, _W - _LABEL_W - 1), min(max(near, default=y) + _LABEL_H, _H - 2))
        placed.append((spot[0], spot[1] - _LABEL_H, spot[0] + _LABEL_W, spot[1]))
        out.append(spot)
    return out


def path_points(xs, ys, seasons, roles, names) -> list:
    """One player's seasons on the small map: ``[x, y, label_x, label_y, label, title]`` each, in season
    order (the script joins them and marks the last). ``xs, ys`` are map positions
    (:meth:`MapFrame.xy_many`). The label is the season's last two characters, placed clear of the
    other labels; the title names the season and its role."""
    pts = list(zip(xs, ys))
    spots = _place_labels(pts)
    return [[x, y, round(lx, 1), round(ly, 1), str(season)[-2:], f"{season}: {role} {names.get(role, '')}"]
            for (x, y), (lx, ly), season, role in zip(pts, spots, seasons, roles)]
