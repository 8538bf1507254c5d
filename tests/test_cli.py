import json
import os
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

from groundkit.cli import main
from groundkit.studies import StudyFileError, load_scan
from groundkit.studies.toml_file import read_study
from tests.studies.helpers import pyscf_fci_curve

ROOT = Path(__file__).resolve().parents[1]

SCAN_STUDY = """\
title = "H2 stretch"

[molecule]
symbols = ["H", "H"]
coordinates = [[0, 0, 0], [0, 0, 0.74]]
basis = "sto-3g"

[components]
trial_state = "uccsd"
minimiser = { name = "bfgs", tolerance = 1e-6 }

[scan]
bond = [0, 1]
start = 0.6
stop = 0.9
points = 4

[output]
directory = "out"
"""


def _write(tmp_path: Path, text: str, name: str = "study.toml") -> Path:
    path = tmp_path / name
    path.write_text(text)
    return path


def test_a_scan_study_writes_results_and_a_summary(tmp_path, capsys):
    path = _write(tmp_path, SCAN_STUDY)
    assert main(["run", str(path), "--quiet"]) == 0
    out = tmp_path / "out"
    scan = load_scan(out / "scan.json")
    assert [round(p.value, 10) for p in scan.points] == [0.6, 0.7, 0.8, 0.9]
    exact = pyscf_fci_curve(np.array([0.6, 0.7, 0.8, 0.9]))  # PySCF FCI on the test's own molecules (reference library)
    assert [p.result.energy for p in scan.points] == pytest.approx(exact, abs=1e-8)  # UCCSD exact for 2 electrons
    assert all(abs(p.result.error) < 1e-8 for p in scan.points)  # internal consistency: the reported errors
    assert scan.points[2].molecule.distance(0, 1) == pytest.approx(0.8)
    assert (out / "summary.csv").read_text().startswith("value,energy,reference,error_mha")
    assert "H2 stretch" in (out / "summary.txt").read_text()
    assert len(list((out / "checkpoint").glob("point-*.json"))) == 4


def test_resume_uses_the_checkpoint_and_a_rerun_without_it_is_refused(tmp_path, capsys):
    path = _write(tmp_path, SCAN_STUDY)
    assert main(["run", str(path), "--quiet"]) == 0
    (tmp_path / "out" / "checkpoint" / "point-00003.json").unlink()
    assert main(["run", str(path), "--quiet"]) == 2
    err = capsys.readouterr().err
    assert "already holds" in err and "--resume" in err and "--overwrite" in err
    assert main(["run", str(path), "--resume"]) == 0
    assert "equilibrium" in capsys.readouterr().out
    assert len(list((tmp_path / "out" / "checkpoint").glob("point-*.json"))) == 4


def test_a_single_point_study(tmp_path):
    path = _write(tmp_path, SCAN_STUDY.split("[scan]")[0])
    assert main(["run", str(path), "--quiet"]) == 0
    data = json.loads((tmp_path / "study" / "result.json").read_text())
    assert data["schema"] == "groundkit.run-result"


def test_an_unknown_key_is_refused_with_its_line(tmp_path):
    path = _write(tmp_path, SCAN_STUDY.replace("basis = ", "bassis = "))
    with pytest.raises(StudyFileError, match=r"molecule\.bassis \(line 6\): unknown key in \[molecule\] 'bassis'"):
        read_study(path)
    path = _write(tmp_path, SCAN_STUDY + "\n[plots]\nshow = true\n")
    with pytest.raises(StudyFileError, match=r"plots \(line 2[0-9]\): unknown table 'plots'"):
        read_study(path)


def test_malformed_files_name_the_key_and_line(tmp_path):
    with pytest.raises(StudyFileError, match="not valid TOML.*line 6"):
        read_study(_write(tmp_path, SCAN_STUDY.replace('basis = "sto-3g"', "basis = sto-3g")))
    with pytest.raises(StudyFileError, match=r"scan\.points \(line 16\).*integer"):
        read_study(_write(tmp_path, SCAN_STUDY.replace("points = 4", 'points = "4"')))
    with pytest.raises(StudyFileError, match=r"components\.trial_state \(line 9\): unknown trial state"):
        read_study(_write(tmp_path, SCAN_STUDY.replace('"uccsd"', '"uccsdt"')))
    with pytest.raises(StudyFileError, match=r"scan\.bond \(line 13\)"):
        read_study(_write(tmp_path, SCAN_STUDY.replace("bond = [0, 1]", "bond = [0, 5]")))
    with pytest.raises(StudyFileError, match=r"molecule\.coordinates \(line 5\).*rows for 2 atoms"):
        read_study(_write(tmp_path, SCAN_STUDY.replace("[[0, 0, 0], [0, 0, 0.74]]", "[[0, 0, 0]]")))
    with pytest.raises(StudyFileError, match="cannot be read"):
        read_study(tmp_path / "missing.toml")
    assert issubclass(StudyFileError, ValueError)


def test_python_dash_m_reports_bad_input_without_a_traceback(tmp_path):
    path = _write(tmp_path, SCAN_STUDY.replace("[output]", "[outputs]"))
    done = subprocess.run([sys.executable, "-m", "groundkit", "run", str(path)], cwd=ROOT, capture_output=True,
                          text=True, timeout=120)
    assert done.returncode == 2
    assert "unknown table 'outputs'" in done.stderr and "Traceback" not in done.stderr


def test_errors_quote_the_offending_line_of_the_study_file(tmp_path):
    with pytest.raises(StudyFileError, match=r"molecule\.bassis \(line 6\): .*\n  6 \| bassis = \"sto-3g\"$"):
        read_study(_write(tmp_path, SCAN_STUDY.replace("basis = ", "bassis = ")))
    with pytest.raises(StudyFileError, match=r"not valid TOML.*line 6.*\n  6 \| basis = sto-3g$"):
        read_study(_write(tmp_path, SCAN_STUDY.replace('basis = "sto-3g"', "basis = sto-3g")))
    with pytest.raises(StudyFileError, match=r"scan\.points \(line 16\).*\n  16 \| points = \"4\"$"):
        read_study(_write(tmp_path, SCAN_STUDY.replace("points = 4", 'points = "4"')))


def test_an_existing_output_is_refused_unless_resumed_or_overwritten(tmp_path, capsys):
    single = _write(tmp_path, SCAN_STUDY.split("[scan]")[0] + '[output]\ndirectory = "single"\n')
    assert main(["run", str(single), "--quiet"]) == 0
    before = (tmp_path / "single" / "result.json").read_bytes()
    assert main(["run", str(single), "--quiet"]) == 2  # a second run would overwrite result.json
    assert "already holds result.json, summary.txt" in capsys.readouterr().err
    assert (tmp_path / "single" / "result.json").read_bytes() == before
    assert main(["run", str(single), "--quiet", "--overwrite"]) == 0
    path = _write(tmp_path, SCAN_STUDY)
    assert main(["run", str(path), "--quiet"]) == 0
    checkpoint = tmp_path / "out" / "checkpoint"
    stamps = {p.name: p.stat().st_mtime_ns for p in checkpoint.glob("point-*.json")}
    assert main(["run", str(path), "--quiet"]) == 2
    assert main(["run", str(path), "--quiet", "--resume"]) == 0  # nothing left to compute
    assert {p.name: p.stat().st_mtime_ns for p in checkpoint.glob("point-*.json")} == stamps
    (tmp_path / "out" / "notes.txt").write_text("mine")
    assert main(["run", str(path), "--quiet", "--overwrite"]) == 0  # the points are computed again
    assert all(p.stat().st_mtime_ns != stamps[p.name] for p in checkpoint.glob("point-*.json"))
    assert (tmp_path / "out" / "notes.txt").read_text() == "mine"  # only groundkit's own files are replaced
    with pytest.raises(SystemExit) as stop:
        main(["run", str(path), "--resume", "--overwrite"])
    assert stop.value.code == 2 and "not allowed with argument" in capsys.readouterr().err


def test_outputs_are_written_with_the_users_umask(tmp_path):
    path = _write(tmp_path, SCAN_STUDY)
    old = os.umask(0o022)
    try:
        assert main(["run", str(path), "--quiet"]) == 0
    finally:
        os.umask(old)
    out = tmp_path / "out"
    for file in ("scan.json", "summary.csv", "summary.txt", "checkpoint/manifest.json", "checkpoint/point-00000.json"):
        assert (out / file).stat().st_mode & 0o777 == 0o644, file  # 0o666 less the umask, as open() gives


TOO_SHORT = SCAN_STUDY.replace("start = 0.6\nstop = 0.9\npoints = 4", "values = [0.05, 0.7, 0.8, 0.9, 1.0]")


def test_failed_points_exit_with_1_and_retry_failed_recomputes_them(tmp_path, capsys):
    path = _write(tmp_path, TOO_SHORT)
    assert main(["run", str(path), "--quiet"]) == 1  # 0.05 Å: the geometry is refused, the point fails
    first = load_scan(tmp_path / "out" / "scan.json")
    failure = first.points[0].failure
    assert "GeometryError" in failure and first.points[0].earlier_failures == ()
    exact = pyscf_fci_curve(np.array([0.7, 0.8, 0.9, 1.0]))  # PySCF FCI on the test's own molecules (reference library)
    assert [p.result.energy for p in first.points[1:]] == pytest.approx(exact, abs=1e-8)
    assert "failed points: 1" in (tmp_path / "out" / "summary.txt").read_text()
    assert main(["run", str(path), "--quiet", "--resume"]) == 1
    assert load_scan(tmp_path / "out" / "scan.json").points[0].earlier_failures == ()  # kept, not retried
    assert main(["run", str(path), "--quiet", "--resume", "--retry-failed"]) == 1  # retried, fails again
    again = load_scan(tmp_path / "out" / "scan.json")
    assert again.points[0].failure == failure and again.points[0].earlier_failures == (failure,)


def test_a_crash_exits_with_3_and_keeps_its_traceback(tmp_path, capsys, monkeypatch):
    import groundkit.studies.batch as batch

    def broken(study, **options):
        raise RuntimeError("a bug in the batch layer")

    monkeypatch.setattr(batch, "run_study", broken)
    path = _write(tmp_path, SCAN_STUDY)
    assert main(["run", str(path), "--quiet"]) == 3
    err = capsys.readouterr().err
    assert "Traceback" in err and "crashed (a bug in groundkit" in err and "RuntimeError: a bug" in err
    saved = (tmp_path / "out" / "crash-traceback.txt").read_text()
    assert "RuntimeError: a bug in the batch layer" in saved


def test_ctrl_c_exits_with_130_and_resume_finishes_the_scan(tmp_path, capsys, monkeypatch):
    from tests.studies.faults import ctrl_c_inside

    path = _write(tmp_path, SCAN_STUDY)
    ctrl_c_inside(monkeypatch, 0.8)
    assert main(["run", str(path), "--quiet"]) == 130
    assert "interrupted; the finished points are in" in capsys.readouterr().err
    assert len(list((tmp_path / "out" / "checkpoint").glob("point-*.json"))) == 2
    monkeypatch.undo()
    assert main(["run", str(path), "--quiet", "--resume"]) == 0
    scan = load_scan(tmp_path / "out" / "scan.json")
    exact = pyscf_fci_curve(np.array([0.6, 0.7, 0.8, 0.9]))  # PySCF FCI on the test's own molecules (reference library)
    assert [p.result.energy for p in scan.points] == pytest.approx(exact, abs=1e-8)
    assert all(p.result.converged for p in scan.points)


def test_help_lists_the_options_and_exit_codes(capsys):
    with pytest.raises(SystemExit):
        main(["run", "--help"])
    text = capsys.readouterr().out
    for word in ("--resume", "--overwrite", "--retry-failed", "exit status", "130"):
        assert word in text
