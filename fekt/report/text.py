"""Plain-text report of a solve: ranked stress-peak table, sections, mesh and timing facts, cautions.

Formats numbers that the pipeline computed; never computes or changes one.
"""

from __future__ import annotations

import math

from ..records import Result
from .units import engineering
from .words import TWO_GRID_METHOD, component_chart_lines, family_check_lines, nearest_chart_line


def num(v, digits: int = 4) -> str:
    """``digits`` significant digits, never in exponent notation: numbers that ``%g`` would write as
    ``5.987e+04`` are written in engineering form instead (``59870``, ``12.34×10⁶``; see
    :func:`fekt.report.units.engineering`, plain digits without group separators in text)."""
    if v is None:
        return "n/a"
    if isinstance(v, float) and not math.isfinite(v):
        return "-"
    text = f"{v:.{digits}g}"
    return engineering(v, digits, group="") if "e" in text else text


def table(headers: list[str], rows: list[list[str]]) -> list[str]:
    widths = [max(len(h), *(len(r[i]) for r in rows)) if rows else len(h) for i, h in enumerate(headers)]
    line = "  ".join(h.ljust(w) for h, w in zip(headers, widths))
    out = [line, "  ".join("-" * w for w in widths)]
    out += ["  ".join(c.ljust(w) for c, w in zip(r, widths)) for r in rows]
    return out


MEASURE_WORDS = {
    "tangential": "tangential boundary stress",
    "principal": "principal boundary stress of the larger magnitude",
    "max_principal": "largest principal boundary stress",
    "min_principal": "smallest principal boundary stress",
    "von_mises": "von Mises equivalent boundary stress",
}
QUANTITY_UNITS = {"force": "force", "moment": "moment", "torque": "moment", "stress": "stress", "pressure": "stress",
                  "shear": "stress", "end load": "force"}


def _component_text(r: Result) -> str:
    parts = []
    for c in r.load.components:
        unit = getattr(r.units, QUANTITY_UNITS.get(c.quantity, "force"), "")
        parts.append(f"{c.name} {num(c.magnitude)} {unit}")
    return ", ".join(parts)


def format_result(r: Result) -> str:
    su, lu = r.units.stress, r.units.length
    lines = [f"fekt: {r.case_name}" + ("   [demo data: invented part]" if r.demo else "")]
    if r.source:
        lines.append(f"case file: {r.source}")
    ends = r.load.ends
    thick = f", thickness {num(r.thickness)} {lu}" if r.thickness is not None else ""
    lines.append(f"{r.model_label}{thick}; loads: {_component_text(r)}")
    if len(ends) == 2 and (ends[0].moment or ends[1].moment):
        lines.append(f"  end moments {num(ends[0].moment)} at '{ends[0].name}' and {num(ends[1].moment)} at "
                     f"'{ends[1].name}' ({r.units.moment})")
    lines.append("")
    names = [c.name for c in r.load.components]
    measure = MEASURE_WORDS.get(r.measure, r.measure)
    heading = f"({measure}, tensile and compressive, ranked by magnitude; stresses in {su}, lengths in {lu})"
    cases = r.load_cases or (None,)
    for case in cases:
        peaks = r.peaks if case is None else case.peaks
        if case is not None:
            factors = ", ".join(f"{name} x {num(f)}" for name, f in case.factors)
            lines.append(f"Load case '{case.name}' ({factors}):")
        lines += peak_tables(r, peaks, names, heading)
        contacts = r.contacts if case is None else case.contacts
        lines += [contact_line(c) for c in contacts]
        if case is not None:
            c = case.most_compressive
            lines.append(f"Most compressive boundary stress: {num(c.sigma)} {su} at ({num(c.x, 5)}, {num(c.y, 5)})")
            lines.append("")
    lines.append("")
    lines.append("Kt = sigma_peak / sigma_nom, signed: positive where the peak and the nominal stress there have "
                 "the same sign (a compressive peak under a compressive nominal stress has a positive Kt). "
                 "Net section: the shortest cut normal to the load axis through the owning feature; "
                 f"{r.nominal_rule or 'sigma_nom = N/A + M*y/I by beam theory from statics'}. Gross section: the same cut without the feature "
                 "(none for shoulders without a width step, corners and plain edges).")
    if len(names) > 1:
        lines.append("Kt_net <component>: each load component alone, at the same point, on its own nominal stress "
                     "(none for a load that needs the others, or a support, to be in equilibrium).")
    for source in sorted({h.nominal_source for h in _all_peaks(r) if h.nominal_source}):
        lines.append(f"Nominal stress: {source}.")
    if not r.load_cases:
        c = r.most_compressive
        lines.append(f"Most compressive boundary stress: {num(c.sigma)} {su} at ({num(c.x, 5)}, {num(c.y, 5)})")
    if r.estimate is not None:
        lines.append(f"Uncertainty: {TWO_GRID_METHOD}")
    lines += chart_lines(r)
    lines.append("")
    seen = set()
    for h in r.peaks:
        if h.feature in seen:
            continue
        seen.add(h.feature)
        s = h.net_section
        g = h.gross_section
        gross = f"gross width {num(g.width)} {lu} ({h.gross_rule})" if g is not None else f"gross: {h.gross_rule}"
        lines.append(f"  net section for {h.feature}: width {num(s.width)} {lu}, area {num(s.area)} {lu}^2, "
                     f"centroid ({num(s.centroid[0], 5)}, {num(s.centroid[1], 5)}), N = {num(h.N)}, "
                     f"M = {num(h.M)}, equilibrium error {num(100 * h.equilibrium_error, 2)} %; {gross}")
    m, t = r.mesh, r.timings
    lines.append("")
    lines.append(f"Mesh: {m.elements} curved 6-node triangles, {m.dofs} DOFs, min scaled Jacobian "
                 f"{num(m.min_scaled_jacobian, 3)}, {num(m.elements_per_radius, 3)} elements per notch radius, "
                 f"largest element {num(m.size_max, 3)} {lu}; solver {m.solver}")
    lines.append(time_line(t))
    for n in r.notes:
        lines.append(f"note: {n}")
    for w in r.warnings:
        lines.append(f"WARNING: {w}")
    if any(h.singular for h in r.peaks):
        lines.append("* singular stress peak: its value grows with mesh refinement; it is not a property of the part")
    lines.append(f"Caution: {r.caution}")
    return "\n".join(lines)


def _all_peaks(r: Result):
    return [h for c in r.load_cases for h in c.peaks] if r.load_cases else list(r.peaks)


def peak_row(r: Result, h, names: list[str]) -> list[str]:
    feat = h.feature + (" [SINGULAR]" if h.singular else "")
    kt_net = num(h.kt_net) if not h.singular else num(h.kt_net) + "*"
    rad = "sharp" if h.radius == 0 else ("-" if not math.isfinite(h.radius) else num(h.radius))
    unc = ""
    if h.band is not None:
        unc = "+-" + num(h.band.kt_net, 2) if h.band.kt_net is not None else "(no band)"
    at = f"({num(h.x, 5)}, {num(h.y, 5)})" + (f" at {num(h.theta, 3)} deg" if h.theta is not None else "")
    row = [str(h.rank), feat, at, num(h.peak), num(h.sigma_nom_net), kt_net + (f" {unc}" if unc else ""),
           num(h.kt_gross)]
    if len(names) > 1:
        by = {c.name: c for c in h.components}
        row += [num(by[n].kt_net) if n in by else "-" for n in names]
    return row + [num(h.net_section.width), f"{num(h.element_size, 3)} / {rad}"] + (
        [h.introduction] if h.introduction else [])


def peak_tables(r: Result, peaks, names: list[str], heading: str) -> list[str]:
    """The notch-peak table and, apart from it, the load-introduction peaks (where loads and supports enter
    the part: bearing arcs, clamped corners), which are not notch Kt."""
    cx, cy = r.coordinates
    where = f"at ({cx}, {cy})" + (", theta" if any(h.theta is not None for h in peaks) else "")
    head = ["#", "feature", where, "sigma_peak", "sigma_nom", "Kt_net", "Kt_gross",
            *(f"Kt_net {n}" for n in (names if len(names) > 1 else ())), "net width", "elem size / radius"]
    notch = [h for h in peaks if not h.introduction]
    intro = [h for h in peaks if h.introduction]
    out = [f"Stress peaks {heading}:"]
    out += table(head, [peak_row(r, h, names) for h in notch]) if notch else ["  (none)"]
    if intro:
        out += ["", "Load-introduction peaks (where a load or a support enters the part; local to the idealised "
                    "load, not notch Kt; never taken as the part's Kt unless named with --feature):"]
        out += table(head + ["where"], [peak_row(r, h, names) for h in intro])
    return out


def contact_line(c) -> str:
    case = f" in load case '{c.case}'" if c.case else ""
    return (f"Pin '{c.load}'{case}: in contact from {num(c.arc_from, 3)} to {num(c.arc_to, 3)} deg either side of "
            f"the force direction ({c.nodes} boundary nodes; active-set iterations {c.iterations}; largest overlap "
            f"left {num(c.overlap, 2)})")


def time_line(t) -> str:
    """Wall time as the user waited for it first (when known), then the stages."""
    stages = (f"geometry {t.geometry_s:.2f} s, mesh {t.mesh_s:.2f} s, assemble {t.assemble_s:.2f} s, "
              f"solve {t.solve_s:.2f} s, post {t.post_s:.2f} s")
    if t.estimate_s is not None:
        stages += f", band mesh {t.estimate_s:.2f} s"
    if t.charts_s is not None:
        stages += f", charts {t.charts_s:.2f} s"
    if t.wall_s is not None:
        return f"Time: {t.wall_s:.2f} s wall ({stages})"
    return f"Time: {stages}; total {t.total_s:.2f} s"


def chart_lines(r: Result) -> list[str]:
    """The chart cross-check lines: the family check, or the nearest chart per feature."""
    if r.family_check is not None:
        peak = r.peak(r.family_check.peak_rank) if r.family_check.peak_rank is not None else None
        return ["", *family_check_lines(r.family_check, peak.chart if peak else None,
                                        peak.component_charts if peak else ())]
    rows = []
    for p in r.peaks:
        if p.chart is not None:
            rows.append(nearest_chart_line(p.feature, p.kt_net, p.chart))
            rows += [line.replace("  component", "      component", 1) for c in p.component_charts
                     for line in component_chart_lines(c)]
    if not rows:
        return []
    return ["", "Nearest chart per feature (each notch alone; ignores interaction with other features):", *rows]
