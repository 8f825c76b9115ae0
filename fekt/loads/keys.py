"""Shared reading of load and support keys (boundary names, force vectors) and the boundaries of a
built part they refer to; every load-type and support module uses these so that their messages agree."""

from __future__ import annotations

import math
from collections.abc import Mapping

import numpy as np

from ..case import fields as F
from ..case.fields import LoadContext
from ..errors import CaseError, GeometryError
from ..geometry.model import ARC, LINE, PartGeometry
from ..kinds import LoopKind

#: relative tolerance for "the same circle" and "straight and collinear" (our own choice)
SHAPE_TOLERANCE = 1e-7


def load_name(table: Mapping[str, object], item: str, default: str) -> str:
    return F.name(table["name"], F.path(item, "name")) if "name" in table else default


def boundaries(table: Mapping[str, object], key: str, ctx: LoadContext, item: str, *, edges: bool = True,
               holes: bool = True) -> tuple[str, ...]:
    """Names of outline edges and/or cut-outs under ``key`` (a name or an array of names), each checked."""
    raw = F.required(table, key, item)
    values = [raw] if isinstance(raw, str) else F.array(raw, F.path(item, key))
    if not values:
        raise CaseError("expected at least one name", item=F.path(item, key))
    known = (tuple(ctx.edges) if edges else ()) + (tuple(ctx.holes) if holes else ())
    what = " or ".join(w for w, on in (("edge", edges), ("cut-out", holes)) if on)
    names = []
    for j, v in enumerate(values):
        sub = F.path(item, key) if isinstance(raw, str) else F.path(F.path(item, key), j)
        n = F.name(v, sub)
        if n not in known:
            if holes and not edges and n in ctx.edges:
                raise CaseError(f"'{n}' is an outline edge, not a cut-out", item=sub,
                                hint=f"cut-outs: {', '.join(ctx.holes) or 'none'}")
            if edges and not holes and n in ctx.holes:
                raise CaseError(f"'{n}' is a cut-out, not an outline edge", item=sub,
                                hint=f"named edges: {', '.join(ctx.edges) or 'none'}")
            raise CaseError(f"the part has no {what} named '{n}'", item=sub,
                            hint=F.close_match(n, known) + f"names: {', '.join(known) or 'none'}")
        if n in names:
            raise CaseError(f"'{n}' is named twice", item=sub)
        names.append(n)
    return tuple(names)


def vector(table: Mapping[str, object], key: str, params: Mapping[str, float], item: str,
           *, nonzero: bool = True) -> tuple[float, float]:
    """A 2-vector [x, y] of numbers or expressions."""
    sub = F.path(item, key)
    raw = F.array(F.required(table, key, item), sub)
    if len(raw) != 2:
        raise CaseError(f"expected 2 components [x, y], got {len(raw)}", item=sub)
    v = tuple(F.number(raw[j], params, F.path(sub, j)) for j in range(2))
    if nonzero and v[0] == 0 and v[1] == 0:
        raise CaseError("the vector is zero", item=sub, hint="a load needs a direction and a magnitude")
    return v


def segments_of(part: PartGeometry, name: str, item: str) -> list[tuple[int, int]]:
    """(loop, segment) references of a named outline edge or cut-out of the built part."""
    refs = part.named_refs(name)
    if refs:
        return refs
    raise GeometryError(f"the part has no edge or cut-out named '{name}'", item=item)


def circle_of(part: PartGeometry, name: str, item: str) -> tuple[np.ndarray, float, list[tuple[int, int]]]:
    """Centre and radius of a circular cut-out (every segment an arc of one circle)."""
    refs = segments_of(part, name, item)
    segs = [part.segment(r) for r in refs]
    loop = part.loops[refs[0][0]]
    if loop.kind != LoopKind.CUTOUT or len(refs) != len(loop.segments):
        raise GeometryError(f"'{name}' is not a cut-out: a bolt or pin acts on a hole", item=item)
    if any(s.kind != ARC for s in segs):
        raise GeometryError(f"the cut-out '{name}' is not a circle: a bolt or pin acts on a circular hole",
                            item=item, hint="give the hole shape = \"circle\"")
    c = np.array(segs[0].center, dtype=float)
    R = segs[0].radius
    for s in segs[1:]:
        if np.hypot(*(np.array(s.center) - c)) > SHAPE_TOLERANCE * R or abs(s.radius - R) > SHAPE_TOLERANCE * R:
            raise GeometryError(f"the cut-out '{name}' is not one circle", item=item)
    return c, R, refs


def straight_edge(part: PartGeometry, name: str, item: str) -> tuple[np.ndarray, np.ndarray, list[tuple[int, int]]]:
    """A point on a straight named edge, its outward unit normal, and its segments (all collinear lines)."""
    refs = segments_of(part, name, item)
    segs = [part.segment(r) for r in refs]
    if any(s.kind != LINE for s in segs):
        raise GeometryError(f"edge '{name}' is not straight", item=item, hint="a symmetry plane or an end load "
                            "needs a straight edge")
    d = np.subtract(segs[0].end, segs[0].start)
    L = float(np.hypot(*d))
    n = np.array([d[1], -d[0]]) / L
    p0 = np.array(segs[0].start, dtype=float)
    size = max(max(np.hypot(*np.subtract(s.end, s.start)) for s in segs), L)
    for s in segs:
        for q in (s.start, s.end):
            if abs(float((np.array(q) - p0) @ n)) > SHAPE_TOLERANCE * size:
                raise GeometryError(f"edge '{name}' is not one straight line", item=item)
    return p0, n, refs


def angle_text(v) -> str:
    return f"{math.degrees(math.atan2(v[1], v[0])):.4g} deg"
