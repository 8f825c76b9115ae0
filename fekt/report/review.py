"""The design-review package: one self-contained HTML document per solve, refinement study and sweep.

Built from the typed records (:class:`fekt.records.Result`, :class:`fekt.studies.convergence.Study`,
:class:`fekt.studies.sweep.PointResult`) into the generic view model of :mod:`fekt.report.html`, then
rendered by it (figures embedded, no script, nothing fetched, A4 print rules). Every number shown is
one the records hold, formatted here (:func:`fekt.report.units.engineering`); nothing is computed.
Figures are drawn by the existing plot functions into a temporary PNG file whose bytes are embedded.

Conventions of the documents (our own):

* the caution comes right after the summary, before any number a reader might copy;
* the peak table lists exactly the result's peaks, in rank order (anchor ``peaks``); the first row is
  highlighted; a singular peak is marked in the feature cell and its Kt gets an asterisk;
* numbers carry 4 significant digits (bands 2), units in the column headers;
* demo cases get the renderer's demo banner.
"""

from __future__ import annotations

import datetime as _dt
import math
import os
import tempfile
from collections.abc import Callable, Mapping, Sequence
from importlib import metadata

from ..records import ChartCheck, NoChart, Result, StressPeak
from . import html as H
from .convergence import spot_message, write_study_plot
from .sweep import format_fit, write_sweep_plot
from .text import num
from .units import engineering
from .words import STUDY_METHOD, TWO_GRID_METHOD, band_message, no_chart_text

#: distributions whose versions a study or sweep report lists (a solve lists what its run recorded)
LIBRARIES = ("fekt", "gmsh", "scikit-fem", "numpy", "scipy", "matplotlib", "meshio", "pint", "jinja2")

DASH = "–"
SINGULAR_NOTE = ("* singular stress peak (a sharp re-entrant corner): its value grows with mesh refinement and "
                 "is not a property of the part; give the corner a radius.")


# --- small formatting helpers ----------------------------------------------------------------------

def q(value, digits: int = 4) -> str:
    """A number with ``digits`` significant digits (engineering form), or a dash when there is none."""
    if value is None:
        return DASH
    v = float(value)
    if not math.isfinite(v):
        return DASH if math.isnan(v) else engineering(v, digits)
    return engineering(v, digits)


def pm(value, digits: int = 2) -> str:
    """A band half-width as ``±0.012``, or a dash."""
    return DASH if value is None else "±" + q(value, digits)


def kt_text(value, singular: bool = False) -> str:
    return q(value) + ("*" if singular and value is not None else "")


def xy(x: float, y: float) -> str:
    return f"({q(x, 5)}, {q(y, 5)})"


def utc_now() -> str:
    return _dt.datetime.now(_dt.timezone.utc).replace(microsecond=0).isoformat().replace("+00:00", " UTC")


def library_versions(names: Sequence[str] = LIBRARIES) -> dict[str, str]:
    """Installed versions of the named distributions (read from their metadata, nothing imported; fekt's
    own from :mod:`fekt.version`, the code that ran)."""
    from ..version import __version__

    out = {}
    for n in names:
        try:
            out[n] = __version__ if n == "fekt" else metadata.version(n)
        except metadata.PackageNotFoundError:
            out[n] = "not installed"
    return out


def figure_png(draw: Callable[[str], None]) -> bytes:
    """The PNG that ``draw(path)`` writes, read back from a temporary folder that is then removed."""
    with tempfile.TemporaryDirectory(prefix="fekt-figure-") as tmp:
        path = os.path.join(tmp, "figure.png")
        draw(path)
        with open(path, "rb") as fh:
            return fh.read()


def _case_blocks(case_text: str | None, source: str, parameters: Mapping[str, float] | None,
                 note: str = "") -> list:
    blocks: list = [H.Heading("Inputs", anchor="inputs")]
    if parameters:
        blocks.append(H.KeyValues(tuple((k, num(v, 6)) for k, v in parameters.items()),
                                  caption="Parameters (evaluated)"))
    if note:
        blocks.append(H.Paragraph(note))
    if case_text is not None:
        blocks.append(H.Preformatted(case_text, caption=f"The case file as read: {source or 'text'}"))
    return blocks


def _provenance(rows: list[tuple[str, str]], versions: Mapping[str, str]) -> H.Provenance:
    rows = list(rows) + [(f"version of {k}", v) for k, v in versions.items()]
    rows.append(("report written", utc_now()))
    return H.Provenance(tuple(rows))


# --- one solve -------------------------------------------------------------------------------------

def peak_rows(result: Result) -> tuple[tuple[str, ...], ...]:
    """The rows of the peak table, one per peak of the result, in rank order (also what tests read)."""
    rows = []
    for p in sorted(result.peaks, key=lambda p: p.rank):
        band = p.band
        rows.append((str(p.rank), p.feature + (" (singular)" if p.singular else ""), q(p.peak),
                     kt_text(p.kt_net, p.singular), pm(band.kt_net if band else None),
                     kt_text(p.kt_gross, p.singular), pm(band.kt_gross if band else None), xy(p.x, p.y)))
    return tuple(rows)


def _peak_table(r: Result) -> H.Table:
    su, lu = r.units.stress, r.units.length
    headers = ("#", "feature", f"σ peak [{su}]", "Kt net", "band", "Kt gross", "band", f"at (x, y) [{lu}]")
    rows = peak_rows(r)
    note = ("σ peak: the signed boundary stress at the peak (tension +, compression -). Kt net = σ peak / σ nom, "
            "net, with σ nom, net = N/A + M·y/I on the net section (the shortest cut normal to the load axis "
            "through the feature that owns the peak), from statics; Kt is positive where the peak and the nominal "
            "stress have the same sign. Kt gross uses the same cut without the feature (hole filled, notches "
            "removed, wider side of a step; none for corners and plain edges). Both nominal stresses and the "
            "sections are in the next table. Bands: the discretisation uncertainty of each Kt (see Uncertainty).")
    return H.Table(headers=headers, rows=rows, numeric=(True, False, True, True, True, True, True, False),
                   emphasis=tuple(i == 0 for i in range(len(rows))), caption="Stress peaks, ranked by peak stress",
                   note=note, anchor="peaks")


def _section_table(r: Result) -> H.Table:
    su, lu, fu, mu = r.units.stress, r.units.length, r.units.force, r.units.moment
    rows = []
    for p in sorted(r.peaks, key=lambda p: p.rank):
        s = p.net_section
        rows.append((str(p.rank), q(p.sigma_nom_net), q(p.sigma_nom_gross), q(s.width), q(s.area), q(s.inertia),
                     q(p.N), q(p.M), q(100 * p.equilibrium_error, 2) if math.isfinite(p.equilibrium_error) else DASH))
    return H.Table(headers=("#", f"σ net [{su}]", f"σ gross [{su}]", f"width [{lu}]", f"area [{lu}²]",
                            f"I [{lu}⁴]", f"N [{fu}]", f"M [{mu}]", "equil. [%]"),
                   rows=tuple(rows), numeric=(True,) * 9, caption="Nominal stresses and net sections",
                   note="σ net, σ gross: the nominal stresses of Kt net and Kt gross at the peak. Width, area and I "
                        "(second moment): the net section. N and M: its resultants from statics (M about the "
                        "section's centroid). Equil.: how far the FE stresses integrated over the cut miss N and M.",
                   anchor="sections")


def _band_blocks(r: Result) -> list:
    blocks: list = [H.Heading("Uncertainty", anchor="uncertainty")]
    if r.estimate is None:
        blocks.append(H.Paragraph("No uncertainty estimate was made for this solve (--no-estimate): the Kt values "
                                  "have no band. Run without it, or run fekt converge, before relying on them."))
        return blocks
    blocks.append(H.Paragraph(f"Method: {TWO_GRID_METHOD}. The coarse mesh had {r.estimate.coarse_dofs} degrees "
                              f"of freedom."))
    rows = []
    for p in sorted(r.peaks, key=lambda p: p.rank):
        b = p.band
        if b is None:
            rows.append((str(p.rank), DASH, DASH, "no counterpart on the coarse mesh: no band"))
            continue
        values = " → ".join(q(v) for v in reversed(b.values_fine_to_coarse))
        rows.append((str(p.rank), str(b.verdict), values, band_message(b, x=p.x, y=p.y)))
    blocks.append(H.Table(headers=("#", "verdict", "Kt net, coarse → fine", "what the band says"), rows=tuple(rows),
                          numeric=(True, False, False, False), caption="Band of each peak", anchor="bands"))
    return blocks


def _chart_cells(p: StressPeak) -> tuple[str, ...]:
    c = p.chart
    if isinstance(c, NoChart):
        return (str(p.rank), p.feature, no_chart_text(c), DASH, DASH, DASH, DASH)
    if not isinstance(c, ChartCheck):
        return (str(p.rank), p.feature, "not checked", DASH, DASH, DASH, DASH)
    chart, fe, basis = c.chart_kt, c.fe_kt, str(c.basis)
    memory = " (fit recalled from memory)" if c.from_memory else ""
    coverage = "inside" if c.coverage == "inside" else "OUTSIDE: " + "; ".join(c.coverage_notes)
    diff = DASH if c.difference_pct is None else f"{c.difference_pct:+.1f} % (fit ±{c.band_pct:.0f} %)"
    return (str(p.rank), p.feature, f"{c.fit}{memory}; {c.confidence} confidence", f"{q(chart)} ({basis})",
            f"{q(fe)} ({basis})", diff, coverage)


def _chart_blocks(r: Result) -> list:
    checked = [p for p in sorted(r.peaks, key=lambda p: p.rank) if p.chart is not None]
    blocks: list = [H.Heading("Chart cross-checks", anchor="charts")]
    fc = r.family_check
    if fc is not None:
        text = f"The case is the standard shape '{fc.family}' ({fc.load or 'combined load'})."
        if fc.peak_rank is None:
            why = no_chart_text(fc.no_chart) if fc.no_chart else "no chart"
            blocks.append(H.Paragraph(f"{text} It has no chart value: {why}."))
            return blocks
        blocks.append(H.Paragraph(f"{text} Peak {fc.peak_rank} is compared with the published chart."))
        checked = [p for p in checked if p.rank == fc.peak_rank]
    elif checked:
        blocks.append(H.Paragraph("Nearest published chart for each feature, measured from the geometry. Each "
                                  "chart treats its notch alone and ignores interaction with other features."))
    if not checked:
        blocks.append(H.Paragraph("No chart cross-check was made."))
        return blocks
    blocks.append(H.Table(headers=("#", "feature", "chart", "chart Kt", "FE Kt", "FE vs chart", "coverage"),
                          rows=tuple(_chart_cells(p) for p in checked),
                          numeric=(True, False, False, True, True, True, False), caption="Charts beside the FE values",
                          anchor="chart-checks"))
    sources = sorted({p.chart.source for p in checked if isinstance(p.chart, ChartCheck)})
    if sources:
        blocks.append(H.Paragraph("Sources: " + "; ".join(sources) + "."))
    return blocks


def _model_rows(r: Result) -> tuple[tuple[str, str], ...]:
    u = r.units
    rows = [("case", r.case_name), ("model", r.model_label), ("thickness", f"{q(r.thickness)} {u.length}")]
    for k, v in r.material.items():
        rows.append((f"material {k}", q(v) + (f" {u.stress}" if k in ("E", "G") else "")))
    ax = r.load.axis
    rows.append(("load axis", f"({q(ax[0], 3)}, {q(ax[1], 3)})"))
    rows.append(("axial force", f"{q(r.load.force)} {u.force}"))
    for e in r.load.ends:
        rows.append((f"end '{e.name}'", f"width {q(e.width)} {u.length}, moment {q(e.moment)} {u.moment}, "
                                        f"centroid {xy(*e.centroid)}"))
    for c in r.load.components:
        unit = {"force": u.force, "moment": u.moment, "stress": u.stress}.get(c.quantity, "")
        rows.append((f"load component '{c.name}'", f"{c.quantity} {q(c.magnitude)} {unit}".rstrip()))
    return tuple(rows)


def _mesh_rows(r: Result) -> tuple[tuple[str, str], ...]:
    m, lu = r.mesh, r.units.length
    rows = [("elements", f"{m.elements} ({m.element})"), ("nodes", str(m.nodes)), ("degrees of freedom", str(m.dofs)),
            ("smallest scaled Jacobian", q(m.min_scaled_jacobian, 3)),
            ("elements per notch radius", q(m.elements_per_radius, 3)), ("uniform splits", str(m.refine)),
            ("largest element", f"{q(m.size_max, 3)} {lu}"), ("meshed area", f"{q(m.area)} {lu}²"),
            ("solver", m.solver)]
    for name, size in m.feature_sizes.items():
        rows.append((f"element size at {name}", f"{q(size, 3)} {lu}"))
    return tuple(rows)


def _timing_rows(r: Result) -> list[tuple[str, str]]:
    t = r.timings
    parts = [("geometry", t.geometry_s), ("mesh", t.mesh_s), ("assemble", t.assemble_s), ("solve", t.solve_s),
             ("post-processing", t.post_s), ("total (fine mesh)", t.total_s), ("uncertainty mesh", t.estimate_s),
             ("chart checks", t.charts_s), ("wall clock", t.wall_s)]
    return [(f"time: {k}", f"{v:.2f} s") for k, v in parts if v is not None]


def solve_document(solved, *, case_text: str | None = None, result: Result | None = None,
                   figure: bytes | None = None, assessment=None) -> H.Document:
    """The review document of one solve.

    ``solved``: the :class:`fekt.pipeline.Solved` state (for the figure, the case's parameters and
    description); ``result``: the result as shown (e.g. converted to other units; default
    ``solved.result``); ``case_text``: the case file's text; ``figure``: PNG bytes of the part/stress figure
    (default: drawn now with :func:`fekt.report.plots.write_figure`, in the case's units); ``assessment``: the
    strength and fatigue assessment as shown (:class:`fekt.records.Assessment`), added as its own section."""
    from .plots import write_figure

    r = result if result is not None else solved.result
    case = solved.case
    png = figure if figure is not None else figure_png(lambda path: write_figure(solved, path))
    su, lu = r.units.stress, r.units.length
    blocks: list = [H.Heading("Summary", anchor="summary")]
    if r.peaks:
        p = r.peaks[0]
        band = f" {pm(p.band.kt_net)}" if p.band is not None and p.band.kt_net is not None else ""
        blocks.append(H.Paragraph(
            f"{len(r.peaks)} stress peak(s). The highest is at {p.feature} {xy(p.x, p.y)} {lu}: peak stress "
            f"{q(p.peak)} {su}, Kt net = {kt_text(p.kt_net, p.singular)}{band} (nominal {q(p.sigma_nom_net)} {su} "
            f"on a net section {q(p.net_section.width)} {lu} wide), Kt gross = {kt_text(p.kt_gross, p.singular)}."
            + (f" {len(r.warnings)} warning(s): see Warnings." if r.warnings else " No warnings.")))
    else:
        blocks.append(H.Paragraph("No stress peak was found on the free boundary."))
    if case.description:
        blocks.append(H.Paragraph(f"Case description: {case.description}"))
    blocks.append(H.Caution(r.caution))
    blocks.append(H.Heading("Stress peaks", anchor="stress-peaks"))
    blocks.append(_peak_table(r))
    if any(p.singular for p in r.peaks):
        blocks.append(H.Paragraph(SINGULAR_NOTE))
    c = r.most_compressive
    blocks.append(H.Paragraph(f"Most compressive boundary stress: {q(c.sigma)} {su} at {xy(c.x, c.y)} {lu}."))
    same_units = (r.units.length, r.units.stress) == (case.units.length, case.units.stress)
    where = "" if same_units else (f" The figure is drawn in the case file's units ({case.units.length}, "
                                   f"{case.units.stress}); the tables are in {lu} and {su}.")
    blocks.append(H.Figure(
        caption="Left: maximum principal stress over the part; numbered circles mark the stress peaks of the table, "
                "dotted lines their net sections. Right: the mesh at peak 1." + where,
        alt=f"Stress field of {r.case_name} with {len(r.peaks)} numbered stress peaks, and the mesh near peak 1",
        png=png, anchor="stress-figure"))
    blocks.append(_section_table(r))
    blocks += _band_blocks(r)
    blocks += _chart_blocks(r)
    if assessment is not None:
        from .assessment import assessment_blocks

        blocks += assessment_blocks(assessment)
    blocks.append(H.WarningList(tuple(r.warnings)))
    if r.notes:
        blocks.append(H.Heading("Notes", anchor="notes"))
        blocks += [H.Paragraph(n) for n in r.notes]
    blocks += _case_blocks(case_text, r.source, dict(case.parameters))
    blocks.append(H.KeyValues(_model_rows(r), caption="Model, material and loads"))
    blocks.append(H.Heading("Mesh", anchor="mesh"))
    blocks.append(H.KeyValues(_mesh_rows(r)))
    prov = [("case file", r.source or DASH), ("case hash (SHA-256, 16 hex digits)", r.provenance.case_sha256_16),
            ("largest restraint reaction / load", q(r.provenance.max_reaction_over_load, 2))]
    prov += _timing_rows(r)
    blocks.append(_provenance(prov, r.provenance.versions))
    return H.Document(title=f"Kt review: {r.case_name}", subtitle=f"fekt solve; {r.model_label}; stresses in {su}, "
                      f"lengths in {lu}", demo=r.demo, blocks=tuple(blocks),
                      footer="Written by fekt from its own computed results.")


# --- a refinement study ---------------------------------------------------------------------------

def study_rows(study) -> tuple[tuple[str, ...], ...]:
    rows = []
    for s in study.spots:
        values = " → ".join(q(v, 5) for v in reversed(s.values))
        p = s.estimate.observed_order if s.estimate is not None else None
        rows.append((str(s.rank), s.key + (" (singular)" if s.singular else ""), values, str(s.verdict),
                     q(p, 3) if p else DASH, q(s.extrapolated, 5), pm(s.band)))
    return tuple(rows)


def study_document(study, *, case_text: str | None = None, source: str = "", parameters=None, case_hash: str = "",
                   length_unit: str = "", figure: bytes | None = None) -> H.Document:
    """The review document of a refinement study (:class:`fekt.studies.convergence.Study`)."""
    png = figure if figure is not None else figure_png(lambda path: write_study_plot(study, path))
    ladder = ("nested splitting of every element (ratio 2)" if study.nested
              else f"elements per notch radius times {study.ratio:g} per level")
    blocks: list = [H.Heading("Summary", anchor="summary"),
                    H.Paragraph(f"{len(study.levels)} meshes, {ladder}; {len(study.spots)} tracked stress peak(s); "
                                f"{study.seconds:.1f} s in all."),
                    H.Caution(study.caution),
                    H.Heading("Meshes", anchor="levels"),
                    H.Table(headers=("level", "elements per radius", "splits", "elements", "DOFs", "seconds"),
                            rows=tuple((str(lv.level), q(lv.elements_per_radius, 4), str(lv.refine), str(lv.elements),
                                        str(lv.dofs), f"{lv.seconds:.2f}") for lv in study.levels),
                            numeric=(True,) * 6, caption="The refinement ladder (level 0 is the case's mesh)",
                            anchor="level-table"),
                    H.Heading("Kt of each peak", anchor="spots")]
    rows = study_rows(study)
    blocks.append(H.Table(headers=("#", "feature", "Kt net, coarse → fine", "sequence", "observed p",
                                   "Richardson value", "band (finest)"),
                          rows=rows, numeric=(True, False, False, False, True, True, True),
                          emphasis=tuple(i == 0 for i in range(len(rows))), caption="Per-peak verdicts and bands",
                          anchor="peaks"))
    blocks.append(H.Paragraph(f"Method: {STUDY_METHOD}. Non-monotone sequences are never extrapolated."))
    for s in study.spots:
        blocks.append(H.Paragraph(f"{s.rank}. {s.key}: {spot_message(s)}"))
    if length_unit:
        blocks.append(H.Paragraph(f"Peak locations in the sentences above are in {length_unit}."))
    blocks.append(H.Figure(caption="Kt net against degrees of freedom for each tracked peak, with the Richardson "
                                   "value and the band on the finest value where there is one.",
                           alt=f"Convergence of Kt net for {len(study.spots)} stress peaks of {study.case_name}",
                           png=png, anchor="convergence-figure"))
    blocks += _case_blocks(case_text, source, parameters)
    prov = [("case file", source or DASH)] + ([("case hash (SHA-256, 16 hex digits)", case_hash)] if case_hash else [])
    prov.append(("study time", f"{study.seconds:.2f} s"))
    blocks.append(_provenance(prov, library_versions()))
    return H.Document(title=f"Kt convergence study: {study.case_name}",
                      subtitle=f"fekt converge; {len(study.levels)} meshes", demo=study.demo, blocks=tuple(blocks),
                      footer="Written by fekt from its own computed results.")


# --- a sweep ----------------------------------------------------------------------------------------

def sweep_rows(results, names: Sequence[str]) -> tuple[tuple[str, ...], ...]:
    rows = []
    for r in sorted(results, key=lambda r: r.index):
        chart = DASH if r.chart_kt is None else f"{q(r.chart_kt)} ({r.chart_basis})"
        rows.append((str(r.index), *(num(r.values[n], 6) for n in names), r.status, q(r.kt_net), pm(r.kt_net_band),
                     q(r.kt_gross), pm(r.kt_gross_band), chart, q(r.peak), r.feature or r.message))
    return tuple(rows)


def sweep_document(results, names: Sequence[str], basis: str, *, case_name: str, source: str = "",
                   case_text: str | None = None, stress_unit: str = "", fit=None, demo: bool = False,
                   caution: str = "", fixed: Mapping[str, float] | None = None, case_hash: str = "",
                   figure: bytes | None = None) -> H.Document:
    """The review document of a sweep (points of :func:`fekt.studies.sweep.run_points`, their fit)."""
    title = f"{os.path.basename(source) or case_name}: Kt over {', '.join(names)}"
    png = figure if figure is not None else figure_png(
        lambda path: write_sweep_plot(results, names, basis, path, title, fit))
    ok = sum(r.status == "ok" for r in results)
    blocks: list = [H.Heading("Summary", anchor="summary"),
                    H.Paragraph(f"{ok} of {len(results)} points solved, varying {', '.join(names)}; Kt on the {basis} "
                                "section is plotted and fitted. Points whose geometry became invalid or whose solve "
                                "failed keep their message in the table.")]
    if caution:
        blocks.append(H.Caution(caution))
    rows = sweep_rows(results, names)
    blocks.append(H.Heading("Points", anchor="points"))
    blocks.append(H.Table(headers=("#", *names, "status", "Kt net", "band", "Kt gross", "band", "chart",
                                   f"σ peak [{stress_unit}]" if stress_unit else "σ peak", "feature / message"),
                          rows=rows, numeric=(True, *(True,) * len(names), False, True, True, True, True, True, True,
                                              False),
                          caption="Each point's highest notch peak; parameter values as in the case file",
                          anchor="peaks"))
    blocks.append(H.Figure(caption=f"Kt {basis} over {names[0]} with each point's band"
                                   + (", the published chart" if any(r.chart_kt is not None and r.chart_basis == basis
                                                                     for r in results) else "")
                                   + (" and the fit" if fit is not None else "") + ".",
                           alt=f"Kt {basis} against {names[0]} for {ok} solved points", png=png,
                           anchor="sweep-figure"))
    if fit is not None:
        blocks.append(H.Heading("Fit", anchor="fit"))
        blocks.append(H.Paragraph(format_fit(fit)))
        blocks.append(H.KeyValues(tuple((k, engineering(v, 6)) for k, v in fit.coefficients.items()),
                                  caption="Fitted coefficients"))
    blocks += _case_blocks(case_text, source, fixed,
                           note="Parameters that the sweep did not vary keep the values shown (expressions of varied "
                                "parameters follow them at each point).")
    prov = [("case file", source or DASH)] + ([("case hash (SHA-256, 16 hex digits)", case_hash)] if case_hash else [])
    blocks.append(_provenance(prov, library_versions()))
    return H.Document(title=f"Kt sweep: {case_name}", subtitle=f"fekt sweep; {len(results)} points", demo=demo,
                      blocks=tuple(blocks), footer="Written by fekt from its own computed results.")


def write_html(path: str, document: H.Document) -> None:
    """Render ``document`` and write it as UTF-8 to ``path``."""
    with open(path, "w", encoding="utf-8") as fh:
        fh.write(H.render(document))


__all__ = ["solve_document", "study_document", "sweep_document", "write_html", "peak_rows", "study_rows",
           "sweep_rows", "figure_png", "library_versions"]
