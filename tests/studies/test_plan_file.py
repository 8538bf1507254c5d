"""The plan command: ``python -m groundkit plan plan.toml`` writes the table, figure, plan file and HTML report;
``--resume`` continues an interrupted plan to the same table; bad files name the key and line."""

from __future__ import annotations

import os

import pandas as pd
import pytest

import groundkit as gk
from groundkit.cli import main

pytestmark = pytest.mark.slow

PLAN = """\
title = "H2 stretch, which register"
[molecule]
symbols = ["H", "H"]
coordinates = [[0, 0, 0], [0, 0, 0.74]]
[geometries]
bond = [0, 1]
values = [0.6, 0.74, 1.4]
[choices]
mapping = ["jordan-wigner"]
tapering = [false, true]
trial_state = ["uccsd", "reference-determinant"]
[limits]
qubits = 4
[output]
directory = "out"
"""


def _write(tmp_path, text):
    path = tmp_path / "plan.toml"
    path.write_text(text)
    return path


def test_plan_command_writes_every_output_and_resumes(tmp_path, capsys):
    path = _write(tmp_path, PLAN)
    assert main(["plan", str(path), "--quiet"]) == 0
    out = tmp_path / "out"
    for name in ("plan.csv", "plan.png", "plan.json", "plan.html", "summary.txt"):
        assert (out / name).is_file(), name
    first = pd.read_csv(out / "plan.csv")
    assert len(first) == 4 and set(first["meets"]) == {True, False}
    html = (out / "plan.html").read_text()
    assert html.startswith("<!DOCTYPE html>") and "data:image/png;base64," in html  # self-contained
    loaded = gk.load_plan(str(out / "plan.json"))
    assert loaded.recommend().configuration == "jordan-wigner (tapered) · UCCSD"
    assert main(["plan", str(path), "--quiet"]) == 2  # outputs exist: --resume or --overwrite
    assert "--resume" in capsys.readouterr().err
    # an interrupted plan: the last points of each run were never written
    for run in (out / "checkpoint" / "runs").iterdir():
        os.remove(run / "point-00002.json")
    assert main(["plan", str(path), "--resume", "--quiet"]) == 0
    again = pd.read_csv(out / "plan.csv")
    assert again.drop(columns="notes").equals(first.drop(columns="notes"))


@pytest.mark.parametrize("change, words", [
    (("[limits]\nqubits = 4", "[limits]\nqbits = 4"), "limits.qbits (line 13): unknown key in [limits] 'qbits'"),
    (('trial_state = ["uccsd", "reference-determinant"]', 'trial_state = ["uccsdd"]'), "choices.trial_state"),
    (("values = [0.6, 0.74, 1.4]", "values = []"), "geometries.values"),
    (("[choices]\n", "[choises]\n"), "unknown table 'choises'"),
    (("qubits = 4", "qubits = -4"), "limit qubits=-4"),
])
def test_bad_plan_files_are_refused(tmp_path, capsys, change, words):
    path = _write(tmp_path, PLAN.replace(*change))
    assert main(["plan", str(path), "--quiet"]) == 2
    assert words in capsys.readouterr().err
