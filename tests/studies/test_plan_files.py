"""Plan files: save and load round trip, and hostile files refused with ResultFileError naming the field."""

from __future__ import annotations

import json

import pytest

import groundkit as gk
from groundkit.studies.plan_persistence import plan_to_dict
from tests.studies.plan_cases import h2_plan

pytestmark = pytest.mark.slow


def test_round_trip(tmp_path):
    plan = h2_plan()
    path = tmp_path / "plan.json"
    plan.save(str(path))
    loaded = gk.load_plan(str(path))
    assert plan_to_dict(loaded) == plan_to_dict(plan)
    assert loaded.table.equals(plan.table)
    assert loaded.recommend() == plan.recommend()
    assert loaded.curve().table["energy"].equals(plan.curve().table["energy"])


def _hostile(tmp_path, change):
    data = json.loads(json.dumps(plan_to_dict(h2_plan())))
    change(data)
    path = tmp_path / "hostile.json"
    path.write_text(json.dumps(data))
    return path


def _set(path, value):
    def change(data):
        target = data
        for key in path[:-1]:
            target = target[key]
        target[path[-1]] = value
    return change


@pytest.mark.parametrize("change, field", [
    (_set(("schema",), "groundkit.scan-result"), "schema"),
    (_set(("version",), 7), "version"),
    (_set(("target",), -1.0), "target"),
    (_set(("rows", 0, "run"), 99), "rows[0].run"),
    (_set(("rows", 0, "device_hours"), "lots"), "rows[0].device_hours"),
    (_set(("rows", 0, "qubits"), 2.5), "rows[0].qubits"),
    (_set(("rows", 0, "evaluations"), -3), "rows[0].evaluations"),
    (_set(("rows", 0, "surprise"), 1), "rows[0].surprise"),
    (_set(("rows", 1, "configuration"), None), "rows[1].configuration"),
    (_set(("limits", "qubits"), 0), "limits.qubits"),
    (_set(("limits", "colour"), 1), "limits.colour"),
    (_set(("curves", 0, "index"), 1), "curves[1].index"),
    (_set(("curves", 0, "scan", "points", 0, "index"), 5), "curves[0].scan.points[0].index"),
    (_set(("curves", 0, "scan", "points", 0, "result", "energy"), "low"), "curves[0].scan.points[0].result.energy"),
    (_set(("skipped",), [{"configuration": "x"}]), "skipped[0].reason"),
])
def test_hostile_plan_files_are_refused(tmp_path, change, field):
    path = _hostile(tmp_path, change)
    with pytest.raises(gk.ResultFileError) as caught:
        gk.load_plan(str(path))
    assert f"{path}: {field}" in str(caught.value)


def test_a_row_claiming_to_meet_with_broken_limits_is_refused(tmp_path):
    def change(data):
        row = next(r for r in data["rows"] if r["meets"])
        row["within_limits"] = False
    path = _hostile(tmp_path, change)
    with pytest.raises(gk.ResultFileError, match="expected false unless meets_target and within_limits"):
        gk.load_plan(str(path))


@pytest.mark.parametrize("text", ["", "{", "[1, 2]", '{"schema": "groundkit.plan-result", "version": 1, "target": NaN}',
                                  "\u0000\u0001"])
def test_files_that_are_not_plans_are_refused(tmp_path, text):
    path = tmp_path / "not-a-plan.json"
    path.write_text(text)
    with pytest.raises(gk.ResultFileError):
        gk.load_plan(str(path))


def test_loading_executes_nothing(tmp_path):
    data = plan_to_dict(h2_plan())
    data["rows"][0]["configuration"] = "__import__('os').system('touch pwned')"
    path = tmp_path / "p.json"
    path.write_text(json.dumps(data))
    loaded = gk.load_plan(str(path))
    assert loaded.rows[0]["configuration"].startswith("__import__")
    assert not (tmp_path / "pwned").exists()
