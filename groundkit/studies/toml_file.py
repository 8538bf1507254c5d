"""Reading a study description from TOML: strict keys, typed values, errors naming the key and its line.

Layout (every table but ``[molecule]`` optional)::

    title = "H2 stretch"
    [molecule]        symbols, coordinates | xyz | xyz_file, basis, charge, multiplicity, unit, name
    [active_space]    the options of ActiveSpace (electrons, orbitals, indices, frozen_core, ...), or name = "..."
                      of a registered active space with its options
    [components]      mapping, trial_state, estimator, minimiser: a registered name (built-in or a user's), or
                      {name = "...", option = ...}; nested components the same way, e.g. pool = "generalised"

Component options are checked by the component classes themselves (one mechanism, see docs/components.md):
an unknown option names the key, its line and the accepted options.
    [scan]            bond = [i, j]; values = [...] or start, stop, points; warm_start; executor
    [output]          directory (default: the file's name without .toml, beside it)
"""

from __future__ import annotations

import os
import re
import tomllib
from dataclasses import dataclass
from typing import Any

from groundkit.errors import GroundkitError
from groundkit.molecule import MoleculeSpec
from groundkit.pipeline import Pipeline
from groundkit.registry import lookup

from .errors import StudyFileError

KEYS: dict[str, tuple[str, ...]] = {
    "": ("title", "molecule", "active_space", "components", "scan", "output"),
    "molecule": ("symbols", "coordinates", "xyz", "xyz_file", "basis", "charge", "multiplicity", "unit", "name"),
    "components": ("mapping", "trial_state", "estimator", "minimiser"),
    "scan": ("bond", "values", "start", "stop", "points", "warm_start", "executor"),
    "output": ("directory",),
}
EXECUTORS = ("serial", "processes")


@dataclass(frozen=True)
class ScanPlan:
    """The ``[scan]`` table: atoms (i, j) whose distance takes each value (the molecule's unit)."""

    bond: tuple[int, int]
    values: tuple[float, ...]
    warm_start: bool | int
    executor: str


@dataclass(frozen=True)
class Study:
    """A checked study file: the pipeline to run, an optional scan, and where to write."""

    title: str
    pipeline: Any
    scan: ScanPlan | None
    output: str
    source: str


class _Lines:
    """Finds the line where a key is defined, for error messages."""

    def __init__(self, text: str) -> None:
        self.lines = text.splitlines()

    def quote(self, number: int | None) -> str:
        """The text of line ``number`` (from 1), as it follows an error message: a new line, then ``  6 | ...``;
        empty when there is no such line."""
        if number is None or not 1 <= number <= len(self.lines):
            return ""
        text = self.lines[number - 1].rstrip()
        return f"\n  {number} | {text[:200]}"

    def of(self, table: str, key: str | None = None) -> int | None:
        current = ""
        for number, line in enumerate(self.lines, start=1):
            header = re.match(r"^\s*\[\s*([^\]]+?)\s*\]", line)
            if header:
                current = header.group(1).strip().strip('"')
                if key is None and current == table or table == "" and current == key:
                    return number
                continue
            if key is not None and current == table and re.match(rf'^\s*"?{re.escape(key)}"?\s*=', line):
                return number
        return None


class _Reader:
    def __init__(self, text: str, source: str) -> None:
        self.lines = _Lines(text)
        self.source = source

    def fail(self, table: str, key: str | None, message: str) -> StudyFileError:
        line = self.lines.of(table, key)
        where = f"{table}.{key}" if table and key else (key or table)
        at = f" (line {line})" if line else ""
        return StudyFileError(f"{self.source}: {where}{at}: {message}{self.lines.quote(line)}")

    def check_keys(self, table: str, data: dict) -> None:
        if table not in KEYS:  # options of a component: its class checks them
            return
        for key in data:
            if key not in KEYS[table]:
                accepted = ", ".join(KEYS[table])
                what = "table" if table == "" else f"key in [{table}]"
                raise self.fail(table, key, f"unknown {what} {key!r}; accepted: {accepted}")

    def get(self, table: str, data: dict, key: str, kinds: tuple, default: Any = None, what: str = "") -> Any:
        if key not in data:
            return default
        value = data[key]
        if isinstance(value, bool) and bool not in kinds or not isinstance(value, kinds):
            raise self.fail(table, key, f"{value!r} is not {what or ' or '.join(k.__name__ for k in kinds)}")
        return value


def read_study(path: str | os.PathLike) -> Study:
    """Parse and check a TOML study file; ``StudyFileError`` naming the key and line for anything wrong."""
    source = os.fspath(path)
    try:
        with open(source, "rb") as fh:
            raw = fh.read()
    except OSError as err:
        raise StudyFileError(f"{source}: cannot be read ({err.strerror}); give the path of a TOML study file") \
            from None
    text = raw.decode("utf-8", errors="replace")
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as err:
        found = re.search(r"at line (\d+)", str(err))
        quoted = _Lines(text).quote(int(found.group(1)) if found else None)
        raise StudyFileError(f"{source}: not valid TOML: {err}{quoted}") from None
    r = _Reader(text, source)
    r.check_keys("", data)
    for table in ("molecule", "active_space", "components", "scan", "output"):
        if table in data:
            if not isinstance(data[table], dict):
                raise r.fail("", table, f"{data[table]!r} is not a table; write it as [{table}]")
            r.check_keys(table, data[table])
    if "molecule" not in data:
        raise StudyFileError(f"{source}: no [molecule] table; a study needs one (symbols and coordinates, or xyz)")
    molecule = _molecule(r, data["molecule"], os.path.dirname(os.path.abspath(source)))
    pipeline = _pipeline(r, molecule, data.get("active_space"), data.get("components", {}))
    scan = _scan(r, data["scan"], molecule) if "scan" in data else None
    default_out = os.path.splitext(os.path.abspath(source))[0]
    output = r.get("output", data.get("output", {}), "directory", (str,), default_out, "a path")
    if not os.path.isabs(output):
        output = os.path.join(os.path.dirname(os.path.abspath(source)), output)
    title = r.get("", data, "title", (str,), os.path.basename(default_out), "a string")
    return Study(title=title, pipeline=pipeline, scan=scan, output=output, source=source)


def _molecule(r: _Reader, table: dict, folder: str) -> Any:

    options = {
        "basis": r.get("molecule", table, "basis", (str,), "sto-3g", "a basis-set name"),
        "charge": r.get("molecule", table, "charge", (int,), 0, "an integer"),
        "multiplicity": r.get("molecule", table, "multiplicity", (int,), 1, "an integer 2S+1"),
        "unit": r.get("molecule", table, "unit", (str,), "angstrom", "'angstrom' or 'bohr'"),
        "name": r.get("molecule", table, "name", (str,), None, "a string"),
    }
    given = [k for k in ("coordinates", "xyz", "xyz_file") if k in table]
    if len(given) != 1:
        raise r.fail("molecule", given[-1] if given else None,
                     f"give exactly one of coordinates (with symbols), xyz or xyz_file; found {given or 'none'}")
    key = given[0]
    try:
        if key == "coordinates":
            symbols = r.get("molecule", table, "symbols", (list,), None, "a list of element symbols")
            if symbols is None:
                raise r.fail("molecule", "coordinates", "coordinates need symbols = [...] beside them")
            coordinates = r.get("molecule", table, "coordinates", (list,), None, "a list of [x, y, z] rows")
            return MoleculeSpec(symbols=tuple(symbols), coordinates=coordinates, **options)
        if "symbols" in table:
            raise r.fail("molecule", "symbols", f"symbols go with coordinates, not with {key}")
        value = r.get("molecule", table, key, (str,), None, "a string")
        if key == "xyz_file" and not os.path.isabs(value):
            value = os.path.join(folder, value)
        if key == "xyz_file" and not os.path.isfile(value):
            raise r.fail("molecule", key, f"file {value!r} does not exist")
        return MoleculeSpec.from_xyz(value, **options)
    except StudyFileError:
        raise
    except GroundkitError as err:
        raise r.fail("molecule", key, str(err)) from None


def _pipeline(r: _Reader, molecule: Any, space: dict | None, components: dict) -> Any:

    pipeline = Pipeline(molecule)
    if space is not None:
        options = dict(space)
        name = options.pop("name", "active-space")
        try:
            pipeline = pipeline.active_space(name, **options)
        except GroundkitError as err:
            key = _refused_key(name, "active_space", options) or next(
                (k for k in options if f"({k}=" in str(err)), None)
            raise r.fail("active_space", key, str(err)) from None
    for role in KEYS["components"]:
        if role not in components:
            continue
        value = components[role]
        if isinstance(value, str):
            name, options = value, {}
        elif isinstance(value, dict) and isinstance(value.get("name"), str):
            options = {k: v for k, v in value.items() if k != "name"}
            name = value["name"]
        else:
            raise r.fail("components", role, f"{value!r} is neither a name nor {{name = \"...\", option = ...}}")
        try:
            pipeline = getattr(pipeline, role)(name, **options)
        except GroundkitError as err:
            raise r.fail("components", role, str(err)) from None
    return pipeline


def _refused_key(name: Any, role: str, options: dict) -> str | None:
    """The first option key the named class does not take (for the line number), else None."""

    try:
        accepted = lookup(role, name).accepted_options()
    except GroundkitError:
        return "name"
    return next((k for k in options if k not in accepted), None)


def _scan(r: _Reader, table: dict, molecule: Any) -> ScanPlan:
    bond = r.get("scan", table, "bond", (list,), None, "a pair of atom indices [i, j]")
    if bond is None:
        raise r.fail("scan", None, "a scan needs bond = [i, j], the atoms whose distance is scanned")
    if len(bond) != 2 or not all(isinstance(i, int) and not isinstance(i, bool) for i in bond) or \
            len(set(bond)) != 2 or not all(0 <= i < molecule.n_atoms for i in bond):
        raise r.fail("scan", "bond", f"{bond!r} must be two different atom indices in 0..{molecule.n_atoms - 1}")
    if "values" in table:
        if any(k in table for k in ("start", "stop", "points")):
            raise r.fail("scan", "values", "give values, or start, stop and points, not both")
        values = r.get("scan", table, "values", (list,), None, "a list of numbers")
        if not values:
            raise r.fail("scan", "values", "is empty; give at least one value")
        if not all(isinstance(v, (int, float)) and not isinstance(v, bool) for v in values):
            raise r.fail("scan", "values", f"{values!r} must be numbers (the molecule's length unit)")
    else:
        missing = [k for k in ("start", "stop", "points") if k not in table]
        if missing:
            raise r.fail("scan", None, f"missing {', '.join(missing)}; give values = [...] or start, stop, points")
        start = r.get("scan", table, "start", (int, float), what="a number")
        stop = r.get("scan", table, "stop", (int, float), what="a number")
        count = r.get("scan", table, "points", (int,), what="an integer >= 1")
        if count < 1:
            raise r.fail("scan", "points", f"{count} must be at least 1")
        step = (stop - start) / (count - 1) if count > 1 else 0.0
        values = [start + k * step for k in range(count)]
    warm = r.get("scan", table, "warm_start", (bool, int), True, "true, false or a number of chains >= 1")
    if not isinstance(warm, bool) and warm < 1:
        raise r.fail("scan", "warm_start", f"{warm} must be true, false or a number of chains >= 1")
    executor = r.get("scan", table, "executor", (str,), "serial", f"one of {EXECUTORS}")
    if executor not in EXECUTORS:
        raise r.fail("scan", "executor", f"{executor!r} is not accepted; use one of {', '.join(EXECUTORS)}")
    return ScanPlan(bond=(bond[0], bond[1]), values=tuple(float(v) for v in values), warm_start=warm,
                    executor=executor)
