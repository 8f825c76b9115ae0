"""Fuzzing with hypothesis: every input either solves or ends in fekt's own error; nothing else escapes.

Three generators: random mutations of the demo and standard case files, random case-shaped tables,
and random DXF content. Each accepted case is solved on a capped mesh so every run is bounded in time.
The quick run is part of the default tests; `pytest -m fuzz` runs the large one (FEKT_FUZZ_EXAMPLES,
default 700 per generator, 2100 in all). Common practice, no external source.
"""

from __future__ import annotations

import copy
import dataclasses
import glob
import os
import tomllib

import ezdxf
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from fekt.case.dxf import read_outline
from fekt.api import case_from_dict
from fekt.case.schema import PartSpec
from fekt.errors import FektError
from fekt.geometry.build import build_part
from fekt.pipeline import run

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
CASES = {os.path.basename(p): tomllib.load(open(p, "rb")) for p in sorted(glob.glob(os.path.join(ROOT, "cases", "*.toml")))}
QUICK = 15
LARGE = int(os.environ.get("FEKT_FUZZ_EXAMPLES", "700"))
COUNTS: dict[str, int] = {}


def solve_bounded(data: dict, source: str = "fuzz.toml") -> str:
    """'solved' or 'rejected'; anything that is not a FektError propagates and fails the test."""
    try:
        case = case_from_dict(data, source)
        mesh = dataclasses.replace(case.mesh, elements_per_radius=min(case.mesh.elements_per_radius, 3.0),
                                   max_elements=15_000)
        run(dataclasses.replace(case, mesh=mesh), equilibrium="warn")
        return "solved"
    except FektError:
        return "rejected"


def _paths(node, prefix=()):
    if isinstance(node, dict):
        for k, v in node.items():
            yield prefix + (k,)
            yield from _paths(v, prefix + (k,))
    elif isinstance(node, list):
        for i, v in enumerate(node):
            yield prefix + (i,)
            yield from _paths(v, prefix + (i,))


junk = st.one_of(
    st.integers(-10**6, 10**6), st.floats(allow_nan=True, allow_infinity=True), st.booleans(),
    st.text(max_size=30), st.sampled_from(["W/0", "2**999", "sqrt(-1)", "d*", "pi", "-5", "1e-300", "0", "a.b",
                                           "__import__('os')", "(" * 40 + "1" + ")" * 40]),
    st.lists(st.integers(-5, 5), max_size=3), st.dictionaries(st.text(max_size=5), st.integers(), max_size=2),
    st.floats(-1e3, 1e3), st.floats(1e-9, 1e-3),
)


@st.composite
def mutated_case(draw):
    name = draw(st.sampled_from(sorted(CASES)))
    data = copy.deepcopy(CASES[name])
    for _ in range(draw(st.integers(1, 3))):
        paths = list(_paths(data))
        path = draw(st.sampled_from(paths))
        parent = data
        for key in path[:-1]:
            parent = parent[key]
        action = draw(st.sampled_from(["replace", "delete", "scale", "perturb", "perturb"]))
        value = parent[path[-1]]
        is_num = isinstance(value, (int, float)) and not isinstance(value, bool)
        if action == "perturb" and is_num:
            parent[path[-1]] = value * draw(st.floats(0.7, 1.3))
        elif action == "delete":
            del parent[path[-1]]
        elif action == "scale" and isinstance(parent[path[-1]], (int, float)) and not isinstance(parent[path[-1]], bool):
            parent[path[-1]] = parent[path[-1]] * draw(st.sampled_from([-1, 0, 0.01, 0.5, 1.5, 10, 1e6]))
        else:
            parent[path[-1]] = draw(junk)
    return data


num = st.floats(-50, 150, allow_nan=False)
pos = st.floats(0.01, 60, allow_nan=False)


@st.composite
def random_case(draw):
    """A bar with straight parallel ends ('left', 'right') and random chains along its long edges,
    random fillets, arcs, cut-outs and notches: most of these reach the solver."""
    L = draw(st.floats(60, 300))
    H = draw(st.floats(10, 80))
    nb = draw(st.integers(0, 3))
    nt = draw(st.integers(0, 3))
    xb = sorted(draw(st.lists(st.floats(0.05 * L, 0.95 * L), min_size=nb, max_size=nb, unique=True)))
    xt = sorted(draw(st.lists(st.floats(0.05 * L, 0.95 * L), min_size=nt, max_size=nt, unique=True)), reverse=True)

    def vert(x, y, edge):
        v = {"x": x, "y": y, "edge": edge}
        if draw(st.integers(0, 2)) == 0:
            v["fillet"] = draw(st.floats(0, 0.3 * H))
        if draw(st.integers(0, 6)) == 0:
            v["arc"] = {"radius": draw(st.floats(0.1 * H, 5 * H)), "bulge": draw(st.sampled_from(["in", "out"]))}
        return v

    outline = [{"x": 0.0, "y": 0.0, "edge": "b0"}]
    outline += [vert(x, draw(st.floats(-0.3 * H, 0.3 * H)), f"b{i + 1}") for i, x in enumerate(xb)]
    outline += [{"x": L, "y": 0.0, "edge": "right"}, {"x": L, "y": H, "edge": "t0"}]
    outline += [vert(x, H + draw(st.floats(-0.3 * H, 0.3 * H)), f"t{i + 1}") for i, x in enumerate(xt)]
    outline += [{"x": 0.0, "y": H, "edge": "left"}]
    part = {"thickness": draw(pos), "outline": outline}
    cut = []
    for k in range(draw(st.integers(0, 2))):
        shape = draw(st.sampled_from(["circle", "ellipse", "slot", "rounded_rectangle"]))
        c = {"name": f"c{k}", "shape": shape, "center": [draw(st.floats(0, L)), draw(st.floats(0, H))]}
        size = st.floats(0.01 * H, 0.8 * H)
        if shape == "circle":
            c["diameter"] = draw(size)
        elif shape == "ellipse":
            c.update(a=draw(size), b=draw(size), angle=draw(st.floats(-180, 180)))
        else:
            c.update(length=draw(size), width=draw(size), angle=draw(st.floats(-180, 180)))
            if shape == "rounded_rectangle":
                c["radius"] = draw(st.floats(0.001 * H, 0.3 * H))
        cut.append(c)
    if cut:
        part["cutouts"] = cut
    if draw(st.booleans()):
        edge = draw(st.sampled_from(["b0", "t0"]))
        part["notches"] = [{"name": "n", "edge": edge, "position": draw(st.floats(0, L)),
                            "depth": draw(st.floats(0.01 * H, 0.6 * H)), "root_radius": draw(st.floats(0, 0.3 * H)),
                            "angle": draw(st.sampled_from([0, 30, 60, 90]))}]
    load = {"ends": ["left", "right"]}
    kind = draw(st.sampled_from(["force", "moment", "both"]))
    sign = draw(st.sampled_from([1.0, -1.0]))
    if kind in ("force", "both"):
        load["force"] = sign * draw(st.floats(100, 1e4))
    if kind in ("moment", "both"):
        load["moment"] = sign * draw(st.floats(1e3, 1e5))
    return {"part": part, "load": load}


@st.composite
def random_dxf(draw):
    doc = ezdxf.new()
    doc.header["$INSUNITS"] = draw(st.sampled_from([0, 1, 4, 5, 6, 99]))
    msp = doc.modelspace()
    for _ in range(draw(st.integers(0, 8))):
        kind = draw(st.sampled_from(["line", "arc", "circle", "poly", "ellipse", "spline", "text"]))
        p = (draw(num), draw(num))
        q = (draw(num), draw(num))
        layer = draw(st.sampled_from(["0", "left", "right", "x"]))
        if kind == "line":
            msp.add_line(p, q, dxfattribs={"layer": layer})
        elif kind == "arc":
            msp.add_arc(p, draw(pos), draw(st.floats(0, 360)), draw(st.floats(0, 360)), dxfattribs={"layer": layer})
        elif kind == "circle":
            msp.add_circle(p, draw(pos))
        elif kind == "poly":
            pts = [(draw(num), draw(num), draw(st.floats(-2, 2))) for _ in range(draw(st.integers(2, 5)))]
            msp.add_lwpolyline(pts, format="xyb", close=draw(st.booleans()))
        elif kind == "ellipse":
            msp.add_ellipse(p, (draw(pos), 0, 0), draw(st.floats(0.1, 1.0)))
        elif kind == "spline":
            msp.add_spline([p, q, (0, 0)])
        else:
            msp.add_text("note")
    if draw(st.booleans()):  # a closed square that loads can find, often with the junk around it
        for (s, t), layer in zip([((0, 0), (100, 0)), ((100, 0), (100, 40)), ((100, 40), (0, 40)), ((0, 40), (0, 0))],
                                 ["bottom", "right", "top", "left"]):
            msp.add_line(s, t, dxfattribs={"layer": layer})
    return doc


def _check_dxf(doc, tmp_path_factory) -> str:
    path = tmp_path_factory.mktemp("dxf") / "f.dxf"
    doc.saveas(path)
    try:
        got = read_outline(path, case_unit="mm", drawing_unit=None)
        build_part(PartSpec(outline=got.outline, cutouts=got.cutouts))
        return "accepted"
    except FektError:
        return "rejected"


def _record(name: str, verdict: str) -> None:
    COUNTS[f"{name}:{verdict}"] = COUNTS.get(f"{name}:{verdict}", 0) + 1


FAST = settings(max_examples=QUICK, deadline=None, suppress_health_check=list(HealthCheck), derandomize=True)
BIG = settings(max_examples=LARGE, deadline=None, suppress_health_check=list(HealthCheck))


@FAST
@given(mutated_case())
def test_quick_mutated_cases(data):
    _record("mutated", solve_bounded(data))


@FAST
@given(random_case())
def test_quick_random_cases(data):
    _record("random", solve_bounded(data))


@FAST
@given(random_dxf())
def test_quick_random_dxf(tmp_path_factory, doc):
    _record("dxf", _check_dxf(doc, tmp_path_factory))


def test_quick_garbage_dxf_bytes(tmp_path):
    from fekt.errors import CaseError

    p = tmp_path / "g.dxf"
    for blob in (b"", b"0\nSECTION\n2\nENTITIES\n", bytes(range(256)) * 4, b"999\nnot a drawing\n"):
        p.write_bytes(blob)
        with pytest.raises(CaseError):
            read_outline(p, case_unit="mm")


@pytest.mark.fuzz
@BIG
@given(mutated_case())
def test_large_mutated_cases(data):
    _record("mutated", solve_bounded(data))


@pytest.mark.fuzz
@BIG
@given(random_case())
def test_large_random_cases(data):
    _record("random", solve_bounded(data))


@pytest.mark.fuzz
@BIG
@given(random_dxf())
def test_large_random_dxf(tmp_path_factory, doc):
    _record("dxf", _check_dxf(doc, tmp_path_factory))


def teardown_module(module):
    if COUNTS:
        path = os.environ.get("FEKT_FUZZ_REPORT")
        if path:
            with open(path, "w", encoding="utf-8") as fh:
                for k, v in sorted(COUNTS.items()):
                    fh.write(f"{k} {v}\n")



