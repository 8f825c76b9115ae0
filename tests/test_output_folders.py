"""Output folders never lose data (reliability report, defects 5, 10, 14 and 15).

Each test names the report's defect it reproduces; inputs are copied from the report's cases folder
(or, where it gave only a description, rebuilt from it) into the test's own temporary folder.
"""

from __future__ import annotations

import glob
import json
import os
import shutil
import stat
import subprocess
import sys

import pytest

from fekt.cli import output
from fekt.cli.main import UsageError, main
from fekt.cli.output import MARKER, plan_output, prepare_output, prepare_sweep_folder
from fekt.report.files import write_json, write_text
from fekt.report.resume import SWEEP_POINT_SCHEMA

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
RESULT_FILES = ["report.txt", "result.json", "stress.png"]


def _report_case(tmp_path, rel: str, name: str | None = None) -> str:
    """The tiny strip case the reliability run's output-folder checks used (cases/strip_hole.toml at 4
    elements per radius) under the name ``rel`` had there."""
    dst = tmp_path / (name or os.path.basename(rel))
    text = open(os.path.join(ROOT, "cases", "strip_hole.toml"), encoding="utf-8").read()
    dst.write_text(text + "\n[mesh]\nelements_per_radius = 4\n", encoding="utf-8")
    return str(dst)


def _leftovers(*folders) -> list[str]:
    """fekt's temporaries (staging folders, temporary files) in the given folders."""
    found = []
    for f in folders:
        found += glob.glob(os.path.join(str(f), ".fekt-*"))
    return sorted(found)


def _visible(folder) -> list[str]:
    return sorted(n for n in os.listdir(folder) if not n.startswith("."))


@pytest.fixture
def no_compute(monkeypatch):
    """Fail loudly if anything starts meshing: a refusal must come before any computation."""
    import gmsh

    def refuse(*a, **k):
        raise AssertionError("the computation started before the output folder was checked")

    monkeypatch.setattr(gmsh, "initialize", refuse)


def _forced_twice_supported(command: str) -> bool:
    """The command counts --force (``--force --force``); until it does, the CLI tests of that
    behaviour run on the API instead."""
    from fekt.cli.main import build_parser

    try:
        args = build_parser().parse_args([command, "x.toml", "--vary", "d=1", "--force", "--force"]
                                         if command == "sweep" else [command, "x.toml", "--force", "--force"])
    except SystemExit:
        return False
    return args.force == 2


# --- defect 15: permissions follow the umask ------------------------------------------------------------

@pytest.mark.parametrize("umask", [0o022, 0o002])
def test_defect15_results_have_the_usual_permissions(tmp_path, umask):
    old = os.umask(umask)
    try:
        target = tmp_path / "new"
        with prepare_output(str(target), command="solve") as out:
            out.write_json("result.json", {"kt": 2.5})
            out.write_text("report.txt", "Kt 2.5\n")
            out.write_with("stress.png", lambda p: open(p, "wb").write(b"\x89PNG"))
        write_text(str(tmp_path / "sweep.csv"), "a,b\n")  # how sweep files are written
        write_json(str(tmp_path / "sweep.json"), {})
    finally:
        os.umask(old)
    assert stat.S_IMODE(os.stat(target).st_mode) == 0o777 & ~umask
    for name in RESULT_FILES + [MARKER]:
        assert stat.S_IMODE(os.stat(target / name).st_mode) == 0o666 & ~umask, name
    for name in ("sweep.csv", "sweep.json"):
        assert stat.S_IMODE(os.stat(tmp_path / name).st_mode) == 0o666 & ~umask
    assert not _leftovers(tmp_path, target)


@pytest.mark.parametrize("umask", [0o022, 0o002])
def test_defect15_cli_solve_out_new_folder(tmp_path, umask, capsys):
    # the report's out/new_folder: folder 0o700 and result.json 0o600 whatever the umask
    case = _report_case(tmp_path, "out/good.toml")
    old = os.umask(umask)
    try:
        assert main(["solve", case, "--no-estimate", "--out", str(tmp_path / "new")]) == 0
    finally:
        os.umask(old)
    assert stat.S_IMODE(os.stat(tmp_path / "new").st_mode) == 0o777 & ~umask
    assert stat.S_IMODE(os.stat(tmp_path / "new" / "result.json").st_mode) == 0o666 & ~umask
    assert _visible(tmp_path / "new") == RESULT_FILES


@pytest.mark.parametrize("umask", [0o022, 0o002])
def test_defect15_sweep_folder_files(tmp_path, umask):
    old = os.umask(umask)
    try:
        with prepare_sweep_folder(str(tmp_path / "sw"), notify=lambda m: None) as folder:
            store = folder.open_store(case_sha256="0" * 64, settings={}, schema=SWEEP_POINT_SCHEMA)
            store.append(_point(0))
            folder.write_text("sweep.csv", "index\n0\n")
    finally:
        os.umask(old)
    assert stat.S_IMODE(os.stat(tmp_path / "sw").st_mode) == 0o777 & ~umask
    for name in ("points.jsonl", "sweep.csv", MARKER, ".fekt.lock"):
        assert stat.S_IMODE(os.stat(tmp_path / "sw" / name).st_mode) == 0o666 & ~umask, name


# --- defect 5: --force never deletes what fekt did not write -------------------------------------------------

def test_defect5_force_keeps_the_case_file_and_notes(tmp_path, capsys, no_compute):
    # report: mkdir w; cp good.toml w/part.toml; echo notes > w/notes.txt; fekt solve w/part.toml --out w --force
    w = tmp_path / "w"
    w.mkdir()
    _report_case(w, "out/good.toml", "part.toml")
    (w / "notes.txt").write_text("notes\n")
    before = {n: (w / n).read_bytes() for n in os.listdir(w)}
    assert main(["solve", str(w / "part.toml"), "--out", str(w), "--force", "--no-estimate"]) == 2
    err = capsys.readouterr().err
    assert f"'{w}'" in err and "did not write" in err and "--force twice" in err
    assert {n: (w / n).read_bytes() for n in os.listdir(w)} == before
    assert not _leftovers(tmp_path, w)


def test_defect5_forced_twice_adds_results_and_keeps_every_file(tmp_path):
    w = tmp_path / "w"
    w.mkdir()
    _report_case(w, "out/good.toml", "part.toml")
    (w / "notes.txt").write_text("notes\n")
    (w / "report.txt").write_text("my own report\n")  # in the way of a result
    said = []
    with prepare_output(str(w), force=2, command="solve", files=RESULT_FILES, notify=said.append) as out:
        out.write_text("report.txt", "Kt 2.5\n")
        out.write_json("result.json", {"kt": 2.5})
    assert (w / "part.toml").exists() and (w / "notes.txt").read_text() == "notes\n"
    assert (w / "report.txt.old").read_text() == "my own report\n"
    assert (w / "report.txt").read_text() == "Kt 2.5\n"
    assert any("report.txt.old" in s for s in said) and any("kept" in s and "part.toml" in s for s in said)
    assert not _leftovers(tmp_path, w)


def test_defect5_force_onto_a_plain_file(tmp_path, capsys, no_compute):
    # report out/is_file_force: the file was replaced by a results folder and survived only as .fekt-old-*
    case = _report_case(tmp_path, "out/good.toml")
    f = tmp_path / "afile2.txt"
    f.write_text("precious\n")
    assert main(["solve", case, "--no-estimate", "--out", str(f), "--force"]) == 2
    err = capsys.readouterr().err
    assert "is a file, not a folder" in err and "--force twice" in err
    assert f.read_text() == "precious\n"
    assert not _leftovers(tmp_path)
    # told twice: the file is renamed, never lost
    said = []
    with prepare_output(str(f), force=2, notify=said.append) as out:
        out.write_text("report.txt", "x\n")
    assert f.is_dir() and (tmp_path / "afile2.txt.old").read_text() == "precious\n"
    assert len(said) == 1 and said[0].startswith(f"moved the file '{f}' aside to '") and "afile2.txt.old" in said[0]


def test_defect5_force_onto_a_symlinked_folder(tmp_path, capsys):
    # report out/symlink_to_dir: the link was moved aside and the results missed the folder it names
    case = _report_case(tmp_path, "out/good.toml")
    (tmp_path / "real").mkdir()
    os.symlink("real", tmp_path / "lnk")
    assert main(["solve", case, "--no-estimate", "--out", str(tmp_path / "lnk")]) == 0
    assert main(["solve", case, "--no-estimate", "--out", str(tmp_path / "lnk"), "--force"]) == 0
    assert os.path.islink(tmp_path / "lnk")
    assert _visible(tmp_path / "real") == RESULT_FILES
    assert not _leftovers(tmp_path, tmp_path / "real")


def test_defect5_force_replaces_only_unchanged_files_fekt_wrote(tmp_path):
    d = tmp_path / "res"
    with prepare_output(str(d), command="converge") as out:
        out.write_text("study.csv", "old\n")
        out.write_text("report.txt", "old report\n")
    (d / "notes.txt").write_text("added by the user\n")
    with pytest.raises(UsageError, match="already exists and holds results of `fekt converge`"):
        with prepare_output(str(d), force=0):
            pass
    said = []
    with prepare_output(str(d), force=1, command="solve", files=["report.txt"], notify=said.append) as out:
        out.write_text("report.txt", "new report\n")
    assert (d / "report.txt").read_text() == "new report\n"
    assert not (d / "study.csv").exists()  # fekt's own old file, unchanged: replaced by the new results
    assert (d / "notes.txt").read_text() == "added by the user\n"
    assert said[0] == f"replaced the results of `fekt converge` in '{d}'"
    # a result file the user edited is no longer fekt's: --force once refuses to overwrite it
    (d / "report.txt").write_text("edited by hand\n")
    with pytest.raises(UsageError, match="'report.txt', which fekt did not write"):
        with prepare_output(str(d), force=1, files=["report.txt"]):
            raise AssertionError("refused before the work")
    assert (d / "report.txt").read_text() == "edited by hand\n"
    assert not _leftovers(tmp_path, d)


def test_defect5_cli_forced_twice(tmp_path, capsys):
    if not _forced_twice_supported("solve"):
        pytest.skip("fekt solve does not count --force yet (add_force_argument)")
    w = tmp_path / "w"
    w.mkdir()
    case = _report_case(w, "out/good.toml", "part.toml")
    (w / "notes.txt").write_text("notes\n")
    assert main(["solve", case, "--out", str(w), "--force", "--force", "--no-estimate"]) == 0
    assert _visible(w) == sorted(["notes.txt", "part.toml"] + RESULT_FILES)


# --- defect 10: every problem with the path is found before the work, exit 2 --------------------------------

def test_defect10_dotdot_through_a_missing_folder(tmp_path, monkeypatch, capsys):
    # report: --out scratch/out/x/../dd ended in FileNotFoundError after the solve
    monkeypatch.chdir(tmp_path)
    case = _report_case(tmp_path, "out/good.toml")
    os.makedirs("scratch/out")
    assert main(["solve", case, "--no-estimate", "--out", "scratch/out/x/../dd"]) == 0
    assert _visible(tmp_path / "scratch" / "out" / "dd") == RESULT_FILES
    assert not os.path.exists("scratch/out/x")
    assert not _leftovers("scratch/out")


@pytest.mark.parametrize("kind", ["under_file", "long_name", "proc", "dev_null", "plain_file", "dangling_link"])
def test_defect10_bad_paths_are_refused_before_the_work(tmp_path, monkeypatch, capsys, no_compute, kind):
    monkeypatch.chdir(tmp_path)
    case = _report_case(tmp_path, "out/good.toml")
    os.makedirs("scratch/out")
    open("scratch/out/plainfile", "w").write("precious\n")
    os.symlink("nowhere", "scratch/out/dangling")
    out, says = {
        "under_file": ("scratch/out/plainfile/sub", "'scratch/out/plainfile' is a file, not a folder"),
        "long_name": ("scratch/out/" + "n" * 300, "has 300 bytes, more than the 255"),
        "proc": ("/proc/fekt-out-test", "cannot be written"),
        "dev_null": ("/dev/null", "is a character device, not a folder"),
        "plain_file": ("scratch/out/plainfile", "is a file, not a folder"),
        "dangling_link": ("scratch/out/dangling", "is a symbolic link to"),
    }[kind]
    assert main(["solve", case, "--no-estimate", "--out", out]) == 2
    err = capsys.readouterr().err
    assert err.startswith("fekt: error: the output folder '" + out[:60]), err
    assert says in err and "internal error" not in err
    assert open("scratch/out/plainfile").read() == "precious\n"
    assert sorted(os.listdir("scratch/out")) == ["dangling", "plainfile"]


def test_defect10_converge_checks_the_folder_before_the_study(tmp_path, capsys, no_compute):
    # report: `fekt converge ... --out` into an unwritable place failed only after the whole study
    case = _report_case(tmp_path, "out/good.toml")
    (tmp_path / "plainfile").write_text("x")
    assert main(["converge", case, "--levels", "2", "--out", str(tmp_path / "plainfile" / "conv")]) == 2
    assert "is a file, not a folder" in capsys.readouterr().err


def test_defect10_refusal_of_a_plain_file_says_so(tmp_path, capsys, no_compute):
    # report: `--out afile.txt` was refused with "already exists and is not empty"
    case = _report_case(tmp_path, "out/good.toml")
    (tmp_path / "afile.txt").write_text("precious\n")
    assert main(["solve", case, "--no-estimate", "--out", str(tmp_path / "afile.txt")]) == 2
    err = capsys.readouterr().err
    assert "is a file, not a folder" in err and "not empty" not in err


def _as_other_user() -> list[str] | None:
    """How to run a command for which permission bits apply: as is for an ordinary user, through
    setpriv as uid 65534 for root (root ignores them); None when neither is possible."""
    if os.geteuid() != 0:
        return []
    return ["setpriv", "--reuid=65534", "--regid=65534", "--clear-groups", "--"] if shutil.which("setpriv") else None


@pytest.mark.parametrize("command", ["solve", "converge", "sweep"])
def test_defect10_read_only_parent(tmp_path, command):
    # report: --out inside a read-only folder (run as uid 65534) was a PermissionError after the work;
    # for sweep, the default folder <case>-sweep could not be created
    import tempfile

    prefix = _as_other_user()
    if prefix is None:
        pytest.skip("running as root without setpriv: permission bits cannot be tested")
    if command == "sweep" and not _forced_twice_supported("sweep"):
        pytest.skip("fekt sweep does not use prepare_sweep_folder yet")
    base = tempfile.mkdtemp(prefix="fekt-ro-test-")  # reachable by uid 65534, unlike pytest's folder
    ro = os.path.join(base, "ro")
    try:
        os.chmod(base, 0o755)
        os.mkdir(ro)
        case = os.path.join(ro, "good.toml")
        shutil.copy(_report_case(tmp_path, "out/good.toml"), case)
        os.chmod(case, 0o644)
        os.chmod(ro, 0o555)
        argv = {"solve": ["solve", case, "--no-estimate", "--out", os.path.join(ro, "new")],
                "converge": ["converge", case, "--levels", "2", "--out", os.path.join(ro, "conv")],
                "sweep": ["sweep", case, "--vary", "d=10,12", "--no-estimate", "--executor", "serial"]}[command]
        code = "import sys; from fekt.cli.main import main; sys.exit(main(sys.argv[1:]))"
        env = dict(os.environ, PYTHONPATH=ROOT + os.pathsep + os.environ.get("PYTHONPATH", ""),
                   MPLCONFIGDIR=os.path.join(base, "mpl"), HOME=base)
        r = subprocess.run(prefix + [sys.executable, "-P", "-c", code, *argv], capture_output=True, text=True,
                           env=env, cwd=base, timeout=120)
        assert r.returncode == 2, r.stderr
        assert "no permission to create files in" in r.stderr and "Traceback" not in r.stderr
        assert sorted(os.listdir(ro)) == ["good.toml"]
    finally:
        if os.path.isdir(ro):
            os.chmod(ro, 0o755)
        shutil.rmtree(base)


def test_defect10_sweep_out_is_a_plain_file(tmp_path):
    # report: `fekt sweep ... --out scratch/out/sweepfile` was NotADirectoryError, with or without --force
    f = tmp_path / "sweepfile"
    f.write_text("precious\n")
    for force in (0, 1):
        with pytest.raises(UsageError, match="is a file, not a folder"):
            with prepare_sweep_folder(str(f), force=force):
                raise AssertionError("refused before the work")
    assert f.read_text() == "precious\n"
    assert not _leftovers(tmp_path)


# --- the staging folder: checked first, moved into place in one step, removed on every exception ------------

@pytest.mark.parametrize("exc", [RuntimeError("boom"), KeyboardInterrupt(), SystemExit(3)],
                         ids=["error", "ctrl-c", "exit"])
def test_nothing_temporary_survives_an_exception(tmp_path, exc):
    target = tmp_path / "a" / "b" / "res"
    with pytest.raises(type(exc)):
        with prepare_output(str(target)) as out:
            out.write_text("report.txt", "half")
            assert _leftovers(tmp_path / "a" / "b")  # the staging folder exists while the work runs
            raise exc
    assert not (tmp_path / "a").exists()  # the parents fekt created are gone again
    # an existing folder of fekt's keeps its old results
    with prepare_output(str(tmp_path / "kept")) as out:
        out.write_text("report.txt", "old\n")
    with pytest.raises(type(exc)):
        with prepare_output(str(tmp_path / "kept"), force=1) as out:
            out.write_text("report.txt", "new\n")
            raise exc
    assert (tmp_path / "kept" / "report.txt").read_text() == "old\n"
    assert not _leftovers(tmp_path, tmp_path / "kept")


def test_new_folder_appears_whole(tmp_path):
    target = tmp_path / "res"
    with prepare_output(str(target), command="solve") as out:
        out.write_text("report.txt", "x\n")
        assert not target.exists()
    assert _visible(target) == ["report.txt"]
    marker = json.loads((target / MARKER).read_text())
    assert marker["command"] == "solve" and marker["state"] == "complete" and set(marker["files"]) == {"report.txt"}


def test_force_once_replaces_fekts_own_results(tmp_path, capsys):
    target = str(tmp_path / "res")
    with prepare_output(target, 0, command="solve") as out:
        out.write_text("report.txt", "1\n")
    with pytest.raises(UsageError, match="already exists"):
        with prepare_output(target, 0, command="solve"):
            raise AssertionError("refused on entering")
    with prepare_output(target, 1, command="solve") as out:
        out.write_text("report.txt", "2\n")
    assert (tmp_path / "res" / "report.txt").read_text() == "2\n"
    assert "replaced the results of `fekt solve`" in capsys.readouterr().err


def test_paths_with_control_characters_are_shown_escaped(tmp_path):
    bad = str(tmp_path / "x\x1b]0;owned\x07") + "/" + "n" * 300
    with pytest.raises(UsageError) as ei:
        plan_output(bad)
    assert "\x1b" not in str(ei.value) and "\\x1b]0;owned\\x07" in str(ei.value)


def test_plan_is_read_only(tmp_path):
    before = sorted(os.listdir(tmp_path))
    plan = plan_output(str(tmp_path / "new" / "deeper"))
    assert plan.state == "new" and sorted(os.listdir(tmp_path)) == before


# --- defect 14 (folder side): --force over a finished sweep leaves nothing stale ----------------------------

def _point(i: int, d: float = 8.0) -> dict:
    from fekt.studies.sweep import PointResult

    return PointResult(index=i, values={"d": d + i}, status="ok", feature="cut-out 'hole'", kt_net=2.5,
                       kt_gross=3.1, peak=15.0, seconds=0.1).to_json()


def test_defect14_force_then_interrupt_leaves_no_stale_summary(tmp_path):
    # report sweep/force_then_interrupt: sweep.json, report.txt, sweep.png of the old sweep stayed beside
    # the new sweep's points after `--force` and Ctrl-C
    d = str(tmp_path / "s")
    with prepare_sweep_folder(d, notify=lambda m: None) as folder:
        store = folder.open_store(case_sha256="a" * 64, settings={"varied": ["d"]}, schema=SWEEP_POINT_SCHEMA)
        for i in range(5):
            store.append(_point(i))
        for name in ("sweep.csv", "sweep.json", "report.txt", "sweep.png"):
            folder.write_text(name, "old sweep\n")
    (tmp_path / "s" / "notes.txt").write_text("mine\n")
    with pytest.raises(UsageError, match="--resume to finish or extend that sweep, --force to start over"):
        with prepare_sweep_folder(d):
            pass
    with pytest.raises(KeyboardInterrupt):
        with prepare_sweep_folder(d, force=1, notify=lambda m: None) as folder:
            store = folder.open_store(case_sha256="a" * 64, settings={"varied": ["d"]}, schema=SWEEP_POINT_SCHEMA)
            store.append(_point(0, 9.0))
            raise KeyboardInterrupt
    assert _visible(tmp_path / "s") == ["notes.txt", "points.jsonl"]
    lines = (tmp_path / "s" / "points.jsonl").read_text().splitlines()
    assert len(lines) == 2 and json.loads(lines[1])["values"] == {"d": 9.0}
    assert json.loads((tmp_path / "s" / MARKER).read_text())["state"] == "incomplete"
    assert not _leftovers(tmp_path, tmp_path / "s")


def test_defect14_interrupted_first_sweep_leaves_no_folder(tmp_path):
    d = tmp_path / "new" / "s"
    with pytest.raises(KeyboardInterrupt):
        with prepare_sweep_folder(str(d)) as folder:
            folder.open_store(case_sha256="a" * 64, settings={}, schema=SWEEP_POINT_SCHEMA)
            raise KeyboardInterrupt  # before the first point finished: nothing worth keeping
    assert not (tmp_path / "new").exists()


def test_resume_and_force_exclude_each_other(tmp_path):
    with pytest.raises(UsageError, match="exclude each other"):
        with prepare_sweep_folder(str(tmp_path / "s"), force=1, resume=True):
            pass


def test_add_force_argument_counts():
    import argparse

    p = argparse.ArgumentParser()
    output.add_force_argument(p)
    assert p.parse_args([]).force == 0 and p.parse_args(["--force", "--force"]).force == 2
