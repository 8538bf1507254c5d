"""Plans as JSON: schema 'groundkit.plan-result' (:data:`groundkit.file_schemas.PLAN`), validated on load,
written atomically; nothing is executed on load. The shared scans are stored whole, so a loaded plan draws its
recommended curve beside the exact reference and baselines."""

from __future__ import annotations

import os
from collections.abc import Iterator
from typing import Any

from groundkit import file_checks, file_schemas
from groundkit.file_reading import FieldFault, as_json, validate
from groundkit.persistence import read_json, write_json_atomic

from .plan_result import PlanResult, RunCurve
from .scan_persistence import build_point, point_to_dict
from .scan_result import ScanResult

SCHEMA = file_schemas.PLAN_NAME
VERSION = file_schemas.VERSION


def plan_to_dict(plan: PlanResult) -> dict[str, Any]:
    return {"schema": SCHEMA, "version": VERSION, "target": float(plan.target), "limits": dict(plan.limits),
            "noise_threshold": bool(plan.noise_threshold), "shared": dict(plan.shared),
            "rows": [dict(r) for r in plan.rows],
            "curves": [{"index": c.index, "label": c.label,
                        "scan": {"configuration": dict(c.scan.configuration), "warm_start": c.scan.warm_start,
                                 "points": [point_to_dict(p) for p in c.scan.points]}} for c in plan.curves],
            "skipped": [dict(s) for s in plan.skipped]}


def plan_faults(data: dict[str, Any]) -> Iterator[FieldFault]:
    """What the schema cannot say: curve indices unique, every row's run a stored curve, labels unique, each
    scan's points in order and sound, and a row that meets the target and limits has its figures."""
    indices: set[int] = set()
    for k, curve in enumerate(data["curves"]):
        if curve["index"] in indices:
            yield FieldFault(("curves", k, "index"), curve["index"], "an index not used by another curve")
        indices.add(curve["index"])
        for j, point in enumerate(curve["scan"]["points"]):
            if point["index"] != j:
                yield FieldFault(("curves", k, "scan", "points", j, "index"), point["index"],
                                 f"{j}: points are stored in scan order, indexed 0, 1, 2, ...")
            yield from file_checks.point_faults(point, ("curves", k, "scan", "points", j))
    labels: set[str] = set()
    for k, row in enumerate(data["rows"]):
        if row["run"] not in indices:
            yield FieldFault(("rows", k, "run"), row["run"], "the index of a stored curve "
                             f"({', '.join(map(str, sorted(indices))) or 'none stored'})")
        if row["configuration"] in labels:
            yield FieldFault(("rows", k, "configuration"), row["configuration"], "a label not used by another row")
        labels.add(row["configuration"])
        if row["meets"] and not (row["meets_target"] and row["within_limits"]):
            yield FieldFault(("rows", k, "meets"), row["meets"], "false unless meets_target and within_limits")
        if row["meets"] and row["device_hours"] is None:
            yield FieldFault(("rows", k, "device_hours"), None, "a device time (a row that meets has one)")


def plan_from_dict(data: Any, source: str = "data", parsed: bool = False) -> PlanResult:
    """Validate and rebuild a PlanResult from :func:`plan_to_dict` output (in memory, or a file's JSON when
    ``parsed``); ``ResultFileError`` naming the field and what is accepted."""
    if not parsed:
        data = as_json(data)
    validate(data, SCHEMA, source, (plan_faults,))
    curves = []
    for k, curve in enumerate(data["curves"]):
        scan = curve["scan"]
        points = tuple(build_point(p, source, ("curves", k, "scan", "points", j)) for j, p in enumerate(scan["points"]))
        curves.append(RunCurve(index=int(curve["index"]), label=curve["label"],
                               scan=ScanResult(points=points, configuration=dict(scan["configuration"]),
                                               warm_start=scan["warm_start"])))
    return PlanResult(rows=tuple(dict(r) for r in data["rows"]), curves=tuple(curves),
                      skipped=tuple(dict(s) for s in data["skipped"]), target=float(data["target"]),
                      limits=dict(data["limits"]), noise_threshold=bool(data["noise_threshold"]),
                      shared={k: int(v) for k, v in data["shared"].items()})


def save_plan(plan: PlanResult, path: str | os.PathLike) -> None:
    """Write ``plan`` to ``path`` as JSON, atomically."""
    write_json_atomic(plan_to_dict(plan), path)


def load_plan(path: str | os.PathLike) -> PlanResult:
    """Read a plan saved by :meth:`PlanResult.save`; ``ResultFileError`` for anything else, naming the field and
    what is accepted (the schema is :data:`groundkit.file_schemas.PLAN`)."""
    data = read_json(path, "a groundkit plan saved by PlanResult.save")
    return plan_from_dict(data, source=str(path), parsed=True)
