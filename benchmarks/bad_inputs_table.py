"""Runs every bad-input example of tests/bad_inputs.py through `fekt solve` and writes
docs/bad-inputs.md: the class of mistake, the message a user sees, and the exit code."""

from __future__ import annotations

import contextlib
import io
import os
import sys
import tempfile

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.join(HERE, "..", "tests"))
sys.path.insert(0, HERE)

from _publish import publish  # noqa: E402

from bad_inputs import BAD_CASES  # noqa: E402

from fekt.cli.main import main  # noqa: E402


def main_table() -> None:
    rows = ["# What fekt says about bad input (written by benchmarks/bad_inputs_table.py)", "",
            "Each row is a case file with one mistake, run as `fekt solve case.toml`.", "",
            "| mistake | message (stderr) | exit code |", "|---|---|---|"]
    with tempfile.TemporaryDirectory() as tmp:
        for name, text, _ in BAD_CASES:
            path = os.path.join(tmp, "case.toml")
            with open(path, "w", encoding="utf-8") as fh:
                fh.write(text)
            err = io.StringIO()
            with contextlib.redirect_stderr(err), contextlib.redirect_stdout(io.StringIO()):
                code = main(["solve", path, "--no-estimate"])
            msg = err.getvalue().strip().replace(tmp + os.sep, "").replace("|", "\\|").replace("\n", " ")
            rows.append(f"| {name} | `{msg}` | {code} |")
    publish(rows, os.path.join(HERE, "..", "docs", "bad-inputs.md"))


if __name__ == "__main__":
    main_table()
