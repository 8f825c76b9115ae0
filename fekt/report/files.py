"""Atomic output files: write to a temporary file in the same folder, then rename it over the target.

A reader never sees a half-written file: the target is either the old one or the complete new one.
Files get the usual permissions of a new file (0o666 minus the process umask), like any file a
program creates; ``tempfile.mkstemp`` would make them owner-only (0o600). The temporary is named
``.fekt-tmp-<name>-<random><ext>`` (the extension is kept because some writers, e.g. matplotlib,
choose the format from it) and is removed on any exception, KeyboardInterrupt and SystemExit
included.
"""

from __future__ import annotations

import json
import os
import secrets
from collections.abc import Callable

from ..errors import InputError

#: every temporary file or folder fekt creates starts with this
TMP_PREFIX = ".fekt-tmp-"
#: longest file name most file systems allow (the temporary's name is cut to fit)
_NAME_MAX = 255


def create_exclusive(folder: str, prefix: str, suffix: str = "", *, directory: bool = False) -> str:
    """Create a new, uniquely named empty file (or folder) in ``folder`` and return its path.

    Unlike ``tempfile.mkstemp``/``mkdtemp`` the mode is 0o666 (folders 0o777) minus the umask, so
    results are readable by whoever may read the user's other files. Never follows a symlink."""
    room = _NAME_MAX - len(suffix) - 9
    if len(prefix) > room:
        prefix = prefix[:max(room, 1)]
    for _ in range(100):
        path = os.path.join(folder, f"{prefix}{secrets.token_hex(4)}{suffix}")
        try:
            if directory:
                os.mkdir(path, 0o777)
            else:
                fd = os.open(path, os.O_WRONLY | os.O_CREAT | os.O_EXCL | os.O_NOFOLLOW | os.O_CLOEXEC, 0o666)
                os.close(fd)
        except FileExistsError:
            continue
        return path
    raise FileExistsError(f"could not create a unique temporary name in '{folder}'")


def _unlink_quiet(path: str) -> None:
    try:
        os.unlink(path)
    except FileNotFoundError:
        pass
    except IsADirectoryError:  # a writer replaced the file by a folder: not ours to judge, leave it
        pass


def fsync_file(path: str) -> None:
    fd = os.open(path, os.O_RDONLY | os.O_CLOEXEC)
    try:
        os.fsync(fd)
    finally:
        os.close(fd)


def fsync_dir(path: str) -> None:
    """Make a rename inside ``path`` durable (best effort: not every file system supports it)."""
    try:
        fd = os.open(path, os.O_RDONLY | os.O_DIRECTORY | os.O_CLOEXEC)
    except OSError:
        return
    try:
        os.fsync(fd)
    except OSError:
        pass
    finally:
        os.close(fd)


def write_atomic(path: str, writer: Callable[[str], None], *, fsync: bool = True) -> None:
    """Call ``writer(tmp_path)`` and move the result to ``path`` only if it succeeded.

    ``path`` must not be a folder (that is reported as an :class:`InputError` naming it). A symlink at
    ``path`` is replaced by the file, never written through."""
    folder = os.path.dirname(os.path.abspath(path))
    base, ext = os.path.splitext(os.path.basename(path))
    if os.path.isdir(path) and not os.path.islink(path):
        raise InputError(f"'{path}' is a folder, so the file of that name cannot be written",
                         hint="move or rename that folder, or write the results elsewhere")
    tmp = create_exclusive(folder, f"{TMP_PREFIX}{base}-", ext)
    try:
        writer(tmp)
        if fsync:
            fsync_file(tmp)
        os.replace(tmp, path)
    except BaseException:
        _unlink_quiet(tmp)
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
