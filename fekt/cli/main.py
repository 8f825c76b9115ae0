"""Command line: ``fekt solve CASE`` and friends. Only this layer turns errors into exit codes.

Exit codes: 0 success; 2 a mistake of the user (a clear message, no traceback unless --debug);
1 a fault of fekt itself (the message says how to report it); 130 interrupted (SIGINT, Ctrl-C);
143 terminated (SIGTERM). See :mod:`fekt.cli.signals` for how both signals clean up.
"""

from __future__ import annotations

import argparse
import logging
import shlex
import sys
import time
import unicodedata

#: when the command started (the reported wall time of a solve counts from here: start-up included)
STARTED = time.perf_counter()

from ..errors import FektError, InputError
from . import signals

EXIT_OK, EXIT_FAIL, EXIT_INPUT = 0, 1, 2
EXIT_INTERRUPT, EXIT_TERMINATED = signals.EXIT_INTERRUPTED, signals.EXIT_TERMINATED
EXIT_PIPE = 141  # 128 + SIGPIPE, what a shell reports for a reader that stopped early

#: distributions whose versions ``fekt --version`` lists (read from their metadata, not imported)
VERSION_OF = ("gmsh", "scikit-fem", "numpy", "scipy", "matplotlib")
#: longest message printed in full (a 1 MB key must not flood the terminal)
MESSAGE_LIMIT = 2000


class UsageError(InputError):
    """Bad command-line usage (a missing file, an output folder that exists, ...)."""


def version_text() -> str:
    """fekt's version and those of the libraries its numbers depend on."""
    from importlib import metadata

    from ..version import __version__

    parts = []
    for dist in VERSION_OF:
        try:
            parts.append(f"{dist} {metadata.version(dist)}")
        except metadata.PackageNotFoundError:
            parts.append(f"{dist} not installed")
    py = ".".join(map(str, sys.version_info[:3]))
    return f"fekt {__version__}\n" + "\n".join(parts) + f"\nPython {py}"


class _VersionAction(argparse.Action):
    def __init__(self, option_strings, dest=argparse.SUPPRESS, default=argparse.SUPPRESS, help=None):
        super().__init__(option_strings=option_strings, dest=dest, default=default, nargs=0, help=help)

    def __call__(self, parser, namespace, values, option_string=None):
        print(version_text())
        parser.exit()


def build_parser() -> argparse.ArgumentParser:
    from . import assess_cmd, charts_cmd, converge_cmd, show_cmd, solve_cmd, sweep_cmd

    p = argparse.ArgumentParser(prog="fekt", description="Elastic stress concentration factors (Kt) of flat "
                                "notched parts by finite elements.")
    p.add_argument("--version", action=_VersionAction,
                   help="print the versions of fekt, gmsh, scikit-fem, numpy, scipy and matplotlib, and exit")
    p.add_argument("--debug", action="store_true", help="show tracebacks for errors")
    sub = p.add_subparsers(dest="command", required=True)
    solve_cmd.add_parser(sub)
    assess_cmd.add_parser(sub)
    converge_cmd.add_parser(sub)
    charts_cmd.add_parser(sub)
    sweep_cmd.add_parser(sub)
    show_cmd.add_parser(sub)
    return p


def clean(text: str, limit: int = MESSAGE_LIMIT) -> str:
    """A message as it may go to a terminal: control characters (escape sequences, carriage returns,
    ...) written as escapes, newlines kept, and at most ``limit`` characters."""
    out = []
    for ch in text:
        if ch == "\n" or unicodedata.category(ch) not in ("Cc", "Cs"):
            out.append(ch)
        else:
            out.append(ascii(ch)[1:-1])
    s = "".join(out)
    if len(s) > limit:
        s = s[:limit] + f"... ({len(s) - limit} more characters)"
    return s


def _report_hint(argv: list[str] | None) -> str:
    args = list(sys.argv[1:] if argv is None else argv)
    args = [a for a in args if a != "--debug"]
    cmd = shlex.join(["fekt", "--debug", *args])
    if len(cmd) > 200:
        cmd = "fekt --debug ..."
    return f"please report this with the case file and the output of `{cmd}`"


def _say(text: str) -> None:
    print(clean(text), file=sys.stderr)


def _stdout_gone() -> int:
    """The reader of stdout went away (``fekt ... | head``): not an error of anyone; stop quietly."""
    import os

    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
        os.close(devnull)
    except (OSError, ValueError):
        pass
    return EXIT_PIPE


def main(argv: list[str] | None = None) -> int:
    try:
        return _main(argv)
    except BrokenPipeError:
        return _stdout_gone()


def _main(argv: list[str] | None) -> int:
    with signals.handled():
        try:
            parser = build_parser()
            args = parser.parse_args(argv)
        except signals.Terminated:
            _say("fekt: terminated")
            return EXIT_TERMINATED
        except KeyboardInterrupt:
            _say("fekt: interrupted")
            return EXIT_INTERRUPT
        logging.basicConfig(level=logging.WARNING, format="%(levelname)s: %(message)s")
        try:
            return int(args.run(args) or 0)
        except signals.Terminated:
            if args.debug:
                raise
            _say("fekt: terminated")
            return EXIT_TERMINATED
        except KeyboardInterrupt:
            if args.debug:
                raise
            _say("fekt: interrupted")
            return EXIT_INTERRUPT
        except BrokenPipeError:
            raise
        except InputError as exc:
            if args.debug:
                raise
            where = getattr(args, "case", None)
            # usage errors (output folders, options) are not about the case file
            about_case = getattr(exc, "about_case", True) and not isinstance(exc, UsageError)
            prefix = f"{where}: " if where and where not in str(exc) and about_case else ""
            _say(f"fekt: error: {prefix}{exc}")
            return EXIT_INPUT
        except FektError as exc:
            if args.debug:
                raise
            _say(f"fekt: failed: {exc}\nfekt: if the case is valid, this is a fault of fekt: {_report_hint(argv)}")
            return EXIT_FAIL
        except Exception as exc:  # a fault of fekt itself: say so plainly, and how to report it
            if args.debug:
                raise
            _say(f"fekt: internal error ({type(exc).__name__}): {exc}\nfekt: this is a fault of fekt: "
                 f"{_report_hint(argv)}")
            return EXIT_FAIL


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
