"""Problem: the electronic Hamiltonian of one molecule in one active space, with its exact reference.

Everything here is computed once and shared: pipelines that differ only downstream (mapping, trial state,
minimiser) receive the same Problem object from :func:`build_problem`.
"""

from __future__ import annotations

from dataclasses import replace
from functools import cached_property
from math import comb

import numpy as np

from . import chemistry, sizing
from .active_space import ActiveSpace, ResolvedActiveSpace
from .baselines import Baselines
from .errors import IntegralConsistencyError, SizeLimitError
from .molecule import MoleculeSpec
from .reference import Reference, make_state
from .space_error import SpaceError, space_error
from .upcalls import upcall
from .workspace import workspace

REFERENCE_DETERMINANT_LIMIT = 20_000_000  # exact reference only up to this many determinants (~160 MB a vector)
HF_CONSISTENCY_TOL = 1e-8  # Hartree: HF determinant energy from the active-space integrals vs the SCF energy


class Problem:
    """Active-space Hamiltonian ``H = core_energy + sum h1[p,q] E_pq + 1/2 sum h2[p,q,r,s] (E_pq E_rs - d_qr E_ps)``.

    ``h1`` (n, n) and ``h2`` (n, n, n, n, chemists' notation (pq|rs)) are real, in Hartree, over the active
    orbitals of the chosen orbital set (canonical by default), with the frozen core folded into ``h1`` and
    ``core_energy`` (nuclear repulsion included).
    """

    def __init__(self, molecule: MoleculeSpec, active_space: ActiveSpace | None = None, *,
                 orbitals: np.ndarray | None = None) -> None:
        """``orbitals`` (n_ao, n_mo), in the order of the active space's orbitals, replaces them (the final
        orbitals of an orbital-optimised run); such a problem is not shared through :func:`build_problem`."""
        self.molecule = molecule
        self.active_space = active_space if active_space is not None else ActiveSpace()
        self.scf = chemistry.solve_scf(molecule)
        self.active_orbitals: ResolvedActiveSpace = self.active_space.resolve(molecule, self.scf)
        if orbitals is not None:
            self.active_orbitals = replace(self.active_orbitals, mo_coeff=np.asarray(orbitals, dtype=float),
                                           orbital_set="optimised", casscf_energy=None, natural_occupations=(),
                                           selection_table=())
        self.core_energy, self.h1, self.h2 = chemistry.active_integrals(
            self.scf, list(self.active_orbitals.core), list(self.active_orbitals.active),
            self.active_orbitals.mo_coeff,
        )
        self._check_hf_energy()
        self.baselines = Baselines(self)
        self._states: list = []
        self._space_error: list = []

    def _check_hf_energy(self) -> None:
        """Raise :class:`IntegralConsistencyError` unless the reference determinant's energy from the active-space
        integrals equals its energy by a second route (1e-8 Ha).

        Canonical orbitals: the second route is the SCF energy itself (the determinant is the SCF solution).
        Natural or CASSCF orbitals: the determinant filling the lowest chosen orbitals is no longer the SCF
        solution (its energy lies above the SCF energy); the second route is PySCF's SCF energy functional of
        that determinant's density in the AO basis (:func:`groundkit.orbitals.solvers.determinant_energy_from_density`),
        which shares no step with the MO transformation and core folding. A free check of the orbital order,
        the core folding and the integral transformation (one Slater–Condon sum, and for non-canonical orbitals
        one Fock build).
        """
        expected, what = self.reference_determinant_check()
        difference = self.hf_energy - expected
        if not abs(difference) <= HF_CONSISTENCY_TOL:
            raise IntegralConsistencyError(
                f"internal error for {self.molecule!r} in {self.active_orbitals}: the reference determinant's "
                f"energy from the active-space integrals is {self.hf_energy:.10f} Ha but {what} is "
                f"{expected:.10f} Ha ({1e3 * difference:+.6f} mHa; tolerance "
                f"{HF_CONSISTENCY_TOL:g} Ha). The orbital order or the integral transformation is wrong; please "
                "report this with the molecule"
            )

    def reference_determinant_check(self) -> tuple[float, str]:
        """(energy in Ha, what it is) that the reference determinant's active-space energy must equal: the SCF
        energy for canonical orbitals, else PySCF's energy of the determinant's density (see _check_hf_energy)."""
        space = self.active_orbitals
        if space.mo_coeff is None:
            return self.scf_energy, f"the {self.scf.method} energy"
        from .orbitals.solvers import determinant_energy_from_density

        n_core = len(space.core)
        order = list(space.core) + list(space.active)
        energy = determinant_energy_from_density(self.scf, space.mo_coeff[:, order], n_core + self.n_beta,
                                                 self.n_alpha - self.n_beta)
        return energy, "PySCF's energy of that determinant's density"

    # sizes and quantum numbers ------------------------------------------------------------------------------
    @property
    def n_orbitals(self) -> int:
        """Active spatial orbitals."""
        return self.active_orbitals.n_orbitals

    @property
    def n_qubits(self) -> int:
        """Spin orbitals of the active space: qubits before any tapering."""
        return 2 * self.n_orbitals

    @property
    def n_alpha(self) -> int:
        return self.active_orbitals.n_alpha

    @property
    def n_beta(self) -> int:
        return self.active_orbitals.n_beta

    @property
    def n_electrons(self) -> int:
        """Active electrons."""
        return self.n_alpha + self.n_beta

    @property
    def multiplicity(self) -> int:
        return self.molecule.multiplicity

    @property
    def spin(self) -> float:
        """Total spin S requested (the exact reference has this S)."""
        return 0.5 * (self.multiplicity - 1)

    @property
    def sz(self) -> float:
        """Spin projection of the determinant space: high spin, Sz = S."""
        return 0.5 * (self.n_alpha - self.n_beta)

    @property
    def n_determinants(self) -> int:
        """Dimension of the (N, Sz) determinant space, C(n, N_alpha) * C(n, N_beta)."""
        return comb(self.n_orbitals, self.n_alpha) * comb(self.n_orbitals, self.n_beta)

    # energies -------------------------------------------------------------------------------------------------
    @property
    def scf_energy(self) -> float:
        """RHF/ROHF total energy from PySCF (Ha)."""
        return self.scf.energy

    @cached_property
    def hf_energy(self) -> float:
        """Energy (Ha) of the reference determinant (lowest active orbitals filled) from the active-space
        Hamiltonian; equals ``scf_energy`` for canonical orbitals, lies above it for natural or CASSCF orbitals."""
        return determinant_energy(self.h1, self.h2, self.core_energy, range(self.n_alpha), range(self.n_beta))

    @property
    def scf_stability(self) -> chemistry.ScfStability:
        """PySCF's stability analysis of the SCF solution (computed on first use; warns when unstable)."""
        return self.scf.stability()

    @property
    def reference(self) -> Reference:
        """Exact ground state with this problem's N, Sz and S (computed on first use)."""
        return Reference(states=tuple(self.lowest_states(1)))

    def lowest_states(self, k: int) -> list:
        """The ``k`` lowest exact states of the requested total spin, ascending in energy."""
        if k < 1:
            raise SizeLimitError(f"k={k} states asked for; ask for at least 1")
        if len(self._states) < k:
            sizing.check_reference(self.n_orbitals, self.n_alpha, self.n_beta)  # memory and time, before PySCF
            if self.n_determinants > REFERENCE_DETERMINANT_LIMIT:
                raise SizeLimitError(
                    f"the exact reference needs {self.n_determinants:,} determinants, above the limit of "
                    f"{REFERENCE_DETERMINANT_LIMIT:,}; choose a smaller active space"
                )
            found = chemistry.lowest_states(
                self.h1, self.h2, self.core_energy, self.n_alpha, self.n_beta, self.spin, n_states=k
            )
            self._states = [make_state(e, ci, ss, self.n_orbitals, self.n_alpha, self.n_beta) for e, ci, ss in found]
        return self._states[:k]

    @property
    def active_space_error(self) -> SpaceError:
        """What the active space loses: the exact active-space energy against full-space FCI where it is
        affordable, else full-space CCSD(T) (:mod:`groundkit.space_error`). Computed on first use and kept."""
        if not self._space_error:
            self._space_error.append(space_error(self))
        return self._space_error[0]

    @property
    def known_active_space_error(self) -> SpaceError | None:
        """The active-space error if it was already computed, else None (nothing is computed)."""
        return self._space_error[0] if self._space_error else None

    # views ----------------------------------------------------------------------------------------------------
    def fermion_hamiltonian(self):
        """The active-space Hamiltonian as an ``openfermion.InteractionOperator`` over interleaved spin orbitals."""
        from openfermion import InteractionOperator
        from openfermion.chem.molecular_data import spinorb_from_spatial

        one, two = spinorb_from_spatial(self.h1, np.asarray(self.h2.transpose(0, 2, 3, 1), order="C"))
        return InteractionOperator(self.core_energy, one, 0.5 * two)

    def summary(self) -> str:
        """Plain-text description: molecule, SCF (attempts, stability), active space, sizes, reference and the
        active-space error (computing it: full-space FCI or CCSD(T))."""
        ref = self.reference
        return "\n".join([
            repr(self.molecule),
            *self.scf_lines(),
            f"active space: {self.active_orbitals}",
            f"qubits (spin orbitals): {self.n_qubits}; determinants (N, Sz): {self.n_determinants:,}",
            f"exact reference: {ref.energy:.10f} Ha, multiplicity {ref.multiplicity}, <S^2> = {ref.spin_square:.6f}",
            *self._space_error_lines(),
        ])

    def _space_error_lines(self) -> list[str]:
        try:
            return [self.active_space_error.line()]
        except Exception as err:  # a summary never fails on this line
            return [f"active-space error: not available ({type(err).__name__}: {err})"]

    def scf_lines(self) -> list[str]:
        """The SCF part of :meth:`summary`: energy, the solver attempts (a fallback is named) and stability."""
        scf = self.scf
        how = "after a fallback: " if scf.needed_fallback else ""
        stability = scf.stability()
        verdict = stability.description if stability.stable else f"UNSTABLE: {stability.description}"
        return [
            f"SCF: {scf.method} {self.scf_energy:.10f} Ha ({how}{'; '.join(scf.attempts)})",
            f"SCF stability: {verdict}",
        ]

    def _repr_html_(self) -> str:
        return upcall("html:problem", self)

    def __repr__(self) -> str:
        return (f"Problem({self.molecule.formula}, {self.active_orbitals.n_electrons}e/{self.n_orbitals}o, "
                f"{self.n_qubits} qubits, multiplicity={self.multiplicity})")


def determinant_energy(h1, h2, core_energy: float, alpha_occ, beta_occ) -> float:
    """Energy (Ha) of one determinant from active-space integrals (Slater–Condon rules)."""
    a, b = np.asarray(list(alpha_occ), dtype=int), np.asarray(list(beta_occ), dtype=int)
    h1, h2 = np.asarray(h1), np.asarray(h2)
    coulomb = np.einsum("iijj->ij", h2)  # (ii|jj)
    exchange = np.einsum("ijji->ij", h2)  # (ij|ji)
    same = coulomb - exchange
    energy = core_energy + h1[a, a].sum() + h1[b, b].sum()
    energy += 0.5 * same[np.ix_(a, a)].sum() + 0.5 * same[np.ix_(b, b)].sum() + coulomb[np.ix_(a, b)].sum()
    return float(energy)


def _key(molecule: MoleculeSpec, active_space: ActiveSpace | None) -> tuple:
    return (molecule, active_space if active_space is not None else ActiveSpace())


def problem_key(problem: Problem) -> tuple:
    """The workspace key of a problem: (molecule, active space)."""
    return (problem.molecule, problem.active_space)


def build_problem(molecule: MoleculeSpec, active_space: ActiveSpace | None = None) -> Problem:
    """The shared Problem for this molecule and active space (kept in the workspace, kind ``problem``)."""
    key = _key(molecule, active_space)

    def build() -> Problem:
        sizing.check_problem(molecule, key[1])  # SCF and integral memory and time, before any PySCF call
        return Problem(molecule, key[1])

    return workspace().fetch("problem", key, build, parents=lambda problem: (problem.scf,),
                             grows=True)


def cached_problem(molecule: MoleculeSpec, active_space: ActiveSpace | None = None) -> Problem | None:
    """The kept Problem for this molecule and active space, or None (nothing is computed)."""
    return workspace().get("problem", _key(molecule, active_space))
