"""ActiveSpace: which molecular orbitals and electrons the correlated (qubit) problem keeps.

Orbitals below the active ones are doubly occupied core, folded into a constant and an effective one-electron
operator; orbitals above are dropped. Orbital indices are 0-based, in the order of the chosen orbital set:
canonical SCF orbitals in energy order (default), natural orbitals by descending occupation.
"""

from __future__ import annotations

import warnings
from dataclasses import dataclass, field

import numpy as np

from .chemistry import ScfSolution
from .component import Component
from .constraints import Bool, Integer, Interval, ListOf, OneOf, OrNone, Pair
from .elements import frozen_core_orbitals
from .errors import ActiveSpaceError, DegenerateBoundaryWarning
from .molecule import MoleculeSpec
from .orbitals.choice import LABELS as ORBITAL_LABELS
from .orbitals.choice import OCCUPATION_LABELS, ORBITAL_SETS, casscf_orbitals, orbital_basis
from .registry import register

DEGENERACY_TOL = 1e-4  # Hartree: orbitals closer than this in energy count as one degenerate set
MP2_OCCUPATION_WINDOW = (0.02, 1.98)  # common practice, no single source


@register("active_space", "active-space", label="active space")
@dataclass(frozen=True)
class ActiveSpace(Component, role="active_space", error=ActiveSpaceError):
    """Configuration of an active space; :meth:`resolve` applies it to one molecule.

    - ``ActiveSpace()``: every orbital and electron (full space).
    - ``ActiveSpace(electrons=4, orbitals=4)``: the window around the Fermi level.
    - ``ActiveSpace(indices=[1, 2, 5])``: these orbitals; occupied ones outside them become core.
    - ``ActiveSpace(frozen_core=True)``: drop the chemical core (1s for Li–Ne, 1s2s2p for Na–Ar, ...).
    - ``ActiveSpace.auto()``: sized by MP2 natural-orbital occupation numbers.

    ``orbital_set`` chooses the orbitals the space is cut from (:mod:`groundkit.orbitals.choice`):
    ``"canonical"`` (Hartree–Fock, the default), ``"mp2-natural"`` or ``"ccsd-natural"`` (natural orbitals in
    descending occupation; windows, indices and ``auto`` count in that order) or ``"casscf"`` (PySCF's CASSCF
    optimises the orbitals of the space chosen in canonical orbitals). Integrals, core energy, reference,
    baselines and circuits all follow the chosen orbitals.
    """

    electrons: int | None = None
    orbitals: int | None = None
    indices: tuple[int, ...] | None = None
    frozen_core: bool = False
    selection: str = "window"
    occupation_window: tuple[float, float] = MP2_OCCUPATION_WINDOW
    orbital_set: str = "canonical"

    constraints = {
        "electrons": OrNone(Integer(0)),
        "orbitals": OrNone(Integer(1)),
        "indices": OrNone(ListOf(Integer(0), min_length=1, unique=True)),
        "frozen_core": Bool(),
        "selection": OneOf("window", "mp2-occupation"),
        "occupation_window": Pair(Interval(float, 0.0, 2.0, closed="neither"), unit="electrons"),
        "orbital_set": OneOf(*ORBITAL_SETS),
    }

    def check_options(self) -> None:
        """Electrons and orbitals together (or indices); orbitals agreeing with the indices given."""
        if (self.electrons is None) != (self.orbitals is None) and self.indices is None:
            raise ActiveSpaceError(
                f"give electrons and orbitals together (got electrons={self.electrons!r}, "
                f"orbitals={self.orbitals!r}), or indices=[...]"
            )
        if self.indices is not None:
            if self.orbitals is not None and self.orbitals != len(self.indices):
                raise ActiveSpaceError(f"orbitals={self.orbitals} disagrees with {len(self.indices)} indices given")
            object.__setattr__(self, "indices", tuple(sorted(self.indices)))

    @classmethod
    def auto(
        cls, *, low: float = MP2_OCCUPATION_WINDOW[0], high: float = MP2_OCCUPATION_WINDOW[1],
        frozen_core: bool = True, orbital_set: str = "canonical",
    ) -> ActiveSpace:
        """Keep the orbitals whose natural-orbital occupation lies in [low, high] (electrons): the MP2 natural
        occupations for canonical and CASSCF orbitals (CASSCF then optimises that space), the occupations of the
        orbitals themselves for ``orbital_set="mp2-natural"`` or ``"ccsd-natural"``. ``explain()`` shows the
        ranking."""
        return cls(selection="mp2-occupation", occupation_window=(float(low), float(high)), frozen_core=frozen_core,
                   orbital_set=orbital_set)

    def resolve(self, molecule: MoleculeSpec, scf: ScfSolution, *, warn: bool = True) -> ResolvedActiveSpace:
        """Core, active and dropped orbital indices and active electron counts for this molecule."""
        n_mo = scf.n_orbitals
        n_docc, n_socc = scf.n_doubly_occupied, scf.n_singly_occupied
        n_frozen = sum(frozen_core_orbitals(s) for s in molecule.symbols) if self.frozen_core else 0
        if n_frozen > n_docc:
            raise ActiveSpaceError(
                f"frozen_core=True would freeze {n_frozen} core orbitals but only {n_docc} are doubly occupied "
                f"for charge {molecule.charge:+d}; use frozen_core=False"
            )
        table: tuple[dict, ...] = ()
        basis = orbital_basis(self.orbital_set, scf, list(range(n_frozen)))
        if self.indices is not None:
            active = list(self.indices)
            if active[-1] >= n_mo:
                raise ActiveSpaceError(
                    f"orbital index {active[-1]} is out of range; this molecule in {molecule.basis} has orbitals "
                    f"0..{n_mo - 1}"
                )
            frozen = set(range(n_frozen))
            if frozen & set(active):
                raise ActiveSpaceError(f"indices {sorted(frozen & set(active))} are frozen core orbitals")
            singles = [i for i in range(n_mo) if 0.5 < scf.mo_occ[i] < 1.5 and i not in active]
            if singles:
                raise ActiveSpaceError(
                    f"singly occupied orbital(s) {singles} must be active for multiplicity {molecule.multiplicity}"
                )
            core = [i for i in range(n_mo) if scf.mo_occ[i] > 1.5 and i not in active]
            n_active_electrons = molecule.n_electrons - 2 * len(core)
            if self.electrons is not None and self.electrons != n_active_electrons:
                raise ActiveSpaceError(
                    f"electrons={self.electrons} disagrees with the {n_active_electrons} electrons that the "
                    f"orbitals {active} hold in the reference determinant"
                )
        else:
            if self.selection == "mp2-occupation":
                from .chemistry import natural_occupations

                occupations = basis.occupations if basis.occupations is not None else natural_occupations(
                    scf, list(range(n_frozen)))
                low, high = self.occupation_window
                n_strong = int(np.count_nonzero(occupations >= high))
                n_weak = int(np.count_nonzero(occupations <= low))
                # never fewer than the highest occupied and lowest unoccupied orbital
                n_core = min(max(n_strong, n_frozen), n_docc - (1 if n_socc == 0 and n_docc > n_frozen else 0))
                n_orb = max(n_mo - n_weak - n_core, n_docc + n_socc - n_core + (1 if n_mo > n_docc + n_socc else 0))
                electrons, orbitals = molecule.n_electrons - 2 * n_core, n_orb
                table = _selection_table(scf, basis.energies, occupations, n_core, n_orb)
            elif self.electrons is None:
                electrons, orbitals = molecule.n_electrons - 2 * n_frozen, n_mo - n_frozen
            else:
                electrons, orbitals = int(self.electrons), int(self.orbitals)  # type: ignore[arg-type]
            core_count = _window_core(molecule, scf, electrons, orbitals, n_frozen)
            core = list(range(core_count))
            active = list(range(core_count, core_count + orbitals))
        n_unpaired = molecule.multiplicity - 1
        n_act_e = molecule.n_electrons - 2 * len(core)
        n_alpha, n_beta = (n_act_e + n_unpaired) // 2, (n_act_e - n_unpaired) // 2
        if n_alpha > len(active):
            raise ActiveSpaceError(
                f"{n_act_e} active electrons ({n_alpha} alpha) do not fit in {len(active)} orbitals; "
                f"give at least {n_alpha} orbitals"
            )
        external = [i for i in range(n_mo) if i not in active and i not in core]
        mo_coeff = None if basis.canonical else basis.mo_coeff
        energies = basis.energies
        natural = () if basis.occupations is None else tuple(float(x) for x in basis.occupations)
        cas = None
        if self.orbital_set == "casscf":
            from .orbitals.continuity import casscf_start

            spin = 0.5 * (molecule.multiplicity - 1)
            cas = casscf_orbitals(scf, core, active, n_alpha, n_beta, spin,
                                  start=casscf_start(molecule, scf, core, active))
            core, active = list(range(len(core))), list(range(len(core), len(core) + len(active)))
            external = list(range(len(core) + len(active), n_mo))
            mo_coeff, energies = cas.mo_coeff, cas.energies
            natural = tuple([2.0] * len(core) + [float(x) for x in cas.occupations] + [0.0] * len(external))
            if table:
                table = tuple({**row, "orbital": i, "energy": float(energies[i]), "occupation": natural[i],
                               "role": "core" if i in core else "active" if i in active else "dropped"}
                              for i, row in enumerate(table))
        resolved = ResolvedActiveSpace(
            core=tuple(core),
            active=tuple(active),
            external=tuple(external),
            n_alpha=n_alpha,
            n_beta=n_beta,
            orbital_energies=tuple(float(e) for e in energies),
            orbital_occupations=tuple(float(o) for o in scf.mo_occ),
            selection_table=table,
            orbital_set=self.orbital_set,
            mo_coeff=mo_coeff,
            natural_occupations=natural,
            casscf_energy=None if cas is None else cas.energy,
            orbital_attempts=() if cas is None else cas.attempts,
        )
        if warn:
            for message in resolved.degenerate_cuts():
                warnings.warn(message, DegenerateBoundaryWarning, stacklevel=3)
        return resolved

    def __repr__(self) -> str:
        if self.selection == "mp2-occupation":
            extra = f", orbital_set={self.orbital_set!r}" if self.orbital_set != "canonical" else ""
            return f"ActiveSpace.auto(low={self.occupation_window[0]}, high={self.occupation_window[1]}, " \
                f"frozen_core={self.frozen_core}{extra})"
        parts = []
        if self.indices is not None:
            parts.append(f"indices={list(self.indices)}")
        elif self.electrons is not None:
            parts.append(f"electrons={self.electrons}, orbitals={self.orbitals}")
        if self.frozen_core:
            parts.append("frozen_core=True")
        if self.orbital_set != "canonical":
            parts.append(f"orbital_set={self.orbital_set!r}")
        return f"ActiveSpace({', '.join(parts) or 'full space'})"


def _window_core(molecule: MoleculeSpec, scf: ScfSolution, electrons: int, orbitals: int, n_frozen: int) -> int:
    """Number of core orbitals for ``electrons`` in ``orbitals`` around the Fermi level, with every check."""
    n_mo = scf.n_orbitals
    n_total = molecule.n_electrons
    n_unpaired = molecule.multiplicity - 1
    available = n_total - 2 * n_frozen
    if electrons > available:
        frozen = f" outside the {n_frozen} frozen core orbitals" if n_frozen else ""
        raise ActiveSpaceError(f"active space asks for {electrons} electrons but {molecule.formula} has {available}"
                               f"{frozen}; give electrons <= {available}")
    if electrons < n_unpaired or (electrons - n_unpaired) % 2:
        raise ActiveSpaceError(
            f"{electrons} active electrons are inconsistent with multiplicity {molecule.multiplicity}: the active "
            f"space must hold the {n_unpaired} unpaired electron(s) plus pairs, i.e. {n_unpaired}, "
            f"{n_unpaired + 2}, {n_unpaired + 4}, ... electrons"
        )
    core = (n_total - electrons) // 2
    if core + orbitals > n_mo:
        raise ActiveSpaceError(
            f"active space asks for {orbitals} orbitals above {core} core orbitals, but {molecule.formula} in "
            f"{molecule.basis} has {n_mo} orbitals; give orbitals <= {n_mo - core}"
        )
    return core


def _selection_table(scf: ScfSolution, energies: np.ndarray, occupations: np.ndarray, n_core: int,
                     n_orb: int) -> tuple[dict, ...]:
    """One row per orbital: energy (Fock diagonal, Ha), HF occupation, the natural occupation that ranked it
    (``occupation``; ``mp2_occupation`` kept for older readers) and its role."""
    rows = []
    for i in range(scf.n_orbitals):
        role = "core" if i < n_core else "active" if i < n_core + n_orb else "dropped"
        rows.append({"orbital": i, "energy": float(energies[i]), "hf_occupation": float(scf.mo_occ[i]),
                     "mp2_occupation": float(occupations[i]), "occupation": float(occupations[i]), "role": role})
    return tuple(rows)


@dataclass(frozen=True)
class ResolvedActiveSpace:
    """An active space applied to one molecule: orbital index lists and active electron counts."""

    core: tuple[int, ...]
    active: tuple[int, ...]
    external: tuple[int, ...]
    n_alpha: int
    n_beta: int
    orbital_energies: tuple[float, ...] = field(repr=False, default=())
    orbital_occupations: tuple[float, ...] = field(repr=False, default=())
    selection_table: tuple[dict, ...] = field(repr=False, default=())
    orbital_set: str = "canonical"
    mo_coeff: np.ndarray | None = field(repr=False, default=None, compare=False)
    natural_occupations: tuple[float, ...] = field(repr=False, default=())
    casscf_energy: float | None = field(repr=False, default=None)
    orbital_attempts: tuple[str, ...] = field(repr=False, default=())

    @property
    def n_orbitals(self) -> int:
        return len(self.active)

    @property
    def n_electrons(self) -> int:
        return self.n_alpha + self.n_beta

    @property
    def n_spin_orbitals(self) -> int:
        """Qubits before tapering under any of the linear encodings."""
        return 2 * len(self.active)

    def degenerate_cuts(self, tol: float = DEGENERACY_TOL) -> list[str]:
        """Messages for each active orbital whose energy is within ``tol`` (Ha) of an orbital left out."""
        e = self.orbital_energies
        messages = []
        outside = list(self.core) + list(self.external)
        for p in self.active:
            partners = [q for q in outside if abs(e[p] - e[q]) < tol]
            if partners:
                messages.append(
                    f"active orbital {p} ({e[p]:.6f} Ha) is degenerate with orbital(s) {partners} left out of the "
                    "active space; results may depend on an arbitrary choice among them. Include or exclude the "
                    "whole degenerate set"
                )
        return messages

    def explain(self) -> str:
        """Plain-text table of orbital energies, occupations and roles, headed by the orbitals' kind; the
        natural-occupation column is what ``ActiveSpace.auto`` ranked by (the orbitals' own occupations for
        natural and CASSCF orbitals)."""
        heading = OCCUPATION_LABELS[self.orbital_set]
        lines = [f"{ORBITAL_LABELS[self.orbital_set]}" + (
            f"; CASSCF energy {self.casscf_energy:.8f} Ha" if self.casscf_energy is not None else ""),
            f"{'orbital':>7} {'energy/Ha':>11} {'HF occ':>6} {heading:>11}  role"]
        natural = self.natural_occupations or (float("nan"),) * len(self.orbital_energies)
        rows = self.selection_table or tuple(
            {"orbital": i, "energy": en, "hf_occupation": occ, "occupation": no,
             "role": "core" if i in self.core else "active" if i in self.active else "dropped"}
            for i, (en, occ, no) in enumerate(zip(self.orbital_energies, self.orbital_occupations, natural))
        )
        for r in rows:
            value = r.get("occupation", r.get("mp2_occupation", float("nan")))
            mp2 = "—" if np.isnan(value) else f"{value:.4f}"
            lines.append(f"{r['orbital']:>7} {r['energy']:>11.5f} {r['hf_occupation']:>6.2f} {mp2:>11}  {r['role']}")
        return "\n".join(lines)

    def __str__(self) -> str:
        kind = "" if self.orbital_set == "canonical" else f" in {ORBITAL_LABELS[self.orbital_set]}"
        return (f"({self.n_electrons}e, {self.n_orbitals}o) active{kind}: orbitals {list(self.active)}, "
                f"core {list(self.core)}, {len(self.external)} dropped")
