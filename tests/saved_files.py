"""Real saved files for the file-validation tests, and small helpers to mutate their JSON.

The result is H2/STO-3G at 0.74 Å minimised with UCCSD; the scan is H2/STO-3G at 0.7, 0.8, 0.9 Å with a
checkpoint directory. Both are computed once per session (``functools.cache``) and handed out as JSON text, so
every test mutates its own copy.
"""

from __future__ import annotations

import json
import os
import tempfile
from functools import cache
from typing import Any

import groundkit as gk

SCAN_VALUES = (0.7, 0.8, 0.9)


def h2(r: float) -> gk.MoleculeSpec:
    """H2/STO-3G on the z axis, ``r`` Å apart."""
    return gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, r)))


@cache
def result_text() -> str:
    """The text of a saved H2/STO-3G UCCSD result."""
    with tempfile.TemporaryDirectory() as folder:
        path = os.path.join(folder, "h2.json")
        h2(0.74).pipeline().trial_state(gk.UCCSD()).run().save(path)
        with open(path, encoding="utf-8") as fh:
            return fh.read()


@cache
def scan_texts() -> tuple[str, dict[str, str]]:
    """(text of a saved H2/STO-3G scan, file name -> text of its checkpoint directory)."""
    with tempfile.TemporaryDirectory() as folder:
        checkpoint = os.path.join(folder, "checkpoint")
        scan = gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, list(SCAN_VALUES), checkpoint=checkpoint)
        path = os.path.join(folder, "scan.json")
        scan.save(path)
        files = {}
        for name in sorted(os.listdir(checkpoint)):
            with open(os.path.join(checkpoint, name), encoding="utf-8") as fh:
                files[name] = fh.read()
        with open(path, encoding="utf-8") as fh:
            return fh.read(), files


def resolve(data: Any, path: tuple) -> tuple[Any, Any]:
    """(container, key) of the node at ``path``."""
    for key in path[:-1]:
        data = data[key]
    return data, path[-1]


def set_at(data: Any, path: tuple, value: Any) -> Any:
    container, key = resolve(data, path)
    container[key] = value
    return data


def delete_at(data: Any, path: tuple) -> Any:
    container, key = resolve(data, path)
    del container[key]
    return data


def write(path: Any, data: Any) -> Any:
    """Write ``data`` as JSON (NaN and Infinity allowed, as a careless writer would) and return ``path``."""
    with open(path, "w", encoding="utf-8") as fh:
        json.dump(data, fh, allow_nan=True)
    return path


def scan_dict(scan: gk.ScanResult) -> dict:
    """Comparable form of a scan (ScanResult compares by identity)."""
    from groundkit.studies.scan_persistence import scan_to_dict

    return scan_to_dict(scan)


def reload_equal(kind: str, path: Any, folder: Any) -> bool:
    """Load ``path`` (kind 'result', 'scan', 'point' or 'plan'), save it again under ``folder``, load that: True when
    the two loaded objects are equal. Raises whatever the first load raises."""
    again = os.path.join(folder, f"again-{kind}.json")
    if kind == "plan":
        from groundkit.studies.plan_persistence import plan_to_dict

        first = gk.load_plan(path)
        first.save(again)
        return plan_to_dict(gk.load_plan(again)) == plan_to_dict(first)
    if kind == "result":
        first = gk.load_result(path)
        first.save(again)
        return gk.load_result(again) == first
    if kind == "scan":
        first = gk.load_scan(path)
        first.save(again)
        return scan_dict(gk.load_scan(again)) == scan_dict(first)
    from groundkit.persistence import write_json_atomic
    from groundkit.studies.scan_persistence import point_to_dict, read_point_file

    data, point = read_point_file(path)
    write_json_atomic({**data, "point": point_to_dict(point)}, again)
    return point_to_dict(read_point_file(again)[1]) == point_to_dict(point)
