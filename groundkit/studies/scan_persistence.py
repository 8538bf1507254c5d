"""Scans and checkpoint files as JSON: schema name and version, validation on load against the JSON Schema documents
of :mod:`groundkit.file_schemas` (and :mod:`groundkit.file_checks`), atomic writes; nothing is executed on load."""

from __future__ import annotations

import os
import re
from typing import Any

from groundkit import file_checks, file_schemas
from groundkit.errors import (
    BasisError,
    ChargeError,
    ElementError,
    GeometryError,
    GroundkitError,
    MultiplicityError,
    ResultFileError,
)
from groundkit.file_reading import FieldFault, Path, as_json, plain_fault, schema_fault, validate
from groundkit.molecule import MoleculeSpec
from groundkit.persistence import build_result, read_json, result_to_dict, write_json_atomic
from groundkit.records import pipeline_from_provenance

from .scan_result import ScanPoint, ScanResult

SCHEMA = file_schemas.SCAN_NAME
VERSION = file_schemas.VERSION


def molecule_to_dict(molecule: MoleculeSpec) -> dict[str, Any]:
    return {"symbols": list(molecule.symbols), "coordinates": [list(c) for c in molecule.coordinates],
            "charge": molecule.charge, "multiplicity": molecule.multiplicity, "basis": molecule.basis,
            "unit": molecule.unit, "name": molecule.name}


def molecule_from_dict(data: Any, source: str, at: Path = ("molecule",)) -> MoleculeSpec:
    """The MoleculeSpec of a molecule record (JSON that passed the schema's ``molecule`` definition); the
    molecule's own checks (elements, distances, charge and spin, basis) become a ``ResultFileError`` naming the
    field ``at`` + the offending key."""
    if not isinstance(data, dict):
        raise FieldFault(at, data, "a molecule record").error(source)
    try:
        return MoleculeSpec(**data)
    except GroundkitError as err:
        key = next((k for kind, k in _MOLECULE_FIELDS if isinstance(err, kind)), None)
        path = at if key is None or key not in data else (*at, key)
        raise FieldFault(path, data if key is None or key not in data else data[key],
                         f"a valid molecule ({type(err).__name__}: {err})").error(source) from None
    except (TypeError, KeyError):
        raise FieldFault(at, data, "a molecule record (symbols, coordinates, charge, multiplicity, basis, unit, "
                                   "name)").error(source) from None


_MOLECULE_FIELDS = ((ElementError, "symbols"), (BasisError, "basis"), (ChargeError, "charge"),
                    (MultiplicityError, "multiplicity"), (GeometryError, "coordinates"))


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
        "earlier_failures": list(point.earlier_failures),
        **({"orbital_jump": point.orbital_jump} if point.orbital_jump else {}),
    }


def point_from_dict(data: Any, source: str) -> ScanPoint:
    """Validate and rebuild one scan point (:func:`point_to_dict` output, in memory)."""
    data = as_json(data)
    fault = plain_fault(data) or schema_fault(data, "scan_point")
    fault = fault or next(file_checks.point_faults(data, ()), None)
    if fault is not None:
        raise fault.error(source)
    return build_point(data, source, ())


def build_point(data: dict[str, Any], source: str, at: Path) -> ScanPoint:
    """The ScanPoint of a point record that passed validation; the molecule is checked by MoleculeSpec itself."""
    molecule = data["molecule"]
    return ScanPoint(
        index=int(data["index"]),
        value=float(data["value"]),
        molecule=None if molecule is None else molecule_from_dict(molecule, source, (*at, "molecule")),
        result=None if data["result"] is None else build_result(data["result"]),
        failure=data["failure"],
        start=data["start"],
        orbital_match=None if data["orbital_match"] is None else float(data["orbital_match"]),
        wall_time=float(data["wall_time"]),
        handover=data["handover"],
        earlier_failures=tuple(data.get("earlier_failures", ())),  # absent before retries were recorded
        orbital_jump=data.get("orbital_jump"),  # absent before CASSCF scans were checked for jumps
    )


def scan_to_dict(scan: ScanResult) -> dict[str, Any]:
    return {"schema": SCHEMA, "version": VERSION, "configuration": dict(scan.configuration),
            "warm_start": scan.warm_start, "points": [point_to_dict(p) for p in scan.points]}


def scan_from_dict(data: Any, source: str = "data", parsed: bool = False) -> ScanResult:
    """Validate and rebuild a ScanResult from :func:`scan_to_dict` output (in memory, or a file's JSON when
    ``parsed``); ``ResultFileError`` naming the field and what is accepted."""
    if not parsed:
        data = as_json(data)
    validate(data, SCHEMA, source, (file_checks.scan_faults,))
    points = tuple(build_point(p, source, ("points", k)) for k, p in enumerate(data["points"]))
    return ScanResult(points=points, configuration=dict(data["configuration"]), warm_start=data["warm_start"])


def read_manifest(path: str | os.PathLike) -> dict[str, Any]:
    """The validated JSON of a checkpoint's ``manifest.json`` (:data:`groundkit.file_schemas.MANIFEST`)."""
    data = read_json(path, "a groundkit checkpoint manifest")
    validate(data, file_schemas.MANIFEST_NAME, str(path))
    return data


def read_point_file(path: str | os.PathLike, description: dict[str, Any] | None = None,
                    fingerprint: str | None = None) -> tuple[dict[str, Any], ScanPoint]:
    """(validated JSON, ScanPoint) of a checkpoint point file ``point-NNNNN.json`` (:data:`groundkit.file_schemas.
    POINT_FILE`): its index is NNNNN. With the scan's ``description`` (as in the manifest) the point's index, value
    and molecule must be that scan's; that comparison is skipped when the file carries a ``fingerprint`` other than
    the one given (the caller refuses such a file as belonging to another scan)."""
    data = read_json(path, "a groundkit scan point")
    checks: list = [file_checks.point_file_faults]
    named = _POINT_FILE.fullmatch(os.path.basename(path))
    if named is not None:
        checks.append(lambda d: file_checks.index_of_file(d["point"], int(named.group(1)), os.path.basename(path)))
    if description is not None:
        scan = as_json(description)
        checks.append(lambda d: () if fingerprint not in (None, d["fingerprint"])
                      else file_checks.point_against_scan(d["point"], scan))
    validate(data, file_schemas.POINT_FILE_NAME, str(path), checks)
    return data, build_point(data["point"], str(path), ("point",))


_POINT_FILE = re.compile(r"point-([0-9]+)\.json")


def save_scan(scan: ScanResult, path: str | os.PathLike) -> None:
    """Write ``scan`` to ``path`` as JSON, atomically."""
    write_json_atomic(scan_to_dict(scan), path)


def load_scan(path: str | os.PathLike) -> ScanResult:
    """Read a scan saved by :meth:`ScanResult.save`; ``ResultFileError`` for anything else, naming the field and
    what is accepted (the schema is :data:`groundkit.file_schemas.SCAN`)."""
    data = read_json(path, "a groundkit scan saved by ScanResult.save")
    return scan_from_dict(data, source=str(path), parsed=True)


# rebuilding the scan ---------------------------------------------------------------------------------------------
def scan_pipeline(scan: ScanResult, source: str = "this scan") -> Any:
    """The scan's Pipeline without a molecule (``Pipeline().trial_state(...)...``), rebuilt from the component
    records of its points' provenance; ResultFileError when no point has a result, or the points were written
    before component records existed."""

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
