"""``fekt show CASE``: draw the part as fekt reads it, without meshing or solving."""

from __future__ import annotations

import os
import sys


def add_parser(sub) -> None:
    p = sub.add_parser("show", help="draw the part as read (edge names, vertex numbers, edge directions, loaded "
                       "ends, load axis, features, warnings) without meshing")
    p.add_argument("case", help="case file (TOML)")
    p.add_argument("--png", metavar="FILE", help="where to write the drawing (default: <case>-part.png in the "
                   "current folder)")
    p.set_defaults(run=run)


def run(args) -> int:
    from ..geometry.build import build_part
    from ..pipeline import apply_loads
    from ..report.partview import summary, write_part_figure
    from .solve_cmd import load

    case = load(args)
    part = build_part(case.part)
    warnings = list(part.warnings)
    applied = None
    try:
        applied = apply_loads(case, part)
    except Exception as exc:  # show the part even when its loads cannot be applied, and say why
        from ..errors import InputError

        if not isinstance(exc, InputError):
            raise
        warnings.append(f"the load cannot be applied: {exc}")
    path = args.png or os.path.splitext(os.path.basename(args.case))[0] + "-part.png"
    write_part_figure(case, part, applied, warnings, path)
    print(summary(case, part, applied, warnings))
    print(f"wrote {path}", file=sys.stderr)
    return 0
