"""The checks of groundkit files that a JSON Schema cannot express: equal lengths, index order, indices in range.

Each check takes data that already passed its schema (:mod:`groundkit.file_schemas`) and yields
:class:`~groundkit.file_reading.FieldFault` records, so its refusals read like the schema's:
``<file>: <field path> is <value>; expected <what is accepted>``.
"""

from __future__ import annotations

import json
from collections.abc import Iterator
from typing import Any

from .file_reading import FieldFault, Path

HISTORY = ("energies", "gradient_norms", "wall_times", "evaluations")


def result_faults(data: dict[str, Any], at: Path = ()) -> Iterator[FieldFault]:
    """A run result: one label per parameter, resources.parameters equal to that count, equal history lengths."""
    n = len(data["parameters"])
    if len(data["parameter_labels"]) != n:
        yield FieldFault((*at, "parameters"), data["parameters"], f"{len(data['parameter_labels'])} numbers, one "
                                                                  "per entry of parameter_labels")
    counted = data["resources"]["parameters"]
    if counted is not None and counted != n:
        yield FieldFault((*at, "resources", "parameters"), counted,
                         f"{n}, the number of entries of parameters")
    history = data["history"]
    length = len(history["energies"])
    for name in HISTORY[1:] + ("standard_errors",):
        if name == "standard_errors" and not history.get(name):  # optional, absent from older files
            continue
        if len(history[name]) != length:
            yield FieldFault((*at, "history", name), history[name],
                             f"one entry per iteration, as many as history.energies ({length})")


def handover_faults(handover: dict[str, Any], at: Path) -> Iterator[FieldFault]:
    """An orbital-matching handover: a rectangular orbital matrix, one parameter index and scale per excitation,
    indices inside the parameters and spin orbitals inside the orbitals."""
    if "orbitals" not in handover:
        return
    rows = handover["orbitals"]
    width = len(rows[0])
    for k, row in enumerate(rows):
        if len(row) != width or not row:
            yield FieldFault((*at, "orbitals", k), row, f"a row of {max(width, 1)} coefficients, as long as the "
                                                        "first row (the matrix is rectangular)")
            return
    n_excitations = len(handover["excitations"])
    for name in ("parameter_index", "scale"):
        if len(handover[name]) != n_excitations:
            yield FieldFault((*at, name), handover[name], f"one entry per excitation ({n_excitations})")
            return
    n_parameters = len(handover["parameters"])
    for k, index in enumerate(handover["parameter_index"]):
        if index >= n_parameters:
            yield FieldFault((*at, "parameter_index", k), index,
                             f"an index below {n_parameters}, the number of parameters")
            return
    spin_orbitals = 2 * width
    for k, excitation in enumerate(handover["excitations"]):
        for side, indices in enumerate(excitation):
            for j, p in enumerate(indices):
                if p >= spin_orbitals:
                    yield FieldFault((*at, "excitations", k, side, j), p,
                                     f"a spin-orbital index below {spin_orbitals} (twice the {width} orbitals)")
                    return


def point_faults(point: dict[str, Any], at: Path) -> Iterator[FieldFault]:
    """One scan point: its result and its handover."""
    if point["result"] is not None:
        yield from result_faults(point["result"], (*at, "result"))
    if point["handover"] is not None:
        yield from handover_faults(point["handover"], (*at, "handover"))


def scan_faults(data: dict[str, Any]) -> Iterator[FieldFault]:
    """A scan: points stored in scan order with indices 0, 1, 2, ... (none repeated or reversed), each point sound."""
    for k, point in enumerate(data["points"]):
        if point["index"] != k:
            yield FieldFault(("points", k, "index"), point["index"],
                             f"{k}: points are stored in scan order, indexed 0, 1, 2, ... (each index once)")
        yield from point_faults(point, ("points", k))


def point_file_faults(data: dict[str, Any]) -> Iterator[FieldFault]:
    """A checkpoint point file: its point is sound."""
    yield from point_faults(data["point"], ("point",))


def index_of_file(point: dict[str, Any], index: int, name: str, at: Path = ("point",)) -> Iterator[FieldFault]:
    """A checkpoint point file holds the point its name gives (``point-00003.json`` holds index 3)."""
    if point["index"] != index:
        yield FieldFault((*at, "index"), point["index"], f"{index}, the index in the file name {name}")


def point_against_scan(point: dict[str, Any], description: dict[str, Any], at: Path = ("point",)) \
        -> Iterator[FieldFault]:
    """A checkpoint point against the scan it belongs to (``description``, JSON as in the manifest): its index is
    a point of the scan, its value is that point's value and its molecule that point's molecule."""
    entries = description["points"]
    index = point["index"]
    if index >= len(entries):
        yield FieldFault((*at, "index"), index, f"an index below {len(entries)}, the number of scan points")
        return
    value, molecule = entries[index]
    if point["value"] != value:
        yield FieldFault((*at, "value"), point["value"], f"{value!r}, the value of scan point {index}")
    elif isinstance(molecule, dict) and point["molecule"] != molecule:
        path, stored, expected = _first_difference(point["molecule"], molecule, (*at, "molecule"))
        yield FieldFault(path, stored, f"{json.dumps(expected)[:60]}, as in the molecule of scan point {index} "
                                       f"(value {value!r})")


def _first_difference(found: Any, expected: Any, path: Path) -> tuple[Path, Any, Any]:
    """(path, found value, expected value) of the first place where two JSON values differ."""
    while True:
        if isinstance(found, dict) and isinstance(expected, dict):
            key = next((k for k in list(expected) + list(found) if found.get(k) != expected.get(k)), None)
            if key is None or key not in found or key not in expected:
                return path, found, expected
            found, expected, path = found[key], expected[key], (*path, key)
        elif isinstance(found, list) and isinstance(expected, list) and len(found) == len(expected):
            k = next(i for i, (a, b) in enumerate(zip(found, expected)) if a != b)
            found, expected, path = found[k], expected[k], (*path, k)
        else:
            return path, found, expected
