"""Supports: a fixed edge or hole (both displacement components held; a bolt modelled as rigid) and a
symmetry plane (the displacement normal to a straight edge held; a half or quarter model).

A support is a record of the load seam (``parse`` / ``apply``, registered in
:data:`fekt.loads.SUPPORTS`). The solver turns supports into restraints (:mod:`fekt.solver.restraints`)
and checks that, together, they remove every rigid motion the loads would set off; the statics of a net
section are then taken on the side of the cut without supports (docs/conventions.md).

Peaks where a fixed edge meets a free edge are load-introduction peaks (the corner of a clamp is
singular in elasticity); a symmetry plane introduces none (its mirror image is the part itself).
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from ..case.fields import LoadContext
from ..errors import CaseError, GeometryError
from ..geometry.model import PartGeometry
from ..models.base import Model
from . import keys
from .base import AppliedSupport, Introduction

KINDS = ("fixed", "symmetry")
KEYS = ("type", "name", "on")
#: points per boundary segment for the extent of a support along an axis
EXTENT_SAMPLES = 64


@dataclass(frozen=True)
class SupportSpec:
    kind: str
    on: tuple[str, ...]
    name: str = "support"

    def apply(self, part: PartGeometry, model: Model) -> AppliedSupport:
        return apply(self, part, model)


def parse(table: Mapping[str, object], ctx: LoadContext, item: str, kind: str) -> SupportSpec:
    on = keys.boundaries(table, "on", ctx, item, holes=(kind == "fixed"))
    if kind not in KINDS:
        raise CaseError(f"unknown support type '{kind}'", item=item, hint=f"types: {', '.join(KINDS)}")
    return SupportSpec(kind=kind, on=on, name=keys.load_name(table, item, kind))


def _points(part: PartGeometry, names, item: str) -> np.ndarray:
    pts = [part.segment(r).sample(max_len=None) for n in names for r in keys.segments_of(part, n, item)]
    pts += [part.segment(r).point(np.linspace(0, 1, EXTENT_SAMPLES)) for n in names
            for r in keys.segments_of(part, n, item)]
    return np.hstack(pts)


def _junctions(part: PartGeometry, names, item: str) -> np.ndarray:
    """Points where the held boundaries meet boundaries that are not held (2, n)."""
    held = {r for n in names for r in keys.segments_of(part, n, item)}
    out = []
    for li, si in held:
        loop = part.loops[li]
        k = len(loop.segments)
        if (li, (si - 1) % k) not in held:
            out.append(loop.segments[si].start)
        if (li, (si + 1) % k) not in held:
            out.append(loop.segments[si].end)
    return np.array(out, dtype=float).T if out else np.zeros((2, 0))


def apply(spec: SupportSpec, part: PartGeometry, model: Model) -> AppliedSupport:
    item = f"supports.{spec.name}.on"
    if not getattr(model, "has_thickness", True):
        raise GeometryError(f"supports are not available for the {model.name} model", item=item,
                            hint="a shaft is loaded by self-equilibrated end loads")
    normal = None
    if spec.kind == "symmetry":
        normals = []
        for n in spec.on:
            _, nrm, _ = keys.straight_edge(part, n, item)
            normals.append(nrm)
        if any(abs(abs(float(a @ normals[0])) - 1.0) > 1e-9 for a in normals):
            raise GeometryError("the edges of one symmetry plane must lie on one line (give two planes as two "
                                "supports)", item=item)
        normal = (float(normals[0][0]), float(normals[0][1]))
    pts = _points(part, spec.on, item)
    intros = ()
    notes = ()
    if spec.kind == "fixed":
        try:  # a fixed straight edge has a normal too (for a section cut right along it)
            normals = [keys.straight_edge(part, n, item)[1] for n in spec.on]
            if all(abs(float(a @ normals[0]) - 1.0) < 1e-9 for a in normals):
                normal = (float(normals[0][0]), float(normals[0][1]))
        except GeometryError:
            normal = None
        corners = _junctions(part, spec.on, item)
        size = max(np.ptp(pts[0]), np.ptp(pts[1]))
        reach = 0.05 * size

        def near(xy, c=corners, r=reach):
            if c.shape[1] == 0:
                return np.zeros(xy.shape[1], dtype=bool)
            d = np.min(np.hypot(xy[0][:, None] - c[0][None, :], xy[1][:, None] - c[1][None, :]), axis=1)
            return d <= r

        intros = (Introduction(spec.on[0], f"where support '{spec.name}' meets a free edge", near),)
        notes = (f"support '{spec.name}': {', '.join(repr(n) for n in spec.on)} fixed (both displacement components "
                 "held; a bolt or clamp taken as rigid)",)
    else:
        notes = (f"support '{spec.name}': symmetry plane on {', '.join(repr(n) for n in spec.on)} (displacement "
                 "normal to it held, sliding along it free)",)
    return AppliedSupport(name=spec.name, kind=spec.kind, boundaries=spec.on,
                          hold="fixed" if spec.kind == "fixed" else "normal", normal=normal, points=pts,
                          introductions=intros, notes=notes)
