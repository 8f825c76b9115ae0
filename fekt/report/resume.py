"""Resume files: one JSON record per finished unit of work (a sweep point), appended as it finishes and
read back to finish an interrupted study.

Format of ``points.jsonl`` (UTF-8, one JSON object per line, each line ends in a newline):

* line 1, the header: ``{"fekt_resume": 1, "kind": "sweep-points", "fekt": "<version>",
  "case_sha256": "<hash of the case file>", "settings": {...}, "key": "index"}``. ``settings`` are the
  caller's (for a sweep: the varied names, whether bands were computed, the basis). A file whose header
  differs in kind, case, settings or fekt version is refused with :class:`ResumeMismatch` (exit 2), so
  points of another case or other settings are never mixed in. A file without a header (an older
  fekt, or not fekt's) is refused the same way.
* every other line: one record, a plain dict checked against the caller's :class:`RecordSchema`.

Rules for damaged lines, applied when the file is opened to resume: a line that is not UTF-8, not
JSON, not an object, or that fails the schema (missing or extra keys, wrong types, an unknown status,
NaN) is skipped and reported with its line number, so its unit of work is computed again; the same
for two lines with one key and different contents (both are dropped) and for a last line cut short
(no newline: the record being written when fekt stopped). A line repeated exactly is kept once. When
anything was skipped, the file is rewritten (atomically) with the header and the good records only,
and the skipped lines are appended, byte for byte, to ``points.rejected`` beside it: nothing is
lost, and the next record is never glued to a cut-short line.

Safety: the files are opened without following symbolic links (O_NOFOLLOW) and must be regular files;
a lock (``fcntl.flock`` on ``.fekt.lock`` in the folder, non-blocking) keeps two fekt processes from
writing one folder (:class:`FolderBusy`, exit 2, naming the folder).
"""

from __future__ import annotations

import errno
import fcntl
import hashlib
import json
import math
import os
import stat
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass

from ..errors import InputError
from .files import fsync_dir, write_atomic

#: version of the resume-file format (the header's ``fekt_resume``)
SCHEMA_VERSION = 1
#: longest line read back (longer ones are damaged lines: skipped and reported)
MAX_LINE = 1 << 20
#: the lock file of a folder
LOCK_NAME = ".fekt.lock"
#: line problems listed one by one in :attr:`ResumeStore.notes` (the rest are counted)
_LISTED = 8


class ResumeMismatch(InputError):
    """The resume file belongs to another case or other settings (or cannot be attributed)."""


class ResumeFileError(InputError):
    """The resume file cannot be used at all (a link, a folder, unreadable, from a newer fekt)."""

    about_case = False  # the CLI does not put the case file's name before the message


class FolderBusy(InputError):
    """Another fekt process holds the folder's lock."""

    about_case = False


def _q(text: str) -> str:
    return "'" + "".join(ascii(c)[1:-1] if ord(c) < 32 or 127 <= ord(c) < 160 else c for c in str(text)) + "'"


def file_sha256(path: str) -> str:
    """SHA-256 of a file's bytes (for the header's ``case_sha256``)."""
    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for block in iter(lambda: fh.read(1 << 20), b""):
            h.update(block)
    return h.hexdigest()


# --- a small validator for plain-dict records -------------------------------------------------------

class Spec:
    """One value's rule; :meth:`problem` returns None when the value is fine, else a short reason."""

    def problem(self, value) -> str | None:  # pragma: no cover - abstract
        raise NotImplementedError


def _show(value) -> str:
    text = json.dumps(value) if not isinstance(value, float) or math.isfinite(value) else repr(value)
    return text if len(text) <= 40 else text[:40] + "..."


class Int(Spec):
    def __init__(self, min: int | None = None, max: int | None = None):
        self.min, self.max = min, max

    def problem(self, v):
        if isinstance(v, bool) or not isinstance(v, int):
            return f"is {_show(v)}, expected a whole number"
        if self.min is not None and v < self.min:
            return f"is {v}, expected at least {self.min}"
        if self.max is not None and v > self.max:
            return f"is {_show(v)}, expected at most {self.max}"
        return None


class Float(Spec):
    """A finite number (ints accepted)."""

    def __init__(self, min: float | None = None):
        self.min = min

    def problem(self, v):
        if isinstance(v, bool) or not isinstance(v, (int, float)):
            return f"is {_show(v)}, expected a number"
        try:
            f = float(v)
        except OverflowError:
            return f"is {_show(v)}, too large a number"
        if not math.isfinite(f):
            return f"is {_show(v)}, expected a finite number"
        if self.min is not None and v < self.min:
            return f"is {_show(v)}, expected at least {self.min}"
        return None


class Str(Spec):
    def __init__(self, max_len: int = 100_000):
        self.max_len = max_len

    def problem(self, v):
        if not isinstance(v, str):
            return f"is {_show(v)}, expected text"
        if len(v) > self.max_len:
            return f"is text of {len(v)} characters, longer than {self.max_len}"
        return None


class Bool(Spec):
    def problem(self, v):
        return None if isinstance(v, bool) else f"is {_show(v)}, expected true or false"


class OneOf(Spec):
    def __init__(self, *values):
        self.values = values

    def problem(self, v):
        if isinstance(v, bool) or v not in self.values:
            return f"is {_show(v)}, expected one of {', '.join(map(str, self.values))}"
        return None


class Optional(Spec):
    """``None`` or a value of ``spec``."""

    def __init__(self, spec):
        self.spec = as_spec(spec)

    def problem(self, v):
        return None if v is None else self.spec.problem(v)


class MapOf(Spec):
    """An object whose keys are text and whose values follow ``spec``."""

    def __init__(self, spec, max_len: int = 1000):
        self.spec, self.max_len = as_spec(spec), max_len

    def problem(self, v):
        if not isinstance(v, dict):
            return f"is {_show(v)}, expected an object"
        if len(v) > self.max_len:
            return f"has {len(v)} entries, more than {self.max_len}"
        for k, x in v.items():
            p = self.spec.problem(x)
            if p:
                return f"entry {_q(k)} {p}"
        return None


class ListOf(Spec):
    """A list whose items follow ``spec`` (a rule or a :class:`RecordSchema` for a list of objects)."""

    def __init__(self, spec, max_len: int = 10_000):
        self.spec, self.max_len = spec if isinstance(spec, RecordSchema) else as_spec(spec), max_len

    def problem(self, v):
        if not isinstance(v, list):
            return f"is {_show(v)}, expected a list"
        if len(v) > self.max_len:
            return f"has {len(v)} items, more than {self.max_len}"
        for i, x in enumerate(v):
            if isinstance(self.spec, RecordSchema):
                p = self.spec.problems(x)
                p = "; ".join(p) if p else None
            else:
                p = self.spec.problem(x)
            if p:
                return f"item {i} {p}"
        return None


def as_spec(x) -> Spec:
    """``int``, ``float``, ``str``, ``bool`` stand for Int(), Float(), Str(), Bool()."""
    if isinstance(x, Spec):
        return x
    table = {int: Int(), float: Float(), str: Str(), bool: Bool()}
    if x in table:
        return table[x]
    raise TypeError(f"not a field rule: {x!r}")


class RecordSchema:
    """The keys a record must have (no more, no fewer) and each one's rule, plus whole-record rules
    (functions returning a reason or None)."""

    def __init__(self, fields: Mapping[str, Spec | type], *, rules: Sequence[Callable[[dict], str | None]] = ()):
        self.fields = {k: as_spec(v) for k, v in fields.items()}
        self.rules = tuple(rules)

    def problems(self, record) -> list[str]:
        if not isinstance(record, dict):
            kind = {list: "a list", str: "text", type(None): "null", bool: "true/false"}.get(type(record), "a number")
            return [f"is {kind}, not an object"]
        out = []
        for k in self.fields:
            if k not in record:
                out.append(f"has no key {_q(k)}")
        for k in record:
            if k not in self.fields:
                out.append(f"has an unexpected key {_q(k)}")
        for k, spec in self.fields.items():
            if k in record:
                p = spec.problem(record[k])
                if p:
                    out.append(f"key {_q(k)} {p}")
        if not out:
            for rule in self.rules:
                p = rule(record)
                if p:
                    out.append(p)
        return out

    def check(self, record) -> None:
        """Raise ValueError when ``record`` breaks the schema (a fault of the caller, not of the user)."""
        p = self.problems(record)
        if p:
            raise ValueError("record does not follow its schema: " + "; ".join(p))


def _ok_has_kt(r: dict) -> str | None:
    if r["status"] == "ok" and r["kt_net"] is None:
        return "has status ok but no Kt"
    return None


#: one stress peak of a sweep point (``PeakSummary`` in fekt/studies/sweep.py). Kt values are signed
#: (a compressive peak under a tensile nominal stress has a negative Kt); gross Kt is None for features
#: without a gross section; bands are half-widths, never negative.
SWEEP_PEAK_SCHEMA = RecordSchema({
    "rank": Int(min=1, max=10**6),
    "feature": str,
    "kind": str,
    "peak": float,
    "kt_net": Optional(float),
    "kt_net_band": Optional(Float(min=0)),
    "kt_gross": Optional(float),
    "kt_gross_band": Optional(Float(min=0)),
    "singular": bool,
})

#: the record of one sweep point as ``PointResult.to_json()`` writes it (fekt/studies/sweep.py)
SWEEP_POINT_SCHEMA = RecordSchema({
    "index": Int(min=0, max=10**9),
    "values": MapOf(float),
    "status": OneOf("ok", "invalid", "failed"),
    "message": str,
    "feature": str,
    "kt_net": Optional(float),
    "kt_net_band": Optional(Float(min=0)),
    "kt_gross": Optional(float),
    "kt_gross_band": Optional(Float(min=0)),
    "chart_kt": Optional(float),
    "chart_basis": str,
    "peak": Optional(float),
    "seconds": Float(min=0),
    "peaks": ListOf(SWEEP_PEAK_SCHEMA),
    "parameters": MapOf(float),
}, rules=[_ok_has_kt])


# --- the lock ------------------------------------------------------------------------------------------

def _open_regular(path: str, flags: int, shown: str, what: str, mode: int = 0o666) -> int | None:
    """Open without following a symlink; None when absent (and not created); refuse anything but a
    regular file."""
    try:
        fd = os.open(path, flags | os.O_NOFOLLOW | os.O_CLOEXEC | os.O_NONBLOCK, mode)
    except FileNotFoundError:
        return None
    except OSError as exc:
        if exc.errno == errno.ELOOP:
            raise ResumeFileError(f"{what} in {shown} is a symbolic link; fekt does not follow links there",
                                  hint=f"remove or rename the link '{os.path.basename(path)}' and run again") from None
        if exc.errno == errno.EISDIR:
            raise ResumeFileError(f"{what} in {shown} is a folder, not a file",
                                  hint=f"remove or rename the folder '{os.path.basename(path)}'") from None
        if exc.errno in (errno.EACCES, errno.EPERM):
            raise ResumeFileError(f"{what} in {shown} cannot be opened (permission denied)",
                                  hint="check the folder's permissions, or choose another --out") from None
        raise
    st = os.fstat(fd)
    if not stat.S_ISREG(st.st_mode):
        os.close(fd)
        kind = "a folder" if stat.S_ISDIR(st.st_mode) else "not a regular file"
        raise ResumeFileError(f"{what} in {shown} is {kind}",
                              hint=f"remove or rename '{os.path.basename(path)}', or choose another --out")
    flags_now = fcntl.fcntl(fd, fcntl.F_GETFL)
    fcntl.fcntl(fd, fcntl.F_SETFL, flags_now & ~os.O_NONBLOCK)
    return fd


class FolderLock:
    """An exclusive, non-blocking ``flock`` on ``<folder>/.fekt.lock``; released on close or when the
    process ends (however it ends). The lock file stays (removing it would race with a newcomer)."""

    def __init__(self, folder: str, shown: str | None = None):
        self.folder = folder
        self.shown = shown or _q(folder)
        self.path = os.path.join(folder, LOCK_NAME)
        self.fd: int | None = None

    def acquire(self) -> FolderLock:
        if self.fd is not None:
            return self
        fd = _open_regular(self.path, os.O_RDWR | os.O_CREAT, self.shown, "the lock file .fekt.lock")
        try:
            fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
        except OSError as exc:
            holder = ""
            try:
                text = os.pread(fd, 32, 0).decode("ascii", "replace").strip()
                holder = f" (process {int(text)})" if text.isdigit() else ""
            except (OSError, ValueError):
                pass
            os.close(fd)
            if exc.errno in (errno.EWOULDBLOCK, errno.EAGAIN, errno.EACCES):
                raise FolderBusy(f"another fekt sweep{holder} is writing the folder {self.shown}",
                                 hint="wait until it has finished, or choose another --out") from None
            raise
        os.ftruncate(fd, 0)
        os.pwrite(fd, f"{os.getpid()}\n".encode(), 0)
        self.fd = fd
        return self

    def release(self) -> None:
        if self.fd is not None:
            fd, self.fd = self.fd, None
            try:
                fcntl.flock(fd, fcntl.LOCK_UN)
            finally:
                os.close(fd)

    def __enter__(self) -> FolderLock:
        return self.acquire()

    def __exit__(self, *exc) -> bool:
        self.release()
        return False


# --- the store -----------------------------------------------------------------------------------------

@dataclass(frozen=True)
class LineProblem:
    line: int
    reason: str


_BAD = object()


def _reject_constant(name: str):
    raise ValueError(f"{name} is not a number fekt writes")


def _read_lines(fd: int):
    """(line number, bytes without the newline, complete?) for every line; overlong lines come back
    cut to MAX_LINE bytes and flagged incomplete=None."""
    with os.fdopen(os.dup(fd), "rb", buffering=1 << 16) as fh:
        fh.seek(0)
        n = 0
        while True:
            chunk = fh.readline(MAX_LINE + 1)
            if not chunk:
                return
            n += 1
            if chunk.endswith(b"\n"):
                yield n, chunk[:-1], True
                continue
            if len(chunk) <= MAX_LINE:  # the end of the file without a newline
                yield n, chunk, False
                return
            head = chunk
            while chunk and not chunk.endswith(b"\n"):
                chunk = fh.readline(MAX_LINE + 1)
            yield n, head[:1000], None


class ResumeStore:
    """A folder's resume file (see the module docstring for the format and the rules).

    ``case_sha256`` and ``settings`` identify the study; ``schema`` checks each record; ``key`` names the
    record field (or fields) that identify a unit of work (records with one key and different contents
    are conflicting duplicates). For a sweep: ``("index", "values")``, so that a resumed sweep over
    another grid adds its points without clashing with the old ones. ``lock``: a held
    :class:`FolderLock` of the folder, or None to take one in :meth:`open`.

    After :meth:`open`: ``records`` (the usable records, in file order), ``problems``
    (:class:`LineProblem` per skipped line), ``notes`` (messages for the user about them), then
    :meth:`append` per finished unit and :meth:`close`."""

    def __init__(self, folder: str, *, case_sha256: str, settings: Mapping, schema: RecordSchema,
                 key: str | Sequence[str] = ("index", "values"), kind: str = "sweep-points",
                 name: str = "points.jsonl",
                 rejected_name: str = "points.rejected", lock: FolderLock | None = None, shown: str | None = None):
        self.folder, self.case_sha256, self.schema, self.kind = folder, case_sha256, schema, kind
        self.key = [key] if isinstance(key, str) else list(key)
        self.settings = json.loads(json.dumps(dict(settings), allow_nan=False))
        self.name, self.rejected_name = name, rejected_name
        self.path = os.path.join(folder, name)
        self.shown = shown or _q(folder)
        self.lock = lock
        self._own_lock = lock is None
        self.fd: int | None = None
        self.records: list[dict] = []
        self.problems: list[LineProblem] = []
        self.notes: list[str] = []
        self.repaired = False
        self.appended = 0

    # header -----------------------------------------------------------------------------------------
    def header(self) -> dict:
        from ..version import __version__

        return {"fekt_resume": SCHEMA_VERSION, "kind": self.kind, "fekt": __version__,
                "case_sha256": self.case_sha256, "settings": self.settings, "key": self.key}

    def _what(self) -> str:
        return f"the resume file {self.name}"

    def _check_header(self, found, line: int) -> None:
        hint = ("pass --force to start over (its finished points are discarded), or choose another --out")
        if not (isinstance(found, dict) and "fekt_resume" in found):
            raise ResumeMismatch(f"{self._what()} in {self.shown} has no header on line {line} (it was written by an "
                                 "older fekt, or not by fekt), so fekt cannot tell which case and settings its "
                                 "points belong to", hint=hint)
        version = found.get("fekt_resume")
        if not isinstance(version, int) or isinstance(version, bool) or version < 1:
            raise ResumeMismatch(f"{self._what()} in {self.shown} has a damaged header (line {line})", hint=hint)
        if version > SCHEMA_VERSION:
            raise ResumeFileError(f"{self._what()} in {self.shown} was written by a newer fekt (format {version}; "
                                  f"this fekt reads format {SCHEMA_VERSION})",
                                  hint="resume it with that fekt, or pass --force to start over")
        want = self.header()
        diffs = []
        if found.get("kind") != want["kind"]:
            diffs.append(f"it holds {_q(found.get('kind'))} records, not {_q(want['kind'])}")
        if found.get("case_sha256") != want["case_sha256"]:
            got = found.get("case_sha256")
            got = got[:12] if isinstance(got, str) else "?"
            diffs.append(f"it was written for another case file (SHA-256 {got}..., the case file now has "
                         f"{want['case_sha256'][:12]}...)")
        fs, ws = found.get("settings"), want["settings"]
        if not isinstance(fs, dict):
            diffs.append("its settings are missing")
        else:
            for k in sorted(set(fs) | set(ws)):
                if fs.get(k, "(not set)") != ws.get(k, "(not set)"):
                    diffs.append(f"it was written with {k} = {_show(fs.get(k, '(not set)'))}, this run has "
                                 f"{k} = {_show(ws.get(k, '(not set)'))}")
        if found.get("fekt") != want["fekt"]:
            diffs.append(f"it was written by fekt {_show(found.get('fekt'))}, this is fekt {want['fekt']}")
        if found.get("key") != want["key"]:
            diffs.append(f"its records are keyed by {_show(found.get('key'))}, not {_show(want['key'])}")
        if diffs:
            raise ResumeMismatch(f"{self._what()} in {self.shown} does not belong to this run: " + "; ".join(diffs),
                                 hint=hint)

    # opening ----------------------------------------------------------------------------------------
    def open(self, *, resume: bool) -> ResumeStore:
        """``resume``: read the existing file (header checked, damaged lines skipped and reported);
        otherwise start a new file with only the header (an existing one is replaced)."""
        if self.lock is None:
            self.lock = FolderLock(self.folder, self.shown)
        self.lock.acquire()
        try:
            if resume:
                self._resume()
            else:
                self._start()
        except BaseException:
            self.close()
            raise
        return self

    def _start(self, keep: Sequence[dict] = ()) -> None:
        lines = [json.dumps(self.header(), allow_nan=False)] + [json.dumps(r, allow_nan=False) for r in keep]
        text = "".join(ln + "\n" for ln in lines)

        def w(tmp: str) -> None:
            with open(tmp, "w", encoding="utf-8") as fh:
                fh.write(text)

        if os.path.lexists(self.path):
            fd = _open_regular(self.path, os.O_RDONLY, self.shown, self._what())  # refuses links and folders
            if fd is not None:
                os.close(fd)
        write_atomic(self.path, w)
        fsync_dir(self.folder)
        self._open_append()

    def _open_append(self) -> None:
        fd = _open_regular(self.path, os.O_WRONLY | os.O_APPEND, self.shown, self._what())
        if fd is None:
            raise ResumeFileError(f"{self._what()} in {self.shown} disappeared while fekt opened it",
                                  hint="run again")
        self.fd = fd

    def _resume(self) -> None:
        fd = _open_regular(self.path, os.O_RDONLY, self.shown, self._what())
        if fd is None:
            self._start()
            return
        header = None
        rejected: list[bytes] = []
        good: list[tuple[int, dict, bytes]] = []
        try:
            for n, raw, complete in _read_lines(fd):
                if n == 1 and raw.startswith(b"\xef\xbb\xbf"):
                    raw = raw[3:]
                if complete is None:
                    if header is None:
                        self._check_header(None, n)
                    self._skip(n, f"is longer than {MAX_LINE} bytes", raw, rejected)
                    continue
                if not raw.strip():
                    continue
                if not complete:
                    self._skip(n, "is cut short (no end of line): the record being written when fekt stopped",
                               raw, rejected)
                    continue
                try:
                    value = json.loads(raw.decode("utf-8"), parse_constant=_reject_constant)
                except UnicodeDecodeError:
                    value, reason = _BAD, "is not UTF-8 text"
                except (ValueError, RecursionError) as exc:
                    value, reason = _BAD, (str(exc) if "is not a number" in str(exc) else "is not valid JSON")
                if header is None:
                    self._check_header(None if value is _BAD else value, n)
                    header = value
                    continue
                if value is _BAD:
                    self._skip(n, reason, raw, rejected)
                    continue
                probs = self.schema.problems(value)
                if probs:
                    self._skip(n, "; ".join(probs[:3]), raw, rejected)
                    continue
                good.append((n, value, raw))
        finally:
            os.close(fd)
        if header is None:  # nothing but blank or cut-short lines: nothing to attribute, start afresh
            self._keep_rejected(rejected)
            self._start()
            self._summarise()
            return
        # one record per key: exact repeats are kept once, conflicting ones are all dropped
        groups: dict[str, list[tuple[int, dict, bytes]]] = {}
        for item in good:
            groups.setdefault(self._key_of(item[1]), []).append(item)
        keep = []
        for items in groups.values():
            first = items[0]
            if all(v == first[1] for _, v, _ in items[1:]):
                keep.append(first)
                for n, _, _ in items[1:]:
                    self.problems.append(LineProblem(n, f"repeats line {first[0]} exactly (kept once)"))
            else:
                lines = ", ".join(str(n) for n, _, _ in items)
                for n, v, raw in items:
                    self._skip(n, f"has the {' and '.join(self.key)} of lines {lines} but other contents (all of them "
                                  "are dropped)", raw, rejected)
        keep.sort(key=lambda item: item[0])
        self.problems.sort(key=lambda p: p.line)
        self.records = [v for _, v, _ in keep]
        if self.problems:
            self._keep_rejected(rejected)
            self._start(keep=self.records)
            self.repaired = True
        else:
            self._open_append()
        self._summarise()

    def _key_of(self, record: dict) -> str:
        return json.dumps([record.get(k) for k in self.key], sort_keys=True)

    def _skip(self, n: int, reason: str, raw: bytes, rejected: list[bytes]) -> None:
        self.problems.append(LineProblem(n, reason))
        rejected.append(raw)

    def _keep_rejected(self, rejected: Sequence[bytes]) -> None:
        if not rejected:
            return
        path = os.path.join(self.folder, self.rejected_name)
        fd = _open_regular(path, os.O_WRONLY | os.O_APPEND | os.O_CREAT, self.shown, f"the file {self.rejected_name}")
        try:
            _write_all(fd, b"".join(r + b"\n" for r in rejected))
            os.fsync(fd)
        finally:
            os.close(fd)

    def _summarise(self) -> None:
        skipped = [p for p in self.problems if "(kept once)" not in p.reason]
        repeats = len(self.problems) - len(skipped)
        if skipped:
            listed = "; ".join(f"line {p.line} {p.reason}" for p in skipped[:_LISTED])
            more = f"; and {len(skipped) - _LISTED} more" if len(skipped) > _LISTED else ""
            self.notes.append(f"{self.name} in {self.shown}: {len(skipped)} line(s) could not be used and their "
                              f"points will be computed again: {listed}{more}. The lines were moved to "
                              f"{self.rejected_name}.")
        if repeats:
            self.notes.append(f"{self.name} in {self.shown}: {repeats} line(s) repeated an earlier line exactly "
                              "and were dropped.")

    # writing ----------------------------------------------------------------------------------------
    def append(self, record: dict) -> None:
        """Append one finished record (checked against the schema first; a bad record is the caller's
        fault and raises ValueError) and flush it to disk."""
        if self.fd is None:
            raise RuntimeError("the resume file is not open")
        self.schema.check(record)
        missing = [k for k in self.key if k not in record]
        if missing:
            raise ValueError(f"record has no key field {missing[0]!r}")
        line = (json.dumps(record, allow_nan=False) + "\n").encode("utf-8")
        _write_all(self.fd, line)
        os.fsync(self.fd)
        self.appended += 1

    @property
    def count(self) -> int:
        """Records in the file: the usable ones read back plus those appended."""
        return len(self.records) + self.appended

    def close(self) -> None:
        if self.fd is not None:
            fd, self.fd = self.fd, None
            os.close(fd)
        if self._own_lock and self.lock is not None:
            self.lock.release()

    def __enter__(self) -> ResumeStore:
        return self

    def __exit__(self, *exc) -> bool:
        self.close()
        return False


def _write_all(fd: int, data: bytes) -> None:
    view = memoryview(data)
    while view:
        n = os.write(fd, view)
        view = view[n:]


__all__ = ["SCHEMA_VERSION", "SWEEP_POINT_SCHEMA", "Bool", "FolderBusy", "FolderLock", "Float", "Int", "LineProblem",
           "MapOf", "OneOf", "Optional", "RecordSchema", "ResumeFileError", "ResumeMismatch", "ResumeStore", "Spec",
           "Str", "as_spec", "file_sha256"]
