"""Warm starts across geometries: match active orbitals by overlap, then carry parameters over.

Between neighbouring geometries the SCF solver may return an orbital with the opposite sign, or two orbitals
in swapped order. Parameters of a trial state refer to orbitals, so reusing them blindly can start the next
minimisation far from its solution. Here the active orbitals of the new geometry are matched to the previous
ones by the cross overlap ``O = C_old^T S(old, new) C_new`` (S the AO overlap between the two geometries):
the assignment that maximises ``sum |O[old, new]|`` gives the permutation, and the sign of each matched entry
gives the phase. Each previous excitation is rewritten in the new orbitals; its angle is multiplied by the
product of the phases of every spin orbital it touches and by the parity of reordering its indices into the new
excitation's order. New excitations with no counterpart start at zero.

:func:`orbital_handover` and :func:`orbital_warm_start` are the warm-start handover of fermionic objectives
(:meth:`groundkit.objective.Objective.handover` and ``warm_start``); this module sits in the objectives' layer for
that reason (``groundkit.studies.orbitals`` re-exports it).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np
from scipy.optimize import linear_sum_assignment

from groundkit.chemistry import cross_overlap
from groundkit.energy_surface import WarmStart


@dataclass(frozen=True)
class OrbitalMatch:
    """How the new active orbitals relate to the old ones: new orbital j ≈ ``signs[j]`` × old orbital
    ``old_of_new[j]``; ``overlaps[j]`` is |O| of that pair (1 for identical orbitals)."""

    old_of_new: tuple[int, ...]
    signs: tuple[int, ...]
    overlaps: tuple[float, ...]

    @property
    def quality(self) -> float:
        """The smallest matched overlap (dimensionless, 0 to about 1); low values mean a poor match."""
        return float(min(self.overlaps)) if self.overlaps else 1.0

    @property
    def is_identity(self) -> bool:
        """True when no orbital changed place or sign."""
        return self.old_of_new == tuple(range(len(self.old_of_new))) and all(s == 1 for s in self.signs)


@dataclass(frozen=True)
class Handover:
    """What one scan point passes to the next for a warm start (plain data).

    ``orbitals``: active MO coefficients (n_ao, n_active) of the geometry; ``excitations``: the trial state's
    excitations ((creators), (annihilators)) in interleaved spin orbitals; ``parameter_index`` and ``scale``:
    which parameter drives each excitation and with which factor; ``parameters``: final parameters (radians).
    """

    orbitals: np.ndarray
    excitations: tuple[tuple[tuple[int, ...], tuple[int, ...]], ...]
    parameter_index: tuple[int, ...]
    scale: tuple[float, ...]
    parameters: np.ndarray

    def angles(self) -> np.ndarray:
        """Rotation angle of every excitation (radians)."""
        return np.asarray(self.scale) * np.asarray(self.parameters, dtype=float)[list(self.parameter_index)]

    def to_dict(self) -> dict:
        return {
            "orbitals": np.asarray(self.orbitals, dtype=float).tolist(),
            "excitations": [[list(c), list(a)] for c, a in self.excitations],
            "parameter_index": list(self.parameter_index),
            "scale": list(self.scale),
            "parameters": [float(x) for x in self.parameters],
        }

    @classmethod
    def from_dict(cls, data: dict) -> Handover:
        return cls(
            orbitals=np.array(data["orbitals"], dtype=float),
            excitations=tuple((tuple(int(p) for p in c), tuple(int(q) for q in a)) for c, a in data["excitations"]),
            parameter_index=tuple(int(i) for i in data["parameter_index"]),
            scale=tuple(float(s) for s in data["scale"]),
            parameters=np.array(data["parameters"], dtype=float),
        )


def match_orbitals(old: np.ndarray, new: np.ndarray, cross: np.ndarray) -> OrbitalMatch:
    """Match the columns of ``new`` (n_ao_b, n) to those of ``old`` (n_ao_a, n) by overlap.

    ``cross`` is the AO overlap <mu(old geometry)|nu(new geometry)>, shape (n_ao_a, n_ao_b).
    """
    overlap = np.asarray(old).T @ np.asarray(cross) @ np.asarray(new)
    rows, cols = linear_sum_assignment(-np.abs(overlap))
    old_of_new = np.empty(overlap.shape[1], dtype=int)
    old_of_new[cols] = rows
    picked = overlap[old_of_new, np.arange(overlap.shape[1])]
    return OrbitalMatch(
        old_of_new=tuple(int(i) for i in old_of_new),
        signs=tuple(-1 if x < 0 else 1 for x in picked),
        overlaps=tuple(float(abs(x)) for x in picked),
    )


def _parity(order: Sequence[int]) -> int:
    """Sign (+1 or -1) of the permutation that sorts ``order`` (distinct integers)."""
    sign, seen = 1, list(order)
    for i in range(len(seen)):
        for j in range(i + 1, len(seen)):
            if seen[i] > seen[j]:
                sign = -sign
    return sign


def _key_and_sign(creators: Sequence[int], annihilators: Sequence[int]) -> tuple[tuple, int]:
    """Order-free key of an excitation and the sign of tau relative to its sorted form."""
    return (tuple(sorted(creators)), tuple(sorted(annihilators))), _parity(creators) * _parity(annihilators)


def transfer_parameters(
    handover: Handover,
    match: OrbitalMatch,
    excitations: Sequence[tuple[Sequence[int], Sequence[int]]],
    parameter_index: Sequence[int],
    scale: Sequence[float],
    n_parameters: int,
) -> tuple[np.ndarray, int]:
    """Parameters (radians) for the new excitations from the previous point's, and how many were carried.

    Each old spin orbital 2i+s becomes 2j+s with ``old_of_new[j] = i``, so tau_old = (product of phases) ×
    tau over the new indices; the new parameter is that angle divided by the new excitation's scale. Where
    several excitations share a parameter, the first one carried sets it.
    """
    new_of_old = {old: new for new, old in enumerate(match.old_of_new)}
    carried: dict[tuple, float] = {}
    for (creators, annihilators), angle in zip(handover.excitations, handover.angles()):
        try:
            mapped_c = [2 * new_of_old[p // 2] + p % 2 for p in creators]
            mapped_a = [2 * new_of_old[q // 2] + q % 2 for q in annihilators]
        except KeyError:  # an orbital outside the matched set: no counterpart
            continue
        phase = 1
        for p in list(mapped_c) + list(mapped_a):
            phase *= match.signs[p // 2]
        key, order_sign = _key_and_sign(mapped_c, mapped_a)
        carried.setdefault(key, angle * phase * order_sign)
    parameters = np.zeros(n_parameters)
    assigned = np.zeros(n_parameters, dtype=bool)
    for (creators, annihilators), index, factor in zip(excitations, parameter_index, scale):
        key, order_sign = _key_and_sign(creators, annihilators)
        if key in carried and not assigned[index] and factor != 0:
            parameters[index] = carried[key] * order_sign / factor
            assigned[index] = True
    return parameters, int(np.count_nonzero(assigned))


def active_orbitals(problem: Any) -> np.ndarray:
    """Active MO coefficients (n_ao, n_active) of a problem, in its chosen orbitals (canonical, natural, CASSCF)."""
    space = problem.active_orbitals
    orbitals = problem.scf.mo_coeff if space.mo_coeff is None else space.mo_coeff
    return np.array(orbitals[:, list(space.active)], dtype=float)


def orbital_handover(problem: Any, plan: Any, parameters: np.ndarray) -> dict[str, Any]:
    """The handover (plain data, kind 'orbital-matching') of an excitation plan at ``parameters`` (radians)."""
    handover = Handover(
        orbitals=active_orbitals(problem),
        excitations=tuple((tuple(e.creators), tuple(e.annihilators)) for e in plan.excitations),
        parameter_index=tuple(int(i) for i in plan.parameter_index),
        scale=tuple(float(f) for f in plan.scale),
        parameters=np.array(parameters, dtype=float),
    )
    data = {"kind": "orbital-matching", **handover.to_dict()}
    space = problem.active_orbitals
    if space.orbital_set == "casscf" and space.mo_coeff is not None:  # the next point's CASSCF starts from these
        data["casscf_orbitals"] = np.asarray(space.mo_coeff, dtype=float).tolist()
    return data


def previous_match(problem: Any, previous: Any, data: dict[str, Any]) -> tuple[Handover, OrbitalMatch] | str:
    """(handover, orbital match) of ``data``, handed over at the molecule ``previous``, with ``problem``'s active
    orbitals; or the reason they cannot be compared."""

    handover = Handover.from_dict(data)
    molecule = problem.molecule
    new_orbitals = active_orbitals(problem)
    if (previous.symbols != molecule.symbols or previous.basis != molecule.basis
            or handover.orbitals.shape != new_orbitals.shape):
        return "previous point has other atoms, basis or active space"
    return handover, match_orbitals(handover.orbitals, new_orbitals, cross_overlap(previous, molecule))


def warm_note(match: OrbitalMatch, carried: int, total: int, what: str = "parameters") -> str:
    """'warm (k/n parameters carried, s sign flips, m orbitals moved)'."""
    flips = sum(1 for s in match.signs if s < 0)
    moved = sum(1 for j, i in enumerate(match.old_of_new) if i != j)
    return f"warm ({carried}/{total} {what} carried, {flips} sign flips, {moved} orbitals moved)"


def orbital_warm_start(problem: Any, plan: Any, previous: Any, data: dict[str, Any]) -> WarmStart:
    """Starting parameters for ``plan`` on ``problem`` from the handover ``data`` of the molecule ``previous``."""
    found = previous_match(problem, previous, data)
    if isinstance(found, str):
        return WarmStart.cold(found)
    handover, match = found
    parameters, carried = transfer_parameters(
        handover, match, [(e.creators, e.annihilators) for e in plan.excitations], plan.parameter_index,
        plan.scale, plan.n_parameters)
    return WarmStart(parameters, warm_note(match, carried, plan.n_parameters), match.quality)
