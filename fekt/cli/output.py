"""Output folders for the CLI: refuse to overwrite unless forced, write everything into a temporary
folder beside the target, and move it into place only when every file is complete."""

from __future__ import annotations

import os
import shutil
import tempfile
from collections.abc import Callable


def check_out_dir(path: str, force: bool) -> None:
    from .main import UsageError

    if os.path.exists(path) and (not os.path.isdir(path) or os.listdir(path)) and not force:
        raise UsageError(f"output folder '{path}' already exists and is not empty",
                         hint="choose another folder or pass --force to replace it")


def write_out_dir(path: str, writers: dict[str, Callable[[str], None]]) -> None:
    """``writers`` maps file name -> function writing that file at the given path."""
    parent = os.path.dirname(os.path.abspath(path))
    os.makedirs(parent, exist_ok=True)
    tmp = tempfile.mkdtemp(prefix=".fekt-out-", dir=parent)
    try:
        for name, write in writers.items():
            write(os.path.join(tmp, name))
        if os.path.exists(path):
            old = tempfile.mkdtemp(prefix=".fekt-old-", dir=parent)
            os.rmdir(old)
            os.replace(path, old)
            os.replace(tmp, path)
            shutil.rmtree(old, ignore_errors=True)
        else:
            os.replace(tmp, path)
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        raise
