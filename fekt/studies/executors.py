"""Process pools for studies (sweep points, convergence levels): gmsh is process-global, so parallel
work uses processes, never threads.

:func:`process_pool` gives a ``concurrent.futures.ProcessPoolExecutor`` whose workers

* ignore SIGINT and SIGTERM: Ctrl-C in a terminal reaches the whole process group, and only fekt's
  main process must act on it (workers used to print ``KeyboardInterrupt`` tracebacks);
* die with fekt, even when fekt is killed with SIGKILL and cleans up nothing: each worker watches
  fekt's main process (a pidfd, or polling where there is none) and ends itself when it is gone.
  (The parent of a worker is the forkserver, which outlives fekt as long as any worker lives, since
  every worker holds the pipe that tells the server fekt is alive; so the parent-death signal alone,
  also requested, would not do.)
* are killed, not waited for, when the ``with`` block ends with an exception (KeyboardInterrupt,
  SIGTERM's Terminated, an error): pending work is cancelled, the workers get SIGKILL and are joined
  with a time limit, so neither a double Ctrl-C nor a stuck worker can hang fekt.

Start method: ``forkserver`` (``spawn`` where it is missing). Workers are forked from a small server
process started once, which has no threads of its own; forking fekt's main process instead (the Linux
default ``fork`` before Python 3.14) copies whatever threads BLAS, gmsh, tqdm or Dask started there,
which can deadlock the child. The server is started with SIGINT and SIGTERM blocked, and every worker
inherits that, so even a worker still starting up is immune to Ctrl-C. Cost, measured for two workers
running a first task that imports the solver stack (numpy, scipy, scikit-fem, gmsh): forkserver
0.76-0.77 s, spawn 0.76-0.86 s, fork 0.79-0.85 s; the imports dominate and happen once per worker.
"""

from __future__ import annotations

import contextlib
import multiprocessing
import os
import select
import signal
import threading
import time
from collections.abc import Callable, Iterable, Iterator
from concurrent.futures import Future, ProcessPoolExecutor, as_completed

from ..errors import InputError

#: seconds to wait for killed workers and the pool's manager thread before giving up on them
JOIN_TIMEOUT = 5.0


def start_method() -> str:
    methods = multiprocessing.get_all_start_methods()
    return "forkserver" if "forkserver" in methods else "spawn"


def _die_with_parent() -> None:
    if os.uname().sysname == "Linux":
        try:
            import ctypes

            libc = ctypes.CDLL(None, use_errno=True)
            PR_SET_PDEATHSIG = 1
            libc.prctl(PR_SET_PDEATHSIG, int(signal.SIGKILL), 0, 0, 0)
        except (OSError, AttributeError):
            pass


def _watch(pid: int) -> None:
    """End this worker as soon as process ``pid`` (fekt's main process) has ended."""
    try:
        fd = os.pidfd_open(pid)
    except ProcessLookupError:
        os._exit(1)
    except (AttributeError, OSError):
        fd = None

    def wait_for_the_end() -> None:
        if fd is not None:
            select.select([fd], [], [])  # readable once the process has ended
        else:
            while True:
                time.sleep(1.0)
                try:
                    os.kill(pid, 0)
                except ProcessLookupError:
                    break
                except PermissionError:
                    pass
        os._exit(1)

    threading.Thread(target=wait_for_the_end, name="fekt-watch-main", daemon=True).start()


def _worker_init(main_pid: int, initializer: Callable | None, initargs: tuple) -> None:
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    signal.signal(signal.SIGTERM, signal.SIG_IGN)
    _die_with_parent()
    _watch(main_pid)
    if initializer is not None:
        initializer(*initargs)


def _shielded_server(method: str) -> None:
    """Start the forkserver with SIGINT/SIGTERM blocked, so that it and every worker forked from it
    never see them (a blocked signal stays blocked across fork and exec)."""
    if method != "forkserver":
        return
    from multiprocessing import forkserver

    if threading.current_thread() is not threading.main_thread() or not hasattr(signal, "pthread_sigmask"):
        forkserver.ensure_running()
        return
    old = signal.pthread_sigmask(signal.SIG_BLOCK, {signal.SIGINT, signal.SIGTERM})
    try:
        forkserver.ensure_running()
    finally:
        signal.pthread_sigmask(signal.SIG_SETMASK, old)


def _check_workers(workers) -> int:
    if isinstance(workers, bool) or not isinstance(workers, int) or workers < 1:
        raise InputError(f"the number of worker processes is {workers!r}; it must be a whole number of at least 1",
                         item="workers", hint="give a positive whole number of processes")
    return workers


@contextlib.contextmanager
def process_pool(workers: int, *, initializer: Callable | None = None, initargs: tuple = (),
                 method: str | None = None) -> Iterator[ProcessPoolExecutor]:
    """A process pool that is shut down cleanly on success and killed on any exception::

        with process_pool(jobs) as pool:
            futs = [pool.submit(fn, *args) for args in tasks]
            for f in as_completed(futs):
                handle(f.result())

    ``workers`` must be a positive whole number (else InputError naming it)."""
    workers = _check_workers(workers)
    method = method or start_method()
    _shielded_server(method)
    pool = ProcessPoolExecutor(max_workers=workers, mp_context=multiprocessing.get_context(method),
                               initializer=_worker_init, initargs=(os.getpid(), initializer, tuple(initargs)))
    try:
        yield pool
        pool.shutdown(wait=True)
    except BaseException:
        abort_pool(pool)
        raise


def abort_pool(pool: ProcessPoolExecutor, timeout: float = JOIN_TIMEOUT) -> None:
    """Cancel what has not started, SIGKILL every worker, join them (bounded). Safe to call twice."""
    procs = list((getattr(pool, "_processes", None) or {}).values())
    manager = getattr(pool, "_executor_manager_thread", None)
    try:
        pool.shutdown(wait=False, cancel_futures=True)
    finally:
        for p in procs:
            try:
                p.kill()
            except (OSError, ValueError, AttributeError):
                pass
        deadline = time.monotonic() + timeout
        for p in procs:
            try:
                p.join(max(0.0, deadline - time.monotonic()))
            except (OSError, ValueError, AssertionError):
                pass
        if manager is not None and manager is not threading.current_thread():
            manager.join(max(0.0, deadline - time.monotonic()))


def imap_unordered(pool: ProcessPoolExecutor, fn: Callable, arg_tuples: Iterable[tuple]) -> Iterator:
    """Submit ``fn(*args)`` for each tuple and yield the results as they finish; pending calls are
    cancelled when the consumer stops early or fails."""
    futs: list[Future] = [pool.submit(fn, *a) for a in arg_tuples]
    try:
        for f in as_completed(futs):
            yield f.result()
    finally:
        for f in futs:
            f.cancel()


__all__ = ["JOIN_TIMEOUT", "abort_pool", "imap_unordered", "process_pool", "start_method"]
