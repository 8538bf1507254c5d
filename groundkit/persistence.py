"""Saving and loading results as JSON: a schema name and version, strict validation, atomic writes.

Loading parses JSON and checks every field's type; it never executes anything (no pickle).
"""

from __future__ import annotations

import json
import math
import os
import re
import tempfile
from dataclasses import asdict
from typing import Any

import numpy as np

from .errors import ResultFileError
from .result import History, ReferenceRecord, Resources, RunResult

SCHEMA = "groundkit.run-result"
VERSION = 1


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
    }


def write_json_atomic(data: Any, path: str | os.PathLike) -> None:
    """Write ``data`` as JSON via a temporary file in the same folder, flushed to disk, then renamed over
    ``path``: a crash never leaves half a file under the final name."""
    text = json.dumps(data, indent=1, allow_nan=False, default=_jsonable)
    folder = os.path.dirname(os.path.abspath(path))
    fd, tmp = tempfile.mkstemp(prefix=".groundkit-", suffix=".tmp", dir=folder)
    try:
        with os.fdopen(fd, "w", encoding="utf-8") as fh:
            fh.write(text)
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, path)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise


def read_json(path: str | os.PathLike, expected: str) -> Any:
    """Parsed JSON of ``path``; ``ResultFileError`` naming ``expected`` when the file is not readable JSON."""
    try:
        with open(path, encoding="utf-8") as fh:
            return json.load(fh)
    except UnicodeDecodeError:
        raise ResultFileError(f"{path}: not a text file; expected {expected} (JSON)") from None
    except json.JSONDecodeError as err:
        raise ResultFileError(
            f"{path}: not valid JSON ({err.msg} at line {err.lineno}, column {err.colno}); the file may be "
            f"truncated. Expected {expected}"
        ) from None


def save_result(result: RunResult, path: str | os.PathLike) -> None:
    """Write ``result`` to ``path`` as JSON, atomically (see :func:`write_json_atomic`)."""
    write_json_atomic(result_to_dict(result), path)


def load_result(path: str | os.PathLike) -> RunResult:
    """Read a result saved by :meth:`RunResult.save`; ``ResultFileError`` for anything else."""
    return result_from_dict(read_json(path, "a groundkit result saved by RunResult.save"), source=str(path))


def result_pipeline(result: RunResult, source: str = "this result") -> Any:
    """The Pipeline that made ``result``, rebuilt from the component records and molecule of its provenance;
    ResultFileError for a file written before those records existed (or one holding an unrecorded component)."""
    from .records import pipeline_from_provenance

    return pipeline_from_provenance(result.provenance, source)


def check_schema(data: Any, schema: str, version: int, source: str, kind: str) -> None:
    """``ResultFileError`` unless ``data`` is a dict carrying ``schema`` and ``version``; ``kind`` names the
    expected content in the message ('result', 'scan')."""
    if not isinstance(data, dict) or "schema" not in data:
        raise ResultFileError(f"{source}: no 'schema' field; expected a groundkit {kind} with schema {schema!r}")
    if data["schema"] != schema:
        raise ResultFileError(f"{source}: schema {data['schema']!r} is not {schema!r}")
    if data.get("version") != version:
        raise ResultFileError(f"{source}: schema version {data.get('version')!r}; this groundkit reads {version}")


def result_from_dict(data: Any, source: str = "data") -> RunResult:
    """Validate and rebuild a RunResult from :func:`result_to_dict` output."""
    check_schema(data, SCHEMA, VERSION, source, "result")
    v = _Validator(source)
    history = v.obj(data, "history", dict)
    reference = v.obj(data, "reference", dict)
    resources = v.obj(data, "resources", dict)
    return RunResult(
        energy=v.number(data, "energy"),
        standard_error=v.number(data, "standard_error"),
        exact_energy=None if data.get("exact_energy") is None else v.number(data, "exact_energy"),
        parameters=np.array(v.numbers(data, "parameters"), dtype=float),
        parameter_labels=tuple(v.strings(data, "parameter_labels")),
        history=History(
            energies=tuple(v.numbers(history, "energies")),
            gradient_norms=tuple(v.numbers(history, "gradient_norms", nullable=True)),
            wall_times=tuple(v.numbers(history, "wall_times")),
            evaluations=tuple(int(x) for x in v.numbers(history, "evaluations")),
        ),
        converged=v.obj(data, "converged", bool),
        stop_reason=v.obj(data, "stop_reason", str),
        reference=ReferenceRecord(
            energy=v.number(reference, "energy"),
            multiplicity=int(v.number(reference, "multiplicity")),
            spin_square=v.number(reference, "spin_square"),
            amplitudes=v.number_map(reference, "amplitudes"),
            method=v.obj(reference, "method", str),
        ),
        baselines=v.number_map(data, "baselines", nullable=True),
        amplitudes=v.number_map(data, "amplitudes"),
        fidelity=v.number(data, "fidelity"),
        spin_square=v.number(data, "spin_square"),
        particle_number=v.number(data, "particle_number"),
        resources=Resources(**{k: (None if resources.get(k) is None else int(v.number(resources, k)))
                               for k in ("qubits", "parameters", "pauli_terms", "measurement_groups",
                                         "two_qubit_gates", "depth")}),
        provenance=v.obj(data, "provenance", dict),
        growth=tuple(v.growth(data)) if "growth" in data else (),  # files written before adaptive runs have none
        # files written before the baseline checks have neither
        suspect_baselines=v.string_map(data, "suspect_baselines") if "suspect_baselines" in data else {},
        baseline_notes=v.string_map(data, "baseline_notes") if "baseline_notes" in data else {},
    )


class _Validator:
    def __init__(self, source: str) -> None:
        self.source = source

    def fail(self, key: str, expected: str, value: Any) -> ResultFileError:
        shown = repr(value)
        shown = shown if len(shown) < 60 else shown[:57] + "..."
        return ResultFileError(f"{self.source}: field {key!r} is {shown}; expected {expected}")

    def obj(self, data: dict, key: str, kind: type) -> Any:
        if key not in data:
            raise ResultFileError(f"{self.source}: field {key!r} is missing; the file is not a complete result")
        value = data[key]
        if not isinstance(value, kind):
            raise self.fail(key, kind.__name__, value)
        return value

    def number(self, data: dict, key: str) -> float:
        value = data.get(key)
        if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
            raise self.fail(key, "a finite number", value)
        return float(value)

    def numbers(self, data: dict, key: str, nullable: bool = False) -> list:
        values = self.obj(data, key, list)
        out = []
        for x in values:
            if x is None and nullable:
                out.append(None)
            elif isinstance(x, bool) or not isinstance(x, (int, float)):
                raise self.fail(key, "a list of numbers", values)
            else:
                out.append(x)
        return out

    def growth(self, data: dict) -> list[dict]:
        """Growth records: objects whose values are numbers, strings, booleans or null, and whose ``operators`` is a
        list of excitations ``[[creators], [annihilators]]`` or Pauli-string labels such as ``"X0 Y2 X3"``."""
        steps = self.obj(data, "growth", list)
        for k, step in enumerate(steps):
            if not isinstance(step, dict):
                raise self.fail(f"growth[{k}]", "an object", step)
            for name, value in step.items():
                if value is None or isinstance(value, (bool, int, float, str)):
                    continue
                if name == "operators" and isinstance(value, list) and all(_grown_operator(op) for op in value):
                    continue
                raise self.fail(f"growth[{k}].{name}", "a number, string, boolean, null or operator list", value)
        return [dict(step) for step in steps]

    def strings(self, data: dict, key: str) -> list[str]:
        values = self.obj(data, key, list)
        if not all(isinstance(x, str) for x in values):
            raise self.fail(key, "a list of strings", values)
        return values

    def string_map(self, data: dict, key: str) -> dict[str, str]:
        values = self.obj(data, key, dict)
        for k, x in values.items():
            if not isinstance(x, str):
                raise self.fail(f"{key}.{k}", "a string", x)
        return dict(values)

    def number_map(self, data: dict, key: str, nullable: bool = False) -> dict:
        values = self.obj(data, key, dict)
        for k, x in values.items():
            if x is None and nullable:
                continue
            if isinstance(x, bool) or not isinstance(x, (int, float)):
                raise self.fail(f"{key}.{k}", "a number", x)
        return dict(values)


_PAULI_LABEL = re.compile(r"[XYZ]\d+( [XYZ]\d+)*")


def _grown_operator(op: Any) -> bool:
    """A growth record's operator: ``[[ints], [ints]]`` (an excitation) or a Pauli-string label ("X0 Y2 X3")."""
    if isinstance(op, str):
        return _PAULI_LABEL.fullmatch(op) is not None
    return isinstance(op, list) and len(op) == 2 and all(
        isinstance(part, list) and all(isinstance(i, int) and not isinstance(i, bool) for i in part) for part in op)


def _jsonable(value: Any) -> Any:
    if isinstance(value, np.generic):
        return value.item()
    if isinstance(value, np.ndarray):
        return value.tolist()
    return repr(value)
