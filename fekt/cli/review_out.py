"""Command-line side of the review package: ``--units``, ``--html`` and ``--vtu``, and progress on stderr.

Each subcommand adds the options with :func:`add_options` and makes one call per output here; the
documents, conversions and file formats themselves live in :mod:`fekt.report` and :mod:`fekt.post`.

* ``--units STRESS,LENGTH`` (or ``[units] output`` in the case file; the option wins): every printer
  (text, JSON, CSV, HTML, VTU) shows stresses and lengths in these units; Kt values never change.
  Without either, results are shown in the case's own units.
* ``--html``: ``report.html`` in the output folder, a self-contained review document.
* ``--vtu`` (solve): ``field.vtu`` in the output folder, the nodal fields for general-purpose viewers.
"""

from __future__ import annotations

import sys
from collections.abc import Callable

from ..case.output_units import OutputUnits, parse_output_units


def add_options(p, *, html: bool = True, vtu: bool = False) -> None:
    p.add_argument("--units", metavar="STRESS,LENGTH",
                   help="show results in these units, e.g. MPa,mm or ksi,in (default: the case's [units] output, "
                        "else the case's own units); Kt values do not change")
    if html:
        p.add_argument("--html", action="store_true",
                       help="also write report.html into the output folder: a self-contained review document")
    if vtu:
        p.add_argument("--vtu", action="store_true",
                       help="also write field.vtu into the output folder: displacement, stresses, principal and "
                            "von Mises stresses and the boundary stress at the mesh nodes, for field viewers")


def check(args, needs_out: bool = True) -> None:
    """--html and --vtu write into the output folder: refuse them without one."""
    from .main import UsageError

    wanted = [f"--{name}" for name in ("html", "vtu") if getattr(args, name, False)]
    if needs_out and wanted and not getattr(args, "out", None):
        raise UsageError(f"{' and '.join(wanted)} write(s) into the output folder: give --out DIR as well")


def output_units(args, units) -> OutputUnits | None:
    """The output units asked for (``--units`` first, then the case's ``[units] output``), or None for the
    case's own. ``units``: the case's :class:`fekt.case.schema.Units`. A missing item comes from the
    case's own units."""
    from ..report.units import case_output_units

    text, item = (args.units, "--units") if getattr(args, "units", None) else (getattr(units, "output", ""),
                                                                                "units.output")
    if not text:
        return None
    return parse_output_units(text, case_output_units(units.length, units.force), item=item)


def shown_result(result, ou: OutputUnits | None):
    """The result as every printer shows it."""
    from ..report.units import convert_result

    return result if ou is None else convert_result(result, ou)


def shown_assessment(assessment, ou: OutputUnits | None):
    """The assessment as every printer shows it (stresses, lengths and gradients in the output units)."""
    from ..report.units import convert_assessment

    return assessment if ou is None else convert_assessment(assessment, ou)


def case_text(path: str) -> str | None:
    try:
        with open(path, encoding="utf-8-sig") as fh:
            return fh.read()
    except (OSError, UnicodeDecodeError):
        return None


def solve_files(args, solved, result, ou: OutputUnits | None) -> dict[str, Callable[[str], None]]:
    """The extra files of ``fekt solve --out`` (report.html, field.vtu) as name -> writer."""
    files: dict[str, Callable[[str], None]] = {}
    if getattr(args, "html", False):
        from ..report.review import solve_document, write_html

        text = case_text(args.case)
        files["report.html"] = lambda p: write_html(p, solve_document(solved, case_text=text, result=result))
    if getattr(args, "vtu", False):
        from ..post.export import nodal_fields
        from ..report.units import converter
        from ..report.vtu import write_fields

        u = solved.case.units
        fs, fl = 1.0, 1.0
        if ou is not None:
            cv = converter(u.length, u.force, ou)
            fs, fl = cv.stress_factor, cv.length_factor

        def vtu(p: str) -> None:
            write_fields(p, nodal_fields(solved.solution, solved.pmesh), result.units.stress, result.units.length,
                         fs, fl)

        files["field.vtu"] = vtu
    return files


def study_files(args, study, case, ou: OutputUnits | None) -> dict[str, Callable[[str], None]]:
    """The extra files of ``fekt converge --out`` (report.html)."""
    if not getattr(args, "html", False):
        return {}
    from ..pipeline import case_hash
    from ..report.review import study_document, write_html

    text = case_text(args.case)
    length = ou.length if ou else case.units.length
    return {"report.html": lambda p: write_html(p, study_document(
        study, case_text=text, source=args.case, parameters=dict(case.parameters), case_hash=case_hash(case),
        length_unit=length))}


def shown_study(study, case, ou: OutputUnits | None):
    from ..report.units import convert_study

    u = case.units
    return study if ou is None else convert_study(study, u.length, u.force, u.stress, ou)


# --- progress ------------------------------------------------------------------------------------------

class Progress:
    """Progress on stderr: a bar on a terminal, one line per finished step otherwise (a log file, CI),
    flushed at once so that a tail -f shows it."""

    def __init__(self, desc: str, total: int | None = None, unit: str = "point", stream=None):
        self.desc, self.total, self.done = desc, total, 0
        self.stream = stream if stream is not None else sys.stderr
        self.bar = None
        if _is_terminal(self.stream):
            from tqdm import tqdm

            self.bar = tqdm(total=total, desc=desc, unit=unit, file=self.stream)

    def step(self, text: str) -> None:
        self.done += 1
        if self.bar is not None:
            self.bar.set_postfix_str(text[:60], refresh=False)
            self.bar.update(1)
            return
        of = f"/{self.total}" if self.total else ""
        print(f"{self.desc} {self.done}{of}: {text}", file=self.stream, flush=True)

    def close(self) -> None:
        if self.bar is not None:
            self.bar.close()


def _is_terminal(stream) -> bool:
    try:
        return bool(stream.isatty())
    except (AttributeError, ValueError, OSError):
        return False


# --- sweeps and goal-seeking ---------------------------------------------------------------------

def points_shown(case, ou: OutputUnits | None) -> Callable:
    """A function giving sweep points (or a goal-seeking answer) as the printers show them."""
    if ou is None:
        return lambda points: points
    from ..report.units import convert_points

    u = case.units
    return lambda points: convert_points(points, u.length, u.force, u.stress, ou)


def sweep_html(args, folder, results, names, fit, case) -> str | None:
    """Write report.html of a sweep into ``folder`` (a :class:`fekt.cli.output.SweepFolder`) when --html
    was given; returns its name."""
    if not getattr(args, "html", False):
        return None
    from ..pipeline import CAUTION, case_hash
    from ..report.review import sweep_document, write_html

    ou = output_units(args, case.units)
    fixed = {k: v for k, v in case.parameters if k not in names}
    doc = sweep_document(points_shown(case, ou)(list(results)), names, args.basis, case_name=case.name,
                         source=args.case, case_text=case_text(args.case),
                         stress_unit=ou.stress if ou else case.units.stress, fit=fit, demo=case.demo,
                         caution=CAUTION, fixed=fixed, case_hash=case_hash(case))
    folder.write_with("report.html", lambda tmp: write_html(tmp, doc))
    return "report.html"
