import os
import signal
import subprocess
import sys
import textwrap
import time
from pathlib import Path

import pytest

import groundkit as gk
from groundkit.studies import CheckpointError
from groundkit.studies import scan as scan_module

from .helpers import assert_same_scan, h2

VALUES = [0.6, 0.7, 0.8, 0.9]
ROOT = Path(__file__).resolve().parents[2]


def _counting(monkeypatch) -> list:
    calls = []
    real = scan_module.run_task

    def counted(task):
        calls.append(task.molecule)
        return real(task)

    monkeypatch.setattr(scan_module, "run_task", counted)
    return calls


def test_a_second_run_skips_finished_points(tmp_path, monkeypatch):
    pipeline = gk.Pipeline().trial_state(gk.UCCSD())
    calls = _counting(monkeypatch)
    first = pipeline.scan(h2, VALUES, checkpoint=str(tmp_path))
    assert len(calls) == 4
    assert sorted(p.name for p in tmp_path.iterdir()) == ["manifest.json"] + [f"point-{k:05d}.json" for k in range(4)]
    again = pipeline.scan(h2, VALUES, checkpoint=str(tmp_path))
    assert len(calls) == 4  # nothing recomputed
    assert_same_scan(first.table, again.table, atol=0)


def test_missing_points_are_computed_and_the_chain_is_warm_started_as_before(tmp_path, monkeypatch):
    pipeline = gk.Pipeline().trial_state(gk.UCCSD())
    whole = pipeline.scan(h2, VALUES)
    pipeline.scan(h2, VALUES, checkpoint=str(tmp_path))
    for k in (2, 3):
        (tmp_path / f"point-{k:05d}.json").unlink()
    (tmp_path / ".groundkit-leftover.tmp").write_text("{half a fi")  # a write that a kill interrupted
    calls = _counting(monkeypatch)
    resumed = pipeline.scan(h2, VALUES, checkpoint=str(tmp_path))
    assert len(calls) == 2
    assert not (tmp_path / ".groundkit-leftover.tmp").exists()
    assert_same_scan(whole.table, resumed.table)


def test_a_checkpoint_of_another_configuration_is_refused(tmp_path):
    gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, VALUES[:2], checkpoint=str(tmp_path))
    with pytest.raises(CheckpointError, match="another scan configuration.*trial_state"):
        gk.Pipeline().trial_state(gk.PairDoubles()).scan(h2, VALUES[:2], checkpoint=str(tmp_path))
    with pytest.raises(CheckpointError, match="scan points"):
        gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, VALUES[:3], checkpoint=str(tmp_path))
    with pytest.raises(CheckpointError, match="warm_start"):
        gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, VALUES[:2], checkpoint=str(tmp_path), warm_start=False)
    assert issubclass(CheckpointError, ValueError)


def test_a_directory_of_other_files_is_refused(tmp_path):
    (tmp_path / "notes.txt").write_text("mine")
    with pytest.raises(CheckpointError, match="no manifest.json"):
        gk.Pipeline().scan(h2, VALUES[:1], checkpoint=str(tmp_path))


KILLED_SCAN = textwrap.dedent("""
    import sys
    import groundkit as gk
    from tests.studies.helpers import h2
    values = [float(v) for v in sys.argv[2].split(",")]
    gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, values, checkpoint=sys.argv[1])
""")


@pytest.mark.slow
def test_a_scan_killed_with_sigkill_resumes_to_the_uninterrupted_scan(tmp_path):
    values = [round(0.5 + 0.05 * k, 2) for k in range(14)]
    directory = tmp_path / "checkpoint"
    child = subprocess.Popen([sys.executable, "-c", KILLED_SCAN, str(directory), ",".join(map(str, values))],
                             cwd=ROOT)
    deadline = time.monotonic() + 120
    while time.monotonic() < deadline and child.poll() is None:
        if directory.is_dir() and len(list(directory.glob("point-*.json"))) >= 3:
            break
        time.sleep(0.01)
    assert child.poll() is None, "the scan finished before it could be killed; give it more points"
    os.kill(child.pid, signal.SIGKILL)
    child.wait()
    finished = len(list(directory.glob("point-*.json")))
    assert 3 <= finished < len(values)
    resumed = gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, values, checkpoint=str(directory))
    files = sorted(p.name for p in directory.glob("point-*.json"))
    assert files == [f"point-{k:05d}.json" for k in range(len(values))]  # every point exactly once
    uninterrupted = gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, values)
    assert_same_scan(uninterrupted.table, resumed.table, atol=1e-9, same_process=False)


def test_a_checkpoint_written_under_the_former_class_names_resumes(tmp_path, monkeypatch):
    """Checkpoints started before PUCCD and GradientDescent were renamed hash the former names; they resume."""
    import json

    from groundkit.studies.checkpoint import fingerprint

    pipeline = gk.Pipeline().trial_state(gk.PairDoubles()).minimiser(gk.FixedStepDescent(step=0.5))
    first = pipeline.scan(h2, VALUES[:3], checkpoint=str(tmp_path))
    (tmp_path / "point-00002.json").unlink()  # as if the old scan was killed before its last point
    manifest_path = tmp_path / "manifest.json"
    manifest = json.loads(manifest_path.read_text())
    description = dict(manifest["description"], trial_state="PUCCD()", minimiser="GradientDescent(step=0.5)")
    old = fingerprint(description)  # what the release before the rename wrote
    manifest_path.write_text(json.dumps({**manifest, "description": description, "fingerprint": old}))
    for path in tmp_path.glob("point-*.json"):
        data = json.loads(path.read_text())
        path.write_text(json.dumps({**data, "fingerprint": old}))
    calls = _counting(monkeypatch)
    again = pipeline.scan(h2, VALUES[:3], checkpoint=str(tmp_path))
    assert len(calls) == 1  # the two stored points are reused, the missing one computed
    assert [p.result.energy for p in again.points] == [p.result.energy for p in first.points]
    assert {json.loads(p.read_text())["fingerprint"] for p in tmp_path.glob("point-*.json")} == {old}
    with pytest.raises(CheckpointError, match="another scan configuration"):
        gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, VALUES[:3], checkpoint=str(tmp_path))
