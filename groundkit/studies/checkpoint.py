"""Checkpoint directory of a scan: one JSON file per finished point, and a manifest with a fingerprint.

Every file is written atomically (temporary file, flush, rename), so a scan killed at any moment leaves each
point either absent or complete, never half-written and never twice. The manifest's fingerprint is a SHA-256 of
the pipeline configuration, the warm-start chaining and every point's value and molecule; a directory written for
another configuration is refused rather than mixed in.
"""

from __future__ import annotations

import hashlib
import json
import os
from typing import Any

from groundkit.errors import ResultFileError

from .errors import CheckpointError
from .former_names import former_descriptions
from .scan_persistence import point_from_dict, point_to_dict, read_json, write_json_atomic
from .scan_result import ScanPoint

MANIFEST = "manifest.json"
MANIFEST_SCHEMA = "groundkit.scan-checkpoint"
POINT_SCHEMA = "groundkit.scan-point"
VERSION = 1


def fingerprint(description: dict[str, Any]) -> str:
    """SHA-256 (hex) of a JSON-ready description, keys sorted."""
    text = json.dumps(description, sort_keys=True, separators=(",", ":"), default=repr)
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


class CheckpointStore:
    """A directory holding ``manifest.json`` and ``point-00000.json``, ``point-00001.json``, ..."""

    def __init__(self, directory: str | os.PathLike, description: dict[str, Any]) -> None:
        self.directory = os.fspath(directory)
        self.description = description
        self.fingerprint = fingerprint(description)
        self._open()

    def _open(self) -> None:
        if os.path.exists(self.directory) and not os.path.isdir(self.directory):
            raise CheckpointError(f"checkpoint {self.directory!r} is a file; give a directory (new or a checkpoint)")
        os.makedirs(self.directory, exist_ok=True)
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
            manifest = read_json(path, "a groundkit checkpoint manifest")
        except ResultFileError as err:
            raise CheckpointError(str(err)) from None
        if not isinstance(manifest, dict) or manifest.get("schema") != MANIFEST_SCHEMA:
            raise CheckpointError(f"{path}: not a groundkit checkpoint manifest (schema {MANIFEST_SCHEMA!r})")
        if manifest.get("version") != VERSION:
            raise CheckpointError(f"{path}: checkpoint version {manifest.get('version')!r}; this groundkit reads "
                                  f"{VERSION}")
        former = [fingerprint(d) for d in former_descriptions(self.description)]
        if manifest.get("fingerprint") in former:  # written before a class rename: resume under its fingerprint
            self.fingerprint = manifest["fingerprint"]
        if manifest.get("fingerprint") != self.fingerprint:
            raise CheckpointError(
                f"checkpoint directory {self.directory!r} belongs to another scan configuration "
                f"({_difference(manifest.get('description'), self.description)}); use a new directory for this "
                "configuration, or delete the old one"
            )

    def point_path(self, index: int) -> str:
        return os.path.join(self.directory, f"point-{index:05d}.json")

    def finished(self) -> dict[int, ScanPoint]:
        """Index -> point of every point already written (leftover temporary files are removed)."""
        out: dict[int, ScanPoint] = {}
        for name in sorted(os.listdir(self.directory)):
            path = os.path.join(self.directory, name)
            if name.startswith(".groundkit-") and name.endswith(".tmp"):
                os.unlink(path)  # a write that a kill interrupted: its point is recomputed
                continue
            if not (name.startswith("point-") and name.endswith(".json")):
                continue
            data = read_json(path, "a groundkit scan point")
            if not isinstance(data, dict) or data.get("schema") != POINT_SCHEMA or data.get("version") != VERSION:
                raise CheckpointError(f"{path}: not a groundkit scan point (schema {POINT_SCHEMA!r}, version "
                                      f"{VERSION})")
            if data.get("fingerprint") != self.fingerprint:
                raise CheckpointError(f"{path}: written by another scan configuration; this directory is mixed")
            point = point_from_dict(data.get("point"), path)
            out[point.index] = point
        return out

    def write(self, point: ScanPoint) -> None:
        """Write one finished point atomically."""
        write_json_atomic({"schema": POINT_SCHEMA, "version": VERSION, "fingerprint": self.fingerprint,
                           "point": point_to_dict(point)}, self.point_path(point.index))


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
