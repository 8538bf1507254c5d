"""Scans as JSON: schema name and version, validation on load, atomic writes; nothing is executed on load."""

from __future__ import annotations

import math
import os
from typing import Any

from groundkit.errors import GroundkitError, ResultFileError
from groundkit.molecule import MoleculeSpec
from groundkit.persistence import check_schema, read_json, result_from_dict, result_to_dict, write_json_atomic

from .scan_result import ScanPoint, ScanResult

SCHEMA = "groundkit.scan-result"
VERSION = 1


def molecule_to_dict(molecule: MoleculeSpec) -> dict[str, Any]:
    return {"symbols": list(molecule.symbols), "coordinates": [list(c) for c in molecule.coordinates],
            "charge": molecule.charge, "multiplicity": molecule.multiplicity, "basis": molecule.basis,
            "unit": molecule.unit, "name": molecule.name}


def molecule_from_dict(data: Any, source: str) -> MoleculeSpec:
    keys = ("symbols", "coordinates", "charge", "multiplicity", "basis", "unit", "name")
    if not isinstance(data, dict) or set(data) != set(keys):
        raise ResultFileError(f"{source}: molecule {str(data)[:60]!r} is not a molecule record with keys {keys}")
    try:
        return MoleculeSpec(**data)
    except (GroundkitError, TypeError) as err:
        raise ResultFileError(f"{source}: the stored molecule is not valid ({err})") from None


def point_to_dict(point: ScanPoint) -> dict[str, Any]:
    return {
        "index": point.index,
        "value": float(point.value),
        "molecule": None if point.molecule is None else molecule_to_dict(point.molecule),
        "result": None if point.result is None else result_to_dict(point.result),
        "failure": point.failure,
        "start": point.start,
        "orbital_match": point.orbital_match,
        "wall_time": float(point.wall_time),
        "handover": point.handover,
    }


def point_from_dict(data: Any, source: str) -> ScanPoint:
    if not isinstance(data, dict):
        raise ResultFileError(f"{source}: a scan point is {str(data)[:60]!r}; expected a JSON object")

    def get(key: str, kinds: tuple, nullable: bool = False) -> Any:
        if key not in data:
            raise ResultFileError(f"{source}: scan point field {key!r} is missing")
        value = data[key]
        if value is None and nullable:
            return None
        if isinstance(value, bool) and bool not in kinds or not isinstance(value, kinds):
            raise ResultFileError(f"{source}: scan point field {key!r} is {str(value)[:60]!r}; expected "
                                  f"{' or '.join(k.__name__ for k in kinds)}")
        if isinstance(value, float) and not math.isfinite(value):
            raise ResultFileError(f"{source}: scan point field {key!r} is {value!r}; expected a finite number")
        return value

    molecule = get("molecule", (dict,), nullable=True)
    result = get("result", (dict,), nullable=True)
    return ScanPoint(
        index=int(get("index", (int,))),
        value=float(get("value", (int, float))),
        molecule=None if molecule is None else molecule_from_dict(molecule, source),
        result=None if result is None else result_from_dict(result, source=source),
        failure=get("failure", (str,), nullable=True),
        start=get("start", (str,)),
        orbital_match=get("orbital_match", (int, float), nullable=True),
        wall_time=float(get("wall_time", (int, float))),
        handover=get("handover", (dict,), nullable=True),
    )


def scan_to_dict(scan: ScanResult) -> dict[str, Any]:
    return {"schema": SCHEMA, "version": VERSION, "configuration": dict(scan.configuration),
            "warm_start": scan.warm_start, "points": [point_to_dict(p) for p in scan.points]}


def scan_from_dict(data: Any, source: str = "data") -> ScanResult:
    check_schema(data, SCHEMA, VERSION, source, "scan")
    configuration, points = data.get("configuration"), data.get("points")
    if not isinstance(configuration, dict) or not all(isinstance(v, str) for v in configuration.values()):
        raise ResultFileError(f"{source}: field 'configuration' is {str(configuration)[:60]!r}; expected strings")
    if not isinstance(points, list):
        raise ResultFileError(f"{source}: field 'points' is {str(points)[:60]!r}; expected a list")
    warm_start = data.get("warm_start")
    if not isinstance(warm_start, str):
        raise ResultFileError(f"{source}: field 'warm_start' is {warm_start!r}; expected a string")
    return ScanResult(points=tuple(point_from_dict(p, source) for p in points), configuration=configuration,
                      warm_start=warm_start)


def save_scan(scan: ScanResult, path: str | os.PathLike) -> None:
    """Write ``scan`` to ``path`` as JSON, atomically."""
    write_json_atomic(scan_to_dict(scan), path)


def load_scan(path: str | os.PathLike) -> ScanResult:
    """Read a scan saved by :meth:`ScanResult.save`; ``ResultFileError`` for anything else."""
    return scan_from_dict(read_json(path, "a groundkit scan saved by ScanResult.save"), source=str(path))


# rebuilding the scan ---------------------------------------------------------------------------------------------
def scan_pipeline(scan: ScanResult, source: str = "this scan") -> Any:
    """The scan's Pipeline without a molecule (``Pipeline().trial_state(...)...``), rebuilt from the component
    records of its points' provenance; ResultFileError when no point has a result, or the points were written
    before component records existed."""
    from groundkit.records import pipeline_from_provenance

    finished = [p for p in scan.points if p.result is not None]
    if not finished:
        raise ResultFileError(f"{source}: no point has a result, so no component record to rebuild the pipeline from")
    return pipeline_from_provenance(finished[0].result.provenance, f"{source} (point {finished[0].index})",
                                    molecule=False)


class StoredGeometries:
    """The geometry function of a finished scan: each scan value gives back the MoleculeSpec stored for it.

    Picklable (a dict of molecules), so it runs in process pools; a value the scan did not have, or one whose
    geometry failed, raises ``ScanInputError`` (recorded as that point's failure)."""

    def __init__(self, scan: ScanResult) -> None:
        self.molecules = {float(p.value): p.molecule for p in scan.points}

    def __call__(self, value: float) -> MoleculeSpec:
        from .errors import ScanInputError

        molecule = self.molecules.get(float(value))
        if molecule is None:
            known = ", ".join(f"{v:g}" for v in self.molecules)
            raise ScanInputError(f"the stored scan has no molecule for value {value!r}; its values: {known}")
        return molecule


def warm_start_setting(label: str) -> bool | int:
    """The ``warm_start`` argument of a scan's stored label ('off', '1 chain', '3 chains')."""
    if label == "off":
        return False
    if label == "1 chain":
        return True
    count = label.split()[0]
    if label.endswith(" chains") and count.isdigit():
        return int(count)
    raise ResultFileError(f"warm start {label!r} is not one of 'off', '1 chain', 'k chains'")
