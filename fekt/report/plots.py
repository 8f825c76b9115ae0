"""The stress figure of a solve: an overview of the part and a zoomed panel at each leading stress peak.

Our look: the signed principal stress of largest magnitude (tension positive, compression negative) on a
perceptually uniform diverging colormap centred on zero, so compressive peaks show as clearly as tensile
ones; a continuous colour bar with its unit; peaks as small numbered rings with labels placed so that
they overlap nothing; singular corners marked with a cross. The overview keeps the part's true shape and
the zoom panels carry the detail, with each peak's Kt written beside it. matplotlib is imported lazily
and never through pyplot (no global state).
"""

from __future__ import annotations

import math

import numpy as np

from ..kinds import FeatureKind
from ..models.base import in_plane_principal
from ..post.fields import corner_stress
from .labels import Placer

#: perceptually uniform diverging colormap (matplotlib >= 3.10), with a fallback for older versions
DIVERGING = ("vanimo", "berlin", "RdBu_r")
#: zoom panels drawn (distinct features, largest peaks first)
ZOOMS = 4
CAUTION = "Linear-elastic idealisation; check against the applicable codes and licensed engineering practice."


def _colormap():
    import matplotlib

    for name in DIVERGING:
        if name in matplotlib.colormaps:
            return matplotlib.colormaps[name]
    return matplotlib.colormaps["coolwarm"]


def signed_dominant(xx, yy, xy):
    """The principal stress of larger magnitude, with its sign (tension +, compression -)."""
    s1, s2 = in_plane_principal(xx, yy, xy)
    return np.where(np.abs(s1) >= np.abs(s2), s1, s2)


def _leading(peaks, n: int):
    """The largest peak of each of the first n distinct features."""
    out, seen = [], set()
    for p in peaks:
        if p.feature in seen:
            continue
        seen.add(p.feature)
        out.append(p)
        if len(out) == n:
            break
    return out


def write_figure(solved, path: str) -> None:
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.collections import LineCollection
    from matplotlib.colors import TwoSlopeNorm
    from matplotlib.figure import Figure
    from matplotlib.tri import Triangulation

    r = solved.result
    mesh = solved.pmesh.mesh
    st = corner_stress(solved.solution, solved.pmesh)
    field = signed_dominant(st.xx, st.yy, st.xy)  # (elements, 3), element values at the corners
    p = mesh.p[:, : mesh.nvertices]
    tri = mesh.t[:3].T
    xs, ys = p[0, tri].ravel(), p[1, tri].ravel()
    T = Triangulation(xs, ys, np.arange(xs.size).reshape(-1, 3))
    lim = float(np.max(np.abs(field))) or 1.0
    norm = TwoSlopeNorm(vcenter=0.0, vmin=-lim, vmax=lim)
    cmap = _colormap()

    x0, y0, x1, y1 = solved.part.bounding_box()
    w, h = max(x1 - x0, 1e-300), max(y1 - y0, 1e-300)
    width = 13.0
    over_h = min(max(0.85 * width / (w / h), 2.4), 7.0)  # slender parts: a short overview, never a sliver
    # zoom on features first: a plain-edge peak is seen well enough in the overview
    leading = _leading([p for p in r.peaks if p.feature_kind != FeatureKind.EDGE] or list(r.peaks), ZOOMS)
    zoom_h = 3.4 if leading else 0.0
    height = over_h + zoom_h + 1.3
    fig = Figure(figsize=(width, height))
    FigureCanvasAgg(fig)
    top = 1.0 - 0.45 / height
    ax = fig.add_axes((0.06, top - over_h / height, 0.8, over_h / height))
    cax = fig.add_axes((0.89, top - over_h / height, 0.015, over_h / height))
    tpc = ax.tripcolor(T, field.ravel(), shading="gouraud", cmap=cmap, norm=norm, rasterized=True)
    cb = fig.colorbar(tpc, cax=cax)
    cb.set_label(f"principal stress of largest magnitude [{r.units.stress}]\n(tension +, compression -)", fontsize=8)
    segs = [s.sample(np.radians(2.0)).T for loop in solved.part.loops for s in loop.segments]
    ax.add_collection(LineCollection(segs, colors="0.1", linewidths=0.9))
    pad = 0.04 * max(w, h)
    ax.set_xlim(x0 - pad, x1 + pad)
    ax.set_ylim(y0 - pad, y1 + pad)
    ax.set_aspect("equal", adjustable="box")
    ax.set_xlabel(f"x [{r.units.length}]", fontsize=8)
    ax.set_ylabel(f"y [{r.units.length}]", fontsize=8)
    ax.tick_params(labelsize=7)
    title = ax.set_title(f"{r.case_name}: stress peaks" + ("  (demo data)" if r.demo else ""), fontsize=11)
    fig.canvas.draw()
    placer = Placer(ax, fontsize=8)
    placer.reserve(title)
    for hpk in r.peaks:
        _mark(ax, hpk)
    for hpk in r.peaks:
        tag = f"{hpk.rank}" + (" singular" if hpk.singular else "")
        placer.add(hpk.x, hpk.y, tag, color="#b2182b" if hpk.singular else "black")
    if leading:
        n = len(leading)
        span_w = 0.86 / n
        for k, hpk in enumerate(leading):
            zax = fig.add_axes((0.06 + k * span_w, 0.55 / height, span_w - 0.04, (zoom_h - 0.6) / height))
            _zoom(zax, T, field, norm, cmap, segs, hpk, r, LineCollection)
    fig.text(0.01, 0.01, CAUTION, fontsize=7, color="0.3")
    fig.savefig(path, dpi=130)


def _mark(ax, hpk) -> None:
    """A small ring at a peak (or a cross at a singular corner) that leaves the peak's colour visible."""
    if hpk.singular:
        ax.plot(hpk.x, hpk.y, "x", ms=7, mew=1.6, color="#b2182b")
    else:
        ax.plot(hpk.x, hpk.y, "o", ms=5, mfc="none", mec="white", mew=2.0)
        ax.plot(hpk.x, hpk.y, "o", ms=5, mfc="none", mec="black", mew=0.8)


def _zoom(zax, T, field, norm, cmap, segs, hpk, r, LineCollection) -> None:
    radius = hpk.radius if (math.isfinite(hpk.radius) and hpk.radius > 0) else 0.0
    span = max(10 * hpk.element_size, 2.5 * radius, 1e-9)
    zax.tripcolor(T, field.ravel(), shading="gouraud", cmap=cmap, norm=norm, rasterized=True)
    zax.add_collection(LineCollection(segs, colors="0.1", linewidths=0.9))
    zax.set_xlim(hpk.x - span, hpk.x + span)
    zax.set_ylim(hpk.y - span, hpk.y + span)
    zax.set_aspect("equal", adjustable="box")
    zax.tick_params(labelsize=6)
    _mark(zax, hpk)
    kt = "no Kt" if hpk.kt_net is None else f"Kt_net {hpk.kt_net:.3g}"
    if hpk.band is not None and hpk.band.kt_net is not None and hpk.kt_net is not None:
        kt += f" +-{hpk.band.kt_net:.1g}"
    sense = "tension" if hpk.peak > 0 else "compression"
    label = f"#{hpk.rank} {hpk.feature}"
    if len(label) > 34:
        label = label[:31] + "..."
    zax.set_title(f"{label}\n{kt}, {hpk.peak:.4g} {r.units.stress} ({sense})"
                  + ("\nSINGULAR: no finite value" if hpk.singular else ""), fontsize=8)
