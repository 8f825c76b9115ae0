"""``fekt show``: the part as fekt understood it, drawn without meshing.

The drawing shows the outline and cut-outs, each named edge with an arrow at its start pointing the
way the case file runs it (notch positions are measured from that start), the vertex numbers of the
outline as written, the loaded ends and the load axis, every notch feature with its name, sharp
corners marked, and the warnings. It is how to check a case file or a drawing before any solve.
"""

from __future__ import annotations

import math

import numpy as np

from ..kinds import FeatureKind
from .labels import Placer

#: colours of the drawing (our own; readable in greyscale: line weight and style carry the meaning too)
INK = "0.1"
EDGE_NAME = "#1f4e79"
LOADED = "#b35806"
FEATURE = "#542788"


def summary(case, part, applied, warnings) -> str:
    """The text ``fekt show`` prints: edges, features, loads and warnings."""
    lines = [f"fekt show: {case.name}" + ("   [demo data: invented part]" if case.demo else "")]
    if case.source:
        lines.append(f"case file: {case.source}")
    lu = case.units.length
    lines.append(f"area {part.area():.6g} {lu}^2; {len(part.loops) - 1} cut-out(s)")
    lines.append("Edges (as the outline runs them):")
    for name in part.edge_names():
        refs = part.edge_segments(name)
        length = sum(part.segment(r).length() for r in refs)
        lines.append(f"  '{name}': length {length:.6g} {lu}")
    lines.append("Features:")
    for f in part.features:
        rad = "sharp (singular)" if f.singular else (f"radius {f.radius:.4g} {lu}" if f.radius > 0 else "-")
        lines.append(f"  {f.name} [{f.kind}]: {rad}, at ({f.point[0]:.5g}, {f.point[1]:.5g})")
    if applied is not None:
        ax = applied.axis
        lines.append(f"Load '{applied.name}' ({applied.kind}): axis ({ax[0]:.4g}, {ax[1]:.4g}); components "
                     + ", ".join(f"{c.name} {c.magnitude:.6g}" for c in applied.components)
                     + "; loaded boundaries " + ", ".join(sorted(applied.loaded)))
    for w in warnings:
        lines.append(f"WARNING: {w}")
    return "\n".join(lines)


def write_part_figure(case, part, applied, warnings, path: str) -> None:
    """Draw the part (see the module docstring) into a PNG."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    x0, y0, x1, y1 = part.bounding_box()
    w, h = max(x1 - x0, 1e-300), max(y1 - y0, 1e-300)
    pad = 0.12 * max(w, h)
    aspect = (w + 2 * pad) / (h + 2 * pad)
    width = 12.0
    plot_h = min(max(0.88 * width / aspect, 2.5), 9.0)  # slender parts get a short but legible strip
    notes = 0.16 * min(len(warnings), 7)
    height = plot_h + 1.2 + notes
    fig = Figure(figsize=(width, height))
    FigureCanvasAgg(fig)  # a renderer of our own (no pyplot, no global backend switch)
    ax = fig.add_axes((0.06, (0.7 + notes) / height, 0.9, plot_h / height))
    ax.set_xlim(x0 - pad, x1 + pad)
    ax.set_ylim(y0 - pad, y1 + pad)
    ax.set_aspect("equal", adjustable="box")
    for loop in part.loops:
        for seg in loop.segments:
            pts = seg.sample(math.radians(2.0))
            ax.plot(pts[0], pts[1], color=INK, lw=1.2, solid_capstyle="round")
    loaded = set(applied.loaded) if applied is not None else set()
    for name in part.edge_names():
        for ref in part.edge_segments(name):
            seg = part.segment(ref)
            pts = seg.sample(math.radians(2.0))
            if name in loaded:
                ax.plot(pts[0], pts[1], color=LOADED, lw=4.0, alpha=0.8, solid_capstyle="butt")
    title = ax.set_title(f"{case.name}: part as read (no mesh)" + ("  [demo data]" if case.demo else ""), fontsize=11)
    ax.set_xlabel(f"x [{case.units.length}]")
    ax.set_ylabel(f"y [{case.units.length}]")
    fig.canvas.draw()  # a renderer for the label placer
    placer = Placer(ax)
    placer.reserve(title)
    _edge_arrows(ax, case, part, placer)
    _features(ax, part, placer)
    if applied is not None:
        _loads(ax, part, applied, placer, pad)
    if warnings:
        text = "\n".join("WARNING: " + _short(w) for w in warnings[:6])
        if len(warnings) > 6:
            text += f"\n... and {len(warnings) - 6} more (see the text output)"
        fig.text(0.01, 0.01, text, fontsize=7.5, color="#8c2d04", va="bottom", ha="left", wrap=True)
    fig.savefig(path, dpi=120)


def _short(text: str, n: int = 180) -> str:
    return text if len(text) <= n else text[: n - 3] + "..."


def _outline_vertices(case, part):
    """The outline's vertices as the case file wrote them (after a standard shape is expanded)."""
    from ..families import expand_family

    return expand_family(case.part).outline


def _edge_arrows(ax, case, part, placer) -> None:
    """Vertex numbers, and an arrow at the start of each edge pointing along the case file's order."""
    verts = _outline_vertices(case, part)
    n = len(verts)
    size = max(np.ptp([v.x for v in verts]) if verts else 1.0, np.ptp([v.y for v in verts]) if verts else 1.0, 1e-300)
    for i, v in enumerate(verts):
        ax.plot(v.x, v.y, "o", ms=3, color="0.35")
        placer.add(v.x, v.y, f"v{i}", fontsize=6.5, color="0.3",
                   bbox=dict(boxstyle="round,pad=0.1", fc="white", ec="none", alpha=0.8))
        nxt = verts[(i + 1) % n]
        d = np.array([nxt.x - v.x, nxt.y - v.y])
        length = float(np.hypot(*d))
        if length == 0:
            continue
        d /= length
        start = np.array([v.x, v.y]) + d * min(0.12 * length, 0.04 * size)
        tip = start + d * min(0.18 * length, 0.06 * size)
        ax.annotate("", tip, start, arrowprops=dict(arrowstyle="-|>", color=EDGE_NAME, lw=1.0, mutation_scale=9))
        if v.edge:
            mid = np.array([v.x, v.y]) + d * 0.5 * length
            normal = np.array([d[1], -d[0]])  # outward on a counter-clockwise outline, inward otherwise
            placer.add(mid[0], mid[1], f"'{v.edge}'", prefer=tuple(normal), color=EDGE_NAME, fontsize=8)


def _features(ax, part, placer) -> None:
    for f in part.features:
        x, y = f.point
        if f.kind == FeatureKind.SHARP_CORNER:
            ax.plot(x, y, "x", ms=9, mew=2.0, color="#b2182b")
            placer.add(x, y, f"{f.name} (singular: give it a radius)", color="#b2182b", fontsize=7.5)
            continue
        ax.plot(x, y, "D", ms=5, mfc="none", mec=FEATURE, mew=1.2)
        rad = f", r = {f.radius:.3g}" if f.radius > 0 else ""
        placer.add(x, y, f"{f.name}{rad}", color=FEATURE, fontsize=7.5)


def _loads(ax, part, applied, placer, pad) -> None:
    axis = np.array(applied.axis)
    for end in applied.ends:
        c = np.array(end.section.centroid)
        out = axis if end is applied.ends[-1] else -axis  # each end pulls outwards in tension
        ax.annotate("", c + out * 0.6 * pad, c, arrowprops=dict(arrowstyle="-|>", color=LOADED, lw=2.0,
                                                                   mutation_scale=14))
        placer.add(c[0], c[1], f"loaded end '{end.name}'", color=LOADED, fontsize=8, prefer=tuple(out))
    x0, y0, x1, y1 = part.bounding_box()
    base = np.array([x0, y0 - 0.6 * pad])
    ax.annotate("", base + axis * 0.8 * pad, base, arrowprops=dict(arrowstyle="-|>", color=INK, lw=1.2))
    ax.text(base[0], base[1] - 0.15 * pad, "load axis", fontsize=7.5, color=INK, va="top")
