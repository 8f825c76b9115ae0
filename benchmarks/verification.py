"""Verification benchmark: fekt at default settings against exact and tabulated references, beside a
naive baseline (uniform straight three-node triangles, no notch refinement) of about the same DOFs.

Writes benchmarks/RESULTS.md itself (run: python benchmarks/verification.py). Times are wall-clock on
the machine that ran it: mesh + solve + post, after import; compare ratios within one run.
"""

from __future__ import annotations

import math
import os
import sys
import time

import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.join(HERE, "..", "tests"))
sys.path.insert(0, HERE)

from _publish import publish  # noqa: E402

from conftest import rect_outline, strip_case, traction_component  # noqa: E402

from fekt.case.schema import Case, CutoutSpec, MeshSpec, PartSpec  # noqa: E402
from fekt.exact import inglis_kt, kirsch_traction  # noqa: E402
from fekt.geometry.build import build_part  # noqa: E402
from fekt.mesh.build import mesh_part  # noqa: E402
from fekt.pipeline import run  # noqa: E402
from fekt.loads.ends import EndsSpec  # noqa: E402
from fekt.models import REGISTRY as MODELS  # noqa: E402
from fekt.pipeline import apply_loads  # noqa: E402
from fekt.post.fields import boundary_samples  # noqa: E402
from fekt.solver.linear import solve  # noqa: E402

# Howland (1930), gross Kt, from memory (docs/references.md)
HOWLAND = {0.1: 3.03, 0.2: 3.14, 0.3: 3.36, 0.4: 3.74, 0.5: 4.32}


def kirsch_run(uniform_dofs: int | None = None):
    spec = PartSpec(outline=rect_outline(20.0, 20.0, -10.0, -10.0),
                    cutouts=(CutoutSpec("h", "circle", (0.0, 0.0), diameter=2.0),))
    part = build_part(spec)
    t0 = time.perf_counter()
    if uniform_dofs is None:
        pm = mesh_part(part, MeshSpec())
    else:
        pm = _uniform_mesh(part, uniform_dofs)
    t1 = time.perf_counter()
    sol = solve(pm, MODELS["plane_stress"], 1.0, 0.3,
                [traction_component(("bottom", "right", "top", "left"), kirsch_traction())])
    t2 = time.perf_counter()
    b = boundary_samples(sol, pm, part)
    kt = float(b.s1[b.loop == 1].max())
    t3 = time.perf_counter()
    return dict(dofs=sol.ndofs, mesh=t1 - t0, solve=t2 - t1, post=t3 - t2, kt=kt)


def _uniform_mesh(part, target_dofs: int):
    """Uniform P1 mesh with about target_dofs DOFs (2 per node; nodes ~ area / (0.433 h^2))."""
    area = part.area()
    h = math.sqrt(area / (0.5 * target_dofs) / 0.5)
    for _ in range(6):
        pm = mesh_part(part, MeshSpec(size=h), order=1, uniform=True)
        dofs = 2 * pm.mesh.p.shape[1]
        h *= math.sqrt(dofs / target_dofs)
        if abs(dofs - target_dofs) < 0.05 * target_dofs:
            break
    return pm


def case_run(case: Case, uniform_dofs: int | None = None):
    if uniform_dofs is None:
        t0 = time.perf_counter()
        r = run(case).result
        t = r.timings
        return dict(dofs=r.mesh.dofs, mesh=t.mesh_s, solve=t.assemble_s + t.solve_s,
                    post=t.post_s, kt=r.peaks[0].kt_gross, total=time.perf_counter() - t0)
    part = build_part(case.part)
    loads = apply_loads(case, part)
    t0 = time.perf_counter()
    pm = _uniform_mesh(part, uniform_dofs)
    t1 = time.perf_counter()
    sol = solve(pm, MODELS[case.part.model], case.material.E, case.material.nu, loads.components)
    t2 = time.perf_counter()
    b = boundary_samples(sol, pm, part)
    peak = float(b.s1[b.loop == 1].max())
    sec = loads.ends[0].section
    force = sum(c.magnitude for c in loads.components if c.quantity == "force")
    t3 = time.perf_counter()
    return dict(dofs=sol.ndofs, mesh=t1 - t0, solve=t2 - t1, post=t3 - t2, kt=peak / (force / sec.area))


def main() -> None:
    rows = []
    cases = [("Kirsch, exact traction on a 20a square", None, 3.0, "Kirsch (1898), exact")]
    for x, ref in HOWLAND.items():
        cases.append((f"Howland strip d/W = {x}, L = 8W (Kt gross)", strip_case(W=40.0, L=320.0, d=40.0 * x), ref,
                      "Howland (1930) table, from memory"))
    a, b = 2.0, 1.0
    ell = Case("inglis", PartSpec(outline=rect_outline(320.0, 80.0), cutouts=(
        CutoutSpec("e", "ellipse", (160.0, 40.0), a=b, b=a),), thickness=1.0), (EndsSpec(("left", "right"), force=80.0),))
    cases.append(("Inglis ellipse a/b = 2, 2a/W = 0.05 (Kt gross)", ell, inglis_kt(a, b),
                  "Inglis (1913), infinite plate"))
    run(strip_case())  # warm-up: imports and first-call costs out of the table
    for name, case, ref, source in cases:
        fe = kirsch_run() if case is None else case_run(case)
        total = fe.get("total", fe["mesh"] + fe["solve"] + fe["post"])
        naive = kirsch_run(fe["dofs"]) if case is None else case_run(case, fe["dofs"])
        rows.append((name, fe, total, ref, source, naive))
    lines = ["# Verification benchmark (written by benchmarks/verification.py)", "",
             "fekt at default settings (curved P2, graded to each notch, facet Gauss-point peak) against exact "
             "or tabulated references; beside it a naive baseline: uniform straight P1 triangles with about the "
             "same DOFs, peak from element stresses on the boundary. Times: wall clock on this machine, "
             "after import.", "",
             "| case | DOFs | mesh s | solve s | post s | total s | Kt | reference | error % | naive DOFs | naive Kt | naive error % |",
             "|---|---|---|---|---|---|---|---|---|---|---|---|"]
    for name, fe, total, ref, source, nv in rows:
        err = 100 * (fe["kt"] - ref) / ref
        nerr = 100 * (nv["kt"] - ref) / ref
        lines.append(f"| {name} | {fe['dofs']} | {fe['mesh']:.2f} | {fe['solve']:.2f} | {fe['post']:.2f} | "
                     f"{total:.2f} | {fe['kt']:.4f} | {ref:.4g} ({source}) | {err:+.3f} | {nv['dofs']} | "
                     f"{nv['kt']:.4f} | {nerr:+.2f} |")
    lines += ["", f"Machine: {os.cpu_count()} cores; numpy {np.__version__}.", ""]
    publish(lines, os.path.join(HERE, "RESULTS.md"))


if __name__ == "__main__":
    main()
