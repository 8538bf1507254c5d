"""Fault injection on checkpointed H2/STO-3G UCCSD scans: kills at random moments, two processes on one checkpoint,
point files corrupted in every way we know of.

Each test asserts what a checkpoint promises: no finished point lost, none duplicated, none silently altered, and
the final table equal to an uninterrupted run's (energies to 1e-10 Ha). UCCSD is exact for two electrons, so the
energies are also checked against PySCF's full CI.
"""

from __future__ import annotations

import hashlib
import json
import math
import re
import shutil
import time
from pathlib import Path

import numpy as np
import pytest

import groundkit as gk
from groundkit.errors import CheckpointWarning
from groundkit.studies import scan as scan_module

from .faults import point_files, start_scan
from .helpers import assert_same_scan, h2, pyscf_fci_curve

VALUES = [round(0.55 + 0.05 * k, 2) for k in range(8)]
PIPELINE = gk.Pipeline().trial_state(gk.UCCSD())
NAMES = [f"point-{k:05d}.json" for k in range(len(VALUES))]


@pytest.fixture(scope="module")
def uninterrupted(tmp_path_factory):
    """The scan run once without faults, and its checkpoint directory."""
    directory = tmp_path_factory.mktemp("uninterrupted")
    scan = PIPELINE.scan(h2, VALUES, checkpoint=str(directory))
    exact = pyscf_fci_curve(np.array(VALUES))  # PySCF FCI on the test's own molecules (reference library)
    np.testing.assert_allclose(scan.table["energy"], exact, atol=1e-8)
    assert all(scan.table["converged"])
    return scan, directory


def _holds_lock(directory: Path, pid: int) -> bool:
    try:
        return json.loads((directory / ".groundkit-lock").read_text())["pid"] == pid
    except (OSError, ValueError, KeyError):
        return False


def _assert_kept(before: dict[str, bytes], now: dict[str, bytes]) -> None:
    """Every point file seen before is still there, byte for byte."""
    assert set(before) <= set(now), f"lost: {sorted(set(before) - set(now))}"
    for name, content in before.items():
        assert now[name] == content, f"{name} changed"


def _assert_each_point_once(directory: Path) -> None:
    indices = [json.loads(p.read_text())["point"]["index"] for p in sorted(directory.glob("point-*.json"))]
    assert indices == list(range(len(VALUES)))


@pytest.mark.slow
def test_sigkill_at_random_moments_then_resume(tmp_path, uninterrupted):
    whole, _ = uninterrupted
    directory = tmp_path / "checkpoint"
    rng = np.random.default_rng(1313)
    seen: dict[str, bytes] = {}
    for _ in range(4):
        child = start_scan(directory, VALUES)
        deadline = time.monotonic() + 120
        while child.poll() is None and not _holds_lock(directory, child.pid) and time.monotonic() < deadline:
            time.sleep(0.01)
        time.sleep(rng.uniform(0.0, 1.5))  # inside a point, between points, or while a point file is written
        child.kill()
        _, err = child.communicate()
        assert child.returncode in (0, -9), err
        now = point_files(directory)
        _assert_kept(seen, now)
        seen = now
    resumed = PIPELINE.scan(h2, VALUES, checkpoint=str(directory))
    final = point_files(directory)
    assert list(final) == NAMES  # every point once
    _assert_kept(seen, final)
    _assert_each_point_once(directory)
    assert not (directory / "set-aside").exists()  # a kill never leaves a file that looks corrupt
    assert not list(directory.glob(".groundkit-*.tmp"))
    assert_same_scan(whole.table, resumed.table, atol=1e-10, same_process=False)


@pytest.mark.slow
def test_two_resumes_at_once_one_refuses_and_neither_damages_the_other(tmp_path, uninterrupted):
    whole, done = uninterrupted
    directory = tmp_path / "checkpoint"
    directory.mkdir()
    for name in ("manifest.json", NAMES[0], NAMES[1]):  # a scan that stopped after two points
        shutil.copy(done / name, directory / name)
    before = point_files(directory)
    first, second = start_scan(directory, VALUES), start_scan(directory, VALUES)
    errors = {child.pid: child.communicate(timeout=300)[1] for child in (first, second)}
    codes = {child.pid: child.returncode for child in (first, second)}
    assert sorted(codes.values()) == [0, 2], errors
    winner = next(pid for pid, code in codes.items() if code == 0)
    loser = next(pid for pid, code in codes.items() if code == 2)
    assert f"CheckpointBusyError: checkpoint {str(directory)!r} is in use by another scan (process {winner} " \
        in errors[loser]
    final = point_files(directory)
    assert list(final) == NAMES
    _assert_kept(before, final)
    _assert_each_point_once(directory)
    resumed = PIPELINE.scan(h2, VALUES, checkpoint=str(directory))  # nothing left to compute
    assert point_files(directory) == final
    assert_same_scan(whole.table, resumed.table, atol=1e-10, same_process=False)


def _rewrite(path: Path, change, checksum: bool) -> None:
    """Apply ``change`` to a point file's data; with ``checksum`` recompute the SHA-256 of the canonical content
    (sorted keys, compact separators, ASCII: the rule docs/studies.md states) so that only other checks can tell."""
    data = json.loads(path.read_text())
    change(data)
    if checksum:
        canonical = json.dumps({"fingerprint": data["fingerprint"], "point": data["point"]}, sort_keys=True,
                               separators=(",", ":"), ensure_ascii=True)
        data["checksum"] = hashlib.sha256(canonical.encode()).hexdigest()  # SHA-256 (Python's hashlib)
    path.write_text(json.dumps(data))


def _set(*keys_and_value):
    *keys, value = keys_and_value

    def change(data):
        target = data["point"]
        for key in keys[:-1]:
            target = target[key]
        target[keys[-1]] = value(target[keys[-1]]) if callable(value) else value
    return change


def _failed_by_hand(path: Path) -> None:
    """A 'failed' mark typed into a finished point's file: no result, a failure message, no checksum."""
    data = json.loads(path.read_text())
    data["point"].update(result=None, failure="RuntimeError: made by hand")
    del data["checksum"]
    path.write_text(json.dumps(data))


CORRUPTIONS = {  # index: (how, what the warning must say)
    0: (lambda p: _rewrite(p, _set("result", "energy", lambda e: e - 1e-3), checksum=False),
        "its checksum does not match its content"),
    1: (lambda p: _rewrite(p, _set("result", "reference", "energy", lambda e: e + 1e-3), checksum=False),
        "its checksum does not match its content"),
    2: (lambda p: _rewrite(p, _set("value", 0.66), checksum=True),
        r"its value is 0\.66; the manifest has 0\.65 at index 2"),
    3: (lambda p: _rewrite(p, _set("molecule", "coordinates", [[0, 0, 0], [0, 0, 0.72]]), checksum=True),
        r"its molecule differs from the manifest's at index 3 \(coordinates: \[\[0, 0, 0\], \[0, 0, 0\.72\]\] there"),
    4: (lambda p: _rewrite(p, _set("result", "parameters", lambda x: [math.nan] * len(x)), checksum=False),
        "holds NaN or infinity"),
    5: (lambda p: _failed_by_hand(p), r"it has no checksum \(not written by this groundkit\)"),
    6: (lambda p: p.write_text(p.read_text()[:500]), "not valid JSON"),
}


def test_corrupted_point_files_of_every_kind_are_set_aside_and_recomputed(tmp_path, monkeypatch, uninterrupted):
    whole, done = uninterrupted
    directory = tmp_path / "checkpoint"
    shutil.copytree(done, directory)
    for index, (corrupt, _) in CORRUPTIONS.items():
        corrupt(directory / NAMES[index])
    corrupted = point_files(directory)
    intact = (directory / NAMES[7]).read_bytes()
    calls = []
    real = scan_module.run_task
    monkeypatch.setattr(scan_module, "run_task", lambda task: calls.append(task) or real(task))
    with pytest.warns(CheckpointWarning) as caught:
        resumed = PIPELINE.scan(h2, VALUES, checkpoint=str(directory))
    messages = [str(w.message) for w in caught if issubclass(w.category, CheckpointWarning)]
    assert len(messages) == len(CORRUPTIONS)
    for index, (_, said) in CORRUPTIONS.items():
        mine = [m for m in messages if f"{NAMES[index]}:" in m]
        assert len(mine) == 1 and re.search(said, mine[0]), (said, mine)
        aside = directory / "set-aside" / f"point-{index:05d}.1.json"
        assert f"moved to {aside}" in mine[0]
        assert aside.read_bytes() == corrupted[NAMES[index]]  # moved aside as it was, not deleted
    assert len(calls) == len(CORRUPTIONS)  # only the corrupted points were computed again
    assert (directory / NAMES[7]).read_bytes() == intact
    _assert_each_point_once(directory)
    assert_same_scan(whole.table, resumed.table, atol=1e-10)
    exact = pyscf_fci_curve(np.array(VALUES))  # PySCF FCI on the test's own molecules (reference library)
    np.testing.assert_allclose(resumed.table["energy"], exact, atol=1e-8)


def test_point_checksums_are_the_sha256_of_the_canonical_content(uninterrupted):
    _, done = uninterrupted
    for name in NAMES:
        data = json.loads((done / name).read_text())
        canonical = json.dumps({"fingerprint": data["fingerprint"], "point": data["point"]}, sort_keys=True,
                               separators=(",", ":"), ensure_ascii=True)
        assert data["checksum"] == hashlib.sha256(canonical.encode()).hexdigest()  # SHA-256 (Python's hashlib)
