import json
import os
import signal
import subprocess
import sys
import textwrap
import time
from pathlib import Path

import numpy as np
import pytest

import groundkit as gk
from groundkit.errors import CheckpointBusyError, CheckpointWarning
from groundkit.studies import CheckpointError, ScanInputError
from groundkit.studies import scan as scan_module

from .faults import ctrl_c_inside
from .helpers import assert_same_scan, h2, pyscf_fci_curve

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
    assert sorted(p.name for p in tmp_path.iterdir()) == [".groundkit-lock", "manifest.json"] + [
        f"point-{k:05d}.json" for k in range(4)]
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
    # the killed scan's lock file still names it, but the operating system released its lock
    assert json.loads((directory / ".groundkit-lock").read_text())["pid"] == child.pid
    resumed = gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, values, checkpoint=str(directory))
    files = sorted(p.name for p in directory.glob("point-*.json"))
    assert files == [f"point-{k:05d}.json" for k in range(len(values))]  # every point exactly once
    uninterrupted = gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, values)
    assert_same_scan(uninterrupted.table, resumed.table, atol=1e-9, same_process=False)


# --- locking ------------------------------------------------------------------------------------------------------

def test_a_second_scan_on_a_held_checkpoint_is_refused_naming_the_holder_and_deletes_nothing(tmp_path):
    from groundkit.studies.checkpoint import CheckpointStore

    holder = CheckpointStore(tmp_path, {"held": "by this test"})  # another scan, holding the directory
    (tmp_path / ".groundkit-inflight.tmp").write_text('{"half": ')  # its write in progress
    try:
        with pytest.raises(CheckpointBusyError,
                           match=rf"in use by another scan \(process {os.getpid()} on host .+, since 20"):
            gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, VALUES[:1], checkpoint=str(tmp_path))
        assert (tmp_path / ".groundkit-inflight.tmp").read_text() == '{"half": '  # the holder's work is untouched
    finally:
        holder.close()
    assert issubclass(CheckpointBusyError, CheckpointError)


# --- trust in point files -----------------------------------------------------------------------------------------

def test_an_edited_point_file_is_set_aside_with_a_warning_and_recomputed(tmp_path):
    pipeline = gk.Pipeline().trial_state(gk.UCCSD())
    first = pipeline.scan(h2, VALUES, checkpoint=str(tmp_path))
    path = tmp_path / "point-00001.json"
    data = json.loads(path.read_text())
    data["point"]["result"]["energy"] -= 0.05  # a better-looking energy, typed in by hand
    path.write_text(json.dumps(data))
    with pytest.warns(CheckpointWarning, match=r"point-00001\.json: its checksum does not match its content.*"
                                               r"set-aside"):
        again = pipeline.scan(h2, VALUES, checkpoint=str(tmp_path))
    assert_same_scan(first.table, again.table)
    assert json.loads((tmp_path / "set-aside" / "point-00001.1.json").read_text()) == data  # moved, not deleted
    exact = pyscf_fci_curve(np.array(VALUES))  # PySCF FCI on the test's own molecules (reference library)
    np.testing.assert_allclose(again.table["energy"], exact, atol=1e-8)


def test_point_files_keep_the_users_umask(tmp_path):
    old = os.umask(0o027)
    try:
        gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, VALUES[:1], checkpoint=str(tmp_path))
    finally:
        os.umask(old)
    for name in ("manifest.json", "point-00000.json"):
        assert (tmp_path / name).stat().st_mode & 0o777 == 0o640  # 0o666 less the umask, as open() gives


# --- Ctrl-C, gaps and failed points ------------------------------------------------------------------------------

def test_ctrl_c_inside_a_point_stops_the_scan_and_a_resume_recomputes_that_point(tmp_path, monkeypatch):
    pipeline = gk.Pipeline().trial_state(gk.UCCSD())
    whole = pipeline.scan(h2, VALUES)
    gk.workspace().clear("minimisation")  # the same minimisations again would be answered from the workspace
    seen = ctrl_c_inside(monkeypatch, 0.8)
    with pytest.raises(KeyboardInterrupt):
        pipeline.scan(h2, VALUES, checkpoint=str(tmp_path))
    assert seen["calls"] == 2  # interrupted inside the third point's minimisation
    assert sorted(p.name for p in tmp_path.glob("point-*.json")) == ["point-00000.json", "point-00001.json"]
    monkeypatch.undo()
    calls = _counting(monkeypatch)
    resumed = pipeline.scan(h2, VALUES, checkpoint=str(tmp_path))
    assert [m.distance(0, 1) for m in calls] == pytest.approx([0.8, 0.9])
    assert all(resumed.table["converged"])
    assert_same_scan(whole.table, resumed.table)


GAPPED = [round(0.55 + 0.05 * k, 2) for k in range(8)]


def test_a_resume_with_gaps_starts_each_gap_from_its_finished_neighbour(tmp_path, monkeypatch):
    pipeline = gk.Pipeline().trial_state(gk.UCCSD())
    whole = pipeline.scan(h2, GAPPED, checkpoint=str(tmp_path))
    for k in (2, 4, 5, 6):  # point 2 and points 4-6 lost
        (tmp_path / f"point-{k:05d}.json").unlink()
    resumed = pipeline.scan(h2, GAPPED, checkpoint=str(tmp_path))
    assert_same_scan(whole.table, resumed.table)  # energies, parameters, iterations and starts to 1e-10
    exact = pyscf_fci_curve(np.array(GAPPED))  # PySCF FCI on the test's own molecules (reference library)
    np.testing.assert_allclose(resumed.table["energy"], exact, atol=1e-8)


def test_failed_points_are_retried_on_request_and_keep_their_failure(tmp_path, monkeypatch):
    from groundkit.errors import ConvergenceError
    from groundkit.pipeline import Pipeline

    real_run = Pipeline.run

    def flaky(self, *args, **kwargs):  # a failure the library reports, at one geometry, this time only
        if abs(self.components["molecule"].distance(0, 1) - 0.7) < 1e-9:
            raise ConvergenceError("SCF did not converge (injected)")
        return real_run(self, *args, **kwargs)

    pipeline = gk.Pipeline().trial_state(gk.UCCSD())
    monkeypatch.setattr(Pipeline, "run", flaky)
    first = pipeline.scan(h2, VALUES, checkpoint=str(tmp_path))
    assert first.failures == {0.7: "ConvergenceError: SCF did not converge (injected)"}
    monkeypatch.undo()
    kept = pipeline.scan(h2, VALUES, checkpoint=str(tmp_path))  # default: a failed point stays failed
    assert kept.failures == first.failures
    retried = pipeline.scan(h2, VALUES, checkpoint=str(tmp_path), retry_failed=True)
    assert retried.failures == {}
    assert retried.points[1].earlier_failures == ("ConvergenceError: SCF did not converge (injected)",)
    exact = pyscf_fci_curve(np.array(VALUES))  # PySCF FCI on the test's own molecules (reference library)
    np.testing.assert_allclose(retried.table["energy"], exact, atol=1e-8)
    # the history is kept in the checkpoint and in a saved scan
    assert pipeline.scan(h2, VALUES, checkpoint=str(tmp_path)).points[1].earlier_failures == \
        retried.points[1].earlier_failures
    retried.save(str(tmp_path / "scan.json"))
    assert gk.studies.load_scan(str(tmp_path / "scan.json")).points[1].earlier_failures == \
        retried.points[1].earlier_failures
    with pytest.raises(ScanInputError, match="retry_failed='yes'"):
        pipeline.scan(h2, VALUES, checkpoint=str(tmp_path), retry_failed="yes")


def test_a_checkpoint_written_under_the_former_class_names_resumes(tmp_path, monkeypatch):
    """Checkpoints written by the release before the renames (version 1, no checksums) hash the former class names;
    they resume, their points reused after the manifest checks."""
    import json

    from groundkit.studies.checkpoint import fingerprint

    pipeline = gk.Pipeline().trial_state(gk.PairDoubles()).minimiser(gk.FixedStepDescent(step=0.5))
    first = pipeline.scan(h2, VALUES[:3], checkpoint=str(tmp_path))
    (tmp_path / "point-00002.json").unlink()  # as if the old scan was killed before its last point
    manifest_path = tmp_path / "manifest.json"
    manifest = json.loads(manifest_path.read_text())
    description = dict(manifest["description"], trial_state="PUCCD()", minimiser="GradientDescent(step=0.5)")
    old = fingerprint(description)  # what the release before the rename wrote
    manifest_path.write_text(json.dumps({**manifest, "version": 1, "description": description, "fingerprint": old}))
    for path in tmp_path.glob("point-*.json"):
        data = json.loads(path.read_text())
        del data["checksum"]  # version 1 had no checksums
        path.write_text(json.dumps({**data, "version": 1, "fingerprint": old}))
    calls = _counting(monkeypatch)
    again = pipeline.scan(h2, VALUES[:3], checkpoint=str(tmp_path))
    assert len(calls) == 1  # the two stored points are reused, the missing one computed
    assert [p.result.energy for p in again.points] == [p.result.energy for p in first.points]
    assert {json.loads(p.read_text())["fingerprint"] for p in tmp_path.glob("point-*.json")} == {old}
    with pytest.raises(CheckpointError, match="another scan configuration"):
        gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, VALUES[:3], checkpoint=str(tmp_path))
