"""Checkpoint directory of a scan: one JSON file per finished point, a manifest with a fingerprint, and a lock.

Every file is written atomically (temporary file, flush, rename), so a scan killed at any moment leaves each
point either absent or complete, never half-written and never twice. The manifest's fingerprint is a SHA-256 of
the pipeline configuration, the warm-start chaining and every point's value and molecule; a directory written for
another configuration is refused rather than mixed in.

Locking: a scan holds an exclusive operating-system lock on ``.groundkit-lock`` (``filelock``, ``flock`` on
POSIX) from opening the directory until it returns. A second scan on the same directory is refused at once with
a :class:`CheckpointError` naming the holder (process id, host, since when); it never deletes or overwrites the
holder's files. The operating system drops the lock when its process dies, so a killed scan never blocks a
resume.

Trust: each point file carries a SHA-256 of its canonical content (sorted keys, no NaN), and its index, value
and molecule are compared with this scan's points. A file that fails any check (edited, damaged, hand-made,
holding NaN, or a point interrupted by Ctrl-C in an older groundkit) is moved to ``set-aside/`` with a
:class:`CheckpointWarning` that names it and says what differed, and its point is computed again.
"""

from __future__ import annotations

import datetime
import hashlib
import json
import os
import re
import socket
import warnings
from typing import Any

from groundkit import file_schemas
from groundkit.errors import CheckpointBusyError, CheckpointWarning, ResultFileError
from groundkit.file_reading import path_text, plain_fault, shown

from .errors import CheckpointError
from .former_names import former_descriptions
from .scan_persistence import point_from_dict, point_to_dict, read_json, read_manifest, write_json_atomic
from .scan_result import ScanPoint
from .work import INTERRUPTED

MANIFEST = "manifest.json"
LOCK = ".groundkit-lock"
SET_ASIDE = "set-aside"
MANIFEST_SCHEMA = "groundkit.scan-checkpoint"
POINT_SCHEMA = "groundkit.scan-point"
VERSION = file_schemas.CHECKPOINT_VERSION
READABLE_VERSIONS = file_schemas.CHECKPOINT_VERSIONS  # version 1: point files of earlier releases, no checksum


def fingerprint(description: dict[str, Any]) -> str:
    """SHA-256 (hex) of a JSON-ready description, keys sorted."""
    text = json.dumps(description, sort_keys=True, separators=(",", ":"), default=repr)
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


def content_checksum(fingerprint_: str, point: Any) -> str:
    """SHA-256 (hex) of a point file's canonical content: its fingerprint and point record, keys sorted, compact,
    ASCII. ``ValueError`` when the record holds NaN or infinity (JSON has neither)."""
    text = json.dumps({"fingerprint": fingerprint_, "point": point}, sort_keys=True, separators=(",", ":"),
                      ensure_ascii=True, allow_nan=False)
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


def _plain(value: Any) -> Any:
    """``value`` as JSON reads it back (tuples become lists, numpy scalars numbers)."""
    return json.loads(json.dumps(value, default=lambda v: v.tolist() if hasattr(v, "tolist") else repr(v)))


class CheckpointStore:
    """A directory holding ``manifest.json`` and ``point-00000.json``, ``point-00001.json``, ...

    Opening it takes the directory's lock; :meth:`close` (or leaving a ``with`` block) releases it. With
    ``retry_failed`` the stored failed points are not returned by :meth:`finished` (they are computed again), and
    their failure messages are kept in :attr:`earlier_failures` for the points that replace them.
    """

    def __init__(self, directory: str | os.PathLike, description: dict[str, Any], *,
                 retry_failed: bool = False) -> None:
        self.directory = os.fspath(directory)
        self.description = description
        self.fingerprint = fingerprint(description)
        self.retry_failed = bool(retry_failed)
        self.earlier_failures: dict[int, tuple[str, ...]] = {}
        self._expected = _plain(description.get("points", []))
        self._lock: Any = None
        self._prepare_directory()
        self._acquire()
        try:
            self._open()
        except BaseException:
            self.close()
            raise

    # lock -----------------------------------------------------------------------------------------------------
    def _prepare_directory(self) -> None:
        if os.path.exists(self.directory) and not os.path.isdir(self.directory):
            raise CheckpointError(f"checkpoint {self.directory!r} is a file; give a directory (new or a checkpoint)")
        os.makedirs(self.directory, exist_ok=True)

    def _acquire(self) -> None:
        from filelock import FileLock, Timeout

        path = os.path.join(self.directory, LOCK)
        lock = FileLock(path, timeout=0, on_acquired=_record_holder)
        try:
            lock.acquire()
        except Timeout:
            raise CheckpointBusyError(
                f"checkpoint {self.directory!r} is in use by another scan ({describe_holder(path)}); wait until it "
                "finishes, or give this scan another directory. The lock of a process that has died is released "
                "by the operating system, so the holder is still running"
            ) from None
        self._lock = lock

    def close(self) -> None:
        """Release the directory's lock (once; later calls do nothing)."""
        lock, self._lock = self._lock, None
        if lock is not None:
            lock.release()

    def __enter__(self) -> CheckpointStore:
        return self

    def __exit__(self, *exc: Any) -> None:
        self.close()

    # manifest -------------------------------------------------------------------------------------------------
    def _open(self) -> None:
        path = os.path.join(self.directory, MANIFEST)
        if not os.path.exists(path):
            stray = [n for n in os.listdir(self.directory) if not n.startswith(".groundkit-")]
            if stray:
                raise CheckpointError(
                    f"checkpoint directory {self.directory!r} has no {MANIFEST} but holds {sorted(stray)[:3]}; "
                    "give an empty or new directory, or one written by a groundkit scan"
                )
            write_json_atomic({"schema": MANIFEST_SCHEMA, "version": VERSION, "fingerprint": self.fingerprint,
                               "description": self.description}, path)
            return
        try:
            manifest = read_manifest(path)  # schema name, version and every field validated
        except ResultFileError as err:
            raise CheckpointError(str(err)) from None
        if not isinstance(manifest, dict) or manifest.get("schema") != MANIFEST_SCHEMA:
            raise CheckpointError(f"{path}: not a groundkit checkpoint manifest (schema {MANIFEST_SCHEMA!r})")
        if manifest.get("version") not in READABLE_VERSIONS:
            raise CheckpointError(
                f"{path}: checkpoint version {manifest.get('version')!r}; this groundkit reads versions "
                f"{', '.join(map(str, READABLE_VERSIONS))}; give a new directory, or delete the old one to start again"
            )
        former = [fingerprint(d) for d in former_descriptions(self.description)]
        if manifest.get("fingerprint") in former:  # written before a class rename: resume under its fingerprint
            self.fingerprint = manifest["fingerprint"]
        if manifest.get("fingerprint") != self.fingerprint:
            raise CheckpointError(
                f"checkpoint directory {self.directory!r} belongs to another scan configuration "
                f"({_difference(manifest.get('description'), self.description)}); use a new directory for this "
                "configuration, or delete the old one"
            )

    # points ---------------------------------------------------------------------------------------------------
    def point_path(self, index: int) -> str:
        return os.path.join(self.directory, f"point-{index:05d}.json")

    def finished(self) -> dict[int, ScanPoint]:
        """Index -> point of every trusted point already written.

        Leftover temporary files of interrupted writes are removed (safe: this process holds the lock, so no
        other scan is writing here). A point file that fails a check is set aside with a CheckpointWarning; with
        ``retry_failed`` the failed points are left out too. Both are computed again."""
        out: dict[int, ScanPoint] = {}
        for name in sorted(os.listdir(self.directory)):
            path = os.path.join(self.directory, name)
            if name.startswith(".groundkit-") and name.endswith(".tmp"):
                os.unlink(path)  # a write that a kill interrupted: its point is recomputed
                continue
            if not (name.startswith("point-") and name.endswith(".json")):
                continue
            point, problem = self._trusted(name, path)
            if problem is not None:
                self._set_aside(name, path, problem)
                continue
            if self.retry_failed and not point.ok:
                self.earlier_failures[point.index] = point.earlier_failures + (str(point.failure),)
                continue
            out[point.index] = point
        return out

    def _trusted(self, name: str, path: str) -> tuple[ScanPoint | None, str | None]:
        """(point, None) for a file that passes every check; (None, what is wrong) otherwise."""
        try:
            data = read_json(path, "a groundkit scan point")
        except ResultFileError as err:
            return None, str(err).removeprefix(f"{path}: ")
        if (not isinstance(data, dict) or data.get("schema") != POINT_SCHEMA
                or data.get("version") not in READABLE_VERSIONS or isinstance(data.get("version"), bool)):
            return None, (f"not a groundkit scan point (schema {POINT_SCHEMA!r}, version "
                          f"{' or '.join(map(str, READABLE_VERSIONS))})")
        if data.get("fingerprint") != self.fingerprint:
            return None, "written by another scan configuration (its fingerprint differs from the manifest's)"
        record = data.get("point")
        unreadable = plain_fault(record)
        if unreadable is not None:  # NaN, infinity, out-of-range numbers or over-deep nesting
            return None, (f"holds NaN or infinity, which groundkit never writes (point."
                          f"{path_text(unreadable.path)} is {shown(unreadable.value)})")
        checksum = content_checksum(data["fingerprint"], record)
        legacy = data["version"] == 1 and "checksum" not in data  # written before checksums; checked below
        if data.get("checksum") != checksum and not legacy:
            return None, ("its checksum does not match its content (edited or damaged after it was written)"
                          if "checksum" in data else "it has no checksum (not written by this groundkit)")
        if not isinstance(record, dict):
            return None, "its point record is not a JSON object"
        named = re.fullmatch(r"point-(\d+)\.json", name)
        index = int(named.group(1)) if named else None
        if index is None or record.get("index") != index:
            return None, f"its index {record.get('index')!r} does not match its file name"
        if not 0 <= index < len(self._expected):
            return None, f"index {index} is outside this scan's {len(self._expected)} points"
        value, molecule = self._expected[index]
        if record.get("value") != value:
            return None, f"its value is {record.get('value')!r}; the manifest has {value!r} at index {index}"
        stored = record.get("molecule")
        if isinstance(molecule, str):
            if stored is not None:
                return None, "it holds a molecule where the manifest records that the geometry function failed"
        elif stored != molecule:
            change = _molecule_change(stored, molecule)
            return None, f"its molecule differs from the manifest's at index {index} ({change})"
        try:
            point = point_from_dict(record, path)
        except ResultFileError as err:
            return None, str(err).removeprefix(f"{path}: ")
        if point.result is not None and INTERRUPTED in point.result.stop_reason:
            return None, "its run was interrupted (Ctrl-C) before it finished"
        return point, None

    def _set_aside(self, name: str, path: str, problem: str) -> None:
        folder = os.path.join(self.directory, SET_ASIDE)
        os.makedirs(folder, exist_ok=True)
        stem = name[: -len(".json")]
        count = 1
        while os.path.exists(target := os.path.join(folder, f"{stem}.{count}.json")):
            count += 1
        os.replace(path, target)
        warnings.warn(f"checkpoint point file {path}: {problem}; moved to {target}, the point is computed again",
                      CheckpointWarning, stacklevel=4)

    def write(self, point: ScanPoint) -> None:
        """Write one finished point atomically, with its checksum."""
        record = _plain(point_to_dict(point))
        write_json_atomic({"schema": POINT_SCHEMA, "version": VERSION, "fingerprint": self.fingerprint,
                           "point": record, "checksum": content_checksum(self.fingerprint, record)},
                          self.point_path(point.index))


def _record_holder(fd: int) -> None:
    """Write who holds the lock into the lock file (called by filelock right after each acquisition)."""
    since = datetime.datetime.now(datetime.UTC).isoformat(timespec="seconds")
    text = json.dumps({"pid": os.getpid(), "host": socket.gethostname(), "since": since}).encode("utf-8")
    os.ftruncate(fd, 0)
    os.lseek(fd, 0, os.SEEK_SET)
    os.write(fd, text)
    os.fsync(fd)


def describe_holder(path: str) -> str:
    """'process 1234 on host h, since 2025-01-01T10:00:00+00:00' from a lock file, or what is known."""
    try:
        with open(path, encoding="utf-8") as fh:
            holder = json.load(fh)
        return f"process {int(holder['pid'])} on host {holder['host']}, since {holder['since']}"
    except (OSError, ValueError, KeyError, TypeError):
        return f"a process that has not yet recorded itself in {path}"


def _molecule_change(stored: Any, expected: Any) -> str:
    if not isinstance(stored, dict):
        return "no molecule record"
    keys = sorted(k for k in set(stored) | set(expected) if stored.get(k) != expected.get(k))
    return ", ".join(f"{k}: {stored.get(k)!r} there, {expected.get(k)!r} in the manifest" for k in keys)[:300]


def _difference(old: Any, new: dict[str, Any]) -> str:
    """Which top-level keys of two descriptions differ, for the error message."""
    if not isinstance(old, dict):
        return "its manifest has no readable description"
    keys = sorted(k for k in set(old) | set(new) if old.get(k) != json.loads(json.dumps(new.get(k), default=repr)))
    parts = []
    for key in keys:
        if key == "points":
            parts.append("the scan points (values or geometries) differ")
        else:
            parts.append(f"{key}: {old.get(key)!r} there, {new.get(key)!r} here")
    return "; ".join(parts) or "fingerprints differ"


def clear_checkpoint(directory: str | os.PathLike) -> None:
    """Remove a checkpoint's manifest, point files, set-aside files and leftover temporary files, holding its lock
    (``CheckpointBusyError`` while another scan runs there). Other files and the lock file stay."""
    from filelock import FileLock, Timeout

    directory = os.fspath(directory)
    if not os.path.isdir(directory):
        return
    path = os.path.join(directory, LOCK)
    lock = FileLock(path, timeout=0, on_acquired=_record_holder)
    try:
        lock.acquire()
    except Timeout:
        raise CheckpointBusyError(
            f"checkpoint {directory!r} is in use by another scan ({describe_holder(path)}); it cannot be cleared "
            "while that scan runs"
        ) from None
    try:
        for name in os.listdir(directory):
            full = os.path.join(directory, name)
            if name == MANIFEST or re.fullmatch(r"point-\d+\.json", name) or (
                    name.startswith(".groundkit-") and name.endswith(".tmp")):
                os.unlink(full)
        aside = os.path.join(directory, SET_ASIDE)
        if os.path.isdir(aside):
            for name in os.listdir(aside):
                os.unlink(os.path.join(aside, name))
            os.rmdir(aside)
    finally:
        lock.release()
