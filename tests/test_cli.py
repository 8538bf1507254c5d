import json
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
    assert "--resume" in capsys.readouterr().err
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
