"""Atomic output: write to a temporary file in the same folder, then rename over the target."""

from __future__ import annotations

import json
import os
import tempfile
from collections.abc import Callable


def write_atomic(path: str, writer: Callable[[str], None]) -> None:
    """Call ``writer(tmp_path)`` and move the result to ``path`` only if it succeeded."""
    folder = os.path.dirname(os.path.abspath(path))
    base, ext = os.path.splitext(os.path.basename(path))
    fd, tmp = tempfile.mkstemp(prefix=f".{base}-", suffix=ext, dir=folder)
    os.close(fd)
    try:
        writer(tmp)
        os.replace(tmp, path)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise


def write_json(path: str, data: dict) -> None:
    def w(tmp: str) -> None:
        with open(tmp, "w", encoding="utf-8") as fh:
            json.dump(data, fh, indent=2, allow_nan=False)
            fh.write("\n")

    write_atomic(path, w)


def write_text(path: str, text: str) -> None:
    def w(tmp: str) -> None:
        with open(tmp, "w", encoding="utf-8") as fh:
            fh.write(text)

    write_atomic(path, w)
