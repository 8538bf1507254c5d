"""The JSON Schema documents (Draft 2020-12) of every file groundkit writes: run results, scans, checkpoint
manifests, checkpoint point files and plans.

The documents are plain dicts, readable as JSON Schema by any validator. ``description`` of each node is what an
error message says is accepted there. Three facts hold for every file before a schema sees it (checked by
:mod:`groundkit.file_reading`, since JSON Schema has no words for them): every number is finite (no NaN,
Infinity, 1e400, or integers beyond 300 digits), no key appears twice in one object, and nothing nests deeper than
64 arrays and objects. "Plain JSON" below therefore means any JSON value of that kind. Checks that relate two
fields (lengths, index order) live in :mod:`groundkit.file_checks`.

Fields added after version 1 was first written (``growth``, ``suspect_baselines``, ``baseline_notes``,
``exact_energy``, the device fields of ``resources``, ``noise``, ``active_space_error``,
``orbital_optimisation``) are optional, so files of earlier releases still load. Records that later releases may
extend (top level, provenance, resources, checkpoint envelopes) accept additional keys of plain JSON; loading
ignores them.
"""

from __future__ import annotations

from typing import Any

DRAFT = "https://json-schema.org/draft/2020-12/schema"
VERSION = 1
RUN_RESULT_NAME = "groundkit.run-result"
SCAN_NAME = "groundkit.scan-result"
MANIFEST_NAME = "groundkit.scan-checkpoint"
POINT_FILE_NAME = "groundkit.scan-point"
PLAN_NAME = "groundkit.plan-result"
VERSION_TEXT = f"the whole number {VERSION} (the version this groundkit reads)"
CHECKPOINT_VERSION = 2  # checkpoint point files carry a checksum since version 2
CHECKPOINT_VERSIONS = (1, 2)  # version 1 (earlier releases): point files without a checksum
MAX_DEPTH = 64
"""Deepest nesting of arrays and objects accepted in a file (groundkit writes at most about 12)."""
ROUNDING = 1e-6
"""Slack beyond the bounds of quantities computed in floating point (fidelity ≤ 1, ⟨S²⟩ ≥ 0, |amplitude| ≤ 1)."""


def _ref(name: str) -> dict[str, str]:
    return {"$ref": f"#/$defs/{name}"}


def _nullable(name: str, description: str) -> dict[str, Any]:
    """``name``'s schema or null."""
    return {"anyOf": [{"type": "null"}, _ref(name)], "description": description}


def _list_of(name: str, description: str) -> dict[str, Any]:
    return {"type": "array", "items": _ref(name), "description": description}


def _map_of(name: str, description: str) -> dict[str, Any]:
    return {"type": "object", "additionalProperties": _ref(name), "description": description}


PAULI_LABEL = r"^[XYZ][0-9]+( [XYZ][0-9]+)*$"

DEFS: dict[str, Any] = {
    "plain": {"description": "plain JSON"},
    "number": {"type": "number", "description": "a finite number"},
    "non_negative": {"type": "number", "minimum": 0, "description": "a finite number ≥ 0"},
    "count": {"type": "integer", "minimum": 0, "description": "a whole number ≥ 0 (not a boolean)"},
    "text": {"type": "string", "description": "a string"},
    "flag": {"type": "boolean", "description": "true or false"},
    "number_or_null": {"type": ["number", "null"], "description": "a finite number or null"},
    "count_or_null": {"type": ["integer", "null"], "minimum": 0, "description": "a whole number ≥ 0 or null"},
    "non_negative_or_null": {"type": ["number", "null"], "minimum": 0, "description": "a finite number ≥ 0 or null"},
    "amplitude": {"type": "number", "minimum": -1 - ROUNDING, "maximum": 1 + ROUNDING,
                  "description": "an amplitude from −1 to 1"},
    "spin_square": {"type": "number", "minimum": -ROUNDING, "description": "⟨S²⟩, a number ≥ 0"},
    "orbital_indices": {"type": "array", "items": _ref("count"),
                        "description": "a list of spin-orbital indices (whole numbers ≥ 0)"},
    "excitation": {"type": "array", "prefixItems": [_ref("orbital_indices"), _ref("orbital_indices")],
                   "minItems": 2, "maxItems": 2,
                   "description": "an excitation [[creators], [annihilators]] of spin-orbital indices"},
    "pauli_label": {"type": "string", "pattern": PAULI_LABEL,
                    "description": "a Pauli-string label such as \"X0 Y2 X3\""},
    "operator": {"anyOf": [_ref("pauli_label"), _ref("excitation")],
                 "description": "an excitation [[creators], [annihilators]] or a Pauli-string label such as "
                                "\"X0 Y2 X3\""},
    "history": {
        "type": "object",
        "required": ["energies", "gradient_norms", "wall_times", "evaluations"],
        "properties": {
            "energies": _list_of("number", "a list of finite energies (Ha), one per iteration"),
            "gradient_norms": _list_of("non_negative_or_null", "a list of gradient norms (≥ 0, or null where "
                                                               "unknown), one per iteration"),
            "wall_times": _list_of("non_negative", "a list of wall times (s, ≥ 0), one per iteration"),
            "evaluations": _list_of("count", "a list of whole numbers ≥ 0 (cumulative evaluations), one per "
                                             "iteration"),
            "standard_errors": _list_of("non_negative_or_null", "a list of standard errors (Ha, ≥ 0, or null "
                                                                "where unknown), one per iteration"),  # optional
        },
        "additionalProperties": _ref("plain"),
        "description": "an object with energies, gradient_norms, wall_times and evaluations",
    },
    "reference": {
        "type": "object",
        "required": ["energy", "multiplicity", "spin_square", "amplitudes", "method"],
        "properties": {
            "energy": _ref("number"),
            "multiplicity": {"type": "integer", "minimum": 1, "description": "a whole number 2S+1 ≥ 1"},
            "spin_square": _ref("spin_square"),
            "amplitudes": _map_of("amplitude", "an object: determinant label → amplitude from −1 to 1"),
            "method": _ref("text"),
        },
        "additionalProperties": _ref("plain"),
        "description": "an object with energy, multiplicity, spin_square, amplitudes and method",
    },
    "resources": {
        "type": "object",
        "required": ["qubits", "parameters", "pauli_terms", "measurement_groups", "two_qubit_gates", "depth"],
        "properties": {
            "qubits": _ref("count"),
            "parameters": _ref("count"),
            "pauli_terms": _ref("count_or_null"),
            "measurement_groups": _ref("count_or_null"),
            "two_qubit_gates": _ref("count_or_null"),
            "depth": _ref("count_or_null"),
            "device": {"type": ["string", "null"], "description": "a device name or null"},
            "logical_two_qubit_gates": _ref("count_or_null"),
            "logical_depth": _ref("count_or_null"),
            "swaps": _ref("count_or_null"),
            "device_shots": _ref("count_or_null"),
            "device_seconds": _ref("non_negative_or_null"),
            "measurement_two_qubit_gates_worst": _ref("count_or_null"),  # optional: files before issue 16
            "measurement_two_qubit_gates_mean": _ref("number_or_null"),
        },
        "additionalProperties": _ref("plain"),
        "description": "an object with qubits, parameters, pauli_terms, measurement_groups, two_qubit_gates and "
                       "depth (and, from results with a device, device, logical_two_qubit_gates, logical_depth, "
                       "swaps, device_shots and device_seconds)",
    },
    "provenance": {
        "type": "object",
        "required": ["versions", "time", "configuration"],
        "properties": {
            "versions": {"type": "object", "description": "an object: library → version"},
            "time": _ref("text"),
            "configuration": {"type": "object", "description": "an object describing the pipeline"},
        },
        "additionalProperties": _ref("plain"),
        "description": "an object with versions, time and configuration",
    },
    "growth_step": {
        "type": "object",
        "required": ["step", "operators", "label", "gradient", "gradient_norm", "energy", "error", "parameters",
                     "two_qubit_gates", "iterations", "minimiser_converged", "wall_time"],
        "properties": {
            "step": _ref("count"),
            "operators": _list_of("operator", "a list of excitations [[creators], [annihilators]] or Pauli-string "
                                              "labels"),
            "label": _ref("text"),
            "gradient": _ref("number_or_null"),
            "gradient_norm": _ref("non_negative_or_null"),
            "energy": _ref("number"),
            "error": _ref("number"),
            "parameters": _ref("count"),
            "two_qubit_gates": _ref("count_or_null"),
            "iterations": _ref("count"),
            "minimiser_converged": _ref("flag"),
            "wall_time": _ref("non_negative"),
        },
        "additionalProperties": False,
        "description": "a growth record (step, operators, label, gradient, gradient_norm, energy, error, "
                       "parameters, two_qubit_gates, iterations, minimiser_converged, wall_time)",
    },
    "noise_record": {
        "type": "object",
        "required": ["noise_model", "simulator", "mitigation", "kept_fraction"],
        "properties": {
            "noise_model": {"type": "object", "description": "an object with the error figures and durations"},
            "simulator": {"enum": ["density-matrix", "trajectories"],
                          "description": "\"density-matrix\" or \"trajectories\""},
            "mitigation": _list_of("text", "a list of mitigation names"),
            "kept_fraction": {"type": "number", "minimum": 0, "maximum": 1 + ROUNDING,
                              "description": "a fraction from 0 to 1"},
            "extrapolation": {"type": ["object", "null"], "description": "a zero-noise fit (an object) or null"},
        },
        "additionalProperties": _ref("plain"),
        "description": "a noise record (noise_model, simulator, mitigation, kept_fraction, ...)",
    },
    "run_result": {
        "type": "object",
        "required": ["schema", "version", "energy", "standard_error", "parameters", "parameter_labels", "history",
                     "converged", "stop_reason", "reference", "baselines", "amplitudes", "fidelity", "spin_square",
                     "particle_number", "resources", "provenance"],
        "properties": {
            "schema": {"const": RUN_RESULT_NAME, "description": f"\"{RUN_RESULT_NAME}\""},
            "version": {"type": "integer", "const": VERSION, "description": VERSION_TEXT},
            "energy": _ref("number"),
            "standard_error": _ref("non_negative"),
            "exact_energy": _ref("number_or_null"),
            "parameters": _list_of("number", "a list of finite parameters (radians), one per parameter label"),
            "parameter_labels": _list_of("text", "a list of strings, one per parameter"),
            "history": _ref("history"),
            "converged": _ref("flag"),
            "stop_reason": _ref("text"),
            "reference": _ref("reference"),
            "baselines": _map_of("number_or_null", "an object: method → energy (Ha) or null"),
            "suspect_baselines": _map_of("text", "an object: method → reason (a string)"),
            "baseline_notes": _map_of("text", "an object: method → note (a string)"),
            "amplitudes": _map_of("amplitude", "an object: determinant label → amplitude from −1 to 1"),
            "fidelity": {"type": "number", "minimum": 0, "maximum": 1 + ROUNDING,
                         "description": "a fidelity from 0 to 1"},
            "spin_square": _ref("spin_square"),
            "particle_number": {"type": "number", "minimum": -ROUNDING, "description": "⟨N⟩, a number ≥ 0"},
            "resources": _ref("resources"),
            "provenance": _ref("provenance"),
            "growth": _list_of("growth_step", "a list of growth records"),
            "noise": _ref("noise_record"),
            "active_space_error": _ref("space_error"),
            "orbital_optimisation": _ref("plain_object"),
        },
        "additionalProperties": _ref("plain"),
        "description": "a groundkit run result (a JSON object)",
    },
    "space_error": {
        "type": "object",
        "required": ["active_energy", "full_energy", "against", "error_mha"],
        "properties": {"active_energy": _ref("number"), "full_energy": _ref("number"), "against": _ref("text"),
                       "note": _ref("text"), "error_mha": _ref("number")},
        "additionalProperties": _ref("plain"),
        "description": "an active-space error (active_energy, full_energy in Ha, against, error_mha)",
    },
    "plain_object": {"type": "object", "additionalProperties": _ref("plain"), "description": "a JSON object"},
    "molecule": {
        "type": "object",
        "required": ["symbols", "coordinates", "charge", "multiplicity", "basis", "unit", "name"],
        "properties": {
            "symbols": {"type": "array", "items": _ref("text"), "minItems": 1, "maxItems": 1000,
                        "description": "a list of 1 to 1000 element symbols"},
            "coordinates": {"type": "array", "maxItems": 1000,
                            "items": {"type": "array", "items": _ref("number"), "minItems": 3, "maxItems": 3,
                                      "description": "three finite numbers (x, y, z)"},
                            "description": "a list of (x, y, z) rows, one per atom"},
            "charge": {"type": "integer", "description": "a whole number"},
            "multiplicity": {"type": "integer", "minimum": 1, "description": "a whole number 2S+1 ≥ 1"},
            "basis": {"type": "string", "minLength": 1, "maxLength": 200, "description": "a basis-set name"},
            "unit": {"enum": ["angstrom", "bohr"], "description": "\"angstrom\" or \"bohr\""},
            "name": {"type": ["string", "null"], "description": "a string or null"},
        },
        "additionalProperties": False,
        "description": "a molecule record (symbols, coordinates, charge, multiplicity, basis, unit, name)",
    },
    "handover": {
        "type": "object",
        "properties": {
            "kind": {"enum": ["orbital-matching", "parameter-reuse"],
                     "description": "\"orbital-matching\" or \"parameter-reuse\""},
            "orbitals": {"type": "array", "minItems": 1,
                         "items": _list_of("number", "a row of finite orbital coefficients"),
                         "description": "a matrix (list of rows) of active orbital coefficients"},
            "excitations": _list_of("excitation", "a list of excitations [[creators], [annihilators]]"),
            "parameter_index": _list_of("count", "a list of parameter indices (whole numbers ≥ 0)"),
            "scale": _list_of("number", "a list of finite factors"),
            "parameters": _list_of("number", "a list of finite parameters (radians)"),
            "n_qubits": _ref("count"),
            "trial_state": _ref("text"),
            "strings": _list_of("pauli_label", "a list of Pauli-string labels"),
        },
        "dependentRequired": {"orbitals": ["excitations", "parameter_index", "scale", "parameters"],
                              "strings": ["parameters"]},
        "allOf": [
            {"if": {"required": ["kind"], "properties": {"kind": {"const": "orbital-matching"}}},
             "then": {"required": ["orbitals"]}},
            {"if": {"required": ["kind"], "properties": {"kind": {"const": "parameter-reuse"}}},
             "then": {"required": ["parameters", "n_qubits"]}},
        ],
        "additionalProperties": _ref("plain"),
        "description": "a warm-start handover object",
    },
    "scan_point": {
        "type": "object",
        "required": ["index", "value", "molecule", "result", "failure", "start", "orbital_match", "wall_time",
                     "handover"],
        "properties": {
            "index": _ref("count"),
            "value": _ref("number"),
            "molecule": _nullable("molecule", "a molecule record or null"),
            "result": _nullable("run_result", "a run result or null"),
            "failure": {"type": ["string", "null"], "description": "a failure message or null"},
            "start": _ref("text"),
            "orbital_match": {"type": ["number", "null"], "minimum": 0, "maximum": 1 + ROUNDING,
                              "description": "an overlap from 0 to 1, or null"},
            "wall_time": _ref("non_negative"),
            "handover": _nullable("handover", "a warm-start handover object or null"),
            "earlier_failures": {"type": "array", "items": _ref("text"),
                                 "description": "a list of earlier failure messages (retried points)"},
            "orbital_jump": {"type": ["string", "null"], "description": "a CASSCF jump report or null"},
        },
        "allOf": [
            {"if": {"properties": {"result": {"type": "null"}}},
             "then": {"properties": {"failure": {"type": "string", "description": "a failure message (a point "
                                                                                  "without a result says why)"}}}},
            {"if": {"properties": {"result": {"type": "object"}}},
             "then": {"properties": {"molecule": {"type": "object", "description": "a molecule record (a point "
                                                                                  "with a result has one)"}}}},
        ],
        "additionalProperties": False,
        "description": "a scan point (index, value, molecule, result, failure, start, orbital_match, wall_time, "
                       "handover)",
    },
    "fingerprint": {"type": "string", "pattern": "^[0-9a-f]{64}$",
                    "description": "a SHA-256 fingerprint (64 hexadecimal digits)"},
}


def _document(name: str, title: str, body: dict[str, Any]) -> dict[str, Any]:
    """A top-level schema document whose ``$defs`` carry every shared definition."""
    return {"$schema": DRAFT, "$id": f"https://groundkit.invalid/schemas/{name}.json", "title": title, **body,
            "$defs": DEFS}


def _envelope(schema_name: str, versions: tuple[int, ...] = (VERSION,)) -> dict[str, Any]:
    accepted = " or ".join(str(v) for v in versions)
    return {"schema": {"const": schema_name, "description": f"\"{schema_name}\""},
            "version": {"type": "integer", "enum": list(versions),
                        "description": f"the whole number {accepted} (the version this groundkit reads)"}}


RUN_RESULT = _document("run-result", "groundkit run result", DEFS["run_result"])
"""A file written by ``RunResult.save``."""

SCAN = _document("scan-result", "groundkit scan", {
    "type": "object",
    "required": ["schema", "version", "configuration", "warm_start", "points"],
    "properties": {
        **_envelope(SCAN_NAME),
        "configuration": {"type": "object", "additionalProperties": _ref("text"),
                          "description": "an object: role → description (a string)"},
        "warm_start": _ref("text"),
        "points": _list_of("scan_point", "a list of scan points"),
    },
    "additionalProperties": _ref("plain"),
    "description": "a groundkit scan (a JSON object)",
})
"""A file written by ``ScanResult.save``."""

MANIFEST = _document("scan-checkpoint", "groundkit scan checkpoint manifest", {
    "type": "object",
    "required": ["schema", "version", "fingerprint", "description"],
    "properties": {
        **_envelope(MANIFEST_NAME, CHECKPOINT_VERSIONS),
        "fingerprint": _ref("fingerprint"),
        "description": {
            "type": "object",
            "required": ["warm_start", "points"],
            "properties": {
                "warm_start": _ref("text"),
                "points": {"type": "array",
                           "items": {"type": "array", "minItems": 2, "maxItems": 2,
                                     "prefixItems": [_ref("number"), {"type": ["object", "string"],
                                                                      "description": "a molecule record or a "
                                                                                     "failure message"}],
                                     "description": "a pair [value, molecule record or failure message]"},
                           "description": "a list of [value, molecule or failure] pairs"},
            },
            "additionalProperties": _ref("plain"),
            "description": "an object describing the scan (components, warm_start, points)",
        },
    },
    "additionalProperties": _ref("plain"),
    "description": "a groundkit checkpoint manifest (a JSON object)",
})
"""``manifest.json`` of a checkpoint directory."""

POINT_FILE = _document("scan-point", "groundkit checkpoint point file", {
    "type": "object",
    "required": ["schema", "version", "fingerprint", "point"],
    "properties": {**_envelope(POINT_FILE_NAME, CHECKPOINT_VERSIONS), "fingerprint": _ref("fingerprint"),
                   "point": _ref("scan_point")},
    "additionalProperties": _ref("plain"),
    "description": "a groundkit checkpoint point file (a JSON object)",
})
"""``point-NNNNN.json`` of a checkpoint directory."""

_PLAN_ROW_NUMBERS = ("worst_error_mha", "worst_geometry", "non_parallelity_mha", "shots_per_energy", "shot_time_us",
                     "device_hours", "noise_threshold", "active_space_error_mha")
_PLAN_ROW_COUNTS = ("qubits", "two_qubit_gates", "depth", "swaps")
_PLAN_ROW_TEXTS = ("configuration", "active_space", "mapping", "trial_state", "minimiser", "grouping", "device",
                   "mitigation", "reason", "notes")
PLAN_ROW = {
    "type": "object",
    "required": [*_PLAN_ROW_TEXTS, "run", *_PLAN_ROW_NUMBERS[:6], *_PLAN_ROW_COUNTS, "evaluations",
                 "energy_estimates", "meets_target", "within_limits", "meets"],
    "properties": {
        **{name: _ref("text") for name in _PLAN_ROW_TEXTS},
        "run": _ref("count"),
        **{name: _ref("number_or_null") for name in _PLAN_ROW_NUMBERS},
        **{name: _ref("count_or_null") for name in _PLAN_ROW_COUNTS},
        "evaluations": _ref("count"),
        "energy_estimates": _ref("count"),
        "meets_target": _ref("flag"),
        "within_limits": _ref("flag"),
        "meets": _ref("flag"),
    },
    "additionalProperties": False,
    "description": "a plan row (configuration, roles, run, errors, resources, shots, device time, verdicts)",
}
PLAN = _document("plan-result", "groundkit plan", {
    "type": "object",
    "required": ["schema", "version", "target", "limits", "noise_threshold", "shared", "rows", "curves", "skipped"],
    "properties": {
        **_envelope(PLAN_NAME),
        "target": {"type": "number", "exclusiveMinimum": 0, "description": "a finite number > 0 (Ha)"},
        "limits": {"type": "object",
                   "properties": {name: {"type": ["number", "null"], "exclusiveMinimum": 0,
                                         "description": "a cap > 0 or null"}
                                  for name in ("qubits", "two_qubit_gates", "shots_per_energy", "device_hours",
                                               "noise_threshold")},
                   "additionalProperties": False,
                   "description": "an object of caps (qubits, two_qubit_gates, shots_per_energy, device_hours, "
                                  "noise_threshold), each > 0 or null"},
        "noise_threshold": _ref("flag"),
        "shared": {"type": "object", "additionalProperties": _ref("count"),
                   "description": "an object: figure → whole number ≥ 0"},
        "rows": {"type": "array", "items": PLAN_ROW, "description": "a list of plan rows"},
        "curves": {"type": "array", "items": {
            "type": "object", "required": ["index", "label", "scan"],
            "properties": {"index": _ref("count"), "label": _ref("text"), "scan": {
                "type": "object", "required": ["configuration", "warm_start", "points"],
                "properties": {"configuration": {"type": "object", "additionalProperties": _ref("text"),
                                                 "description": "an object: role → description (a string)"},
                               "warm_start": _ref("text"),
                               "points": _list_of("scan_point", "a list of scan points")},
                "additionalProperties": False, "description": "a scan (configuration, warm_start, points)"}},
            "additionalProperties": False, "description": "a shared run (index, label, scan)"},
            "description": "a list of shared runs"},
        "skipped": {"type": "array", "items": {
            "type": "object", "required": ["configuration", "reason"],
            "properties": {"configuration": _ref("text"), "reason": _ref("text")}, "additionalProperties": False,
            "description": "a skipped configuration (configuration, reason)"},
            "description": "a list of skipped configurations"},
    },
    "additionalProperties": _ref("plain"),
    "description": "a groundkit plan (a JSON object)",
})
"""A file written by ``PlanResult.save``."""

ENVELOPE_VERSIONS = {RUN_RESULT_NAME: (VERSION,), SCAN_NAME: (VERSION,), MANIFEST_NAME: CHECKPOINT_VERSIONS,
                     POINT_FILE_NAME: CHECKPOINT_VERSIONS, PLAN_NAME: (VERSION,)}
ENVELOPES = {name: _document(f"{name}-envelope", f"{name} envelope", {
    "type": "object", "required": ["schema", "version"], "properties": _envelope(name, ENVELOPE_VERSIONS[name]),
    "description": f"a groundkit file with \"schema\": \"{name}\""})
    for name in ENVELOPE_VERSIONS}
"""The schema name and version alone, checked first so that a file of another kind or version says so."""

DOCUMENTS = {RUN_RESULT_NAME: RUN_RESULT, SCAN_NAME: SCAN, MANIFEST_NAME: MANIFEST, POINT_FILE_NAME: POINT_FILE,
             PLAN_NAME: PLAN}
"""Schema name → JSON Schema document."""
