"""What a plan is asked: the geometries of the curve, the choices to cross per role, and the limits.

Every refusal is a :class:`PlanInputError` (a ``ScanInputError``, so a ``ValueError``) naming the bad value and
what is accepted. Device profiles, groupings and mitigations are checked against the registry
(:mod:`groundkit.registry`), the way every component name is.
"""

from __future__ import annotations

import math
import numbers
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, fields
from typing import Any

from groundkit import components as _c
from groundkit.estimators.grouping import grouping_names
from groundkit.molecule import MoleculeSpec

from .errors import ScanInputError


class PlanInputError(ScanInputError):
    """Geometries, choices or limits that cannot make a plan; the message names the value and what is accepted."""


ROLES = ("active_space", "mapping", "tapering", "trial_state", "minimiser", "grouping", "device", "mitigation")
"""The roles a plan crosses, in the order of a configuration's label."""

_ALIASES = {"active_spaces": "active_space", "mappings": "mapping", "taper": "tapering",
            "trial_states": "trial_state", "minimisers": "minimiser", "groupings": "grouping", "devices": "device",
            "device_profile": "device", "device_profiles": "device", "mitigations": "mitigation"}


# geometries --------------------------------------------------------------------------------------------------------
@dataclass(frozen=True)
class MoleculeList:
    """The geometry function of a plan given as a list of molecules: value k gives molecule k (picklable)."""

    molecules: tuple[MoleculeSpec, ...]

    def __call__(self, value: float) -> MoleculeSpec:
        k = int(value)
        if k != value or not 0 <= k < len(self.molecules):
            raise PlanInputError(f"geometry index {value!r} is not one of 0..{len(self.molecules) - 1}")
        return self.molecules[k]


def plan_geometries(geometries: Any) -> tuple[Callable[[float], MoleculeSpec], list[float]]:
    """(geometry function, values) of ``geometries``: a pair ``(function, values)`` or a list of MoleculeSpec
    (whose values are 0, 1, 2, ...). Every molecule must have the same atoms, charge, multiplicity and basis."""
    from .scan import build_molecules, scan_values

    if isinstance(geometries, Sequence) and not isinstance(geometries, (str, bytes)) and geometries and all(
            isinstance(m, MoleculeSpec) for m in geometries):
        function: Callable[[float], MoleculeSpec] = MoleculeList(tuple(geometries))
        values = [float(k) for k in range(len(geometries))]
    elif isinstance(geometries, tuple) and len(geometries) == 2 and callable(geometries[0]):
        function, values = geometries[0], scan_values(geometries[1])
    else:
        raise PlanInputError(
            f"geometries {_short(geometries)}: give a pair (geometry function, values), e.g. "
            "(gk.BondStretch(molecule), [1.2, 1.6, 2.4]), or a non-empty list of MoleculeSpec"
        )
    built = build_molecules(function, values)
    failed = [(v, why) for v, (m, why) in zip(values, built) if m is None]
    if failed:
        value, why = failed[0]
        raise PlanInputError(f"the geometry of value {value!r} cannot be built ({why}); a plan needs every geometry")
    molecules = [m for m, _ in built]
    first = molecules[0]
    for value, molecule in zip(values, molecules):
        for what in ("symbols", "charge", "multiplicity", "basis"):
            if getattr(molecule, what) != getattr(first, what):
                raise PlanInputError(
                    f"the geometry of value {value!r} has {what} {getattr(molecule, what)!r} but the first has "
                    f"{getattr(first, what)!r}; one plan is one curve of one molecule (same atoms, charge, "
                    "multiplicity and basis): make one plan per molecule"
                )
    return function, values


# choices -----------------------------------------------------------------------------------------------------------
def _short(value: Any) -> str:
    text = repr(value)
    return text if len(text) <= 80 else text[:77] + "..."


def _as_device(value: Any) -> Any:
    return None if value is None else _c.as_component("device", value)


def _as_grouping(value: Any) -> str:
    accepted = grouping_names()
    if not isinstance(value, str) or value not in accepted:
        raise PlanInputError(f"grouping {_short(value)} is not known; accepted: {', '.join(accepted)}")
    return value


def _as_tapering(value: Any) -> bool:
    if not isinstance(value, bool):
        raise PlanInputError(f"tapering {_short(value)}; accepted: True or False")
    return value


def _as_mitigation(value: Any) -> Any:
    if value is None or isinstance(value, (str, Mapping)) or hasattr(value, "to_dict"):
        return value
    raise PlanInputError(f"mitigation {_short(value)}; give None, a mitigation name, or a mitigation component")


_CONVERT: dict[str, Callable[[Any], Any]] = {
    "active_space": lambda v: None if v is None else _c.as_active_space(v),
    "mapping": lambda v: None if v is None else _c.as_mapping(v),
    "tapering": _as_tapering,
    "trial_state": lambda v: None if v is None else _c.as_trial_state(v),
    "minimiser": lambda v: None if v is None else _c.as_minimiser(v),
    "grouping": _as_grouping,
    "device": _as_device,
    "mitigation": _as_mitigation,
}

_DEFAULT: dict[str, list[Any]] = {"active_space": [None], "mapping": [None], "tapering": [], "trial_state": [None],
                                  "minimiser": [None], "grouping": ["qwc"], "device": [None], "mitigation": [None]}


def plan_choices(choices: Any) -> dict[str, list[Any]]:
    """Role → list of candidate components (None keeps groundkit's default) for every role in :data:`ROLES`.

    ``choices`` maps roles (``"mapping"`` or ``"mappings"``, ...) to a list of candidates or a single one.
    ``tapering`` is a list of True/False applied to every mapping (left out: each mapping as given)."""
    if not isinstance(choices, Mapping):
        raise PlanInputError(f"choices {_short(choices)}: give a dict role → candidates, e.g. "
                             "{'mapping': ['jordan-wigner', 'parity'], 'trial_state': [gk.UCCSD()]}")
    out = {role: list(default) for role, default in _DEFAULT.items()}
    seen: dict[str, str] = {}
    for key, given in choices.items():
        role = _ALIASES.get(key, key) if isinstance(key, str) else key
        if role not in ROLES:
            raise PlanInputError(f"unknown role {key!r} in choices; accepted: {', '.join(ROLES)} (or their plurals)")
        if role in seen:
            raise PlanInputError(f"choices name the role {role!r} twice (as {seen[role]!r} and {key!r}); give it once")
        seen[role] = key
        items = list(given) if isinstance(given, (list, tuple)) else [given]
        if not items:
            raise PlanInputError(f"choices[{key!r}] is empty; give at least one candidate, or leave the role out "
                                 "to keep the default")
        converted = []
        for item in items:
            try:
                converted.append(_CONVERT[role](item))
            except PlanInputError:
                raise
            except ValueError as err:  # a component's own refusal: say which choice it was
                raise PlanInputError(f"choices[{key!r}]: {err}") from None
        out[role] = converted
    return out


# limits ------------------------------------------------------------------------------------------------------------
@dataclass(frozen=True)
class PlanLimits:
    """Caps a configuration must keep to be recommended (None: no cap).

    ``qubits``; ``two_qubit_gates`` (after routing when the device profile routes, else of the logical circuit);
    ``shots_per_energy`` at the target precision; ``device_hours`` for the whole curve; ``noise_threshold``: the
    smallest tolerated error-rate factor (the device's error rates times this factor must still give the target),
    which asks for the noise-threshold column."""

    qubits: int | None = None
    two_qubit_gates: int | None = None
    shots_per_energy: float | None = None
    device_hours: float | None = None
    noise_threshold: float | None = None

    def as_dict(self) -> dict[str, float | int | None]:
        return {f.name: getattr(self, f.name) for f in fields(self)}

    def __bool__(self) -> bool:
        return any(v is not None for v in self.as_dict().values())


_LIMIT_ALIASES = {"routed_two_qubit_gates": "two_qubit_gates", "shots": "shots_per_energy",
                  "hours": "device_hours", "max_qubits": "qubits"}
_WHOLE = ("qubits", "two_qubit_gates")


def plan_limits(limits: Any) -> PlanLimits:
    """A :class:`PlanLimits` from None, a PlanLimits or a dict of caps; PlanInputError naming a bad cap."""
    if limits is None:
        return PlanLimits()
    if isinstance(limits, PlanLimits):
        items = limits.as_dict()
    elif isinstance(limits, Mapping):
        items = {}
        given: dict[str, str] = {}
        known = [f.name for f in fields(PlanLimits)]
        for key, value in limits.items():
            name = _LIMIT_ALIASES.get(key, key) if isinstance(key, str) else key
            if name not in known:
                raise PlanInputError(f"unknown limit {key!r}; accepted: {', '.join(known)}")
            if name in given and items[name] != value:
                raise PlanInputError(f"limits contradict each other: {given[name]!r} = {items[name]!r} and {key!r} "
                                     f"= {value!r} cap the same figure ({name}); give one value")
            given[name] = key
            items[name] = value
    else:
        raise PlanInputError(f"limits {_short(limits)}: give None or a dict such as {{'qubits': 12, "
                             "'device_hours': 10}")
    for name, value in items.items():
        if value is None:
            continue
        if isinstance(value, bool) or not isinstance(value, numbers.Real) or not math.isfinite(float(value)) \
                or value <= 0:
            raise PlanInputError(f"limit {name}={value!r}; a cap must be a finite number > 0 (or None for none)")
        if name in _WHOLE and float(value) != int(value):
            raise PlanInputError(f"limit {name}={value!r}; a count cap must be a whole number")
    return PlanLimits(**{k: (int(v) if k in _WHOLE and v is not None else v) for k, v in items.items()})


def plan_target(target: Any) -> float:
    """The target accuracy (Ha): a finite number > 0."""
    if isinstance(target, bool) or not isinstance(target, numbers.Real) or not math.isfinite(float(target)) \
            or target <= 0:
        raise PlanInputError(f"target={target!r}; give the accuracy to hold at every geometry in Hartree, a finite "
                             "number > 0 (chemical accuracy is 1.6e-3)")
    return float(target)
