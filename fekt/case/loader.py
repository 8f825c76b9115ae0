"""Read a case file (TOML) into a :class:`~fekt.case.schema.Case`.

The loader checks what only the file can get wrong: syntax, known keys, value types, unit names,
and the sign of values that can only be positive. Whether the described shape is a valid planar
region is left to :func:`fekt.geometry.build.build_part`, which has the geometry to judge it.

Every failure raises :class:`~fekt.errors.CaseError` whose ``item`` is the dotted path of the
offending entry (e.g. ``part.outline[2].fillet``; array indices count from 0) and whose ``hint``
suggests a fix. The file format is described in ``docs/case-format.md``.
"""

from __future__ import annotations

import math
import tomllib
from collections.abc import Callable, Mapping, Sequence
from dataclasses import replace
from pathlib import Path
from typing import TypeVar

from fekt.case import fields as F
from fekt.case.expr import resolve_parameters
from fekt.case.fields import Catalogue, LoadContext
from fekt.case import strengths as S
from fekt.case.output_units import OutputUnits, parse_output_units
from fekt.case.schema import (
    FORCE_UNITS,
    LENGTH_UNITS,
    Case,
    CutoutSpec,
    LoadCaseSpec,
    STRENGTH_KEYS,
    AssessmentSpec,
    Material,
    MeshSpec,
    NominalSpec,
    NotchSpec,
    PartSpec,
    Units,
    Vertex,
    chain_signed_area,
)
from fekt.errors import CaseError, InputError

__all__ = ["SHAPES", "case_from_dict", "load_case", "parse_case", "read_case_table"]

_T = TypeVar("_T")

BULGES = ("out", "in")

_TOP_KEYS = ("case", "units", "parameters", "part", "material", "load", "loads", "supports", "load_cases", "nominal",
             "mesh", "cycle", "assessment")
_LOAD_CASE_KEYS = ("name", "factors")
_NOMINAL_KEYS = ("axis", "stress", "feature")
_CASE_KEYS = ("name", "description", "demo", "measure")
#: the boundary stresses peaks can be found by (values of fekt.kinds.Measure)
MEASURES = ("auto", "tangential", "principal", "max_principal", "min_principal", "von_mises")
_UNITS_KEYS = ("length", "force", "output")
_PART_KEYS = ("model", "thickness", "outline", "cutouts", "notches", "family", "dimensions", "dxf", "dxf_units",
              "dxf_tolerance")
_OUTLINE_VERTEX_KEYS = ("x", "y", "edge", "fillet", "arc", "name")
# Cut-out chains have no edge names: nothing refers to the edges of a hole.
_CHAIN_VERTEX_KEYS = ("x", "y", "fillet", "arc")
_ARC_KEYS = ("radius", "bulge")
_NOTCH_KEYS = ("name", "edge", "position", "depth", "root_radius", "angle")
_CUTOUT_COMMON_KEYS = ("name", "shape")
#: keys each cut-out shape takes besides name and shape, and which of them are required
_SHAPE_KEYS: Mapping[str, tuple[str, ...]] = {
    "circle": ("center", "diameter"),
    "ellipse": ("center", "a", "b", "angle"),
    "slot": ("center", "length", "width", "angle"),
    "rounded_rectangle": ("center", "length", "width", "radius", "angle"),
    "chain": ("vertices",),
}
_SHAPE_REQUIRED: Mapping[str, tuple[str, ...]] = {
    "circle": ("center", "diameter"),
    "ellipse": ("center", "a", "b"),
    "slot": ("center", "length", "width"),
    "rounded_rectangle": ("center", "length", "width", "radius"),
    "chain": ("vertices",),
}
SHAPES = tuple(_SHAPE_KEYS)
_MATERIAL_KEYS = ("E", "nu", *STRENGTH_KEYS)
_MESH_KEYS = ("elements_per_radius", "size", "growth", "max_elements")


# --- public API ----------------------------------------------------------------------------------

def _read_text(file: Path) -> str:
    try:
        # utf-8-sig: editors on some systems prepend a byte-order mark that TOML does not allow.
        return file.read_text(encoding="utf-8-sig")
    except FileNotFoundError:
        raise CaseError("no such case file", item=str(file)) from None
    except UnicodeDecodeError as exc:
        raise CaseError(f"the file is not UTF-8 text ({exc.reason} at byte {exc.start})", item=str(file),
                        hint="save the case file as UTF-8") from None
    except OSError as exc:
        raise CaseError(f"cannot read the case file: {exc.strerror or exc}", item=str(file)) from None


def _toml(text: str, source: str) -> dict:
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        # tomllib's message already ends with "(at line L, column C)", which is what the user needs.
        raise CaseError(f"TOML syntax error: {exc}", item=source,
                        hint="see docs/case-format.md for the file format") from None


def read_case_table(path: str | Path) -> dict:
    """The parsed TOML table of a case file (sweeps rebuild the case from it with other parameters)."""
    return _toml(_read_text(Path(path)), str(path))


def load_case(path: str | Path, catalogue: Catalogue) -> Case:
    """Read and check the case file at ``path``; ``Case.source`` is the path as given."""
    return case_from_dict(read_case_table(path), str(Path(path)), catalogue=catalogue)


def parse_case(text: str, catalogue: Catalogue, source: str = "<string>") -> Case:
    """Parse case-file text; ``source`` names it in messages and becomes ``Case.source``."""
    return case_from_dict(_toml(text, source), source, catalogue=catalogue)


def case_from_dict(data: dict, source: str, overrides: Mapping[str, float] | None = None, *,
                   catalogue: Catalogue) -> Case:
    """Check an already parsed case table (as :func:`tomllib.loads` returns it) and build the Case.

    ``overrides`` replaces the values of named parameters (sweeps and goal-seeking vary them);
    ``catalogue`` names the analysis models, load types and standard shapes a file may use
    (:data:`fekt.registry.CATALOGUE` is the default)."""
    root = F.table(data, source or "<case>")
    F.check_keys(root, _TOP_KEYS, "")
    if overrides:
        raw_params = dict(F.table(root.get("parameters", {}), "parameters"))
        for name, value in overrides.items():
            if name not in raw_params:
                known = list(raw_params)
                raise CaseError(f"the case has no parameter named '{name}'", item=f"parameters.{name}",
                                hint=F.close_match(name, known) or
                                f"parameters in this case: {', '.join(known) or 'none'}")
            raw_params[name] = float(value)
        root = {**root, "parameters": raw_params}
    # Sections are read in the order they usually appear in a file, so the first error reported
    # is the first one the reader meets.
    name, description, demo, measure = _case_info(root.get("case", {}), source)
    units = _units(root.get("units", {}))
    params = resolve_parameters(root.get("parameters", {}), item_prefix="parameters")
    part = _part(F.required(root, "part", ""), params, catalogue, units, source)
    material = _material(root.get("material", {}), params)
    family = catalogue.families[part.family] if part.family else None
    edges = tuple(family.edges) if family else tuple(_edge_names(part.outline))
    holes = tuple(family.holes) if family else tuple(c.name for c in part.cutouts)
    ctx = LoadContext(params=params, edges=edges, default_ends=tuple(family.ends) if family else None,
                      holes=holes, model=part.model)
    loads = _loads(root, ctx, catalogue, part.model)
    supports = _supports(root.get("supports", []), ctx, catalogue)
    load_cases = _load_cases(root.get("load_cases", []), loads, params)
    nominal = _nominal(root.get("nominal", {}), params, len(load_cases) if load_cases else 1)
    mesh = _mesh(root.get("mesh", {}), params)
    cycle = S.cycle(root["cycle"], params) if "cycle" in root else None
    if cycle is not None and cycle.form == "cases":
        names = [lc.name for lc in load_cases]
        for key, name in (("max_case", cycle.max_case), ("min_case", cycle.min_case)):
            if name not in names:
                raise CaseError(f"the case has no load case named '{name}'", item=f"cycle.{key}",
                                hint=F.close_match(name, names) + f"load cases: {', '.join(names) or 'none'}")
    assessment = S.assessment(root["assessment"]) if "assessment" in root else AssessmentSpec()
    return Case(name=name, part=part, loads=loads, material=material, mesh=mesh, units=units,
                description=description, parameters=tuple(params.items()), source=source, demo=demo,
                measure=measure, supports=supports, load_cases=load_cases, nominal=nominal, cycle=cycle,
                assessment=assessment)


# --- [case] and [units] ------------------------------------------------------------------------------

def _default_name(source: str) -> str:
    # "<string>" and similar pseudo-sources have no useful stem.
    if not source or source.startswith("<"):
        return "case"
    return Path(source).stem


def _case_info(raw: object, source: str) -> tuple[str, str, bool, str]:
    table = F.table(raw, "case")
    F.check_keys(table, _CASE_KEYS, "case")
    name = F.name(table["name"], "case.name") if "name" in table else _default_name(source)
    description = F.text(table["description"], "case.description") if "description" in table else ""
    demo = F.flag(table["demo"], "case.demo") if "demo" in table else False
    measure = F.choice(table["measure"], MEASURES, "case.measure") if "measure" in table else "auto"
    return name, description, demo, measure


def _units(raw: object) -> Units:
    table = F.table(raw, "units")
    F.check_keys(table, _UNITS_KEYS, "units")
    length = F.choice(table.get("length", "mm"), LENGTH_UNITS, "units.length")
    force = F.choice(table.get("force", "N"), FORCE_UNITS, "units.force")
    output = _output_units(table["output"], length) if "output" in table else ""
    return Units(length=length, force=force, output=output)


def _output_units(raw: object, length: str) -> str:
    """``[units] output``: checked here (so a bad unit is reported with the file's other mistakes) and
    kept as written; the command line resolves a missing item from the case's own units."""
    text = F.text(raw, "units.output").strip()
    try:
        parse_output_units(text, OutputUnits(length=length), item="units.output")
    except InputError as exc:
        raise CaseError(exc.message, item="units.output", hint=exc.hint) from None
    return text


# --- [part] --------------------------------------------------------------------------------------------

def _part(raw: object, params: Mapping[str, float], catalogue: Catalogue, units: Units | None = None,
          source: str = "") -> PartSpec:
    table = F.table(raw, "part")
    F.check_keys(table, _PART_KEYS, "part")
    model = F.choice(table.get("model", _default_model(table, catalogue)), tuple(catalogue.models), "part.model")
    if "thickness" in table and not catalogue.models[model].has_thickness:
        raise CaseError(f"model '{model}' takes no thickness", item="part.thickness",
                        hint="a shaft is a solid of revolution described by its meridian section (x along the axis, "
                             "y = radius); remove thickness")
    if "thickness" in table:
        thickness = F.positive(table["thickness"], params, "part.thickness")
    elif catalogue.models[model].needs_thickness:
        raise CaseError("missing required value 'thickness' in [part]", item="part.thickness",
                        hint="a plane-stress part needs its thickness to turn forces into stresses")
    else:
        thickness = 1.0  # plane strain: per unit thickness; a shaft has none (not used)
    if "family" in table:
        return _family_part(table, params, catalogue, model, thickness)
    if "dxf" in table:
        outline, cutouts = _dxf_part(table, params, units or Units(), source)
    else:
        for key in ("dxf_units", "dxf_tolerance"):
            if key in table:
                raise CaseError(f"'{key}' only applies with part.dxf", item=f"part.{key}")
        outline = _outline(F.required(table, "outline", "part"), params)
        cutouts = ()
    cutouts = cutouts + _items(table, "cutouts", params, _cutout)
    F.unique([c.name for c in cutouts], "part.cutouts", "cut-out")
    notches = _items(table, "notches", params, _notch)
    F.unique([n.name for n in notches], "part.notches", "notch")
    notches = tuple(_notch_on_outline(n, k, outline) for k, n in enumerate(notches))
    return PartSpec(outline=outline, cutouts=cutouts, notches=notches, model=model, thickness=thickness)


def _default_model(table: Mapping[str, object], catalogue: Catalogue) -> str:
    """The model when the file gives none: a standard shape's first model (a shaft family is
    axisymmetric), otherwise plane stress."""
    family = catalogue.families.get(table["family"]) if isinstance(table.get("family"), str) else None
    models = getattr(family, "models", None)
    return models[0] if models else "plane_stress"


def _dxf_part(table: Mapping[str, object], params: Mapping[str, float], units: Units,
              source: str) -> tuple[tuple[Vertex, ...], tuple[CutoutSpec, ...]]:
    """Outline and cut-outs from the DXF drawing named by part.dxf (relative to the case file)."""
    from .dxf import MM_PER_UNIT, read_outline

    if "outline" in table:
        raise CaseError("give either part.outline or part.dxf, not both", item="part.outline")
    name = F.text(table["dxf"], "part.dxf")
    base = Path(source).parent if source and not source.startswith("<") else Path(".")
    path = (base / name) if not Path(name).is_absolute() else Path(name)
    if not path.is_file():
        raise CaseError(f"DXF file '{path}' not found", item="part.dxf", hint="the path is relative to the case file")
    unit = F.choice(table["dxf_units"], tuple(MM_PER_UNIT), "part.dxf_units") if "dxf_units" in table else None
    tol = F.positive(table["dxf_tolerance"], params, "part.dxf_tolerance") if "dxf_tolerance" in table else None
    drawing = read_outline(path, case_unit=units.length, drawing_unit=unit, tolerance=tol)
    return drawing.outline, drawing.cutouts


def _family_part(table: Mapping[str, object], params: Mapping[str, float], catalogue: Catalogue, model: str,
                 thickness: float) -> PartSpec:
    """A standard shape given by its handbook dimensions (see fekt.families)."""
    family = F.choice(table["family"], tuple(catalogue.families), "part.family")
    for key in ("outline", "cutouts", "notches"):
        if key in table:
            raise CaseError(f"'{key}' cannot be combined with family = '{family}'", item=f"part.{key}",
                            hint="a family builds the whole outline from its dimensions; remove one of them")
    shape = catalogue.families[family]
    models = tuple(getattr(shape, "models", ()) or ())
    if models and model not in models:
        raise CaseError(f"family '{family}' is not solved with model '{model}'", item="part.model",
                        hint=f"it takes model = {' or '.join(repr(m) for m in models)}"
                             + ("; or leave model out" if "model" in table else ""))
    dims = F.table(F.required(table, "dimensions", "part"), "part.dimensions")
    F.check_keys(dims, shape.required + shape.optional, "part.dimensions")
    for key in shape.required:
        F.required(dims, key, "part.dimensions")
    values = tuple((k, F.positive(dims[k], params, f"part.dimensions.{k}")) for k in shape.required + shape.optional
                   if k in dims)
    return PartSpec(outline=(), model=model, thickness=thickness, family=family, dimensions=values)


def _items(table: Mapping[str, object], key: str, params: Mapping[str, float],
           read: Callable[[object, str, int, Mapping[str, float]], _T]) -> tuple[_T, ...]:
    item = f"part.{key}"
    entries = F.array(table.get(key, []), item)
    return tuple(read(entry, f"{item}[{k}]", k, params) for k, entry in enumerate(entries))


def _outline(raw: object, params: Mapping[str, float]) -> tuple[Vertex, ...]:
    item = "part.outline"
    entries = F.array(raw, item)
    vertices = tuple(_vertex(v, F.path(item, i), params, _OUTLINE_VERTEX_KEYS, index=i) for i, v in enumerate(entries))
    for i, v in enumerate(vertices):
        if v.name is not None and not (v.fillet > 0 or v.arc_radius is not None):
            raise CaseError("only a fillet or an arc edge can be named (the name is the feature's)",
                            item=f"{item}[{i}].name", hint="give the vertex a fillet or an arc, or remove the name")
    F.unique([v.name for v in vertices if v.name is not None], item, "feature")
    named = [v.edge for v in vertices if v.edge is not None]
    # Loads and notches find edges by name, so a repeated name would silently pick several edges.
    indices = [i for i, v in enumerate(vertices) if v.edge is not None]
    for pos, name in enumerate(named):
        first = named.index(name)
        if first != pos:
            raise CaseError(f"the edge name '{name}' is already used by {item}[{indices[first]}]",
                            item=f"{item}[{indices[pos]}].edge", hint="give each edge its own name")
    return vertices


def _vertex(raw: object, item: str, params: Mapping[str, float], keys: Sequence[str],
            index: int | None = None) -> Vertex:
    table = F.table(raw, item)
    F.check_keys(table, keys, item)
    x = F.number(F.required(table, "x", item), params, F.path(item, "x"))
    y = F.number(F.required(table, "y", item), params, F.path(item, "y"))
    fillet = F.positive(table.get("fillet", 0.0), params, F.path(item, "fillet"), zero_ok=True)
    edge = F.name(table["edge"], F.path(item, "edge")) if "edge" in table else None
    arc_radius, bulge = _arc(table["arc"], F.path(item, "arc"), params) if "arc" in table else (None, "out")
    name = F.name(table["name"], F.path(item, "name")) if "name" in table else None
    return Vertex(x=x, y=y, fillet=fillet, edge=edge, arc_radius=arc_radius, bulge=bulge, name=name, index=index)


def _arc(raw: object, item: str, params: Mapping[str, float]) -> tuple[float, str]:
    table = F.table(raw, item)
    F.check_keys(table, _ARC_KEYS, item)
    radius = F.positive(F.required(table, "radius", item), params, F.path(item, "radius"))
    bulge = F.choice(table.get("bulge", "out"), BULGES, F.path(item, "bulge"))
    return radius, bulge


def _point(raw: object, item: str, params: Mapping[str, float]) -> tuple[float, float]:
    values = F.array(raw, item)
    if len(values) != 2:
        raise CaseError(f"expected 2 coordinates [x, y], got {len(values)}", item=item)
    return F.number(values[0], params, F.path(item, 0)), F.number(values[1], params, F.path(item, 1))


def _check_cutout_keys(table: Mapping[str, object], shape: str, item: str) -> None:
    allowed = _CUTOUT_COMMON_KEYS + _SHAPE_KEYS[shape]
    for key in table:
        if key in allowed:
            continue
        users = [s for s, keys in _SHAPE_KEYS.items() if key in keys]
        if users:
            # A key of another shape is a different mistake from a typo: say which shapes take it.
            raise CaseError(f"key '{key}' does not apply to shape '{shape}'", item=F.path(item, key),
                            hint=f"'{shape}' takes {', '.join(_SHAPE_KEYS[shape])}; "
                                 f"'{key}' belongs to {', '.join(users)}")
        raise CaseError(f"unknown key '{key}' in [{item}]", item=F.path(item, key), hint=F.suggest(key, allowed))


def _size(table: Mapping[str, object], key: str, params: Mapping[str, float], item: str) -> float:
    """A cut-out dimension: positive when given, 0 (meaning "not used by this shape") when absent."""
    if key not in table:
        return 0.0
    return F.positive(table[key], params, F.path(item, key))


def _cutout(raw: object, item: str, k: int, params: Mapping[str, float]) -> CutoutSpec:
    table = F.table(raw, item)
    shape = F.choice(F.required(table, "shape", item), SHAPES, F.path(item, "shape"))
    _check_cutout_keys(table, shape, item)
    for key in _SHAPE_REQUIRED[shape]:
        F.required(table, key, item)
    name = F.name(table["name"], F.path(item, "name")) if "name" in table else f"cut-out {k + 1}"
    if shape == "chain":
        entries = F.array(table["vertices"], F.path(item, "vertices"))
        vertices = tuple(_vertex(v, F.path(F.path(item, "vertices"), j), params, _CHAIN_VERTEX_KEYS, index=j)
                         for j, v in enumerate(entries))
        return CutoutSpec(name=name, shape=shape, vertices=vertices)
    return CutoutSpec(
        name=name,
        shape=shape,
        center=_point(table["center"], F.path(item, "center"), params),
        diameter=_size(table, "diameter", params, item),
        a=_size(table, "a", params, item),
        b=_size(table, "b", params, item),
        length=_size(table, "length", params, item),
        width=_size(table, "width", params, item),
        radius=_size(table, "radius", params, item),
        angle=F.optional(table, "angle", 0.0, params, item),
    )


def _notch(raw: object, item: str, k: int, params: Mapping[str, float]) -> NotchSpec:
    table = F.table(raw, item)
    F.check_keys(table, _NOTCH_KEYS, item)
    for key in ("edge", "position", "depth", "root_radius"):
        F.required(table, key, item)
    return NotchSpec(
        name=F.name(table["name"], F.path(item, "name")) if "name" in table else f"notch {k + 1}",
        edge=F.name(table["edge"], F.path(item, "edge")),
        position=F.positive(table["position"], params, F.path(item, "position")),
        depth=F.positive(table["depth"], params, F.path(item, "depth")),
        root_radius=F.positive(table["root_radius"], params, F.path(item, "root_radius"), zero_ok=True),
        angle=F.optional(table, "angle", 0.0, params, item),
    )


# --- notch positions and outline orientation -----------------------------------------------------------

def _edge_names(outline: Sequence[Vertex]) -> list[str]:
    return [v.edge for v in outline if v.edge is not None]


def _edge_length(outline: Sequence[Vertex], i: int) -> float:
    a, b = outline[i], outline[(i + 1) % len(outline)]
    return math.hypot(b.x - a.x, b.y - a.y)


def _notch_on_outline(notch: NotchSpec, k: int, outline: Sequence[Vertex]) -> NotchSpec:
    """Check the notch's edge and position as written, then express the position as build_part reads it.

    The file measures ``position`` from the vertex that starts the edge in the order the outline is
    written. build_part turns a clockwise outline counter-clockwise first, which makes the other end
    the start, so on a clockwise outline the position becomes ``L - position``.
    """
    item = f"part.notches[{k}]"
    names = _edge_names(outline)
    if notch.edge not in names:
        hint = F.close_match(notch.edge, names)
        raise CaseError(f"the outline has no edge named '{notch.edge}'", item=F.path(item, "edge"),
                        hint=hint + f"named edges: {', '.join(names) or 'none'}")
    index = next(i for i, v in enumerate(outline) if v.edge == notch.edge)
    length = _edge_length(outline, index)
    # Checked here rather than left to build_part because its message would quote the converted
    # position, which on a clockwise outline is not the number the user wrote.
    if notch.position >= length:
        raise CaseError(f"position {notch.position:.6g} is not inside edge '{notch.edge}' (length {length:.6g})",
                        item=F.path(item, "position"),
                        hint="position is measured from the vertex that starts the edge, "
                             "in the order the outline is written")
    if len(outline) >= 3 and chain_signed_area(outline) < 0:
        return replace(notch, position=length - notch.position)
    return notch


# --- [material], [load], [mesh] ----------------------------------------------------------------------

def _material(raw: object, params: Mapping[str, float]) -> Material:
    table = F.table(raw, "material")
    F.check_keys(table, _MATERIAL_KEYS, "material")
    default = Material()
    E = F.positive(table.get("E", default.E), params, "material.E")
    nu = F.optional(table, "nu", default.nu, params, "material")
    # The isotropic elastic energy is positive definite only for -1 < nu < 0.5.
    if not -1.0 < nu < 0.5:
        raise CaseError(f"Poisson's ratio {nu:.6g} must lie strictly between -1 and 0.5", item="material.nu")
    return Material(E=E, nu=nu, **S.strengths(table, params))


def _loads(root: Mapping[str, object], ctx: LoadContext, catalogue: Catalogue, model: str) -> tuple:
    """``[load]`` (one load) or ``[[loads]]`` (several, each with its own name)."""
    if "load" in root and "loads" in root:
        raise CaseError("give either [load] or [[loads]], not both", item="loads",
                        hint="[[loads]] holds several loads, each with a name")
    if "loads" not in root:
        return (_load(F.required(root, "load", ""), ctx, catalogue, model, "load"),)
    raw = F.array(root["loads"], "loads")
    if not raw:
        raise CaseError("[[loads]] is empty", item="loads", hint="give at least one load")
    if len(raw) > 1:
        for i, t in enumerate(raw):
            if isinstance(t, Mapping) and "name" not in t:
                raise CaseError("with several loads each needs a name", item=F.path(F.path("loads", i), "name"),
                                hint='e.g. name = "pin"; load cases and reports refer to loads by name')
    loads = tuple(_load(t, ctx, catalogue, model, F.path("loads", i)) for i, t in enumerate(raw))
    F.unique([ld.name for ld in loads], "loads", "load")
    return loads


def _supports(raw: object, ctx: LoadContext, catalogue: Catalogue) -> tuple:
    items = F.array(raw, "supports")
    out = []
    for i, t in enumerate(items):
        item = F.path("supports", i)
        table = F.table(t, item)
        kinds = tuple(catalogue.supports)
        kind = F.choice(F.required(table, "type", item), kinds, F.path(item, "type"))
        module = catalogue.supports[kind]
        F.check_keys(table, module.KEYS, item)
        out.append(module.parse(table, ctx, item, kind))
    names = [s.name for s in out]
    if len(set(names)) != len(names):
        dup = next(n for n in names if names.count(n) > 1)
        raise CaseError(f"two supports are named '{dup}'", item="supports", hint="give each support its own name")
    return tuple(out)


def _load_cases(raw: object, loads: tuple, params: Mapping[str, float]) -> tuple[LoadCaseSpec, ...]:
    items = F.array(raw, "load_cases")
    known = [ld.name for ld in loads]
    out = []
    for i, t in enumerate(items):
        item = F.path("load_cases", i)
        table = F.table(t, item)
        F.check_keys(table, _LOAD_CASE_KEYS, item)
        name = F.name(F.required(table, "name", item), F.path(item, "name"))
        factors = F.table(F.required(table, "factors", item), F.path(item, "factors"))
        pairs = []
        for load, value in factors.items():
            sub = F.path(F.path(item, "factors"), load)
            if load not in known:
                raise CaseError(f"the case has no load named '{load}'", item=sub,
                                hint=F.close_match(load, known) + f"loads: {', '.join(known)}")
            pairs.append((load, F.number(value, params, sub)))
        if not any(v != 0 for _, v in pairs):
            raise CaseError("every factor of the load case is zero", item=F.path(item, "factors"),
                            hint="give at least one load a non-zero factor")
        out.append(LoadCaseSpec(name, tuple(pairs)))
    F.unique([c.name for c in out], "load_cases", "load case")
    return tuple(out)


def _nominal(raw: object, params: Mapping[str, float], n_cases: int) -> NominalSpec:
    table = F.table(raw, "nominal")
    F.check_keys(table, _NOMINAL_KEYS, "nominal")
    axis = None
    if "axis" in table:
        value = table["axis"]
        if isinstance(value, list):
            if len(value) != 2:
                raise CaseError("expected an angle in degrees or a direction [x, y]", item="nominal.axis")
            axis = tuple(F.number(v, params, F.path("nominal.axis", j)) for j, v in enumerate(value))
            if axis == (0.0, 0.0):
                raise CaseError("the direction is zero", item="nominal.axis")
        else:
            ang = math.radians(F.number(value, params, "nominal.axis"))
            axis = (math.cos(ang), math.sin(ang))
    stress = None
    if "stress" in table:
        stress = F.number(table["stress"], params, "nominal.stress")
        if stress == 0:
            raise CaseError("a nominal stress of zero gives no Kt", item="nominal.stress")
        if n_cases > 1:
            raise CaseError("a stated nominal stress belongs to one load case; this case has several",
                            item="nominal.stress", hint="state it in a case file with one load case")
    feature = F.text(table["feature"], "nominal.feature") if "feature" in table else None
    if feature is not None and stress is None:
        raise CaseError("nominal.feature names the feature a stated nominal stress is for: give stress too",
                        item="nominal.feature")
    return NominalSpec(axis=axis, stress=stress, feature=feature)


def _load(raw: object, ctx: LoadContext, catalogue: Catalogue, model: str, item: str = "load") -> object:
    """One load table: its ``type`` (the model's usual load when not given) names the load type that reads
    the rest of its keys. A load type that lists the models it applies to (``MODELS``) is refused on
    others, and a key that belongs to another load type says which one."""
    table = F.table(raw, item)
    default = catalogue.models[model].default_load
    kind = F.choice(table["type"], tuple(catalogue.loads), F.path(item, "type")) if "type" in table else default
    load_type = catalogue.loads[kind]
    models = getattr(load_type, "MODELS", None)
    if models and model not in models:
        raise CaseError(f"load type '{kind}' does not apply to model '{model}'", item=F.path(item, "type"),
                        hint=f"'{kind}' is for model = {' or '.join(repr(m) for m in models)}; model '{model}' "
                             f"takes type = '{default}'")
    for key in table:
        if key in load_type.KEYS:
            continue
        owners = [k for k, t in catalogue.loads.items() if k != kind and key in t.KEYS]
        if owners:
            where = "; ".join(f"load type '{k}'" + (f" (model = {' or '.join(repr(m) for m in t.MODELS)})"
                                                     if getattr(t, "MODELS", None) else "")
                              for k, t in ((k, catalogue.loads[k]) for k in owners))
            raise CaseError(f"'{key}' is not a load of model '{model}' (load type '{kind}' takes "
                            f"{', '.join(k for k in load_type.KEYS if k != 'type')})", item=F.path(item, key),
                            hint=f"'{key}' belongs to {where}")
    F.check_keys(table, load_type.KEYS, item)
    return load_type.parse({k: v for k, v in table.items() if k != "type"}, ctx, item)


def _mesh(raw: object, params: Mapping[str, float]) -> MeshSpec:
    table = F.table(raw, "mesh")
    F.check_keys(table, _MESH_KEYS, "mesh")
    default = MeshSpec()
    per_radius = F.positive(table.get("elements_per_radius", default.elements_per_radius), params,
                           "mesh.elements_per_radius")
    size = F.positive(table["size"], params, "mesh.size") if "size" in table else None
    growth = F.positive(table.get("growth", default.growth), params, "mesh.growth")
    cap = F.positive(table.get("max_elements", default.max_elements), params, "mesh.max_elements")
    return MeshSpec(elements_per_radius=per_radius, size=size, growth=growth, max_elements=int(cap))
