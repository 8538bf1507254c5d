"""Plan files (TOML) and their command, ``python -m groundkit plan study.toml [--resume | --overwrite]``.

Layout (``[molecule]``, ``[geometries]`` and ``[choices]`` required)::

    title = "LiH bond breaking"
    [molecule]     as in a study file (symbols and coordinates, xyz or xyz_file; basis, charge, ...)
    [geometries]   bond = [i, j]; values = [...] or start, stop, points (the molecule's length unit)
    [choices]      active_space = [{electrons = 2, orbitals = 3}, ...]; mapping, trial_state, minimiser, device,
                   mitigation = [name or {name = "...", option = ...}, ...]; tapering = [false, true];
                   grouping = ["qwc", "none"]
    [limits]       qubits, two_qubit_gates, shots_per_energy, device_hours, noise_threshold
    [plan]         target (Ha, default 1.6e-3), noise_threshold (true/false), warm_start, executor
    [output]       directory (default: the file's name without .toml, beside it)

Written to the output directory: ``plan.csv`` (the table), ``plan.png`` (frontier and recommended curve),
``plan.json`` (the plan file, ``gk.load_plan``), ``plan.html`` (a self-contained report), ``summary.txt`` and
``checkpoint/`` (one directory per shared run; ``--resume`` continues from it).
"""

from __future__ import annotations

import os
import shutil
import tomllib
from dataclasses import dataclass
from typing import Any

from groundkit.errors import GroundkitError, OutputExistsError

from .errors import StudyFileError
from .toml_file import EXECUTORS, _molecule, _Reader

PLAN_KEYS: dict[str, tuple[str, ...]] = {
    "": ("title", "molecule", "geometries", "choices", "limits", "plan", "output"),
    "geometries": ("bond", "values", "start", "stop", "points"),
    "choices": ("active_space", "mapping", "tapering", "trial_state", "minimiser", "grouping", "device",
                "mitigation"),
    "limits": ("qubits", "two_qubit_gates", "shots_per_energy", "device_hours", "noise_threshold"),
    "plan": ("target", "noise_threshold", "warm_start", "executor"),
    "output": ("directory",),
}
OUTPUTS = ("plan.csv", "plan.png", "plan.json", "plan.html", "summary.txt", "checkpoint")


@dataclass(frozen=True)
class PlanStudy:
    """A checked plan file: everything ``gk.plan`` takes, and where to write."""

    title: str
    geometries: tuple[Any, list[float]]
    choices: dict[str, list[Any]]
    limits: dict[str, Any]
    target: float
    noise_threshold: bool | None
    warm_start: bool | int
    executor: str
    output: str
    source: str


def read_plan_file(path: str | os.PathLike) -> PlanStudy:
    """Parse and check a TOML plan file; ``StudyFileError`` naming the key and line for anything wrong."""
    from .geometries import BondStretch

    source = os.fspath(path)
    try:
        with open(source, "rb") as fh:
            text = fh.read().decode("utf-8", errors="replace")
    except OSError as err:
        raise StudyFileError(f"{source}: cannot be read ({err.strerror}); give the path of a TOML plan file") \
            from None
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as err:
        raise StudyFileError(f"{source}: not valid TOML: {err}") from None
    r = _Reader(text, source)
    _check(r, "", data)
    for table in ("molecule", "geometries", "choices"):
        if table not in data or not isinstance(data[table], dict):
            raise StudyFileError(f"{source}: no [{table}] table; a plan file needs [molecule], [geometries] and "
                                 "[choices]")
    for table in PLAN_KEYS:
        if table and table in data:
            if not isinstance(data[table], dict):
                raise r.fail("", table, f"{data[table]!r} is not a table; write it as [{table}]")
            _check(r, table, data[table])
    molecule = _molecule(r, data["molecule"], os.path.dirname(os.path.abspath(source)))
    bond, values = _geometries(r, data["geometries"], molecule)
    choices = {role: _candidates(r, role, given) for role, given in data["choices"].items()}
    settings = data.get("plan", {})
    target = r.get("plan", settings, "target", (int, float), 1.6e-3, "a number of Hartree > 0")
    noise = r.get("plan", settings, "noise_threshold", (bool,), None, "true or false")
    warm = r.get("plan", settings, "warm_start", (bool, int), True, "true, false or a number of chains >= 1")
    executor = r.get("plan", settings, "executor", (str,), "serial", f"one of {EXECUTORS}")
    if executor not in EXECUTORS:
        raise r.fail("plan", "executor", f"{executor!r} is not accepted; use one of {', '.join(EXECUTORS)}")
    default_out = os.path.splitext(os.path.abspath(source))[0]
    output = r.get("output", data.get("output", {}), "directory", (str,), default_out, "a path")
    if not os.path.isabs(output):
        output = os.path.join(os.path.dirname(os.path.abspath(source)), output)
    title = r.get("", data, "title", (str,), os.path.basename(default_out), "a string")
    return PlanStudy(title=title, geometries=(BondStretch(molecule, *bond), values), choices=choices,
                     limits=dict(data.get("limits", {})), target=float(target), noise_threshold=noise,
                     warm_start=warm, executor=executor, output=output, source=source)


def _check(r: _Reader, table: str, data: dict) -> None:
    for key in data:
        if key not in PLAN_KEYS.get(table, (key,)):
            what = "table" if table == "" else f"key in [{table}]"
            raise r.fail(table, key, f"unknown {what} {key!r}; accepted: {', '.join(PLAN_KEYS[table])}")


def _geometries(r: _Reader, table: dict, molecule: Any) -> tuple[tuple[int, int], list[float]]:
    """``bond = [i, j]`` and ``values = [...]`` (or ``start``, ``stop``, ``points``) of ``[geometries]``."""
    bond = r.get("geometries", table, "bond", (list,), None, "a pair of atom indices [i, j]")
    if bond is None or len(bond) != 2 or not all(isinstance(i, int) and not isinstance(i, bool) for i in bond) \
            or len(set(bond)) != 2 or not all(0 <= i < molecule.n_atoms for i in bond):
        raise r.fail("geometries", "bond" if bond is not None else None,
                     f"bond = {bond!r}: give two different atom indices in 0..{molecule.n_atoms - 1}")
    if "values" in table:
        values = r.get("geometries", table, "values", (list,), None, "a list of numbers")
        if not values or not all(isinstance(v, (int, float)) and not isinstance(v, bool) for v in values):
            raise r.fail("geometries", "values", f"{values!r} must be a non-empty list of numbers")
        return (bond[0], bond[1]), [float(v) for v in values]
    start = r.get("geometries", table, "start", (int, float), None, "a number")
    stop = r.get("geometries", table, "stop", (int, float), None, "a number")
    count = r.get("geometries", table, "points", (int,), None, "an integer >= 1")
    if start is None or stop is None or count is None or count < 1:
        raise r.fail("geometries", None, "give values = [...], or start, stop and points (>= 1)")
    step = (stop - start) / (count - 1) if count > 1 else 0.0
    return (bond[0], bond[1]), [float(start + k * step) for k in range(count)]


def _candidates(r: _Reader, role: str, given: Any) -> list[Any]:
    """Components of one role from names, {name = ..., options} tables, booleans (tapering) or plain strings."""
    from groundkit import components as _c

    items = given if isinstance(given, list) else [given]
    out = []
    for item in items:
        if role in ("tapering", "grouping", "mitigation", "device") and not isinstance(item, dict):
            out.append(item)
            continue
        if isinstance(item, dict):
            options = {k: v for k, v in item.items() if k != "name"}
            name = item.get("name", "active-space" if role == "active_space" else None)
        else:
            name, options = item, {}
        if not isinstance(name, str):
            raise r.fail("choices", role, f"{item!r} is neither a name nor {{name = \"...\", option = ...}}")
        try:
            out.append(_c.as_component(role, name, **options))
        except GroundkitError as err:
            raise r.fail("choices", role, str(err)) from None
    return out


def run_plan_file(study: PlanStudy, *, resume: bool = False, overwrite: bool = False,
                  progress: bool = True) -> str:
    """Run the plan file; returns the summary text (also written to ``summary.txt``)."""
    from groundkit.upcalls import upcall

    from .planning import plan

    if resume and overwrite:
        raise StudyFileError(f"{study.source}: resume and overwrite exclude each other; give one of them")
    existing = [n for n in OUTPUTS if os.path.exists(os.path.join(study.output, n))]
    if existing and not (resume or overwrite):
        raise OutputExistsError(
            f"{study.source}: output directory {study.output!r} already holds {', '.join(existing)}; run with "
            "--resume to continue it, with --overwrite to replace it, or set [output] directory to another folder")
    if overwrite:
        for name in existing:
            path = os.path.join(study.output, name)
            shutil.rmtree(path) if os.path.isdir(path) else os.unlink(path)
    os.makedirs(study.output, exist_ok=True)
    try:
        result = plan(study.geometries, study.choices, study.target, study.limits,
                      noise_threshold=study.noise_threshold,
                      executor=None if study.executor == "serial" else study.executor,
                      checkpoint=os.path.join(study.output, "checkpoint"), warm_start=study.warm_start,
                      progress=progress)
    except GroundkitError as err:
        raise StudyFileError(f"{study.source}: {err}") from None
    out = study.output
    result.table.to_csv(os.path.join(out, "plan.csv"), index=False)
    result.plot(os.path.join(out, "plan.png"))
    result.save(os.path.join(out, "plan.json"))
    with open(os.path.join(out, "plan.html"), "w", encoding="utf-8") as fh:
        fh.write(f"<!DOCTYPE html><html><head><meta charset='utf-8'><title>{_escape(study.title)}</title></head>"
                 f"<body><h2>{_escape(study.title)}</h2>{upcall('html:plan', result)}</body></html>\n")
    text = f"{study.title}\n\n{result.summary()}\n"
    with open(os.path.join(out, "summary.txt"), "w", encoding="utf-8") as fh:
        fh.write(text)
    return text


def _escape(text: str) -> str:
    from html import escape

    return escape(text)
