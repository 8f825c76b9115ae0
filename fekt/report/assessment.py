"""Plain-text report of the strength and fatigue assessment (``fekt assess``).

Formats the numbers of a :class:`fekt.records.Assessment`; never computes one. The cautions come first,
before any number a reader might copy, and again at the end.
"""

from __future__ import annotations

import math

from ..records import Assessment, NotchFactorRecord, PeakAssessment
from .text import num, table

#: short column names of the notch-factor methods (the records carry the full names and formulas)
SHORT = {"Peterson": "Peterson", "Neuber/Kuhn-Hardrath": "Neuber", "Heywood": "Heywood",
         "FKM support factor": "FKM", "Siebel-Stieler support factor": "Siebel-St."}


#: shorter column heads of the criteria in the review document
HEAD = {"modified Goodman": "Goodman", "ASME elliptic": "ASME ell."}


def factor(v, digits: int = 3) -> str:
    """A safety factor or ratio, or a dash."""
    return "-" if v is None else num(v, digits)


def _kf_cell(f: NotchFactorRecord) -> str:
    if f.kf is None:
        return "-"
    return f"{num(f.kf, 4)} ({num(f.q, 3)})" if f.q is not None else num(f.kf, 4)


def strength_line(a: Assessment) -> str:
    s, su = a.strengths, a.units.stress
    lu = a.units.length
    parts = []
    for label, v, unit in (("Sy", s.yield_strength, su), ("Su", s.ultimate_strength, su),
                           ("Se", s.fatigue_strength, su), ("a", s.peterson_a, lu), ("rho'", s.neuber_rho, lu),
                           ("s_g", s.siebel_sg, lu)):
        if v is not None:
            parts.append(f"{label} = {num(v)} {unit}")
    text = ", ".join(parts) or "no strengths"
    if s.fatigue_strength is not None:
        text += f" (fatigue strength: {s.fatigue_basis})"
    if s.group:
        text += f"; group {s.group}"
    return text


def static_rows(a: Assessment) -> list[list[str]]:
    rows = []
    for p in a.peaks:
        sp, sn = p.static_peak, p.static_net
        rows.append([str(p.rank), p.feature + (" [SINGULAR]" if p.singular else ""), num(sp.stress),
                     factor(sp.factor) if sp.factor is not None else "- (singular)" if p.singular else "-",
                     num(sn.stress), factor(sn.factor)])
    return rows


def _radius(p: PeakAssessment) -> str:
    return "sharp" if p.radius == 0 else ("-" if not math.isfinite(p.radius) else num(p.radius))


def gradient_rows(a: Assessment) -> list[list[str]]:
    """Kt, root radius, the FE relative stress gradient and the chart's beside it."""
    rows = []
    for p in a.peaks:
        g = p.relative_gradient
        chart = "-" if g.chart is None else num(g.chart, 4)
        diff = "-" if g.difference_pct is None else f"{g.difference_pct:+.1f} %"
        rows.append([str(p.rank), p.feature, "-" if p.kt is None else num(p.kt, 4), _radius(p),
                     "-" if g.fe is None else num(g.fe, 4), chart, diff])
    return rows


def kf_rows(a: Assessment) -> list[list[str]]:
    """Kf (q) by every method, and the spread between the methods."""
    rows = []
    for p in a.peaks:
        spread = "-" if p.kf_spread is None else f"{p.kf_spread.spread_pct:.1f} %"
        rows.append([str(p.rank), p.feature, *(_kf_cell(f) for f in p.notch_factors), spread])
    return rows


def fatigue_rows(a: Assessment, criteria: tuple[str, ...]) -> list[list[str]]:
    rows = []
    for p in a.peaks:
        f = p.fatigue
        if f is None:
            rows.append([str(p.rank), p.feature, "none", "-", "-", "-", *("-" for _ in criteria), "-", "-"])
            continue
        by = {c.criterion: c for c in f.criteria}
        rows.append([str(p.rank), p.feature, SHORT.get(f.notch_method, f.notch_method),
                     "-" if f.kf is None else num(f.kf, 4),
                     num(f.local_mean), num(f.local_amplitude),
                     *(factor(by[c].factor) if c in by else "-" for c in criteria),
                     f.governing or "-", factor(f.first_cycle_yield)])
    return rows


def _grouped(pairs) -> list[str]:
    """``(rank, text)`` pairs as one line per text with the peaks it applies to."""
    groups: dict[str, list[int]] = {}
    for rank, text in pairs:
        groups.setdefault(text, [])
        if rank not in groups[text]:
            groups[text].append(rank)
    return [f"  peak{'s' if len(r) > 1 else ''} {', '.join(map(str, r))}: {t}" for t, r in groups.items()]


def _reasons(a: Assessment) -> list[tuple[str, str]]:
    """Why methods gave no Kf: (methods and peaks, reason), one per reason."""
    groups: dict[str, tuple[list[str], list[int]]] = {}
    for p in a.peaks:
        for f in p.notch_factors:
            if f.kf is None and f.reason:
                methods, ranks = groups.setdefault(f.reason, ([], []))
                if f.method not in methods:
                    methods.append(f.method)
                if p.rank not in ranks:
                    ranks.append(p.rank)
    n_methods = len(a.peaks[0].notch_factors) if a.peaks else 0
    out = []
    for why, (methods, ranks) in groups.items():
        who = "every method" if len(methods) == n_methods else ", ".join(SHORT.get(m, m) for m in methods)
        out.append((f"{who}, peak{'s' if len(ranks) > 1 else ''} {', '.join(map(str, ranks))}", why))
    return out


def governing_lines(a: Assessment) -> list[str]:
    out = []
    g = a.fatigue_governing
    if g is not None:
        p = a.peak(g.rank)
        spread = ""
        if p.kf_spread is not None:
            k = p.kf_spread
            spread = (f"; Kf there from {num(k.low, 4)} ({k.low_method}) to {num(k.high, 4)} ({k.high_method}), "
                      f"spread {k.spread_pct:.1f} %")
        out.append(f"Governing fatigue: peak {g.rank} ({g.feature}), {g.check}, n = {factor(g.factor)}{spread}")
    elif a.cycle is not None:
        out.append("Governing fatigue: none (no peak has a finite fatigue safety factor)")
    for label, g in (("peak stress vs yield", a.static_peak_governing),
                     ("net-section stress vs yield", a.static_net_governing)):
        if g is not None:
            out.append(f"Governing static ({label}): peak {g.rank} ({g.feature}), n = {factor(g.factor)}")
    return out


def format_assessment(a: Assessment) -> str:
    su, lu = a.units.stress, a.units.length
    lines = [f"Strength and fatigue assessment: {a.case_name}" + ("   [demo data: invented part]" if a.demo else "")]
    lines += [f"Caution: {c}" for c in a.cautions[:1]]
    lines.append(f"Material: {strength_line(a)}")
    lines.append(f"Cycle: {a.cycle}" if a.cycle else "Cycle: none given ([cycle] in the case file): static checks "
                 "and notch factors only")
    if a.cycle:
        lines.append(f"Kf for the local cycle: {a.notch_factor}" + (" (the largest of the methods that give one)"
                                                                       if a.notch_factor == "largest" else ""))
    lines.append("")
    lines.append(f"Static checks (n = Sy / |stress|; stresses in {su}):")
    lines += table(["#", "feature", "sigma_peak", "n_peak", "sigma_net", "n_net"], static_rows(a))
    lines.append("")
    methods = [SHORT.get(f.method, f.method) for f in a.peaks[0].notch_factors] if a.peaks else []
    lines.append(f"Relative stress gradient chi* at each peak (1/{lu}): from the FE field and the chart approximation "
                 f"of the root radius (chart vs FE); radius in {lu}:")
    lines += table(["#", "feature", "Kt_net", "radius", "chi*_FE", "chi*_chart", "chart vs FE"], gradient_rows(a))
    lines.append("")
    lines.append("Fatigue notch factor Kf by method (q in brackets):")
    lines += table(["#", "feature", *methods, "Kf spread"], kf_rows(a))
    if a.peaks:
        lines.append("Methods: " + "; ".join(f"{SHORT.get(f.method, f.method)}: {f.formula}"
                                            for f in a.peaks[0].notch_factors))
    reasons = _reasons(a)
    if reasons:
        lines.append("No Kf:")
        lines += [f"  {who}: {why}" for who, why in reasons]
    if a.cycle:
        lines.append("")
        lines.append(f"Fatigue safety factors of the local cycle (stresses in {su}):")
        lines += table(["#", "feature", "Kf from", "Kf", "sigma_m", "sigma_a", *a.criteria, "governing",
                        "n first-cycle yield"], fatigue_rows(a, a.criteria))
        notes = _grouped([(p.rank, n) for p in a.peaks if p.fatigue is not None for n in p.fatigue.notes]
                         + [(p.rank, p.reason) for p in a.peaks if p.fatigue is None and p.reason])
        if notes:
            lines.append("Fatigue notes:")
            lines += notes
    lines.append("")
    lines += governing_lines(a)
    if a.estimates:
        lines.append("")
        lines.append("Estimated values:")
        for e in a.estimates:
            unit = su if e.dimension == "stress" else lu
            memo = " (from memory)" if e.from_memory and "from memory" not in e.source else ""
            notes = f"; {'; '.join(e.notes)}" if e.notes else ""
            lines.append(f"  {e.quantity} = {num(e.value)} {unit} by {e.rule} [{e.inputs}]; {e.source}{memo}{notes}")
    gnotes = sorted({n for p in a.peaks for n in p.relative_gradient.notes})
    lines.append("")
    lines.append("Chart gradients: " + (a.peaks[0].relative_gradient.chart_source if a.peaks and a.peaks[0].relative_gradient.chart_source
                                        else "FKM guideline (from memory)") + ("; " + "; ".join(gnotes) if gnotes else ""))
    for n in a.notes:
        lines.append(f"note: {n}")
    for c in a.cautions:
        lines.append(f"Caution: {c}")
    return "\n".join(lines)



# --- the review document (HTML) ---------------------------------------------------------------------

def _html_rows(rows: list[list[str]]) -> tuple[tuple[str, ...], ...]:
    return tuple(tuple(r) for r in rows)


def assessment_blocks(a: Assessment) -> list:
    """The assessment section of the review document (:func:`fekt.report.review.solve_document`): the
    cautions first, then the three tables, the governing checks, the estimates and the notes."""
    from . import html as H

    su, lu = a.units.stress, a.units.length
    blocks: list = [H.Heading("Strength and fatigue assessment", anchor="assessment")]
    blocks += [H.Caution(c, title="Caution: assessment") for c in a.cautions[:2]]
    blocks.append(H.Paragraph(f"Material: {strength_line(a)}."))
    blocks.append(H.Paragraph(f"Cycle: {a.cycle}; Kf for the local cycle: {a.notch_factor}." if a.cycle else
                              "No cycle given ([cycle] in the case file): static checks and notch factors only."))
    blocks.append(H.Table(headers=("#", "feature", f"σ peak [{su}]", "n peak", f"σ net [{su}]", "n net"),
                          rows=_html_rows(static_rows(a)), numeric=(True, False, True, True, True, True),
                          caption="Static checks: n = Sy / |σ|", anchor="static-checks",
                          note="σ peak: the elastic peak stress; σ net: the largest nominal stress on the peak's net "
                               "section. Both at the case's load as stated."))
    methods = tuple(SHORT.get(f.method, f.method) for f in a.peaks[0].notch_factors) if a.peaks else ()
    blocks.append(H.Table(headers=("#", "feature", "Kt net", f"radius [{lu}]", f"χ* FE [1/{lu}]",
                                   f"χ* chart [1/{lu}]", "chart vs FE"),
                          rows=_html_rows(gradient_rows(a)), numeric=(True, False, True, True, True, True, True),
                          caption="Relative stress gradient at each peak", anchor="gradients",
                          note="χ* = -(dσ/dn)/σ at the peak, n the inward normal: from the FE field (a fit of the stress "
                               "at interior points along the inward normal) and from the chart approximation of the "
                               "root radius."))
    blocks.append(H.Table(headers=("#", "feature", *methods, "Kf spread"), rows=_html_rows(kf_rows(a)),
                          numeric=(True, False, *(True,) * len(methods), True),
                          caption="Fatigue notch factor Kf by method (q in brackets)", anchor="notch-factors",
                          note="Methods: " + "; ".join(f"{SHORT.get(f.method, f.method)}: {f.formula}"
                                                      for f in (a.peaks[0].notch_factors if a.peaks else ()))))
    reasons = _reasons(a)
    if reasons:
        blocks.append(H.KeyValues(tuple(reasons), caption="Why a method gives no Kf"))
    if a.cycle:
        rows = [r[:-2] + [HEAD.get(r[-2], r[-2]), r[-1]] for r in fatigue_rows(a, a.criteria)]
        blocks.append(H.Table(headers=("#", "feature", "Kf from", "Kf", f"σm [{su}]", f"σa [{su}]",
                                       *(HEAD.get(c, c) for c in a.criteria), "governing", "n yield"),
                              rows=_html_rows(rows),
                              numeric=(True, False, False, True, True, True, *(True,) * len(a.criteria), False, True),
                              caption="Fatigue safety factors of the local cycle", anchor="fatigue",
                              note="σm, σa: mean and alternating stress of the local cycle (Kf/Kt times the elastic "
                                   "peak stresses); safety factors by the modified Goodman line (Goodman), Gerber's "
                                   "parabola and the ASME ellipse (ASME ell.); n yield: first-cycle yield of the local "
                                   "cycle (Langer line, Sy / max |σ|)."))
        notes = _grouped([(p.rank, n) for p in a.peaks if p.fatigue is not None for n in p.fatigue.notes]
                         + [(p.rank, p.reason) for p in a.peaks if p.fatigue is None and p.reason])
        if notes:
            blocks.append(H.Paragraph("Fatigue notes: " + "; ".join(n.strip() for n in notes) + "."))
    gov = governing_lines(a)
    if gov:
        blocks.append(H.Paragraph(". ".join(gov) + "."))
    if a.estimates:
        blocks.append(H.KeyValues(tuple((e.quantity, f"{num(e.value)} {su if e.dimension == 'stress' else lu}: "
                                                     f"{e.rule} [{e.inputs}]; {e.source}") for e in a.estimates),
                                  caption="Estimated material values"))
    for n in a.notes:
        blocks.append(H.Paragraph(f"Note: {n}"))
    blocks += [H.Caution(c, title="Caution") for c in a.cautions[2:]]
    return blocks


__all__ = ["assessment_blocks", "fatigue_rows", "format_assessment", "governing_lines", "gradient_rows", "kf_rows",
           "static_rows"]
