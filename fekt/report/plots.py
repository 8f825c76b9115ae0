"""Figures for a solve: outline, mesh near the stress peaks, maximum principal stress field.

Our look: a perceptually uniform colormap (cividis: readable in greyscale and by colour-blind
readers), a continuous colour bar with a labelled unit, stress peaks as numbered open circles and net
sections as dashed lines. matplotlib is imported lazily so the library never pays for it.
"""

from __future__ import annotations

import numpy as np

from ..models.base import in_plane_principal
from ..post.fields import corner_stress


def write_figure(solved, path: str) -> None:
    from matplotlib.collections import LineCollection, PolyCollection
    from matplotlib.figure import Figure
    from matplotlib.tri import Triangulation

    r = solved.result
    mesh = solved.pmesh.mesh
    st = corner_stress(solved.solution, solved.pmesh)
    s1, _ = in_plane_principal(st.xx, st.yy, st.xy)  # (elements, 3)
    # split each P2 triangle into its corners for display (element values, unaveraged)
    p = mesh.p[:, : mesh.nvertices]
    tri = mesh.t.T
    xs = p[0, tri].ravel()
    ys = p[1, tri].ravel()
    T = Triangulation(xs, ys, np.arange(xs.size).reshape(-1, 3))
    fig = Figure(figsize=(13, 5.2))
    axes = fig.subplots(1, 2, gridspec_kw={"width_ratios": [2.2, 1]})
    ax = axes[0]
    vmax = float(np.max(s1))
    vmin = float(min(np.min(s1), 0.0))
    tpc = ax.tripcolor(T, s1.ravel(), shading="gouraud", cmap="cividis", vmin=vmin, vmax=vmax)
    cb = fig.colorbar(tpc, ax=ax, shrink=0.85)
    cb.set_label(f"maximum principal stress [{r.units.stress}]")
    _outline(ax, solved, LineCollection)
    axis = np.array(r.load.axis)
    e = np.array([-axis[1], axis[0]])
    for h in r.peaks:
        ax.plot(h.x, h.y, "o", mfc="none", mec="white", mew=2.2, ms=11)
        ax.plot(h.x, h.y, "o", mfc="none", mec="black", mew=1.0, ms=11)
        ax.annotate(str(h.rank), (h.x, h.y), xytext=(7, 7), textcoords="offset points", fontsize=10,
                    color="black", bbox=dict(boxstyle="round,pad=0.15", fc="white", ec="none", alpha=0.8))
        for a, b in h.net_section.intervals:
            p0 = h.net_section.s * axis + a * e
            p1 = h.net_section.s * axis + b * e
            ax.plot([p0[0], p1[0]], [p0[1], p1[1]], "--", color="white", lw=1.4)
            ax.plot([p0[0], p1[0]], [p0[1], p1[1]], ":", color="black", lw=1.0)
    ax.set_aspect("equal")
    ax.set_xlabel(f"x [{r.units.length}]")
    ax.set_ylabel(f"y [{r.units.length}]")
    title = f"{r.case_name}: maximum principal stress"
    if r.demo:
        title += " (demo data)"
    ax.set_title(title, fontsize=11)
    # zoom on the top stress peak: the mesh there
    ax2 = axes[1]
    if r.peaks:
        h = r.peaks[0]
        span = max(8 * h.element_size, 3 * (h.radius if np.isfinite(h.radius) and h.radius > 0 else h.element_size))
        polys = p[:, tri].transpose(1, 2, 0)  # (elements, 3 corners, xy)
        ax2.add_collection(PolyCollection(polys, facecolors="none", edgecolors="0.35", linewidths=0.5))
        _outline(ax2, solved, LineCollection)
        ax2.plot(h.x, h.y, "o", mfc="none", mec="black", mew=1.5, ms=12)
        ax2.set_xlim(h.x - span, h.x + span)
        ax2.set_ylim(h.y - span, h.y + span)
        ax2.set_aspect("equal")
        ax2.set_title(f"mesh at stress peak 1 ({h.feature})", fontsize=10)
        ax2.set_xlabel(f"x [{r.units.length}]")
    fig.text(0.01, 0.01, "Linear-elastic 2D idealisation; check against applicable codes and licensed "
             "engineering practice.", fontsize=8, color="0.3")
    fig.tight_layout(rect=(0, 0.03, 1, 1))
    fig.savefig(path, dpi=130)


def _outline(ax, solved, LineCollection) -> None:
    segs = []
    for loop in solved.part.loops:
        for s in loop.segments:
            pts = s.sample(np.radians(2.0)).T
            segs.append(pts)
    ax.add_collection(LineCollection(segs, colors="black", linewidths=1.2))
