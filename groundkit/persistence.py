"""Saving and loading results as JSON: a schema name and version, strict validation, atomic writes.

Loading parses JSON strictly and validates it against the JSON Schema document
:data:`groundkit.file_schemas.RUN_RESULT` plus the checks of :mod:`groundkit.file_checks`; it never executes
anything (no pickle). Every refusal is a ``ResultFileError`` naming the file, the field and what is accepted.
"""

from __future__ import annotations

import json
import os
import tempfile
from dataclasses import asdict
from typing import Any

import numpy as np

from . import file_checks, file_reading, file_schemas
from .result import History, ReferenceRecord, Resources, RunResult

SCHEMA = file_schemas.RUN_RESULT_NAME
VERSION = file_schemas.VERSION


def result_to_dict(result: RunResult) -> dict[str, Any]:
    """Plain JSON-ready dict of a RunResult, with schema name and version."""
    return {
        "schema": SCHEMA,
        "version": VERSION,
        "energy": float(result.energy),
        "standard_error": float(result.standard_error),
        "exact_energy": None if result.exact_energy is None else float(result.exact_energy),
        "parameters": [float(x) for x in result.parameters],
        "parameter_labels": list(result.parameter_labels),
        "history": {k: list(v) for k, v in asdict(result.history).items()},
        "converged": bool(result.converged),
        "stop_reason": result.stop_reason,
        "reference": asdict(result.reference),
        "baselines": dict(result.baselines),
        "suspect_baselines": dict(result.suspect_baselines),
        "baseline_notes": dict(result.baseline_notes),
        "amplitudes": dict(result.amplitudes),
        "fidelity": float(result.fidelity),
        "spin_square": float(result.spin_square),
        "particle_number": float(result.particle_number),
        "resources": asdict(result.resources),
        "provenance": result.provenance,
        "growth": [dict(step) for step in result.growth],
        **({} if result.noise is None else {"noise": result.noise}),
        **({"active_space_error": dict(result.active_space_error)} if result.active_space_error else {}),
        **({"orbital_optimisation": dict(result.orbital_optimisation)} if result.orbital_optimisation else {}),
    }


def write_json_atomic(data: Any, path: str | os.PathLike) -> None:
    """Write ``data`` as JSON via a temporary file in the same folder, flushed to disk, then renamed over
    ``path``: a crash never leaves half a file under the final name. The file gets the mode an ordinary
    ``open`` would give it (0o666 less the process umask), not the private 0o600 of a temporary file."""
    text = json.dumps(data, indent=1, allow_nan=False, default=_jsonable)
    folder = os.path.dirname(os.path.abspath(path))
    fd, tmp = tempfile.mkstemp(prefix=".groundkit-", suffix=".tmp", dir=folder)
    try:
        if hasattr(os, "fchmod"):
            os.fchmod(fd, 0o666 & ~process_umask())
        with os.fdopen(fd, "w", encoding="utf-8") as fh:
            fh.write(text)
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, path)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise


def process_umask() -> int:
    """This process's file-creation mask, read without changing it where Linux reports it (``/proc``); elsewhere
    set and restored at once."""
    try:
        with open("/proc/self/status", encoding="ascii") as fh:
            for line in fh:
                if line.startswith("Umask:"):
                    return int(line.split()[1], 8)
    except (OSError, ValueError, IndexError):
        pass
    mask = os.umask(0o022)
    os.umask(mask)
    return mask


def read_json(path: str | os.PathLike, expected: str) -> Any:
    """Parsed JSON of ``path``; ``ResultFileError`` naming ``expected`` when the file is not readable JSON. Tokens
    no groundkit file may hold (NaN, Infinity, 1e400, repeated keys) are kept for validation to name
    (see :func:`groundkit.file_reading.parse`)."""
    return file_reading.read_json(path, expected)


def save_result(result: RunResult, path: str | os.PathLike) -> None:
    """Write ``result`` to ``path`` as JSON, atomically (see :func:`write_json_atomic`)."""
    write_json_atomic(result_to_dict(result), path)


def load_result(path: str | os.PathLike) -> RunResult:
    """Read a result saved by :meth:`RunResult.save`; ``ResultFileError`` for anything else, naming the field and
    what is accepted (the schema is :data:`groundkit.file_schemas.RUN_RESULT`)."""
    data = read_json(path, "a groundkit result saved by RunResult.save")
    return result_from_dict(data, source=str(path), parsed=True)


def result_from_dict(data: Any, source: str = "data", parsed: bool = False) -> RunResult:
    """Validate and rebuild a RunResult from :func:`result_to_dict` output (a dict in memory, or a file's JSON when
    ``parsed``); ``ResultFileError`` naming the field and what is accepted."""
    if not parsed:
        data = file_reading.as_json(data)
    file_reading.validate(data, SCHEMA, source, (file_checks.result_faults,))
    return build_result(data)


def result_pipeline(result: RunResult, source: str = "this result") -> Any:
    """The Pipeline that made ``result``, rebuilt from the component records and molecule of its provenance;
    ResultFileError for a file written before those records existed (or one holding an unrecorded component)."""
    from .records import pipeline_from_provenance

    return pipeline_from_provenance(result.provenance, source)


def build_result(data: dict[str, Any]) -> RunResult:
    """A RunResult from a dict that passed validation (:data:`groundkit.file_schemas.RUN_RESULT` and
    :func:`groundkit.file_checks.result_faults`)."""
    history, reference, resources = data["history"], data["reference"], data["resources"]
    return RunResult(
        energy=float(data["energy"]),
        standard_error=float(data["standard_error"]),
        exact_energy=_float_or_none(data.get("exact_energy")),
        parameters=np.array(data["parameters"], dtype=float),
        parameter_labels=tuple(data["parameter_labels"]),
        history=History(
            energies=tuple(float(x) for x in history["energies"]),
            gradient_norms=tuple(_float_or_none(x) for x in history["gradient_norms"]),
            wall_times=tuple(float(x) for x in history["wall_times"]),
            evaluations=tuple(int(x) for x in history["evaluations"]),
            standard_errors=tuple(_float_or_none(x) for x in history.get("standard_errors", ())),  # absent before
        ),
        converged=data["converged"],
        stop_reason=data["stop_reason"],
        reference=ReferenceRecord(
            energy=float(reference["energy"]),
            multiplicity=int(reference["multiplicity"]),
            spin_square=float(reference["spin_square"]),
            amplitudes={k: float(v) for k, v in reference["amplitudes"].items()},
            method=reference["method"],
        ),
        baselines={k: _float_or_none(v) for k, v in data["baselines"].items()},
        amplitudes={k: float(v) for k, v in data["amplitudes"].items()},
        fidelity=float(data["fidelity"]),
        spin_square=float(data["spin_square"]),
        particle_number=float(data["particle_number"]),
        resources=_resources(resources),
        provenance=data["provenance"],
        growth=tuple(_growth_step(step) for step in data.get("growth", ())),  # absent before adaptive runs
        # files written before the baseline checks have neither
        suspect_baselines=dict(data.get("suspect_baselines", {})),
        noise=data.get("noise"),  # absent before noisy runs recorded their noise, and for other estimators
        baseline_notes=dict(data.get("baseline_notes", {})),
        # absent before the active-space error and orbital-optimised runs existed
        active_space_error=_space_error(data.get("active_space_error")),
        orbital_optimisation=None if data.get("orbital_optimisation") is None else dict(data["orbital_optimisation"]),
    )


def _space_error(data: dict[str, Any] | None) -> dict[str, Any] | None:
    if data is None:
        return None
    return {"active_energy": float(data["active_energy"]), "full_energy": float(data["full_energy"]),
            "against": str(data["against"]), "note": str(data.get("note", "")),
            "error_mha": float(data["error_mha"])}


RESOURCE_FIELDS = ("qubits", "parameters", "pauli_terms", "measurement_groups", "two_qubit_gates", "depth")
DEVICE_COUNT_FIELDS = ("logical_two_qubit_gates", "logical_depth", "swaps", "device_shots")
"""Resource counts of results with a device; absent from files written before devices (loaded as None)."""


def _resources(data: dict[str, Any]) -> Resources:
    counts = {k: None if data.get(k) is None else int(data[k]) for k in (*RESOURCE_FIELDS, *DEVICE_COUNT_FIELDS)}
    seconds = data.get("device_seconds")
    return Resources(**counts, device=data.get("device"), device_seconds=None if seconds is None else float(seconds),
                     **_measurement_gates(data))
_FLOAT_FIELDS = ("gradient", "gradient_norm", "energy", "error", "wall_time")


def _measurement_gates(resources: dict) -> dict[str, Any]:
    """The measurement circuits' two-qubit gates (absent from files written before they were counted)."""
    worst = resources.get("measurement_two_qubit_gates_worst")
    mean = resources.get("measurement_two_qubit_gates_mean")
    return {"measurement_two_qubit_gates_worst": None if worst is None else int(worst),
            "measurement_two_qubit_gates_mean": _float_or_none(mean)}


def _float_or_none(value: Any) -> float | None:
    return None if value is None else float(value)


def _growth_step(step: dict[str, Any]) -> dict[str, Any]:
    """A growth record with whole numbers as ints and energies as floats (as ``GrowthStep.to_dict`` writes them)."""
    out = dict(step)
    for name in ("step", "parameters", "iterations", "two_qubit_gates"):
        out[name] = None if out[name] is None else int(out[name])
    for name in _FLOAT_FIELDS:
        out[name] = _float_or_none(out[name])
    return out


def _jsonable(value: Any) -> Any:
    if isinstance(value, np.generic):
        return value.item()
    if isinstance(value, np.ndarray):
        return value.tolist()
    return repr(value)


jsonable = _jsonable
"""JSON form of NumPy values; the repr of anything else JSON cannot hold (the writer's ``default``)."""
