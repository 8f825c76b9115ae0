"""SIGINT and SIGTERM for the command line: both stop fekt through an exception, so every ``finally``
and context manager cleans up (temporary output folders, worker processes, locks).

* The first SIGINT raises KeyboardInterrupt (exit 130, ``fekt: interrupted``); the first SIGTERM
  raises :class:`Terminated`, a KeyboardInterrupt subclass, so clean-up written for Ctrl-C covers it
  too (exit 143, ``fekt: terminated``).
* A second signal while fekt is stopping does not interrupt the clean-up (a double Ctrl-C must neither
  leave temporaries nor hang); it says so. A third one ends the process at once (``os._exit``).
* :func:`held` defers both signals over a few steps that must not be cut in half (moving results into
  place); a signal that arrived meanwhile is raised when the block ends.
"""

from __future__ import annotations

import contextlib
import os
import signal
import threading
from collections.abc import Iterator

EXIT_INTERRUPTED = 130  # 128 + SIGINT
EXIT_TERMINATED = 143  # 128 + SIGTERM

_SIGNALS = (signal.SIGINT, signal.SIGTERM)


class Terminated(KeyboardInterrupt):
    """Raised in the main thread when fekt receives SIGTERM."""

    def __init__(self, signum: int = signal.SIGTERM):
        super().__init__(f"terminated by signal {signum}")
        self.signum = signum


class _State:
    def __init__(self) -> None:
        self.installed = False
        self.first: int | None = None
        self.more = 0
        self.hold = 0
        self.pending: int | None = None


_state = _State()


def exit_code(exc: BaseException) -> int:
    """130 for Ctrl-C, 143 for SIGTERM."""
    return EXIT_TERMINATED if isinstance(exc, Terminated) else EXIT_INTERRUPTED


def _raise_for(signum: int):
    if signum == signal.SIGINT:
        raise KeyboardInterrupt
    raise Terminated(signum)


def _handler(signum, frame) -> None:
    if _state.first is not None:
        _state.more += 1
        if _state.more == 1:
            _say("fekt: still stopping (removing temporary files); press Ctrl-C again to stop at once\n")
        else:
            _say("fekt: stopped at once; temporary files may remain\n")
            os._exit(EXIT_TERMINATED if _state.first == signal.SIGTERM else EXIT_INTERRUPTED)
        return
    if _state.hold:
        _state.pending = _state.pending or signum
        return
    _state.first = signum
    _raise_for(signum)


def _say(text: str) -> None:
    try:  # not print(): the main thread may be inside a write to stderr right now
        os.write(2, text.encode())
    except OSError:
        pass


def _in_main_thread() -> bool:
    return threading.current_thread() is threading.main_thread()


@contextlib.contextmanager
def handled() -> Iterator[None]:
    """Install fekt's SIGINT/SIGTERM handlers for the duration (only in the main thread; elsewhere a
    no-op), then put the previous ones back."""
    if not _in_main_thread() or _state.installed:
        yield
        return
    old = {s: signal.getsignal(s) for s in _SIGNALS}
    _state.__init__()
    try:
        for s in _SIGNALS:
            signal.signal(s, _handler)
        _state.installed = True
        yield
    finally:
        for s, h in old.items():
            signal.signal(s, h if h is not None else signal.SIG_DFL)
        _state.__init__()


@contextlib.contextmanager
def held() -> Iterator[None]:
    """Defer SIGINT and SIGTERM over the block; one that arrived is raised when it ends (unless the
    block is already ending with an exception, or fekt is already stopping)."""
    if not _in_main_thread():
        yield
        return
    if _state.installed:
        _state.hold += 1
        failed = False
        try:
            yield
        except BaseException:
            failed = True
            raise
        finally:
            _state.hold -= 1
            if _state.hold == 0 and _state.pending is not None:
                signum, _state.pending = _state.pending, None
                if _state.first is None:
                    _state.first = signum
                    if not failed:
                        _raise_for(signum)
        return
    # fekt's handlers are not installed (fekt used as a library): block the signals for this thread
    if not hasattr(signal, "pthread_sigmask"):
        yield
        return
    old = signal.pthread_sigmask(signal.SIG_BLOCK, set(_SIGNALS))
    try:
        yield
    finally:
        signal.pthread_sigmask(signal.SIG_SETMASK, old)


def stopping() -> bool:
    """True once a SIGINT or SIGTERM was received (fekt is cleaning up)."""
    return _state.first is not None


__all__ = ["EXIT_INTERRUPTED", "EXIT_TERMINATED", "Terminated", "exit_code", "handled", "held", "stopping"]
