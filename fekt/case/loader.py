"""Read a case file (TOML) into a :class:`~fekt.case.schema.Case`.

The loader checks what only the file can get wrong: syntax, known keys, value types, unit names,
and the sign of values that can only be positive. Whether the described shape is a valid planar
region is left to :func:`fekt.geometry.build.build_part`, which has the geometry to judge it.

Every failure raises :class:`~fekt.errors.CaseError` whose ``item`` is the dotted path of the
offending entry (e.g. ``part.outline[2].fillet``; array indices count from 0) and whose ``hint``
suggests a fix. The file format is described in ``docs/case-format.md``.
"""

from __future__ import annotations

import difflib
import math
import tomllib
from collections.abc import Callable, Mapping, Sequence
from dataclasses import replace
from pathlib import Path
from typing import TypeVar

from fekt.case.expr import evaluate, resolve_parameters
from fekt.case.schema import (
    FAMILIES,
    FORCE_UNITS,
    LENGTH_UNITS,
    Case,
    CutoutSpec,
    LoadSpec,
    Material,
    MeshSpec,
    NotchSpec,
    PartSpec,
    Units,
    Vertex,
)
from fekt.errors import CaseError

__all__ = ["MODELS", "SHAPES", "case_from_dict", "load_case", "parse_case"]

_T = TypeVar("_T")

MODELS = ("plane_stress", "plane_strain")
BULGES = ("out", "in")

_TOP_KEYS = ("case", "units", "parameters", "part", "material", "load", "mesh")
_CASE_KEYS = ("name", "description", "demo")
_UNITS_KEYS = ("length", "force")
_PART_KEYS = ("model", "thickness", "outline", "cutouts", "notches", "family", "dimensions", "dxf", "dxf_units",
              "dxf_tolerance")
_OUTLINE_VERTEX_KEYS = ("x", "y", "edge", "fillet", "arc")
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
_MATERIAL_KEYS = ("E", "nu")
_LOAD_KEYS = ("ends", "force", "stress", "moment")
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


def load_case(path: str | Path) -> Case:
    """Read and check the case file at ``path``; ``Case.source`` is the path as given."""
    return case_from_dict(read_case_table(path), str(Path(path)))


def parse_case(text: str, source: str = "<string>") -> Case:
    """Parse case-file text; ``source`` names it in messages and becomes ``Case.source``."""
    return case_from_dict(_toml(text, source), source)


def case_from_dict(data: dict, source: str, overrides: Mapping[str, float] | None = None) -> Case:
    """Check an already parsed case table (as :func:`tomllib.loads` returns it) and build the Case.

    ``overrides`` replaces the values of named parameters (sweeps and goal-seeking vary them)."""
    root = _table(data, source or "<case>")
    _check_keys(root, _TOP_KEYS, "")
    if overrides:
        raw_params = dict(_table(root.get("parameters", {}), "parameters"))
        for name, value in overrides.items():
            if name not in raw_params:
                known = list(raw_params)
                close = difflib.get_close_matches(name, known, n=1)
                raise CaseError(f"the case has no parameter named '{name}'", item=f"parameters.{name}",
                                hint=f"did you mean '{close[0]}'?" if close else
                                f"parameters in this case: {', '.join(known) or 'none'}")
            raw_params[name] = float(value)
        root = {**root, "parameters": raw_params}
    # Sections are read in the order they usually appear in a file, so the first error reported
    # is the first one the reader meets.
    name, description, demo = _case_info(root.get("case", {}), source)
    units = _units(root.get("units", {}))
    params = resolve_parameters(root.get("parameters", {}), item_prefix="parameters")
    part = _part(_required(root, "part", ""), params, units, source)
    material = _material(root.get("material", {}), params)
    edges = list(FAMILIES[part.family].edges) if part.family else _edge_names(part.outline)
    load = _load(_required(root, "load", ""), params, edges, default_ends=("left", "right") if part.family else None)
    mesh = _mesh(root.get("mesh", {}), params)
    return Case(name=name, part=part, load=load, material=material, mesh=mesh, units=units,
                description=description, parameters=tuple(params.items()), source=source, demo=demo)


# --- generic checks --------------------------------------------------------------------------------

def _path(parent: str, key: str | int) -> str:
    if isinstance(key, int):
        return f"{parent}[{key}]"
    return f"{parent}.{key}" if parent else key


def _kind(value: object) -> str:
    """The TOML name of a value's type, for messages (users never see Python type names)."""
    if isinstance(value, bool):
        return "a boolean"
    if isinstance(value, (int, float)):
        return "a number"
    if isinstance(value, str):
        return "a string"
    if isinstance(value, Mapping):
        return "a table"
    if isinstance(value, (list, tuple)):
        return "an array"
    return f"a {type(value).__name__} value"


def _suggest(key: str, allowed: Sequence[str]) -> str:
    # Case is compared loosely because 'e' for 'E' is the likeliest slip, and difflib sees
    # 'e' and 'E' as entirely different.
    lowered = {a.lower(): a for a in allowed}
    matches = difflib.get_close_matches(key.lower(), list(lowered), n=3)
    if matches:
        return "did you mean " + " or ".join(repr(lowered[m]) for m in matches) + "?"
    return "allowed keys: " + ", ".join(allowed)


def _check_keys(table: Mapping[str, object], allowed: Sequence[str], item: str) -> None:
    for key in table:
        if key not in allowed:
            where = f"in [{item}]" if item else "at the top level"
            raise CaseError(f"unknown key '{key}' {where}", item=_path(item, key), hint=_suggest(key, allowed))


def _table(value: object, item: str) -> Mapping[str, object]:
    if not isinstance(value, Mapping):
        raise CaseError(f"expected a table, got {_kind(value)}", item=item,
                        hint="write it as [section] or as { key = value, ... }")
    return value


def _array(value: object, item: str) -> list:
    if not isinstance(value, list):
        raise CaseError(f"expected an array, got {_kind(value)}", item=item, hint="write it as [ ..., ... ]")
    return value


def _required(table: Mapping[str, object], key: str, item: str) -> object:
    if key not in table:
        where = f"[{item}]" if item else "the case file"
        raise CaseError(f"missing required value '{key}' in {where}", item=_path(item, key))
    return table[key]


def _text(value: object, item: str) -> str:
    if not isinstance(value, str):
        raise CaseError(f"expected a string, got {_kind(value)}", item=item, hint='put the text in quotes: "..."')
    return value


def _name(value: object, item: str) -> str:
    name = _text(value, item)
    if not name.strip():
        raise CaseError("a name must not be empty", item=item)
    return name


def _choice(value: object, choices: Sequence[str], item: str) -> str:
    text = _text(value, item)
    if text not in choices:
        close = difflib.get_close_matches(text, list(choices), n=1)
        hint = f"did you mean '{close[0]}'? " if close else ""
        raise CaseError(f"'{text}' is not one of: {', '.join(choices)}", item=item,
                        hint=hint + f"allowed: {', '.join(choices)}")
    return text


def _flag(value: object, item: str) -> bool:
    # Only true booleans: 0/1 or "yes" are ambiguous in a file meant to be read by people.
    if not isinstance(value, bool):
        raise CaseError(f"expected true or false, got {_kind(value)}", item=item)
    return value


#: no dimension, load or modulus in any supported unit system comes near this (our own guard against
#: values that overflow later, e.g. a radius of 1e300)
MAX_MAGNITUDE = 1e15


def _number(value: object, params: Mapping[str, float], item: str) -> float:
    x = evaluate(value, params, item=item)
    if abs(x) > MAX_MAGNITUDE:
        raise CaseError(f"{x:.6g} is out of range (|value| must be below {MAX_MAGNITUDE:g})", item=item)
    return x


def _positive(raw: object, params: Mapping[str, float], item: str, *, zero_ok: bool = False) -> float:
    """Evaluate a value that only makes sense positive (or zero, with ``zero_ok``)."""
    value = _number(raw, params, item)
    if value > 0 or (zero_ok and value == 0):
        return value
    rule = "zero or positive" if zero_ok else "positive"
    # Quote the expression too: the user wrote it, not the number it came to.
    shown = f"{raw.strip()!r} evaluates to {value:.6g}, which" if isinstance(raw, str) else f"value {value:.6g}"
    raise CaseError(f"{shown} must be {rule}", item=item)


def _optional(table: Mapping[str, object], key: str, default: float, params: Mapping[str, float],
              item: str) -> float:
    return _number(table[key], params, _path(item, key)) if key in table else default


def _unique(names: Sequence[str], item: str, what: str) -> None:
    # Results and messages name features after their items, so two items with one name would be
    # indistinguishable in every report.
    seen: dict[str, int] = {}
    for k, name in enumerate(names):
        if name in seen:
            raise CaseError(f"the {what} name '{name}' is already used by {item}[{seen[name]}]",
                            item=f"{item}[{k}].name", hint=f"give each {what} its own name")
        seen[name] = k


# --- [case] and [units] ------------------------------------------------------------------------------

def _default_name(source: str) -> str:
    # "<string>" and similar pseudo-sources have no useful stem.
    if not source or source.startswith("<"):
        return "case"
    return Path(source).stem


def _case_info(raw: object, source: str) -> tuple[str, str, bool]:
    table = _table(raw, "case")
    _check_keys(table, _CASE_KEYS, "case")
    name = _name(table["name"], "case.name") if "name" in table else _default_name(source)
    description = _text(table["description"], "case.description") if "description" in table else ""
    demo = _flag(table["demo"], "case.demo") if "demo" in table else False
    return name, description, demo


def _units(raw: object) -> Units:
    table = _table(raw, "units")
    _check_keys(table, _UNITS_KEYS, "units")
    length = _choice(table.get("length", "mm"), LENGTH_UNITS, "units.length")
    force = _choice(table.get("force", "N"), FORCE_UNITS, "units.force")
    return Units(length=length, force=force)


# --- [part] --------------------------------------------------------------------------------------------

def _part(raw: object, params: Mapping[str, float], units: Units | None = None, source: str = "") -> PartSpec:
    table = _table(raw, "part")
    _check_keys(table, _PART_KEYS, "part")
    model = _choice(table.get("model", "plane_stress"), MODELS, "part.model")
    if "thickness" in table:
        thickness = _positive(table["thickness"], params, "part.thickness")
    elif model == "plane_stress":
        raise CaseError("missing required value 'thickness' in [part]", item="part.thickness",
                        hint="a plane-stress part needs its thickness to turn forces into stresses")
    else:
        thickness = 1.0  # plane strain: per unit thickness
    if "family" in table:
        return _family_part(table, params, model, thickness)
    if "dxf" in table:
        outline, cutouts = _dxf_part(table, params, units or Units(), source)
    else:
        for key in ("dxf_units", "dxf_tolerance"):
            if key in table:
                raise CaseError(f"'{key}' only applies with part.dxf", item=f"part.{key}")
        outline = _outline(_required(table, "outline", "part"), params)
        cutouts = ()
    cutouts = cutouts + _items(table, "cutouts", params, _cutout)
    _unique([c.name for c in cutouts], "part.cutouts", "cut-out")
    notches = _items(table, "notches", params, _notch)
    _unique([n.name for n in notches], "part.notches", "notch")
    notches = tuple(_notch_on_outline(n, k, outline) for k, n in enumerate(notches))
    return PartSpec(outline=outline, cutouts=cutouts, notches=notches, model=model, thickness=thickness)


def _dxf_part(table: Mapping[str, object], params: Mapping[str, float], units: Units,
              source: str) -> tuple[tuple[Vertex, ...], tuple[CutoutSpec, ...]]:
    """Outline and cut-outs from the DXF drawing named by part.dxf (relative to the case file)."""
    from .dxf import MM_PER_UNIT, read_outline

    if "outline" in table:
        raise CaseError("give either part.outline or part.dxf, not both", item="part.outline")
    name = _text(table["dxf"], "part.dxf")
    base = Path(source).parent if source and not source.startswith("<") else Path(".")
    path = (base / name) if not Path(name).is_absolute() else Path(name)
    if not path.is_file():
        raise CaseError(f"DXF file '{path}' not found", item="part.dxf", hint="the path is relative to the case file")
    unit = _choice(table["dxf_units"], tuple(MM_PER_UNIT), "part.dxf_units") if "dxf_units" in table else None
    tol = _positive(table["dxf_tolerance"], params, "part.dxf_tolerance") if "dxf_tolerance" in table else None
    drawing = read_outline(path, case_unit=units.length, drawing_unit=unit, tolerance=tol)
    return drawing.outline, drawing.cutouts


def _family_part(table: Mapping[str, object], params: Mapping[str, float], model: str,
                 thickness: float) -> PartSpec:
    """A standard shape given by its handbook dimensions (see schema.FAMILIES)."""
    family = _choice(table["family"], tuple(FAMILIES), "part.family")
    for key in ("outline", "cutouts", "notches"):
        if key in table:
            raise CaseError(f"'{key}' cannot be combined with family = '{family}'", item=f"part.{key}",
                            hint="a family builds the whole outline from its dimensions; remove one of them")
    shape = FAMILIES[family]
    dims = _table(_required(table, "dimensions", "part"), "part.dimensions")
    _check_keys(dims, shape.required + shape.optional, "part.dimensions")
    for key in shape.required:
        _required(dims, key, "part.dimensions")
    values = tuple((k, _positive(dims[k], params, f"part.dimensions.{k}")) for k in shape.required + shape.optional
                   if k in dims)
    return PartSpec(outline=(), model=model, thickness=thickness, family=family, dimensions=values)


def _items(table: Mapping[str, object], key: str, params: Mapping[str, float],
           read: Callable[[object, str, int, Mapping[str, float]], _T]) -> tuple[_T, ...]:
    item = f"part.{key}"
    entries = _array(table.get(key, []), item)
    return tuple(read(entry, f"{item}[{k}]", k, params) for k, entry in enumerate(entries))


def _outline(raw: object, params: Mapping[str, float]) -> tuple[Vertex, ...]:
    item = "part.outline"
    entries = _array(raw, item)
    vertices = tuple(_vertex(v, _path(item, i), params, _OUTLINE_VERTEX_KEYS) for i, v in enumerate(entries))
    named = [v.edge for v in vertices if v.edge is not None]
    # Loads and notches find edges by name, so a repeated name would silently pick several edges.
    indices = [i for i, v in enumerate(vertices) if v.edge is not None]
    for pos, name in enumerate(named):
        first = named.index(name)
        if first != pos:
            raise CaseError(f"the edge name '{name}' is already used by {item}[{indices[first]}]",
                            item=f"{item}[{indices[pos]}].edge", hint="give each edge its own name")
    return vertices


def _vertex(raw: object, item: str, params: Mapping[str, float], keys: Sequence[str]) -> Vertex:
    table = _table(raw, item)
    _check_keys(table, keys, item)
    x = _number(_required(table, "x", item), params, _path(item, "x"))
    y = _number(_required(table, "y", item), params, _path(item, "y"))
    fillet = _positive(table.get("fillet", 0.0), params, _path(item, "fillet"), zero_ok=True)
    edge = _name(table["edge"], _path(item, "edge")) if "edge" in table else None
    arc_radius, bulge = _arc(table["arc"], _path(item, "arc"), params) if "arc" in table else (None, "out")
    return Vertex(x=x, y=y, fillet=fillet, edge=edge, arc_radius=arc_radius, bulge=bulge)


def _arc(raw: object, item: str, params: Mapping[str, float]) -> tuple[float, str]:
    table = _table(raw, item)
    _check_keys(table, _ARC_KEYS, item)
    radius = _positive(_required(table, "radius", item), params, _path(item, "radius"))
    bulge = _choice(table.get("bulge", "out"), BULGES, _path(item, "bulge"))
    return radius, bulge


def _point(raw: object, item: str, params: Mapping[str, float]) -> tuple[float, float]:
    values = _array(raw, item)
    if len(values) != 2:
        raise CaseError(f"expected 2 coordinates [x, y], got {len(values)}", item=item)
    return _number(values[0], params, _path(item, 0)), _number(values[1], params, _path(item, 1))


def _check_cutout_keys(table: Mapping[str, object], shape: str, item: str) -> None:
    allowed = _CUTOUT_COMMON_KEYS + _SHAPE_KEYS[shape]
    for key in table:
        if key in allowed:
            continue
        users = [s for s, keys in _SHAPE_KEYS.items() if key in keys]
        if users:
            # A key of another shape is a different mistake from a typo: say which shapes take it.
            raise CaseError(f"key '{key}' does not apply to shape '{shape}'", item=_path(item, key),
                            hint=f"'{shape}' takes {', '.join(_SHAPE_KEYS[shape])}; "
                                 f"'{key}' belongs to {', '.join(users)}")
        raise CaseError(f"unknown key '{key}' in [{item}]", item=_path(item, key), hint=_suggest(key, allowed))


def _size(table: Mapping[str, object], key: str, params: Mapping[str, float], item: str) -> float:
    """A cut-out dimension: positive when given, 0 (meaning "not used by this shape") when absent."""
    if key not in table:
        return 0.0
    return _positive(table[key], params, _path(item, key))


def _cutout(raw: object, item: str, k: int, params: Mapping[str, float]) -> CutoutSpec:
    table = _table(raw, item)
    shape = _choice(_required(table, "shape", item), SHAPES, _path(item, "shape"))
    _check_cutout_keys(table, shape, item)
    for key in _SHAPE_REQUIRED[shape]:
        _required(table, key, item)
    name = _name(table["name"], _path(item, "name")) if "name" in table else f"cut-out {k + 1}"
    if shape == "chain":
        entries = _array(table["vertices"], _path(item, "vertices"))
        vertices = tuple(_vertex(v, _path(_path(item, "vertices"), j), params, _CHAIN_VERTEX_KEYS)
                         for j, v in enumerate(entries))
        return CutoutSpec(name=name, shape=shape, vertices=vertices)
    return CutoutSpec(
        name=name,
        shape=shape,
        center=_point(table["center"], _path(item, "center"), params),
        diameter=_size(table, "diameter", params, item),
        a=_size(table, "a", params, item),
        b=_size(table, "b", params, item),
        length=_size(table, "length", params, item),
        width=_size(table, "width", params, item),
        radius=_size(table, "radius", params, item),
        angle=_optional(table, "angle", 0.0, params, item),
    )


def _notch(raw: object, item: str, k: int, params: Mapping[str, float]) -> NotchSpec:
    table = _table(raw, item)
    _check_keys(table, _NOTCH_KEYS, item)
    for key in ("edge", "position", "depth", "root_radius"):
        _required(table, key, item)
    return NotchSpec(
        name=_name(table["name"], _path(item, "name")) if "name" in table else f"notch {k + 1}",
        edge=_name(table["edge"], _path(item, "edge")),
        position=_positive(table["position"], params, _path(item, "position")),
        depth=_positive(table["depth"], params, _path(item, "depth")),
        root_radius=_positive(table["root_radius"], params, _path(item, "root_radius"), zero_ok=True),
        angle=_optional(table, "angle", 0.0, params, item),
    )


# --- notch positions and outline orientation -----------------------------------------------------------

def _signed_area(vertices: Sequence[Vertex]) -> float:
    """Shoelace area of the vertex polygon: positive when the vertices run counter-clockwise."""
    n = len(vertices)
    return 0.5 * sum(vertices[i].x * vertices[(i + 1) % n].y - vertices[(i + 1) % n].x * vertices[i].y
                     for i in range(n))


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
        close = difflib.get_close_matches(notch.edge, names, n=1)
        hint = f"did you mean '{close[0]}'? " if close else ""
        raise CaseError(f"the outline has no edge named '{notch.edge}'", item=_path(item, "edge"),
                        hint=hint + f"named edges: {', '.join(names) or 'none'}")
    index = next(i for i, v in enumerate(outline) if v.edge == notch.edge)
    length = _edge_length(outline, index)
    # Checked here rather than left to build_part because its message would quote the converted
    # position, which on a clockwise outline is not the number the user wrote.
    if notch.position >= length:
        raise CaseError(f"position {notch.position:.6g} is not inside edge '{notch.edge}' (length {length:.6g})",
                        item=_path(item, "position"),
                        hint="position is measured from the vertex that starts the edge, "
                             "in the order the outline is written")
    if len(outline) >= 3 and _signed_area(outline) < 0:
        return replace(notch, position=length - notch.position)
    return notch


# --- [material], [load], [mesh] ----------------------------------------------------------------------

def _material(raw: object, params: Mapping[str, float]) -> Material:
    table = _table(raw, "material")
    _check_keys(table, _MATERIAL_KEYS, "material")
    default = Material()
    E = _positive(table.get("E", default.E), params, "material.E")
    nu = _optional(table, "nu", default.nu, params, "material")
    # The isotropic elastic energy is positive definite only for -1 < nu < 0.5.
    if not -1.0 < nu < 0.5:
        raise CaseError(f"Poisson's ratio {nu:.6g} must lie strictly between -1 and 0.5", item="material.nu")
    return Material(E=E, nu=nu)


def _ends(raw: object, edges: Sequence[str]) -> tuple[str, str]:
    item = "load.ends"
    values = _array(raw, item)
    if len(values) != 2:
        raise CaseError(f"expected 2 edge names, got {len(values)}", item=item,
                        hint='name two parallel straight edges, e.g. ends = ["left", "right"]')
    first, second = (_name(v, _path(item, j)) for j, v in enumerate(values))
    for j, name in enumerate((first, second)):
        if name not in edges:
            close = difflib.get_close_matches(name, list(edges), n=1)
            hint = f"did you mean '{close[0]}'? " if close else ""
            raise CaseError(f"the outline has no edge named '{name}'", item=_path(item, j),
                            hint=hint + f"named edges: {', '.join(edges) or 'none (add edge = ... to the outline)'}")
    if first == second:
        raise CaseError(f"both ends are the edge '{first}'", item=item, hint="the load needs two different edges")
    return first, second


def _load(raw: object, params: Mapping[str, float], edges: Sequence[str],
          default_ends: tuple[str, str] | None = None) -> LoadSpec:
    table = _table(raw, "load")
    _check_keys(table, _LOAD_KEYS, "load")
    if "ends" not in table and default_ends:
        ends = default_ends  # standard shapes are loaded at their ends "left" and "right"
    else:
        ends = _ends(_required(table, "ends", "load"), edges)
    if "force" in table and "stress" in table:
        raise CaseError("give either force or stress, not both", item="load.stress",
                        hint="stress is the nominal stress on the first end's section; force = stress * area")
    if not any(key in table for key in ("force", "stress", "moment")):
        raise CaseError("missing load: give force, stress or moment (or a combination)", item="load")
    force = _optional(table, "force", 0.0, params, "load")
    stress = _number(table["stress"], params, "load.stress") if "stress" in table else None
    moment = _optional(table, "moment", 0.0, params, "load")
    if force == 0 and not stress and moment == 0:
        # A zero load gives zero stress everywhere, and Kt is a ratio of stresses.
        raise CaseError("the load is zero", item="load", hint="give a non-zero force, stress or moment")
    return LoadSpec(ends=ends, force=force, moment=moment, stress=stress)


def _mesh(raw: object, params: Mapping[str, float]) -> MeshSpec:
    table = _table(raw, "mesh")
    _check_keys(table, _MESH_KEYS, "mesh")
    default = MeshSpec()
    per_radius = _positive(table.get("elements_per_radius", default.elements_per_radius), params,
                           "mesh.elements_per_radius")
    size = _positive(table["size"], params, "mesh.size") if "size" in table else None
    growth = _positive(table.get("growth", default.growth), params, "mesh.growth")
    cap = _positive(table.get("max_elements", default.max_elements), params, "mesh.max_elements")
    return MeshSpec(elements_per_radius=per_radius, size=size, growth=growth, max_elements=int(cap))
