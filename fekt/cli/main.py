"""Command line: ``fekt solve CASE`` and friends. Only this layer turns errors into exit codes.

Exit codes: 0 success, 2 invalid input (clear message, no traceback unless --debug), 1 internal
failure, 130 interrupted.
"""

from __future__ import annotations

import argparse
import logging
import sys

from ..errors import FektError, InputError

EXIT_OK, EXIT_FAIL, EXIT_INPUT, EXIT_INTERRUPT = 0, 1, 2, 130


class UsageError(InputError):
    """Bad command-line usage (a missing file, an output folder that exists, ...)."""


def build_parser() -> argparse.ArgumentParser:
    from . import charts_cmd, converge_cmd, solve_cmd, sweep_cmd

    p = argparse.ArgumentParser(prog="fekt", description="Elastic stress concentration factors (Kt) of flat "
                                "notched parts by finite elements.")
    p.add_argument("--debug", action="store_true", help="show tracebacks for errors")
    sub = p.add_subparsers(dest="command", required=True)
    solve_cmd.add_parser(sub)
    converge_cmd.add_parser(sub)
    charts_cmd.add_parser(sub)
    sweep_cmd.add_parser(sub)
    return p


def main(argv: list[str] | None = None) -> int:
    parser = build_parser()
    args = parser.parse_args(argv)
    logging.basicConfig(level=logging.WARNING, format="%(levelname)s: %(message)s")
    try:
        return int(args.run(args) or 0)
    except KeyboardInterrupt:
        print("fekt: interrupted", file=sys.stderr)
        return EXIT_INTERRUPT
    except InputError as exc:
        if args.debug:
            raise
        where = getattr(args, "case", None)
        prefix = f"{where}: " if where and where not in str(exc) else ""
        print(f"fekt: error: {prefix}{exc}", file=sys.stderr)
        return EXIT_INPUT
    except FektError as exc:
        if args.debug:
            raise
        print(f"fekt: failed: {exc}", file=sys.stderr)
        return EXIT_FAIL
    except Exception as exc:  # internal failure: say so plainly
        if args.debug:
            raise
        print(f"fekt: internal error ({type(exc).__name__}): {exc}\n(run with --debug for the traceback)",
              file=sys.stderr)
        return EXIT_FAIL


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
