"""Labels that do not overlap: a small greedy placer for matplotlib annotations.

Each label is tried at growing distances from its anchor in eight directions (the preferred direction
first) and kept at the first place where its box overlaps no label placed before, no reserved box (the
title, the legend) and stays inside the axes; a thin leader line joins it to its anchor. Our own simple
scheme: the labels of a part drawing are few (tens), so a greedy search is enough.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

#: offsets tried, in points: distances and the eight directions (preferred direction first)
DISTANCES = (10, 18, 28, 40, 55, 75, 100)
DIRECTIONS = [(math.cos(math.radians(a)), math.sin(math.radians(a))) for a in (45, 135, -45, -135, 90, -90, 0, 180)]


@dataclass
class Placer:
    """Places annotations on one axes without overlaps (call :meth:`add` for each label, in priority order)."""

    ax: object
    fontsize: float = 8.0

    def __post_init__(self):
        self.fig = self.ax.figure
        self.taken: list = []

    def reserve(self, artist) -> None:
        """Keep labels off an artist already drawn (a title, a legend)."""
        self.taken.append(artist.get_window_extent(self._renderer()).expanded(1.05, 1.1))

    def _renderer(self):
        return self.fig.canvas.get_renderer()

    def add(self, x: float, y: float, text: str, *, prefer: tuple[float, float] | None = None, **kw):
        """An annotation of the data point (x, y), placed where it overlaps nothing placed before."""
        renderer = self._renderer()
        axes_box = self.ax.get_window_extent(renderer)
        directions = list(DIRECTIONS)
        if prefer is not None:
            n = math.hypot(*prefer) or 1.0
            directions.insert(0, (prefer[0] / n, prefer[1] / n))
        style = dict(fontsize=self.fontsize, color="black", ha="center", va="center", annotation_clip=False,
                     bbox=dict(boxstyle="round,pad=0.15", fc="white", ec="0.6", lw=0.5, alpha=0.9),
                     arrowprops=dict(arrowstyle="-", color="0.25", lw=0.6, shrinkA=0, shrinkB=2))
        style.update(kw)
        best = None
        for dist in DISTANCES:
            for dx, dy in directions:
                ann = self.ax.annotate(text, (x, y), xytext=(dx * dist, dy * dist), textcoords="offset points",
                                       **style)
                box = _text_box(ann, renderer)
                inside = (box.x0 >= axes_box.x0 and box.x1 <= axes_box.x1 and box.y0 >= axes_box.y0
                          and box.y1 <= axes_box.y1)
                if inside and not any(box.overlaps(t) for t in self.taken):
                    self.taken.append(box)
                    return ann
                if best is None and inside:
                    best = (dx * dist, dy * dist)
                ann.remove()
        # nowhere free: the first place inside the axes (or the nearest one), so the label is never lost
        offset = best or (directions[0][0] * DISTANCES[0], directions[0][1] * DISTANCES[0])
        ann = self.ax.annotate(text, (x, y), xytext=offset, textcoords="offset points", **style)
        self.taken.append(_text_box(ann, renderer))
        return ann


def _text_box(ann, renderer):
    """The box of an annotation's text alone (its leader line would always touch its own anchor)."""
    from matplotlib.text import Text

    ann.update_positions(renderer)
    return Text.get_window_extent(ann, renderer).expanded(1.15, 1.3)
