"""``fekt solve CASE``: one case, ranked hot spots with Kt."""

from __future__ import annotations

import json
import os
import shutil
import sys
import tempfile


def add_parser(sub) -> None:
    p = sub.add_parser("solve", help="solve one case file and report every hot spot with its Kt")
    p.add_argument("case", help="case file (TOML)")
    p.add_argument("--json", action="store_true", help="print the full result as JSON instead of the table")
    p.add_argument("--out", metavar="DIR", help="write result.json, report.txt and stress.png into DIR")
    p.add_argument("--force", action="store_true", help="replace DIR if it already exists")
    p.add_argument("--elements-per-radius", type=float, help="override the case's mesh.elements_per_radius")
    p.set_defaults(run=run)


def prepare_out_dir(path: str, force: bool) -> None:
    from .main import UsageError

    if os.path.exists(path) and (not os.path.isdir(path) or os.listdir(path)) and not force:
        raise UsageError(f"output folder '{path}' already exists and is not empty",
                         hint="choose another folder or pass --force to replace it")


def publish_dir(tmp: str, path: str) -> None:
    """Move a finished temporary folder into place (replacing an old one only at the very end)."""
    if os.path.exists(path):
        old = path.rstrip("/") + ".old-fekt"
        os.replace(path, old)
        os.replace(tmp, path)
        shutil.rmtree(old, ignore_errors=True)
    else:
        os.replace(tmp, path)


def run(args) -> int:
    import dataclasses

    from ..case.loader import load_case
    from ..pipeline import run as run_case
    from ..report.files import write_json, write_text
    from ..report.text import format_result
    from .main import UsageError

    if not os.path.isfile(args.case):
        raise UsageError(f"case file '{args.case}' not found")
    if args.out:
        prepare_out_dir(args.out, args.force)
    case = load_case(args.case)
    if args.elements_per_radius:
        case = dataclasses.replace(case, mesh=dataclasses.replace(case.mesh,
                                                                   elements_per_radius=args.elements_per_radius))
    solved = run_case(case)
    result = solved.result
    text = format_result(result)
    if args.json:
        print(json.dumps(result.to_dict(), indent=2))
    else:
        print(text)
    if args.out:
        from ..report.plots import write_figure

        parent = os.path.dirname(os.path.abspath(args.out))
        os.makedirs(parent, exist_ok=True)
        tmp = tempfile.mkdtemp(prefix=".fekt-out-", dir=parent)
        try:
            write_json(os.path.join(tmp, "result.json"), result.to_dict())
            write_text(os.path.join(tmp, "report.txt"), text + "\n")
            write_figure(solved, os.path.join(tmp, "stress.png"))
            publish_dir(tmp, args.out)
        except BaseException:
            shutil.rmtree(tmp, ignore_errors=True)
            raise
        if not args.json:
            print(f"wrote {args.out}/result.json, report.txt, stress.png", file=sys.stderr)
    return 0
