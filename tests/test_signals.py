"""Signals and worker processes (reliability report, defects 2, 6 and 7), exit codes and messages of the
command line, ``fekt --version``.

The signal tests run a small fekt command line in a child process (a subcommand that starts a pool of
sleeping tasks, or writes an output folder and waits) and send it signals the way a terminal (Ctrl-C:
SIGINT to the whole process group) or a service manager (SIGTERM) would.
"""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import textwrap
import time

import pytest

from fekt.cli import signals
from fekt.errors import InputError
from fekt.studies.executors import process_pool

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))

#: a fekt command line with one more subcommand, ``nap MODE OUT``: MODE "pool" runs sleeping tasks in a
#: process pool, "output" writes an output folder and waits before finishing it
SCRIPT = textwrap.dedent("""
    import argparse, sys, time
    import fekt.cli.main as m

    def nap(args):
        if args.mode == "pool":
            from fekt.studies.executors import process_pool
            with process_pool(2) as pool:
                pool.submit(int, 0).result()  # a worker is up
                futs = [pool.submit(time.sleep, 60) for _ in range(4)]
                time.sleep(0.3)
                print("ready", flush=True)
                for f in futs:
                    f.result()
        else:
            from fekt.cli.output import prepare_output
            with prepare_output(args.out, command="nap") as out:
                out.write_text("report.txt", "half done\\n")
                print("ready", flush=True)
                time.sleep(60)
        return 0

    build = m.build_parser

    def build_parser():
        p = build()
        sub = next(a for a in p._actions if isinstance(a, argparse._SubParsersAction))
        n = sub.add_parser("nap")
        n.add_argument("mode")
        n.add_argument("out")
        n.set_defaults(run=nap)
        return p

    m.build_parser = build_parser
    sys.exit(m.main(sys.argv[1:]))
""")


def _start(tmp_path, mode: str, out: str = "-") -> subprocess.Popen:
    env = dict(os.environ, PYTHONPATH=ROOT + os.pathsep + os.environ.get("PYTHONPATH", ""))

    def as_in_a_terminal():  # default dispositions, whatever the test runner had
        signal.signal(signal.SIGINT, signal.SIG_DFL)
        signal.signal(signal.SIGTERM, signal.SIG_DFL)

    p = subprocess.Popen([sys.executable, "-P", "-c", SCRIPT, "nap", mode, out], cwd=str(tmp_path), env=env,
                         stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True, start_new_session=True,
                         preexec_fn=as_in_a_terminal)
    line = p.stdout.readline()
    if line.strip() != "ready":
        p.kill()
        raise AssertionError(f"the child did not start: {line!r} {p.stderr.read()}")
    return p


def _alive_in_group(pgid: int) -> list[int]:
    """Processes of the group that still run (zombies are dead: only their exit status is left)."""
    alive = []
    for d in os.listdir("/proc"):
        if not d.isdigit():
            continue
        try:
            with open(f"/proc/{d}/stat") as fh:
                s = fh.read()
        except OSError:
            continue
        fields = s[s.rindex(")") + 2:].split()
        if int(fields[2]) == pgid and fields[0] != "Z":
            alive.append(int(d))
    return alive


def _no_survivors(pgid: int, within: float = 5.0) -> list[int]:
    deadline = time.monotonic() + within
    while True:
        alive = _alive_in_group(pgid)
        if not alive or time.monotonic() > deadline:
            break
        time.sleep(0.05)
    for pid in alive:  # do not leave them to the next test
        try:
            os.kill(pid, signal.SIGKILL)
        except ProcessLookupError:
            pass
    return alive


def _finish(p: subprocess.Popen, timeout: float = 10.0) -> tuple[int, str, float]:
    t0 = time.monotonic()
    try:
        p.wait(timeout=timeout)
    except subprocess.TimeoutExpired:
        os.killpg(p.pid, signal.SIGKILL)
        p.wait()
        raise AssertionError(f"still running {timeout} s after the signal (hang)") from None
    return p.returncode, p.stderr.read(), time.monotonic() - t0


# --- defect 2: a double Ctrl-C during a parallel run ends it, quickly, with nothing left behind ---------------

def test_defect2_double_ctrl_c_exits_130_without_hanging(tmp_path):
    # report: two SIGINTs 0.3 s apart to the process group of `fekt sweep --workers 2` hung 6 of 6 times
    p = _start(tmp_path, "pool")
    os.killpg(p.pid, signal.SIGINT)
    time.sleep(0.3)
    os.killpg(p.pid, signal.SIGINT)
    code, err, seconds = _finish(p)
    assert code == 130 and seconds < 5.0, (code, seconds, err)
    assert "fekt: interrupted" in err and "Traceback" not in err
    assert _no_survivors(p.pid) == []


# --- defect 6: SIGTERM is handled like Ctrl-C: message, 143, clean-up, no orphans ----------------------------

@pytest.mark.parametrize("to_group", [False, True], ids=["main-process", "process-group"])
def test_defect6_sigterm_stops_workers(tmp_path, to_group):
    # report: `kill PID` of a pool sweep or `converge --jobs 2` left the workers alive under PID 1
    p = _start(tmp_path, "pool")
    (os.killpg if to_group else os.kill)(p.pid, signal.SIGTERM)
    code, err, seconds = _finish(p)
    assert code == 143 and err.strip().endswith("fekt: terminated"), (code, err)
    assert "Traceback" not in err and seconds < 5.0
    assert _no_survivors(p.pid) == []


def test_defect6_no_orphans_even_after_sigkill(tmp_path):
    # nothing in fekt runs after SIGKILL: the workers (and the forkserver) must still go by themselves
    p = _start(tmp_path, "pool")
    assert len(_alive_in_group(p.pid)) >= 3
    os.kill(p.pid, signal.SIGKILL)
    p.wait(timeout=10)
    assert _no_survivors(p.pid) == []


@pytest.mark.parametrize("sig,code,says", [(signal.SIGTERM, 143, "fekt: terminated"),
                                           (signal.SIGINT, 130, "fekt: interrupted")], ids=["TERM", "INT"])
def test_defect6_signal_removes_the_temporary_output(tmp_path, sig, code, says):
    # report: `.fekt-out-*` folders stayed beside the --out target after SIGTERM (6 of 40 runs)
    p = _start(tmp_path, "output", "a/b/res")
    assert [n for n in os.listdir(tmp_path / "a" / "b") if n.startswith(".fekt-out-")]  # staging exists
    os.kill(p.pid, sig)
    got, err, _ = _finish(p)
    assert got == code and says in err, err
    assert not (tmp_path / "a").exists()  # no staging folder, no target, no parent created for it
    assert _no_survivors(p.pid) == []


# --- defect 7: Ctrl-C in a terminal prints no worker tracebacks ----------------------------------------------

def test_defect7_ctrl_c_to_the_group_prints_no_worker_traceback(tmp_path):
    # report: `fekt converge --jobs 2`, Ctrl-C: "Process ForkProcess-1: Traceback ... KeyboardInterrupt"
    p = _start(tmp_path, "pool")
    os.killpg(p.pid, signal.SIGINT)
    code, err, _ = _finish(p)
    assert code == 130
    assert err.strip() == "fekt: interrupted", err
    assert _no_survivors(p.pid) == []


def test_workers_ignore_terminal_signals():
    with process_pool(1) as pool:
        got = [pool.submit(signal.getsignal, s).result() for s in (signal.SIGINT, signal.SIGTERM)]
    assert got == [signal.SIG_IGN, signal.SIG_IGN]


def test_pool_is_killed_on_an_exception():
    with pytest.raises(RuntimeError):
        with process_pool(2) as pool:
            pool.submit(int, 0).result()
            futs = [pool.submit(time.sleep, 30) for _ in range(3)]
            pids = list(pool._processes)
            raise RuntimeError("a point failed")
    assert all(f.cancelled() or f.done() for f in futs)
    for pid in pids:
        try:
            with open(f"/proc/{pid}/stat") as fh:
                state = fh.read().rsplit(")", 1)[1].split()[0]
        except OSError:
            continue
        assert state == "Z", f"worker {pid} still runs"


@pytest.mark.parametrize("bad", [0, -1, True, 1.5])
def test_pool_size_is_checked(bad):
    # report defect 13: `--workers -1` ended in "internal error (ValueError): max_workers must be > 0"
    with pytest.raises(InputError, match="at least 1"):
        with process_pool(bad):
            pass


# --- the handlers themselves -------------------------------------------------------------------------------

def test_sigterm_raises_terminated_and_handlers_are_restored():
    before = signal.getsignal(signal.SIGTERM), signal.getsignal(signal.SIGINT)
    with pytest.raises(signals.Terminated):
        with signals.handled():
            os.kill(os.getpid(), signal.SIGTERM)
            time.sleep(1)
    assert (signal.getsignal(signal.SIGTERM), signal.getsignal(signal.SIGINT)) == before
    assert signals.exit_code(signals.Terminated()) == 143 and signals.exit_code(KeyboardInterrupt()) == 130


def test_held_defers_a_signal_to_the_end_of_the_block():
    steps = []
    with pytest.raises(KeyboardInterrupt):
        with signals.handled():
            with signals.held():
                os.kill(os.getpid(), signal.SIGINT)
                time.sleep(0.05)
                steps.append("finished the block")
            steps.append("after the block")
    assert steps == ["finished the block"]


def test_a_second_signal_does_not_cut_the_clean_up(capfd):
    cleaned = []
    with signals.handled():
        try:
            os.kill(os.getpid(), signal.SIGINT)
            time.sleep(1)
        except KeyboardInterrupt:
            os.kill(os.getpid(), signal.SIGINT)  # the impatient second Ctrl-C, during the clean-up
            time.sleep(0.05)
            cleaned.append(True)
    assert cleaned == [True]
    assert "still stopping" in capfd.readouterr().err


# --- exit codes and messages of main() ----------------------------------------------------------------------

def _with_command(monkeypatch, run):
    import argparse

    import fekt.cli.main as m

    build = m.build_parser

    def build_parser():
        p = build()
        sub = next(a for a in p._actions if isinstance(a, argparse._SubParsersAction))
        sub.add_parser("boom").set_defaults(run=run)
        return p

    monkeypatch.setattr(m, "build_parser", build_parser)
    return m.main


def test_fault_of_fekt_says_how_to_report_it(monkeypatch, capsys):
    def run(args):
        raise RuntimeError("something inside fekt broke")

    main = _with_command(monkeypatch, run)
    assert main(["boom"]) == 1
    err = capsys.readouterr().err
    assert "fekt: internal error (RuntimeError): something inside fekt broke" in err
    assert "please report this with the case file and the output of `fekt --debug boom`" in err


def test_messages_cannot_drive_the_terminal(monkeypatch, capsys):
    # report defect 16: a case name with OSC and erase-screen sequences went to the terminal raw
    from fekt.cli.main import UsageError

    def run(args):
        raise UsageError("unknown key '\x1b]0;owned\x07\x1b[2Jx'" + "k" * 5000)

    main = _with_command(monkeypatch, run)
    assert main(["boom"]) == 2
    err = capsys.readouterr().err
    assert "\x1b" not in err and "\x07" not in err and "\\x1b]0;owned\\x07\\x1b[2Jx" in err
    assert len(err) < 2200 and "more characters" in err


def test_version_names_fekt_and_its_libraries_without_importing_them():
    from importlib import metadata

    import fekt

    code = textwrap.dedent("""
        import sys
        from fekt.cli.main import main
        try:
            main(["--version"])
        except SystemExit as e:
            print("exit", e.code)
        print("imported", [m for m in ("gmsh", "skfem", "numpy", "scipy", "matplotlib") if m in sys.modules])
    """)
    env = dict(os.environ, PYTHONPATH=ROOT + os.pathsep + os.environ.get("PYTHONPATH", ""))
    r = subprocess.run([sys.executable, "-P", "-c", code], capture_output=True, text=True, env=env, timeout=60)
    lines = r.stdout.splitlines()
    assert lines[0] == f"fekt {fekt.__version__}"
    for dist in ("gmsh", "scikit-fem", "numpy", "scipy", "matplotlib"):
        assert f"{dist} {metadata.version(dist)}" in lines
    assert "exit 0" in lines and "imported []" in lines
