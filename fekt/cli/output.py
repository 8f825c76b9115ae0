"""Output folders for the CLI: checked before any work, written in a temporary folder, moved into place
atomically, and never at the cost of a file fekt did not write.

Rules (the ``force`` count is how many times ``--force`` was given; declare the option with
:func:`add_force_argument`, i.e. argparse ``action="count"``):

* The path is checked before any computation (on entering
  :class:`prepare_output`): ``..`` and symbolic links are resolved, every missing parent folder must
  be creatable (no plain file on the way, a writable folder to create it in, names within the file
  system's length limit). Every problem is a :class:`~fekt.cli.main.UsageError` (exit 2) naming the
  path as the user gave it.
* A new folder is written as ``.fekt-out-<random>`` beside the target and renamed into place in one
  step when every file is complete; a reader sees no folder or the whole folder.
* fekt marks the folders it writes with a small file ``.fekt.json`` listing its files and their
  SHA-256. ``force=0``: only a new path or an empty folder is accepted. ``force=1``: a folder fekt
  wrote before is reused; the files fekt wrote there (unchanged since) are replaced, and fekt says so.
  ``force>=2`` ("told twice", ``--force --force``): fekt also writes into a folder it did not write and
  takes the place of a plain file. Even then nothing fekt did not write is deleted: files of the
  folder are kept, and a file in the way (the plain file itself, or a file of the folder with the name
  of a result) is renamed to ``NAME.old`` (``NAME.old-2``, ... if taken), and fekt says so. Devices,
  pipes and sockets are always refused.
* Results for an existing folder are staged in ``.fekt-out-<random>`` inside it and each file is then
  renamed into place; SIGINT and SIGTERM are held back during those few renames.
* Nothing temporary survives an exception, KeyboardInterrupt, SIGTERM (see :mod:`fekt.cli.signals`)
  or SystemExit; folders fekt created for the output are removed again when nothing was written.

Sweep folders grow point by point and are resumed, so they are written in place instead:
:class:`prepare_sweep_folder` (the same checks, a lock, and a resume file via
:class:`fekt.report.resume.ResumeStore`).
"""

from __future__ import annotations

import datetime
import hashlib
import json
import os
import shutil
import stat
import sys
import unicodedata
from collections.abc import Callable, Iterable, Mapping, Sequence

from ..report.files import TMP_PREFIX, create_exclusive, fsync_dir, write_atomic, write_json, write_text

#: marker file fekt writes into every folder it fills
MARKER = ".fekt.json"
#: the lock file of a sweep folder
LOCK = ".fekt.lock"
#: staging folders, beside a new target or inside an existing one
STAGING_PREFIX = ".fekt-out-"
#: entries that do not make a folder "non-empty" for fekt (its own bookkeeping)
_BOOKKEEPING = (MARKER, LOCK)
_MARKER_VERSION = 1


# --- how paths are shown ------------------------------------------------------------------------------

def show(path: str | os.PathLike) -> str:
    """``path`` quoted as the user gave it, with control characters (newlines, escape sequences)
    written as escapes so that a file name cannot drive the terminal."""
    s = os.fsdecode(os.fspath(path))
    out = []
    for ch in s:
        if unicodedata.category(ch) in ("Cc", "Cs"):
            out.append(ascii(ch)[1:-1] if ch not in "\n\t\r" else {"\n": "\\n", "\t": "\\t", "\r": "\\r"}[ch])
        else:
            out.append(ch)
    return "'" + "".join(out) + "'"


def _short(name: str, n: int = 40) -> str:
    return name if len(name) <= n else name[:n] + "..."


def _rel(path: str) -> str:
    """A path fekt found (not one the user typed), relative to the working folder when inside it."""
    try:
        rel = os.path.relpath(path)
    except ValueError:
        return path
    return path if rel.startswith("..") else rel


def _usage(message: str, hint: str | None = None) -> Exception:
    from .main import UsageError

    return UsageError(message, hint=hint)


def add_force_argument(parser, what: str = "DIR") -> None:
    """The ``--force`` option with the counting semantics described in this module."""
    parser.add_argument("--force", action="count", default=0,
                        help=f"replace the results fekt wrote in {what} before; give it twice (--force --force) "
                             f"to write into a folder fekt did not write, or in place of a plain file (files "
                             f"fekt did not write are kept, or renamed to NAME.old if in the way)")


# --- markers -------------------------------------------------------------------------------------------

def _sha256(path: str) -> str | None:
    h = hashlib.sha256()
    try:
        fd = os.open(path, os.O_RDONLY | os.O_NOFOLLOW | os.O_NONBLOCK | os.O_CLOEXEC)
    except OSError:
        return None
    try:
        if not stat.S_ISREG(os.fstat(fd).st_mode):
            return None
        while True:
            b = os.read(fd, 1 << 20)
            if not b:
                break
            h.update(b)
    finally:
        os.close(fd)
    return h.hexdigest()


def read_marker(folder: str) -> dict | None:
    """fekt's marker in ``folder`` (None when absent, unreadable or not one of fekt's)."""
    try:
        fd = os.open(os.path.join(folder, MARKER), os.O_RDONLY | os.O_NOFOLLOW | os.O_NONBLOCK | os.O_CLOEXEC)
    except OSError:
        return None
    try:
        st = os.fstat(fd)
        if not stat.S_ISREG(st.st_mode) or st.st_size > 1 << 20:
            return None
        raw = b""
        while True:
            b = os.read(fd, 1 << 16)
            if not b:
                break
            raw += b
        data = json.loads(raw.decode("utf-8"))
    except (OSError, ValueError, RecursionError):
        return None
    finally:
        os.close(fd)
    if not (isinstance(data, dict) and data.get("fekt-output") == _MARKER_VERSION
            and isinstance(data.get("files"), dict)):
        return None
    return data


def _marker(command: str, state: str, files: Mapping[str, dict]) -> dict:
    from ..version import __version__

    now = datetime.datetime.now(datetime.timezone.utc).isoformat(timespec="seconds")
    return {"fekt-output": _MARKER_VERSION, "fekt": __version__, "command": command, "state": state,
            "written": now, "files": dict(sorted(files.items()))}


def _owned(folder: str, marker: dict | None, names_owned_by_name: Iterable[str] = ()) -> dict[str, dict]:
    """Files in ``folder`` that fekt wrote and nobody changed since, with their marker entries.

    A regular file is fekt's when the marker lists it with a SHA-256 that still matches, or lists it
    without one (a file that grows while fekt works, like a sweep's points), or, in a folder fekt
    marked, when its name is in ``names_owned_by_name`` (the files of that kind of folder)."""
    out: dict[str, dict] = {}
    if marker is None:
        return out
    listed = marker["files"]
    for name in set(listed) | set(names_owned_by_name):
        if not _plain_name(name):
            continue
        path = os.path.join(folder, name)
        try:
            if not stat.S_ISREG(os.lstat(path).st_mode):
                continue
        except OSError:
            continue
        info = listed.get(name)
        if not isinstance(info, dict):
            if name in names_owned_by_name:
                out[name] = {}
            continue
        want = info.get("sha256")
        if want is None:
            out[name] = {}
            continue
        wanted = [want] if isinstance(want, str) else [w for w in want if isinstance(w, str)] \
            if isinstance(want, list) else []
        if _sha256(path) in wanted:
            out[name] = {"sha256": wanted}
    return out


def _plain_name(name: str) -> bool:
    return (isinstance(name, str) and name not in ("", ".", "..") and "/" not in name and "\0" not in name
            and name not in _BOOKKEEPING)


def _old_name(folder: str, name: str) -> str:
    """A free name ``NAME.old`` (``NAME.old-2``, ...) in ``folder`` for moving ``name`` aside."""
    limit = _name_max(folder)
    for k in range(1, 10000):
        suffix = ".old" if k == 1 else f".old-{k}"
        base = name
        while len(os.fsencode(base + suffix)) > limit:
            base = base[:-1]
        cand = base + suffix
        if not os.path.lexists(os.path.join(folder, cand)):
            return cand
    raise FileExistsError(f"no free name to move '{name}' aside in '{folder}'")


def _name_max(folder: str) -> int:
    try:
        return int(os.pathconf(folder, "PC_NAME_MAX"))
    except (OSError, ValueError):
        return 255


def _path_max(folder: str) -> int:
    try:
        return int(os.pathconf(folder, "PC_PATH_MAX"))
    except (OSError, ValueError):
        return 4096


def _listdir(folder: str) -> list[str]:
    """The entries of ``folder`` that are not fekt's own bookkeeping or temporaries."""
    return sorted(n for n in os.listdir(folder)
                  if n not in _BOOKKEEPING and not n.startswith(TMP_PREFIX) and not n.startswith(STAGING_PREFIX))


# --- checks --------------------------------------------------------------------------------------------

class OutputPlan:
    """The result of checking an output path: where it really is and what is there now.

    ``state`` is ``new`` (nothing there), ``empty`` (an empty folder), ``fekt`` (a folder fekt wrote),
    ``foreign`` (a folder with files fekt did not write) or ``file`` (a plain file, ``force >= 2``)."""

    def __init__(self, given: str, real: str, state: str, force: int, missing: list[str], marker: dict | None,
                 entries: list[str], link: str | None, what: str):
        self.given, self.real, self.state, self.force = given, real, state, force
        self.missing, self.marker, self.entries, self.link, self.what = missing, marker, entries, link, what
        self.shown = show(given)


def plan_output(path: str | os.PathLike, force: int | bool = 0, *, files: Iterable[str] = (),
                what: str = "output folder", allow_fekt: bool = False,
                owned_by_name: Iterable[str] = (), fekt_hint: str | None = None,
                foreign_hint: str | None = None) -> OutputPlan:
    """Check ``path`` as an output folder without writing anything there (a probe folder is created
    and removed again to prove that the place is writable). Raises UsageError for every problem.

    ``files``: names of the files that will be written (a file of that name fekt did not write is in
    the way: refused unless ``force >= 2``). ``allow_fekt``: accept a folder fekt wrote without force
    (a sweep being resumed)."""
    force = int(force or 0)
    given = os.fsdecode(os.fspath(path))
    shown = show(given)
    if not given.strip():
        raise _usage(f"the {what} {shown} is empty", hint="give the name of a folder")
    if "\0" in given:
        raise _usage(f"the {what} {shown} contains a NUL character", hint="give the name of a folder")
    link = None
    if os.path.islink(given):
        link = os.path.realpath(given)
        if not os.path.exists(link):
            raise _usage(f"the {what} {shown} is a symbolic link to '{_rel(link)}', which does not exist",
                         hint="remove the link or point it at a folder, or choose another folder")
    real = os.path.realpath(given)
    if os.path.islink(real):
        raise _usage(f"the {what} {shown} is a loop of symbolic links", hint="choose another folder")
    # the nearest part of the path that exists; everything below it is created
    missing: list[str] = []
    cur = real
    while not os.path.lexists(cur):
        missing.append(cur)
        parent = os.path.dirname(cur)
        if parent == cur:
            break
        cur = parent
    anchor = cur
    missing.reverse()
    if missing and not os.path.isdir(anchor):
        raise _usage(f"the {what} {shown} cannot be created: '{_rel(anchor)}' is a file, not a folder",
                     hint="choose a path whose parent folders are folders")
    limit = _name_max(anchor if os.path.isdir(anchor) else os.path.dirname(anchor))
    for m in missing:
        name = os.path.basename(m)
        if len(os.fsencode(name)) > limit:
            raise _usage(f"the {what} {shown} cannot be created: the name {show(_short(name))} has "
                         f"{len(os.fsencode(name))} bytes, more than the {limit} this file system allows",
                         hint="choose a shorter name")
    if len(os.fsencode(real)) + 32 > _path_max(anchor if os.path.isdir(anchor) else "/"):
        raise _usage(f"the {what} {shown} is a path of {len(os.fsencode(real))} bytes, too long for this "
                     "file system", hint="choose a shorter path")

    marker = None
    entries: list[str] = []
    if missing:
        state, probe_in = "new", anchor
    else:
        try:
            st = os.stat(real)
        except OSError as exc:
            raise _usage(f"the {what} {shown} cannot be checked ({os.strerror(exc.errno or 0) or exc})",
                         hint="choose a folder you can read and write") from None
        if stat.S_ISDIR(st.st_mode):
            try:
                entries = _listdir(real)
            except PermissionError:
                raise _usage(f"the {what} {shown} exists but cannot be read (permission denied)",
                             hint="choose a folder you can read and write") from None
            marker = read_marker(real)
            if marker is None and os.path.lexists(os.path.join(real, MARKER)):
                entries.append(MARKER)  # not fekt's marker: a file like any other
            if marker is not None:
                state = "fekt"
            elif entries:
                state = "foreign"
            else:
                state = "empty"
            probe_in = real
        elif stat.S_ISREG(st.st_mode):
            state, probe_in = "file", os.path.dirname(real)
        else:
            kind = ("a character device" if stat.S_ISCHR(st.st_mode) else "a block device" if stat.S_ISBLK(st.st_mode)
                    else "a named pipe" if stat.S_ISFIFO(st.st_mode) else "a socket" if stat.S_ISSOCK(st.st_mode)
                    else "not a folder")
            raise _usage(f"the {what} {shown} is {kind}, not a folder", hint="choose a folder")

    # what is there, and may it be replaced?
    if state == "file" and force < 2:
        raise _usage(f"the {what} {shown} is a file, not a folder",
                     hint=f"choose another folder, or pass --force twice (--force --force) to rename the file "
                          f"to '{os.path.basename(real)}.old' and write the folder in its place")
    if state == "foreign" and force < 2:
        listing = ", ".join(_short(n, 30) for n in entries[:4]) + (", ..." if len(entries) > 4 else "")
        raise _usage(f"the {what} {shown} already exists and holds files fekt did not write ({listing}); "
                     "fekt replaces only folders it wrote itself",
                     hint=foreign_hint or "choose another folder, or pass --force twice (--force --force) to add the "
                                          "results to it: its files are kept, and one in the way of a result is "
                                          "renamed to NAME.old")
    if state == "fekt" and force < 1 and not allow_fekt:
        when = f" on {_short(marker['written'], 32)}" if isinstance(marker.get("written"), str) else ""
        raise _usage(f"the {what} {shown} already exists and holds results of {_by(marker)}{when}",
                     hint=fekt_hint or "pass --force to replace them, or choose another folder; files fekt did not "
                                       "write there are kept")
    if state in ("fekt", "foreign") and files:
        owned = _owned(real, marker, owned_by_name) if state == "fekt" else {}
        in_way = sorted(n for n in set(files) if os.path.lexists(os.path.join(real, n)) and n not in owned)
        if in_way and force < 2:
            raise _usage(f"the {what} {shown} holds {', '.join(show(n) for n in in_way)}, which fekt did not "
                         "write (or which was changed since), and a result of that name would replace it",
                         hint="move it away, or pass --force twice (--force --force) to have fekt rename it "
                              "to NAME.old")

    _probe(probe_in, shown, what)
    return OutputPlan(given, real, state, force, missing, marker, entries, link, what)


def _probe(folder: str, shown: str, what: str) -> None:
    """Create and remove a folder in ``folder``: the only sure test that fekt can write there."""
    from .signals import held

    try:
        with held():
            p = create_exclusive(folder, f"{TMP_PREFIX}probe-", directory=True)
            os.rmdir(p)
    except PermissionError:
        raise _usage(f"the {what} {shown} cannot be written: no permission to create files in '{_rel(folder)}'",
                     hint="choose a folder you can write to") from None
    except OSError as exc:
        reason = os.strerror(exc.errno) if exc.errno else str(exc)
        raise _usage(f"the {what} {shown} cannot be written: creating a file in '{_rel(folder)}' failed "
                     f"({reason})", hint="choose a folder on a writable disk") from None


def _create_missing(missing: Sequence[str], upto: int) -> list[str]:
    """Create ``missing[:upto]`` (top-down); return those this call created."""
    created = []
    try:
        for d in missing[:upto]:
            try:
                os.mkdir(d, 0o777)
                created.append(d)
            except FileExistsError:
                if not os.path.isdir(d):
                    raise
    except BaseException:
        _remove_created(created)
        raise
    return created


def _remove_created(created: Sequence[str]) -> None:
    for d in reversed(created):
        try:
            os.rmdir(d)
        except OSError:
            break


# --- solve / converge: one folder written at the end ----------------------------------------------------

class OutputFolder:
    """Files being written for one output folder; they reach the target only on :meth:`commit`."""

    def __init__(self, plan: OutputPlan, command: str, notify: Callable[[str], None]):
        self.plan = plan
        self.command = command
        self.notify = notify
        self.shown = plan.shown
        self.target = plan.real
        self.written: list[str] = []
        self.notices: list[str] = []
        self._created: list[str] = []
        self._done = False
        inplace = plan.state in ("empty", "fekt", "foreign")
        self._inplace = inplace
        from .signals import held

        with held():  # a signal now would leave a folder nobody removes
            if not inplace:
                self._created = _create_missing(plan.missing, len(plan.missing) - 1)
            try:
                where = plan.real if inplace else os.path.dirname(plan.real)
                self.staging = create_exclusive(where, STAGING_PREFIX, directory=True)
            except BaseException:
                _remove_created(self._created)
                raise

    # writing ------------------------------------------------------------------------------------------
    def _path(self, name: str) -> str:
        if not _plain_name(name) or name.startswith(".fekt"):
            raise ValueError(f"'{name}' is not a plain file name fekt may write")
        if self._done:
            raise RuntimeError("the output folder was already committed or discarded")
        return os.path.join(self.staging, name)

    def _add(self, name: str) -> None:
        if name not in self.written:
            self.written.append(name)

    def file(self, name: str) -> str:
        """Where to write ``name`` yourself (inside the staging folder); it is committed if it exists."""
        path = self._path(name)
        self._add(name)
        return path

    def write_with(self, name: str, fn: Callable[[str], None]) -> None:
        """``fn(path)`` writes the file ``name`` (if it fails, the file is not part of the results)."""
        write_atomic(self._path(name), fn, fsync=False)
        self._add(name)

    def write_json(self, name: str, data: dict) -> None:
        write_json(self._path(name), data)
        self._add(name)

    def write_text(self, name: str, text: str) -> None:
        write_text(self._path(name), text)
        self._add(name)

    # finishing ----------------------------------------------------------------------------------------
    def _manifest(self) -> dict[str, dict]:
        self.written = [n for n in self.written if os.path.isfile(os.path.join(self.staging, n))]
        return {n: {"sha256": _sha256(os.path.join(self.staging, n)),
                    "size": os.path.getsize(os.path.join(self.staging, n))} for n in self.written}

    def commit(self) -> None:
        """Move the results into place (atomically for a new folder) and say what was replaced."""
        from .signals import held

        if self._done:
            return
        try:
            with held():
                manifest = self._manifest()
                for n in self.written:
                    _fsync_quiet(os.path.join(self.staging, n))
                if self._inplace:
                    self._commit_inplace(manifest)
                else:
                    self._commit_new(manifest)
                self._done = True
        except BaseException:
            self.discard()
            raise
        for n in self.notices:
            self.notify(n)

    def _commit_new(self, manifest: dict[str, dict]) -> None:
        plan = self.plan
        write_json(os.path.join(self.staging, MARKER), _marker(self.command, "complete", manifest))
        aside = None
        parent = os.path.dirname(plan.real)
        if plan.state == "file":
            if not os.path.isfile(plan.real) or os.path.islink(plan.real):
                raise _usage(f"the {plan.what} {self.shown} changed while fekt was running", hint="run again")
            aside = os.path.join(parent, _old_name(parent, os.path.basename(plan.real)))
            os.rename(plan.real, aside)
        try:
            if os.path.lexists(plan.real):
                raise _usage(f"the {plan.what} {self.shown} was created by something else while fekt was running; "
                             "the results were not written", hint="run again, or choose another folder")
            os.rename(self.staging, plan.real)
        except BaseException:
            if aside is not None:
                os.rename(aside, plan.real)
            raise
        fsync_dir(parent)
        if aside is not None:
            self.notices.append(f"moved the file {self.shown} aside to {show(_rel(aside))}")

    def _commit_inplace(self, manifest: dict[str, dict]) -> None:
        plan, real = self.plan, self.plan.real
        if not os.path.isdir(real):
            raise _usage(f"the {plan.what} {self.shown} was removed while fekt was running; the results were not "
                         "written", hint="run again")
        marker = read_marker(real)
        owned = _owned(real, marker)
        new = set(self.written)
        in_way = sorted(n for n in new | {MARKER} if os.path.lexists(os.path.join(real, n)) and n not in owned
                        and not (n == MARKER and marker is not None))
        if in_way and plan.force < 2:
            raise _usage(f"the {plan.what} {self.shown} now holds {', '.join(show(n) for n in in_way)}, which fekt "
                         "did not write; the results were not written",
                         hint="move it away, or pass --force twice (--force --force) to have fekt rename it to "
                              "NAME.old")
        for n in in_way:
            old = _old_name(real, n)
            os.rename(os.path.join(real, n), os.path.join(real, old))
            self.notices.append(f"renamed {show(n)} in {self.shown}, which fekt did not write, to {show(old)}")
        # while the files move, the marker lists old and new ones: a crash leaves nothing unaccounted for
        during = {n: {"sha256": list(owned.get(n, {}).get("sha256", [])) + [manifest[n]["sha256"]]} if n in manifest
                  else owned[n] for n in set(owned) | new}
        write_json(os.path.join(real, MARKER), _marker(self.command, "incomplete", during))
        for n in self.written:
            os.replace(os.path.join(self.staging, n), os.path.join(real, n))
        for n in sorted(set(owned) - new):
            try:
                os.unlink(os.path.join(real, n))
            except FileNotFoundError:
                pass
        write_json(os.path.join(real, MARKER), _marker(self.command, "complete", manifest))
        shutil.rmtree(self.staging, ignore_errors=True)
        fsync_dir(real)
        if plan.state == "fekt":
            self.notices.insert(0, f"replaced the results of {_by(marker)} in {self.shown}")
        kept = [n for n in _listdir(real) if n not in new and n != MARKER and not n.startswith(STAGING_PREFIX)]
        if kept and plan.state in ("fekt", "foreign"):
            self.notices.append(f"kept {len(kept)} file(s) in {self.shown} that fekt did not write: "
                                + ", ".join(show(_short(n, 30)) for n in kept[:5]) + (", ..." if len(kept) > 5 else ""))

    def discard(self) -> None:
        """Remove everything this object created (idempotent; also on a second Ctrl-C)."""
        from .signals import held

        with held():
            self._done = True
            if os.path.isdir(self.staging) and not os.path.islink(self.staging):
                shutil.rmtree(self.staging, ignore_errors=True)
            _remove_created(self._created)
            self._created = []


def _fsync_quiet(path: str) -> None:
    try:
        fd = os.open(path, os.O_RDONLY | os.O_CLOEXEC)
    except OSError:
        return
    try:
        os.fsync(fd)
    except OSError:
        pass
    finally:
        os.close(fd)


def _by(marker: dict | None) -> str:
    """Who wrote a folder, for messages: "`fekt solve`" or "fekt"."""
    cmd = marker.get("command") if marker else None
    return f"`fekt {cmd}`" if isinstance(cmd, str) and cmd.isidentifier() and cmd != "fekt" else "fekt"


def _stderr(message: str) -> None:
    print(f"fekt: {message}", file=sys.stderr)


class prepare_output:
    """Context manager for one output folder; ``path=None`` yields None (no output asked for).

    Entering checks the path (UsageError, before any work) and creates the staging folder; a normal
    exit commits the files, any exception (KeyboardInterrupt, SIGTERM's Terminated and SystemExit
    included) removes every temporary and leaves the target as it was::

        with prepare_output(args.out, force=args.force, command="solve",
                            files=("result.json", "report.txt", "stress.png")) as out:
            result = ...                      # the computation
            if out:
                out.write_json("result.json", result.to_dict())
                out.write_text("report.txt", text)
                out.write_with("stress.png", lambda p: write_figure(solved, p))
        # committed here; out.shown is the path as the user gave it

    ``force`` is how many times ``--force`` was given (argparse ``action="count"``, see
    :func:`add_force_argument`; ``True`` counts once):

    * 0: only a new path or an empty folder;
    * 1: also a folder fekt wrote (it has fekt's ``.fekt.json``): the files fekt wrote there and nobody
      changed since are replaced, other files are kept, and fekt says so;
    * 2 or more ("told twice", ``--force --force``): also a folder fekt did not write (its files are
      kept, the results are added) or a plain file (renamed to ``NAME.old``, the folder takes its
      place); a file fekt did not write that is in the way of a result is renamed to ``NAME.old``.
      Nothing is ever deleted that fekt did not write. Devices, pipes and sockets are always refused.

    ``files``: the names that will be written, so that a file in their way is reported before the work.
    ``notify``: where the notices go ("replaced the results of ..."); default: stderr, ``fekt:`` first.
    """

    def __init__(self, path: str | os.PathLike | None, force: int | bool = 0, *, command: str | None = None,
                 files: Iterable[str] = (), notify: Callable[[str], None] | None = None):
        self.path, self.force, self.command, self.files = path, int(force or 0), command, tuple(files)
        self.notify = notify or _stderr
        self.folder: OutputFolder | None = None

    def __enter__(self) -> OutputFolder | None:
        if self.path is None:
            return None
        plan = plan_output(self.path, self.force, files=self.files)
        self.folder = OutputFolder(plan, self.command, self.notify)
        return self.folder

    def __exit__(self, et, ev, tb) -> bool:
        if self.folder is None:
            return False
        if et is None:
            self.folder.commit()
        else:
            self.folder.discard()
        return False


# --- sweeps: a folder written point by point --------------------------------------------------------------

#: files a sweep writes (the resume file, its rejected lines, and the summaries)
SWEEP_FILES = ("points.jsonl", "points.rejected", "sweep.csv", "sweep.json", "report.txt", "sweep.png",
               "report.html")
#: files that hold the finished points and are kept by --resume
SWEEP_RECORD = ("points.jsonl", "points.rejected")


class SweepFolder:
    """A sweep's folder while the sweep runs: locked, marked as fekt's, written in place.

    Nothing is deleted before :meth:`open_store` has checked the resume file: with ``--force`` the
    files fekt wrote there are then removed (files fekt did not write are kept); with ``--resume`` only
    the summaries (they are rewritten at the end), so that an interrupted run leaves the finished points
    and nothing stale."""

    def __init__(self, plan: OutputPlan, *, resume: bool, command: str, files: Sequence[str],
                 record: Sequence[str], notify: Callable[[str], None], lock=None):
        from ..report.resume import FolderLock

        self.plan, self.resume, self.command, self.notify = plan, resume, command, notify
        self.files, self.record = tuple(files), tuple(record)
        self.shown, self.path = plan.shown, plan.real
        self.store = None
        self.notices: list[str] = []
        self._created: list[str] = []
        self._made_target = False
        self._aside: str | None = None
        self._written: dict[str, dict] = {}
        self._started = False
        from .signals import held

        with held():
            if plan.state == "file":  # told twice: the file is renamed, not lost
                parent = os.path.dirname(plan.real)
                self._aside = os.path.join(parent, _old_name(parent, os.path.basename(plan.real)))
                os.rename(plan.real, self._aside)
                self.notices.append(f"moved the file {self.shown} aside to {show(_rel(self._aside))}")
            try:
                if plan.state in ("new", "file"):
                    self._created = _create_missing(plan.missing, len(plan.missing) - 1) if plan.missing else []
                    try:
                        os.mkdir(plan.real, 0o777)
                        self._made_target = True
                    except FileExistsError:
                        if not os.path.isdir(plan.real):
                            raise
            except BaseException:
                self._undo_creation()
                raise
        self.lock = lock if lock is not None else FolderLock(plan.real, shown=self.shown)
        try:
            self.lock.acquire()
            # again under the lock: another fekt may have written here since the first check
            self.plan = plan_output(plan.given, plan.force, what=plan.what, allow_fekt=resume,
                                    owned_by_name=self.files, fekt_hint="pass --resume to finish or extend that "
                                    "sweep, --force to start over, or choose another --out")
            self._clean_stale_temporaries()
        except BaseException:
            self.lock.release()
            self._undo_creation()
            raise

    def _clean_stale_temporaries(self) -> None:
        # under the lock no other fekt writes here, so a temporary of fekt's is left from a killed run
        for n in os.listdir(self.path):
            if n.startswith(TMP_PREFIX):
                p = os.path.join(self.path, n)
                if os.path.isfile(p) and not os.path.islink(p):
                    os.unlink(p)

    # the resume file ---------------------------------------------------------------------------------
    def open_store(self, *, case_sha256: str, settings: Mapping, schema, key=("index", "values"),
                   kind: str = "sweep-points"):
        """Open (``resume``) or start the folder's ``points.jsonl`` and only then clear what is stale.

        Raises ResumeMismatch (exit 2) for a resume file of another case or other settings: nothing is
        deleted then. Problems with single lines are in ``store.notes`` (print them)."""
        from ..report.resume import ResumeStore

        marker = read_marker(self.path)
        if self.resume and marker is not None and marker.get("command") not in (None, self.command):
            raise _usage(f"the sweep folder {self.shown} holds results of `fekt {marker.get('command')}`, not a "
                         "sweep, so there is nothing to resume", hint="pass --force to replace them, or choose "
                                                                     "another --out")
        owned = _owned(self.path, marker, self.files if marker is not None else ())
        store = ResumeStore(self.path, case_sha256=case_sha256, settings=settings, schema=schema, key=key,
                            kind=kind, lock=self.lock, shown=self.shown)
        if self.resume:
            store.open(resume=True)  # checks before anything is removed
            stale = [n for n in owned if n not in self.record]
        else:
            stale = list(owned)
            store_existing = [n for n in (store.name, store.rejected_name) if os.path.lexists(os.path.join(self.path, n))
                              and n not in owned]
            if store_existing and self.plan.force < 2:
                raise _usage(f"the sweep folder {self.shown} holds {', '.join(map(show, store_existing))}, which fekt "
                             "did not write", hint="move it away, or pass --force twice to have it renamed to NAME.old")
            for n in store_existing:
                old = _old_name(self.path, n)
                os.rename(os.path.join(self.path, n), os.path.join(self.path, old))
                self.notices.append(f"renamed {show(n)} in {self.shown}, which fekt did not write, to {show(old)}")
        in_way = [n for n in self.files if n not in owned and n not in (store.name, store.rejected_name)
                  and os.path.lexists(os.path.join(self.path, n))]
        if in_way and self.plan.force < 2:
            raise _usage(f"the sweep folder {self.shown} holds {', '.join(map(show, in_way))}, which fekt did not "
                         "write (or which was changed since)",
                         hint="move it away, or pass --force twice to have it renamed to NAME.old")
        from .signals import held

        with held():
            for n in in_way:
                old = _old_name(self.path, n)
                os.rename(os.path.join(self.path, n), os.path.join(self.path, old))
                self.notices.append(f"renamed {show(n)} in {self.shown}, which fekt did not write, to {show(old)}")
            for n in stale:
                try:
                    os.unlink(os.path.join(self.path, n))
                except FileNotFoundError:
                    pass
            if not self.resume:
                if owned and marker is not None:
                    self.notices.append(f"starting over in {self.shown}: removed the results of {_by(marker)} there")
                store.open(resume=False)
            self.store = store
            self._write_marker("running")
            self._started = True
        for n in self.notices:
            self.notify(n)
        self.notices.clear()
        return store

    # summaries ---------------------------------------------------------------------------------------
    def file(self, name: str) -> str:
        if not _plain_name(name) or name.startswith(".fekt"):
            raise ValueError(f"'{name}' is not a plain file name fekt may write")
        return os.path.join(self.path, name)

    def _wrote(self, name: str) -> None:
        self._written[name] = {"sha256": _sha256(self.file(name))}

    def write_with(self, name: str, fn: Callable[[str], None]) -> None:
        write_atomic(self.file(name), fn)
        self._wrote(name)

    def write_json(self, name: str, data: dict) -> None:
        write_json(self.file(name), data)
        self._wrote(name)

    def write_text(self, name: str, text: str) -> None:
        write_text(self.file(name), text)
        self._wrote(name)

    # bookkeeping -------------------------------------------------------------------------------------
    def _write_marker(self, state: str) -> None:
        files: dict[str, dict] = {}
        for n in self.record:
            if os.path.isfile(os.path.join(self.path, n)):
                files[n] = {}
        files.update(self._written)
        write_json(os.path.join(self.path, MARKER), _marker(self.command, state, files))

    def finish(self) -> None:
        try:
            if self._started:
                self._write_marker("complete")
        finally:
            self.lock.release()

    def abort(self) -> None:
        """After an exception: keep a resumable record if points were finished, else remove what this
        run created (never a file fekt did not write)."""
        from .signals import held

        with held():
            try:
                points = self.store.count if self.store is not None else 0
                if self.store is not None:
                    self.store.close()
                if points == 0 and self._made_target:
                    for n in list(self._written) + list(self.record) + [MARKER]:
                        try:
                            os.unlink(os.path.join(self.path, n))
                        except (FileNotFoundError, IsADirectoryError):
                            pass
                    self.lock.release()
                    self._undo_creation()
                elif self._started:
                    self._write_marker("incomplete")
            finally:
                self.lock.release()

    def _undo_creation(self) -> None:
        """Remove the folder this run created (only when nothing else is in it) and put back a file
        that was moved aside."""
        if self._made_target:
            try:
                os.unlink(os.path.join(self.path, LOCK))
            except OSError:
                pass
            try:
                os.rmdir(self.path)
            except OSError:
                return
            self._made_target = False
            _remove_created(self._created)
        if self._aside is not None and not os.path.lexists(self.path):
            try:
                os.rename(self._aside, self.path)
                self._aside = None
            except OSError:
                pass


class prepare_sweep_folder:
    """Context manager for a sweep's folder (see :class:`SweepFolder`)::

        with prepare_sweep_folder(out, force=args.force, resume=args.resume) as folder:
            store = folder.open_store(case_sha256=file_sha256(args.case), schema=SWEEP_POINT_SCHEMA,
                                      settings={"varied": names, "estimate": not args.no_estimate,
                                                "basis": args.basis})
            for note in store.notes: print(f"fekt: warning: {note}", file=sys.stderr)
            done = ...store.records...
            ... store.append(point_dict) as each point finishes ...
            folder.write_text("sweep.csv", csv); folder.write_json("sweep.json", data); ...

    ``force``: the count of ``--force``: 1 starts over in a folder fekt wrote, 2 also accepts a folder
    fekt did not write (its files are kept) or a plain file (renamed to NAME.old). ``resume`` and
    ``force`` exclude each other. Entering takes the folder's lock (FolderBusy, exit 2, if another fekt
    sweep writes there).
    """

    def __init__(self, path: str | os.PathLike, *, force: int | bool = 0, resume: bool = False,
                 command: str = "sweep", files: Sequence[str] = SWEEP_FILES, record: Sequence[str] = SWEEP_RECORD,
                 notify: Callable[[str], None] | None = None):
        self.path, self.force, self.resume, self.command = path, int(force or 0), bool(resume), command
        self.files, self.record = tuple(files), tuple(record)
        self.notify = notify or _stderr
        self.folder: SweepFolder | None = None

    def __enter__(self) -> SweepFolder:
        from ..report.resume import FolderLock

        if self.resume and self.force:
            raise _usage("--resume and --force exclude each other",
                         hint="--resume keeps the finished points, --force starts over: pass one of them")
        lock = None
        real = os.path.realpath(self.path)
        if os.path.isdir(real) and os.path.isfile(os.path.join(real, LOCK)):
            # a sweep running there is the first thing to tell (before "the folder exists")
            lock = FolderLock(real, shown=show(self.path)).acquire()
        legacy = None
        if os.path.isdir(real) and read_marker(real) is None and os.path.lexists(os.path.join(real, self.record[0])):
            legacy = (f"if an older fekt wrote this sweep, its {self.record[0]} does not say which case file and "
                      "settings its points belong to, so they cannot be resumed: choose another --out, or pass "
                      "--force twice (--force --force) to start over there (the old files are renamed to NAME.old)")
        try:
            plan = plan_output(self.path, self.force, what="sweep folder", allow_fekt=self.resume,
                               owned_by_name=self.files, foreign_hint=legacy,
                               fekt_hint="pass --resume to finish or extend that sweep, --force to start over, or "
                                         "choose another --out")
            self.folder = SweepFolder(plan, resume=self.resume, command=self.command, files=self.files,
                                      record=self.record, notify=self.notify, lock=lock)
        except BaseException:
            if lock is not None:
                lock.release()
            raise
        return self.folder

    def __exit__(self, et, ev, tb) -> bool:
        if self.folder is None:
            return False
        if et is None:
            self.folder.finish()
        else:
            self.folder.abort()
        return False


__all__ = ["MARKER", "LOCK", "SWEEP_FILES", "OutputFolder", "OutputPlan", "SweepFolder", "add_force_argument",
           "plan_output", "prepare_output", "prepare_sweep_folder", "read_marker", "show"]
