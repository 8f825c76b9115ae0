"""The package layout follows the data flow, and imports only point upstream (DEVELOPERS.md).

An ``ast`` walk over every module of ``fekt``: each import (top level or inside a function) must point
to the same or an earlier stage of the flow. Also: no numerics in ``report/`` (it formats numbers, it
does not compute them) and no command-line syntax in ``studies/`` (studies are called from Python too).
Common practice for layered code; no external source.
"""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

PACKAGE = Path(__file__).resolve().parents[1] / "fekt"

#: the data flow, upstream first; modules of one stage may import each other
STAGES: list[tuple[str, ...]] = [
    ("fekt.errors", "fekt.kinds", "fekt.exact", "fekt.records", "fekt.version"),
    ("fekt.case",),
    ("fekt.families",),
    ("fekt.geometry",),
    ("fekt.mesh",),
    ("fekt.models",),
    ("fekt.loads",),
    ("fekt.registry",),
    ("fekt.solver",),
    ("fekt.post",),
    ("fekt.pipeline",),
    ("fekt.charts",),
    ("fekt.assess",),
    ("fekt.studies",),
    ("fekt.report",),
    ("fekt.api",),
    ("fekt.cli",),
    ("fekt",),
]

#: libraries that compute, which the report layer must not use (it only formats and draws numbers)
NUMERIC_LIBRARIES = ("skfem", "scipy", "gmsh", "shapely")
NUMERIC_CALLS = {"linalg", "polyfit", "polyval", "lstsq", "einsum", "gradient", "interp"}


def stage_of(module: str) -> int:
    best = None
    for i, names in enumerate(STAGES):
        for n in names:
            if (module == n or module.startswith(n + ".")) and (best is None or len(n) > best[1]):
                best = (i, len(n))
    assert best is not None, f"{module} belongs to no stage: add it to STAGES"
    return best[0]


def module_name(path: Path) -> str:
    rel = path.relative_to(PACKAGE.parent).with_suffix("")
    parts = list(rel.parts)
    if parts[-1] == "__init__":
        parts = parts[:-1]
    return ".".join(parts)


def imports_of(path: Path) -> list[tuple[str, int]]:
    """(imported fekt module, line) for every import in the file, relative ones resolved."""
    mod = module_name(path)
    package = mod if path.name == "__init__.py" else mod.rsplit(".", 1)[0]
    out = []
    for node in ast.walk(ast.parse(path.read_text(), str(path))):
        if isinstance(node, ast.Import):
            out += [(a.name, node.lineno) for a in node.names if a.name.split(".")[0] == "fekt"]
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = package.split(".")
                base = base[: len(base) - (node.level - 1)]
                target = ".".join(base + ([node.module] if node.module else []))
            else:
                target = node.module or ""
            if target.split(".")[0] != "fekt":
                continue
            if node.module is None or target == "fekt":
                # "from . import x": the names are submodules
                out += [(f"{target}.{a.name}", node.lineno) for a in node.names]
            else:
                out.append((target, node.lineno))
    return out


MODULES = sorted(PACKAGE.rglob("*.py"))


@pytest.mark.parametrize("path", MODULES, ids=[module_name(p) for p in MODULES])
def test_imports_point_upstream(path):
    me = module_name(path)
    mine = stage_of(me)
    bad = [f"line {line}: {me} ({STAGES[mine][0]}) imports {target} ({STAGES[stage_of(target)][0]})"
           for target, line in imports_of(path) if stage_of(target) > mine]
    assert not bad, "imports pointing back up the data flow:\n" + "\n".join(bad)


REPORT = sorted((PACKAGE / "report").rglob("*.py"))


@pytest.mark.parametrize("path", REPORT, ids=[module_name(p) for p in REPORT])
def test_report_computes_nothing(path):
    tree = ast.parse(path.read_text())
    bad = []
    for node in ast.walk(tree):
        if isinstance(node, (ast.Import, ast.ImportFrom)):
            names = [a.name for a in node.names] if isinstance(node, ast.Import) else [node.module or ""]
            bad += [f"line {node.lineno}: imports {n}" for n in names if n.split(".")[0] in NUMERIC_LIBRARIES]
        if isinstance(node, ast.Attribute) and node.attr in NUMERIC_CALLS:
            bad.append(f"line {node.lineno}: uses .{node.attr}")
    assert not bad, f"{module_name(path)} computes numbers:\n" + "\n".join(bad)


STUDIES = sorted((PACKAGE / "studies").rglob("*.py"))


@pytest.mark.parametrize("path", STUDIES, ids=[module_name(p) for p in STUDIES])
def test_studies_speak_no_command_line(path):
    tree = ast.parse(path.read_text())
    bad = []
    for node in ast.walk(tree):
        if isinstance(node, ast.Constant) and isinstance(node.value, str) and node.value.startswith("--"):
            bad.append(f"line {node.lineno}: option text {node.value!r}")
        if isinstance(node, (ast.Import, ast.ImportFrom)):
            names = [a.name for a in node.names] if isinstance(node, ast.Import) else [node.module or ""]
            bad += [f"line {node.lineno}: imports {n}" for n in names if n in ("argparse", "sys")]
    assert not bad, f"{module_name(path)} speaks command-line syntax:\n" + "\n".join(bad)


def test_the_checker_catches_an_upward_import(tmp_path):
    # the test must be able to fail: a geometry module importing the solver is caught
    fake = PACKAGE / "geometry" / "_layering_probe.py"
    assert stage_of("fekt.geometry._layering_probe") < stage_of("fekt.solver.linear")
    target = [t for t, _ in imports_of(Path(__file__))]  # this test file imports no fekt module
    assert target == []
    src = tmp_path / "probe.py"
    src.write_text("from ..solver.linear import solve\n")
    tree_targets = []
    for node in ast.walk(ast.parse(src.read_text())):
        if isinstance(node, ast.ImportFrom):
            base = "fekt.geometry".split(".")
            tree_targets.append(".".join(base[: len(base) - (node.level - 1)] + [node.module]))
    assert tree_targets == ["fekt.solver.linear"]
    assert stage_of(tree_targets[0]) > stage_of(str(fake.stem) and "fekt.geometry._layering_probe")
