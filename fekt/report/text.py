"""Plain-text report of a solve: ranked hot-spot table, sections, mesh and timing facts, cautions.

Formats numbers that the pipeline computed; never computes or changes one.
"""

from __future__ import annotations

import math

from ..pipeline import Result


def _num(v, digits: int = 4) -> str:
    if v is None:
        return "n/a"
    if isinstance(v, float) and not math.isfinite(v):
        return "-"
    return f"{v:.{digits}g}"


def _table(headers: list[str], rows: list[list[str]]) -> list[str]:
    widths = [max(len(h), *(len(r[i]) for r in rows)) if rows else len(h) for i, h in enumerate(headers)]
    line = "  ".join(h.ljust(w) for h, w in zip(headers, widths))
    out = [line, "  ".join("-" * w for w in widths)]
    out += ["  ".join(c.ljust(w) for c, w in zip(r, widths)) for r in rows]
    return out


def format_result(r: Result) -> str:
    su, lu = r.units["stress"], r.units["length"]
    lines = [f"fekt: {r.case_name}" + ("   [demo data: invented part]" if r.demo else "")]
    if r.source:
        lines.append(f"case file: {r.source}")
    ends = r.load["ends"]
    lines.append(f"{r.model.replace('_', ' ')}, thickness {_num(r.thickness)} {lu}; "
                 f"axial force {_num(r.load['force'])} {r.units['force']}, moments "
                 f"{_num(ends[0]['moment'])} at '{ends[0]['name']}' and {_num(ends[1]['moment'])} at "
                 f"'{ends[1]['name']}' ({r.units['moment']})")
    lines.append("")
    rows = []
    for h in r.hot_spots:
        feat = h.feature + (" [SINGULAR]" if h.singular else "")
        kt_net = _num(h.kt_net) if not h.singular else _num(h.kt_net) + "*"
        rad = "sharp" if h.radius == 0 else ("-" if not math.isfinite(h.radius) else _num(h.radius))
        unc = ""
        if r.uncertainty and str(h.rank) in r.uncertainty.get("hot_spots", {}):
            u = r.uncertainty["hot_spots"][str(h.rank)]
            unc = "+-" + _num(u["kt_net_band"], 2) if u.get("kt_net_band") is not None else "(no band)"
        rows.append([str(h.rank), feat, f"({_num(h.x, 5)}, {_num(h.y, 5)})", _num(h.peak),
                     _num(h.sigma_nom_net), kt_net + (f" {unc}" if unc else ""), _num(h.kt_gross),
                     _num(h.net_section.width), f"{_num(h.element_size, 3)} / {rad}"])
    lines.append(f"Hot spots (boundary maximum principal stress, ranked; stresses in {su}, lengths in {lu}):")
    lines += _table(["#", "feature", "at (x, y)", "sigma_peak", "sigma_nom", "Kt_net", "Kt_gross",
                     "net width", "elem size / radius"], rows)
    lines.append("")
    gross_end = r.hot_spots[0].gross_end if r.hot_spots else ""
    lines.append(f"Kt_net = sigma_peak / sigma_nom on the net section (shortest cut normal to the load axis "
                 f"through the owning feature; sigma_nom = N/A + M*y/I by beam theory). Kt_gross uses the "
                 f"section of end '{gross_end}' (the wider loaded end).")
    c = r.most_compressive
    lines.append(f"Most compressive boundary stress: {_num(c['sigma'])} {su} at ({_num(c['x'], 5)}, {_num(c['y'], 5)})")
    if r.uncertainty:
        lines.append(f"Uncertainty: {r.uncertainty.get('method', '')}")
    if r.charts:
        lines += ["", *r.charts.get("lines", [])]
    lines.append("")
    seen = set()
    for h in r.hot_spots:
        if h.feature in seen:
            continue
        seen.add(h.feature)
        s = h.net_section
        lines.append(f"  net section for {h.feature}: width {_num(s.width)} {lu}, area {_num(s.area)} {lu}^2, "
                     f"centroid ({_num(s.centroid[0], 5)}, {_num(s.centroid[1], 5)}), N = {_num(h.N)}, "
                     f"M = {_num(h.M)}, equilibrium error {_num(100 * h.equilibrium_error, 2)} %")
    m, t = r.mesh, r.timings
    lines.append("")
    lines.append(f"Mesh: {m['elements']} curved 6-node triangles, {m['dofs']} DOFs, min scaled Jacobian "
                 f"{_num(m['min_scaled_jacobian'], 3)}, {_num(m['elements_per_radius'], 3)} elements per notch radius, "
                 f"largest element {_num(m['size_max'], 3)} {lu}; solver {m['solver']}")
    lines.append(f"Time: mesh {t['mesh_s']:.2f} s, assemble {t['assemble_s']:.2f} s, solve {t['solve_s']:.2f} s, "
                 f"post {t['post_s']:.2f} s, total {t['total_s']:.2f} s")
    for n in r.notes:
        lines.append(f"note: {n}")
    for w in r.warnings:
        lines.append(f"WARNING: {w}")
    if any(h.singular for h in r.hot_spots):
        lines.append("* singular hot spot: its peak grows with mesh refinement; the value is not a property of the part")
    lines.append(f"Caution: {r.caution}")
    return "\n".join(lines)
