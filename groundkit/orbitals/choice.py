"""Which orbitals an active space is cut from: canonical Hartree–Fock, MP2 or CCSD natural orbitals, or CASSCF.

``ActiveSpace(orbital_set=...)`` names one of :data:`ORBITAL_SETS`. Natural orbitals diagonalise the method's
spin-summed 1-RDM (frozen chemical core left as it is) and come in descending occupation, so "the lowest
orbitals" still means "the most occupied" and an active window or ``ActiveSpace.auto`` ranks them by their
occupation. CASSCF orbitals are optimised by PySCF for the active space chosen in canonical orbitals (window,
indices or auto); their active block holds the CASSCF natural orbitals. The computed orbitals are cached on the
SCF solution (per set and frozen list). docs/orbitals.md says which to choose.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..chemistry import ScfSolution
from . import cost, solvers

ORBITAL_SETS = ("canonical", "mp2-natural", "ccsd-natural", "casscf")
LABELS = {"canonical": "canonical Hartree–Fock orbitals", "mp2-natural": "MP2 natural orbitals",
          "ccsd-natural": "CCSD natural orbitals", "casscf": "CASSCF orbitals",
          "optimised": "orbitals optimised with the trial state"}
OCCUPATION_LABELS = {"canonical": "MP2 NO occ", "mp2-natural": "MP2 NO occ", "ccsd-natural": "CCSD NO occ",
                     "casscf": "CAS NO occ", "optimised": "NO occ"}


@dataclass(frozen=True, eq=False)
class OrbitalBasis:
    """One set of molecular orbitals of a molecule: coefficients (n_ao, n_mo), the natural occupations that rank
    them (electrons; None for canonical orbitals), and the diagonal of the Fock matrix of the reference
    determinant in this basis (Ha; the orbital energies for canonical orbitals)."""

    kind: str
    mo_coeff: np.ndarray = field(repr=False)
    occupations: np.ndarray | None = field(repr=False)
    energies: np.ndarray = field(repr=False)

    @property
    def canonical(self) -> bool:
        return self.kind == "canonical"


def orbital_basis(kind: str, scf: ScfSolution, frozen: list[int]) -> OrbitalBasis:
    """The orbitals of ``kind`` (canonical, or natural orbitals of MP2 or CCSD with ``frozen`` uncorrelated) for
    an SCF solution; CASSCF orbitals start from the canonical ones (see :func:`casscf_orbitals`). Cached."""
    if kind in ("canonical", "casscf"):
        return OrbitalBasis("canonical", scf.mo_coeff, None, np.asarray(scf.mo_energy, dtype=float))
    store = scf._mf.__dict__.setdefault("_groundkit_orbitals", {})
    key = (kind, tuple(sorted(frozen)))
    if key not in store:
        method = {"mp2-natural": "mp2", "ccsd-natural": "ccsd"}[kind]
        if method == "ccsd":
            check_ccsd_affordable(scf, frozen)
        occupations, coeff = solvers.natural_orbitals(scf, method, frozen)
        fock = solvers.reference_fock(scf, coeff, scf.n_doubly_occupied, scf.n_singly_occupied)
        store[key] = OrbitalBasis(kind, coeff, occupations, np.diag(fock).copy())
    return store[key]


def check_ccsd_affordable(scf: ScfSolution, frozen: list[int]) -> None:
    """Raise :class:`SizeLimitError` when the CCSD behind CCSD natural orbitals would exceed ``groundkit.limits``
    (memory of its integrals and amplitudes, and a rough time of o^2 v^4 operations per iteration)."""
    n_mo = scf.n_orbitals - len(frozen)
    occupied = scf.n_doubly_occupied + scf.n_singly_occupied - len(frozen)
    virtual = n_mo - scf.n_doubly_occupied + len(frozen)
    memory, seconds = cost.ccsd_cost(n_mo, occupied, virtual)
    cost.refuse_if_over(f"CCSD natural orbitals ({occupied} occupied, {virtual} virtual orbitals)", memory, seconds,
                        "use orbital_set='mp2-natural' (same ranking idea, far cheaper)")


@dataclass(frozen=True, eq=False)
class CasscfOrbitals:
    """CASSCF orbitals of one active space (ordered core, active, external), its energy (Ha), the active natural
    occupations and the attempts PySCF needed."""

    mo_coeff: np.ndarray = field(repr=False)
    energy: float
    occupations: np.ndarray = field(repr=False)
    attempts: tuple[str, ...]
    energies: np.ndarray = field(repr=False)


def casscf_orbitals(scf: ScfSolution, core: list[int], active: list[int], n_alpha: int, n_beta: int,
                    spin: float, start: np.ndarray | None = None) -> CasscfOrbitals:
    """CASSCF for the active orbitals ``active`` (indices into the canonical orbitals, core ``core`` doubly
    occupied), starting from ``start`` (orbitals in that same core, active, external order; default the
    canonical ones), with MP2 natural orbitals of the same window as a last start. Cached per start."""
    n_mo = scf.n_orbitals
    external = [i for i in range(n_mo) if i not in set(core) | set(active)]
    order = list(core) + list(active) + external
    first = scf.mo_coeff[:, order] if start is None else np.asarray(start, dtype=float)
    store = scf._mf.__dict__.setdefault("_groundkit_casscf", {})
    key = (tuple(core), tuple(active), n_alpha, n_beta, None if start is None else first.tobytes())
    if key not in store:
        memory, seconds = cost.casscf_cost(scf.mo_coeff.shape[0], len(active), n_alpha, n_beta)
        cost.refuse_if_over(f"CASSCF orbitals in ({n_alpha + n_beta}e, {len(active)}o)", memory, seconds,
                            "choose a smaller active space or orbital_set='mp2-natural'")

        def more_starts() -> list[tuple[str, np.ndarray]]:
            natural = orbital_basis("mp2-natural", scf, [])
            return [("MP2 natural orbitals of the same window", natural.mo_coeff)]

        found = solvers.casscf(scf, first, len(core), len(active), n_alpha, n_beta, spin, more_starts)
        n_core = len(core)
        fock = solvers.reference_fock(scf, found.mo_coeff, n_core + n_beta, n_alpha - n_beta)
        store[key] = CasscfOrbitals(found.mo_coeff, found.energy, found.occupations, found.attempts,
                                    np.diag(fock).copy())
    return store[key]


def semicanonical(scf: ScfSolution, mo_coeff: np.ndarray, core: list[int], active: list[int], n_alpha: int,
                  n_beta: int) -> np.ndarray:
    """``mo_coeff`` with its active doubly occupied, singly occupied and empty blocks (of the reference
    determinant) each rotated to diagonalise the determinant's spin-averaged Fock matrix; core and dropped
    orbitals unchanged. CISD, CCSD and the active-space energy are unchanged by these rotations; MP2 and the (T)
    correction of CCSD(T), which read orbital energies from the Fock diagonal, become semicanonical."""
    c = np.array(mo_coeff, dtype=float)
    n_core = len(core)
    fock = solvers.reference_fock(scf, c[:, list(core) + list(active)], n_core + n_beta, n_alpha - n_beta)
    blocks = [list(range(n_core, n_core + n_beta)), list(range(n_core + n_beta, n_core + n_alpha)),
              list(range(n_core + n_alpha, n_core + len(active)))]
    columns = list(core) + list(active)
    for block in blocks:
        if len(block) > 1:
            _, vectors = np.linalg.eigh(fock[np.ix_(block, block)])
            picked = [columns[i] for i in block]
            c[:, picked] = c[:, picked] @ vectors
    from ..chemistry import canonical_phases

    return canonical_phases(c)
