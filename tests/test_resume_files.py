"""Resume files of sweeps (reliability report, defects 1, 4, 8 and 14).

The damaged ``points.jsonl`` files are the report's own (cases/sweep/points_*.jsonl), copied into each
test's folder. They have no header (the format before this one); the tests use them twice: as they
are (refused: fekt cannot tell which case they belong to) and behind a header of the report's case, to
check how every damaged line is handled.
"""

from __future__ import annotations

import json
import os
import stat
import subprocess
import sys
import textwrap

import pytest

from fekt.cli.main import main
from fekt.cli.output import prepare_sweep_folder
from fekt.report.resume import (SCHEMA_VERSION, SWEEP_POINT_SCHEMA, Float, FolderBusy, FolderLock, Int, MapOf, OneOf,
                                Optional, RecordSchema, ResumeFileError, ResumeMismatch, ResumeStore, file_sha256)

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))

#: the report's reference sweep of cases/sweep/case.toml, --vary d=8:16:5 --no-estimate (its first line)
FIRST = {"index": 0, "values": {"d": 8.0}, "status": "ok", "message": "", "feature": "cut-out 'hole'",
         "kt_net": 2.527159138362407, "kt_net_band": None, "kt_gross": 3.1589489229530088, "kt_gross_band": None,
         "chart_kt": None, "chart_basis": "", "peak": 15.794744614765044, "seconds": 0.27984159299921885,
         "peaks": [{"rank": 1, "feature": "cut-out 'hole'", "kind": "cut-out", "peak": 15.794744614765044,
                    "kt_net": 2.527159138362407, "kt_net_band": None, "kt_gross": 3.1589489229530088,
                    "kt_gross_band": None, "singular": False},
                   {"rank": 2, "feature": "cut-out 'hole'", "kind": "cut-out", "peak": -5.1,
                    "kt_net": -0.816, "kt_net_band": None, "kt_gross": -1.02, "kt_gross_band": None,
                    "singular": False}],
         "parameters": {"d": 8.0, "W": 40.0}}
SETTINGS = {"varied": ["d"], "estimate": False, "basis": "net"}


def _point(i: int) -> dict:
    return dict(FIRST, index=i, values={"d": 8.0 + 2 * i}, kt_net=2.5 - 0.05 * i)


def test_sweep_records_as_written_follow_the_schema():
    # the schema must accept every record fekt itself writes: signed Kt (a compressive peak under a
    # tensile nominal stress is negative), no gross Kt for a plain shoulder, a point without peaks
    from fekt.studies.sweep import PeakSummary, PointResult

    peaks = (PeakSummary(1, "fillet at vertex 3", "fillet", 210.0, 2.1, 0.01, None, None, False),
             PeakSummary(2, "cut-out 'hole'", "cut-out", -80.0, -0.8, None, -1.1, None, False))
    ok = PointResult(index=3, values={"r": 2.0}, status="ok", feature="fillet at vertex 3", kt_net=2.1,
                     kt_net_band=0.01, peak=210.0, seconds=1.5, peaks=peaks, parameters={"r": 2.0, "W": 40.0})
    bad = PointResult(index=4, values={"r": -1.0}, status="invalid", message="r must be positive")
    for r in (ok, bad):
        assert SWEEP_POINT_SCHEMA.problems(json.loads(json.dumps(r.to_json()))) == []
        assert PointResult.from_json(r.to_json()) == r
    assert SWEEP_POINT_SCHEMA.problems(dict(ok.to_json(), kt_net_band=-0.1))  # a band is never negative


def _reference_jsonl() -> bytes:
    return b"".join(json.dumps(_point(i)).encode() + b"\n" for i in range(5))


def _report_points(name: str) -> bytes:
    """The damaged files of the reliability run (their damage rebuilt here from a reference sweep, so
    that the test needs no file outside the project)."""
    ref = _reference_jsonl()
    lines = ref.split(b"\n")

    def rec(**kw):
        d = dict(FIRST)
        d.update(kw)
        return json.dumps(d).encode()

    return {
        "truncate_midline": ref[: len(lines[0]) + len(lines[1]) // 2 + 1],
        "garbage_text": b"hello world\nnot json at all\n" + ref,
        "garbage_binary": bytes(range(256)) * 4 + b"\n" + ref,
        "latin1_byte": ref.replace(b'"ok"', b'"\xe9"', 1),
        "json_number_line": b"42\n" + ref, "json_list_line": b"[1, 2]\n" + ref,
        "json_null_line": b"null\n" + ref, "json_string_line": b'"x"\n' + ref,
        "missing_status": rec(status=None).replace(b', "status": null', b"") + b"\n",
        "extra_key": rec(evil=1) + b"\n", "index_str": rec(index="0") + b"\n",
        "index_negative": rec(index=-1) + b"\n", "index_huge": rec(index=10 ** 30) + b"\n",
        "index_bool": rec(index=True) + b"\n", "values_not_dict": rec(values=[1]) + b"\n",
        "values_nan": rec(values={"d": float("nan")}) + b"\n", "kt_string": rec(kt_net="high") + b"\n",
        "kt_null_ok": rec(kt_net=None) + b"\n", "status_weird": rec(status="maybe") + b"\n",
        "duplicate_lines": ref + ref, "crlf": ref.replace(b"\n", b"\r\n"),
        "nul_bytes": b"\x00" * 1000 + b"\n" + ref, "bom": b"\xef\xbb\xbf" + ref, "empty_file": b"",
    }[name]


def _case(tmp_path, name="case.toml") -> str:
    dst = tmp_path / name
    text = open(os.path.join(ROOT, "cases", "strip_hole.toml"), encoding="utf-8").read()
    if name == "other_case.toml":
        text = text.replace('L = "8*W"', 'L = "16*W"')
    dst.write_text(text + "\n[mesh]\nelements_per_radius = 4\n", encoding="utf-8")
    return str(dst)


def _header(case_sha256: str, settings=SETTINGS) -> bytes:
    store = ResumeStore(".", case_sha256=case_sha256, settings=settings, schema=SWEEP_POINT_SCHEMA)
    return json.dumps(store.header()).encode() + b"\n"


def _store(folder, sha="c" * 64, settings=SETTINGS) -> ResumeStore:
    return ResumeStore(str(folder), case_sha256=sha, settings=settings, schema=SWEEP_POINT_SCHEMA)


def _sweep_cli_wired() -> bool:
    from fekt.cli.main import build_parser

    try:
        return build_parser().parse_args(["sweep", "x.toml", "--vary", "d=1", "--force", "--force"]).force == 2
    except SystemExit:
        return False


needs_wired_sweep = pytest.mark.skipif(not _sweep_cli_wired(),
                                       reason="fekt sweep does not use prepare_sweep_folder/ResumeStore yet")


# --- defect 1: the resume file is never followed through a symlink ------------------------------------------

def test_defect1_symlinked_points_file_is_refused(tmp_path):
    # report: ln -s ../victim.txt s/points.jsonl; fekt sweep ... --out s --resume appended to victim.txt
    s = tmp_path / "s"
    s.mkdir()
    victim = tmp_path / "victim.txt"
    victim.write_text("keep\n")
    os.symlink("../victim.txt", s / "points.jsonl")
    for resume in (True, False):
        with pytest.raises(ResumeFileError, match="is a symbolic link; fekt does not follow links"):
            _store(s).open(resume=resume)
    assert victim.read_text() == "keep\n" and os.path.islink(s / "points.jsonl")


def test_defect1_symlink_in_a_folder_fekt_wrote(tmp_path):
    # the attack of the report against a real sweep folder: its points.jsonl swapped for a link
    d = tmp_path / "s"
    with prepare_sweep_folder(str(d), notify=lambda m: None) as folder:
        folder.open_store(case_sha256="c" * 64, settings=SETTINGS, schema=SWEEP_POINT_SCHEMA).append(_point(0))
    victim = tmp_path / "victim.txt"
    victim.write_text("keep\n")
    os.remove(d / "points.jsonl")
    os.symlink("../victim.txt", d / "points.jsonl")
    with pytest.raises(ResumeFileError, match="symbolic link"):
        with prepare_sweep_folder(str(d), resume=True) as folder:
            folder.open_store(case_sha256="c" * 64, settings=SETTINGS, schema=SWEEP_POINT_SCHEMA)
    with pytest.raises(Exception, match="which fekt did not write"):  # --force once does not touch it either
        with prepare_sweep_folder(str(d), force=1) as folder:
            folder.open_store(case_sha256="c" * 64, settings=SETTINGS, schema=SWEEP_POINT_SCHEMA)
    assert victim.read_text() == "keep\n" and os.path.islink(d / "points.jsonl")


@needs_wired_sweep
def test_defect1_cli(tmp_path, capsys):
    case = _case(tmp_path)
    s = tmp_path / "s"
    s.mkdir()
    (tmp_path / "victim.txt").write_text("keep\n")
    os.symlink("../victim.txt", s / "points.jsonl")
    args = ["sweep", case, "--vary", "d=8:16:5", "--out", str(s), "--resume", "--no-estimate", "--executor", "serial"]
    assert main(args) == 2
    assert "Traceback" not in capsys.readouterr().err
    assert (tmp_path / "victim.txt").read_text() == "keep\n"


def test_points_file_that_is_a_folder_or_a_pipe(tmp_path):
    # report defect 8: points.jsonl a directory gave IsADirectoryError (exit 1)
    (tmp_path / "a" / "points.jsonl").mkdir(parents=True)
    with pytest.raises(ResumeFileError, match="is a folder"):
        _store(tmp_path / "a").open(resume=True)
    (tmp_path / "b").mkdir()
    os.mkfifo(tmp_path / "b" / "points.jsonl")
    with pytest.raises(ResumeFileError, match="not a regular file"):  # and never blocks on the pipe
        _store(tmp_path / "b").open(resume=True)


# --- defect 4: points of another case or other settings are never reused -------------------------------------

def test_defect4_other_case_file_is_detected(tmp_path):
    # report: sweep case.toml, then resume with other_case.toml: "(5 points reused)" of the wrong part
    case, other = _case(tmp_path), _case(tmp_path, "other_case.toml")
    with _store(tmp_path, file_sha256(case)).open(resume=False) as st:
        for i in range(5):
            st.append(_point(i))
    before = (tmp_path / "points.jsonl").read_bytes()
    with pytest.raises(ResumeMismatch) as ei:
        _store(tmp_path, file_sha256(other)).open(resume=True)
    msg = str(ei.value)
    assert "written for another case file" in msg and "--force" in msg
    assert file_sha256(case)[:12] in msg and file_sha256(other)[:12] in msg
    assert (tmp_path / "points.jsonl").read_bytes() == before


def test_defect4_other_settings_are_detected(tmp_path):
    # report sweep/resume_changed_estimate: resuming a --no-estimate sweep without it reused every point
    with _store(tmp_path).open(resume=False) as st:
        st.append(_point(0))
    with pytest.raises(ResumeMismatch, match="written with estimate = false, this run has estimate = true"):
        _store(tmp_path, settings=dict(SETTINGS, estimate=True)).open(resume=True)
    with pytest.raises(ResumeMismatch, match="varied"):
        _store(tmp_path, settings=dict(SETTINGS, varied=["d", "W"])).open(resume=True)
    with _store(tmp_path).open(resume=True) as st:  # the same settings resume
        assert [r["index"] for r in st.records] == [0]


@needs_wired_sweep
def test_defect4_cli(tmp_path, capsys):
    case, other = _case(tmp_path), _case(tmp_path, "other_case.toml")
    common = ["--vary", "d=8:16:2", "--out", str(tmp_path / "r"), "--no-estimate", "--executor", "serial"]
    assert main(["sweep", case, *common]) == 0
    assert main(["sweep", other, *common, "--resume"]) == 2
    err = capsys.readouterr().err
    assert "another case file" in err and "points reused" not in err


def test_headerless_file_is_refused_not_mixed(tmp_path):
    # every damaged file of the report has no header (the format before this one)
    (tmp_path / "points.jsonl").write_bytes(_report_points("truncate_midline"))
    with pytest.raises(ResumeMismatch, match="has no header on line 1"):
        _store(tmp_path).open(resume=True)


def test_newer_format_is_refused(tmp_path):
    header = json.loads(_header("c" * 64))
    header["fekt_resume"] = SCHEMA_VERSION + 1
    (tmp_path / "points.jsonl").write_text(json.dumps(header) + "\n")
    with pytest.raises(ResumeFileError, match="written by a newer fekt"):
        _store(tmp_path).open(resume=True)


# --- defect 8: damaged lines are reported, skipped and kept aside; the rest resumes --------------------------

#: report input -> (records kept, lines skipped, what some of them are reported as); line numbers count
#: the header
DAMAGE = {
    "garbage_text": (5, 2, {2: "is not valid JSON", 3: "is not valid JSON"}),
    "garbage_binary": (5, 5, {2: "is not valid JSON", 3: "is not UTF-8 text", 6: "is not UTF-8 text"}),
    "latin1_byte": (4, 1, {2: "is not UTF-8 text"}),
    "json_number_line": (5, 1, {2: "is a number, not an object"}),
    "json_list_line": (5, 1, {2: "is a list, not an object"}),
    "json_null_line": (5, 1, {2: "is null, not an object"}),
    "json_string_line": (5, 1, {2: "is text, not an object"}),
    "missing_status": (0, 1, {2: "has no key 'status'"}),
    "extra_key": (0, 1, {2: "has an unexpected key 'evil'"}),
    "index_str": (0, 1, {2: "key 'index' is \"0\", expected a whole number"}),
    "index_negative": (0, 1, {2: "key 'index' is -1, expected at least 0"}),
    "index_huge": (0, 1, {2: "expected at most"}),
    "index_bool": (0, 1, {2: "key 'index' is true, expected a whole number"}),
    "values_not_dict": (0, 1, {2: "key 'values' is [1], expected an object"}),
    "values_nan": (0, 1, {2: "NaN is not a number fekt writes"}),
    "kt_string": (0, 1, {2: "key 'kt_net' is \"high\", expected a number"}),
    "kt_null_ok": (0, 1, {2: "has status ok but no Kt"}),
    "status_weird": (0, 1, {2: "key 'status' is \"maybe\", expected one of ok, invalid, failed"}),
    "nul_bytes": (5, 1, {2: "is not valid JSON"}),
    "truncate_midline": (1, 1, {3: "is cut short (no end of line)"}),
    "duplicate_lines": (5, 0, {7: "repeats line 2 exactly (kept once)", 11: "repeats line 6 exactly"}),
    "crlf": (5, 0, {}),
    "bom": (5, 0, {}),
    "empty_file": (0, 0, {}),
}


@pytest.mark.parametrize("name", sorted(DAMAGE))
def test_defect8_damaged_lines(tmp_path, name):
    # report: 11 kinds of damage ended in exit 1 (UnicodeDecodeError, AttributeError, TypeError, ...)
    # every time, and a "maybe" status was reused; now each line is judged on its own
    kept, n_bad, reported = DAMAGE[name]
    blob = _report_points(name)
    bom = b"\xef\xbb\xbf" if blob.startswith(b"\xef\xbb\xbf") else b""  # a BOM opens the file, before the header
    (tmp_path / "points.jsonl").write_bytes(bom + _header("c" * 64) + blob[len(bom):])
    with _store(tmp_path).open(resume=True) as st:
        assert len(st.records) == kept
        assert all(not SWEEP_POINT_SCHEMA.problems(r) for r in st.records)
        got = {p.line: p.reason for p in st.problems}
        for line, says in reported.items():
            assert says in got.get(line, ""), (line, got)
        bad = sorted(n for n, why in got.items() if "kept once" not in why)
        assert len(bad) == n_bad, got
        if bad:
            assert "will be computed again" in st.notes[0]
            assert all(f"line {n} " in st.notes[0] for n in bad[:8])
            assert (tmp_path / "points.rejected").read_bytes().count(b"\n") >= n_bad
        st.append(_point(9))  # appending after a repair is safe
    # the repaired file is clean: header, the kept records, the new one; nothing reported the next time
    with _store(tmp_path).open(resume=True) as st:
        assert not st.problems and len(st.records) == kept + 1


def test_defect8_truncated_line_does_not_eat_the_next_point(tmp_path):
    # report: "A line cut short by a crash eats the next point": resume twice, the second run reused 4 of 5
    (tmp_path / "points.jsonl").write_bytes(_header("c" * 64) + _report_points("truncate_midline"))
    with _store(tmp_path).open(resume=True) as st:
        assert [r["index"] for r in st.records] == [0]
        for i in (1, 2, 3, 4):  # the resumed run finishes the other points
            st.append(_point(i))
    with _store(tmp_path).open(resume=True) as st:
        assert [r["index"] for r in st.records] == [0, 1, 2, 3, 4] and not st.problems
    raw = (tmp_path / "points.jsonl").read_bytes()
    assert raw.endswith(b"\n") and all(json.loads(ln) for ln in raw.splitlines())


def test_defect8_conflicting_duplicates_are_all_dropped(tmp_path):
    a, b = _point(1), dict(_point(1), kt_net=9.9)
    (tmp_path / "points.jsonl").write_bytes(_header("c" * 64) + b"".join(json.dumps(r).encode() + b"\n"
                                                                          for r in (_point(0), a, b)))
    with _store(tmp_path).open(resume=True) as st:
        assert [r["index"] for r in st.records] == [0]
        assert {p.line for p in st.problems} == {3, 4}


def test_same_index_other_grid_is_not_a_conflict(tmp_path):
    # a sweep resumed over a finer grid appends points whose indices the old grid used for other values
    with _store(tmp_path).open(resume=False) as st:
        st.append(_point(1))
        st.append(dict(_point(1), values={"d": 9.0}))
    with _store(tmp_path).open(resume=True) as st:
        assert len(st.records) == 2 and not st.problems


def test_overlong_line_is_skipped_without_reading_it_whole(tmp_path):
    huge = json.dumps(dict(_point(1), message="m" * 3_000_000)).encode()
    (tmp_path / "points.jsonl").write_bytes(_header("c" * 64) + json.dumps(_point(0)).encode() + b"\n" + huge + b"\n")
    with _store(tmp_path).open(resume=True) as st:
        assert [r["index"] for r in st.records] == [0]
        assert "longer than" in st.problems[0].reason


@needs_wired_sweep
def test_defect8_cli_reports_and_resumes(tmp_path, capsys):
    # report reproducer: cp points_json_number_line.jsonl g/points.jsonl; fekt sweep ... --resume (exit 1)
    case = _case(tmp_path)
    g = tmp_path / "g"
    common = ["--vary", "d=8:16:2", "--out", str(g), "--no-estimate", "--executor", "serial"]
    assert main(["sweep", case, *common]) == 0
    lines = (g / "points.jsonl").read_bytes().split(b"\n")
    (g / "points.jsonl").write_bytes(lines[0] + b"\n42\n" + b"\n".join(lines[1:]))
    assert main(["sweep", case, *common, "--resume"]) == 0
    err = capsys.readouterr().err
    assert "line 2 is a number, not an object" in err and "(2 points reused)" in err


def test_records_are_checked_when_appended(tmp_path):
    with _store(tmp_path).open(resume=False) as st:
        with pytest.raises(ValueError, match="expected a finite number"):
            st.append(dict(_point(0), values={"d": float("nan")}))
        with pytest.raises(ValueError, match="unexpected key"):
            st.append(dict(_point(0), evil=1))
    assert (tmp_path / "points.jsonl").read_bytes().count(b"\n") == 1  # the header only


def test_validator_rules():
    schema = RecordSchema({"n": Int(min=0), "x": Float(), "s": OneOf("a", "b"), "m": MapOf(float),
                           "o": Optional(str)}, rules=[lambda r: "x must exceed n" if r["x"] <= r["n"] else None])
    good = {"n": 1, "x": 2.5, "s": "a", "m": {"d": 1}, "o": None}
    assert schema.problems(good) == []
    assert schema.problems(dict(good, n=True)) == ["key 'n' is true, expected a whole number"]
    assert schema.problems(dict(good, x=float("inf"))) == ["key 'x' is inf, expected a finite number"]
    assert schema.problems(dict(good, x=10 ** 400)) == ["key 'x' is " + str(10 ** 400)[:40] + "..., too large a number"]
    assert schema.problems(dict(good, s="c")) == ["key 's' is \"c\", expected one of a, b"]
    assert schema.problems(dict(good, m={"d": "1"})) == ["key 'm' entry 'd' is \"1\", expected a number"]
    assert schema.problems(dict(good, x=0.5)) == ["x must exceed n"]
    assert schema.problems([]) == ["is a list, not an object"]


# --- defect 14: two sweeps cannot write one folder -----------------------------------------------------------

def test_defect14_lock_refuses_a_second_writer(tmp_path):
    d = str(tmp_path / "c")
    with prepare_sweep_folder(d, notify=lambda m: None) as folder:
        store = folder.open_store(case_sha256="c" * 64, settings=SETTINGS, schema=SWEEP_POINT_SCHEMA)
        store.append(_point(0))
        for kw in ({}, {"resume": True}, {"force": 1}):
            with pytest.raises(FolderBusy) as ei:
                with prepare_sweep_folder(d, **kw):
                    raise AssertionError("a second sweep got in")
            assert f"another fekt sweep (process {os.getpid()}) is writing the folder '{d}'" in str(ei.value)
        with pytest.raises(FolderBusy):
            _store(d).open(resume=True)
        store.append(_point(1))
    lines = (tmp_path / "c" / "points.jsonl").read_text().splitlines()
    assert [json.loads(ln)["index"] for ln in lines[1:]] == [0, 1]


def test_defect14_lock_across_processes(tmp_path):
    # the report: two `fekt sweep --out c` started together interleaved their points; here a second
    # process holds the lock while this one tries
    code = textwrap.dedent(f"""
        import sys, time
        from fekt.report.resume import FolderLock
        with FolderLock({str(tmp_path)!r}):
            print("locked", flush=True)
            sys.stdin.readline()
    """)
    env = dict(os.environ, PYTHONPATH=ROOT + os.pathsep + os.environ.get("PYTHONPATH", ""))
    p = subprocess.Popen([sys.executable, "-P", "-c", code], stdin=subprocess.PIPE, stdout=subprocess.PIPE,
                         text=True, env=env)
    try:
        assert p.stdout.readline().strip() == "locked"
        with pytest.raises(FolderBusy, match=f"process {p.pid}"):
            FolderLock(str(tmp_path)).acquire()
    finally:
        p.stdin.write("\n")
        p.stdin.close()
        p.wait(timeout=10)
    FolderLock(str(tmp_path)).acquire().release()  # free again once the other process ended


@needs_wired_sweep
def test_defect14_cli_two_sweeps_started_together(tmp_path):
    case = _case(tmp_path)
    env = dict(os.environ, PYTHONPATH=ROOT + os.pathsep + os.environ.get("PYTHONPATH", ""))
    code = "import sys; from fekt.cli.main import main; sys.exit(main(sys.argv[1:]))"
    out = str(tmp_path / "c")
    common = ["--out", out, "--no-estimate", "--executor", "serial"]
    first = subprocess.Popen([sys.executable, "-P", "-c", code, "sweep", case, "--vary", "d=8:16:40", *common],
                             env=env, stderr=subprocess.PIPE, text=True)
    try:
        for _ in range(200):  # until the first one holds the folder
            if os.path.exists(os.path.join(out, "points.jsonl")):
                break
            import time

            time.sleep(0.05)
        second = subprocess.run([sys.executable, "-P", "-c", code, "sweep", case, "--vary", "d=9:15:4", *common,
                                 "--resume"], env=env, capture_output=True, text=True, timeout=60)
    finally:
        first.wait(timeout=120)
    assert first.returncode == 0, first.stderr.read()
    assert second.returncode == 2 and "another fekt sweep" in second.stderr and "is writing the folder" in second.stderr
    lines = open(os.path.join(out, "points.jsonl")).read().splitlines()
    assert sorted(json.loads(ln)["index"] for ln in lines[1:]) == list(range(40))


def test_resume_file_permissions_follow_umask(tmp_path):
    for umask in (0o022, 0o002):
        old = os.umask(umask)
        try:
            d = tmp_path / oct(umask)
            d.mkdir()
            with _store(d).open(resume=False) as st:
                st.append(_point(0))
        finally:
            os.umask(old)
        assert stat.S_IMODE(os.stat(d / "points.jsonl").st_mode) == 0o666 & ~umask
