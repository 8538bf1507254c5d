"""The chemistry layer: every call into PySCF lives here (SCF, integrals, classical baselines, FCI solves).

Functions take and return plain numbers and arrays; PySCF objects stay private to this module. SCF solutions
are kept in the workspace per :class:`~groundkit.molecule.MoleculeSpec` (kind ``SCF``), so repeated calls for
one molecule cost nothing.
"""

from __future__ import annotations

import warnings
from collections.abc import Callable, Iterator
from contextlib import contextmanager
from dataclasses import dataclass, field
from functools import lru_cache
from typing import TYPE_CHECKING, Any

import numpy as np

from .errors import ActiveSpaceError, BasisError, ConvergenceError, ScfFallbackWarning, ScfInstabilityWarning
from .workspace import workspace

if TYPE_CHECKING:  # pragma: no cover
    from .molecule import MoleculeSpec

SCF_CONV_TOL = 1e-10  # Hartree
SCF_MAX_CYCLES = (100, 300, 100)  # plain DIIS, DIIS with level shift, second-order solver
SCF_INITIAL_GUESS = "minao"  # PySCF's superposition of atomic densities: no randomness, the same on every run
SCF_THREADS = 1  # BLAS/OpenMP threads inside an SCF: one thread makes every run take the same path (see below)
CC_MAX_CYCLE = 200  # CISD and CCSD iterations before a baseline is reported as not converged
FCI_CONV_TOL = 1e-12  # Hartree


@dataclass(frozen=True)
class ScfStability:
    """PySCF's stability analysis of an RHF/ROHF solution (the lowest eigenvalues of the orbital Hessian).

    ``internal``: no lower solution of the same kind (RHF or ROHF) by a real orbital rotation. ``external``: for
    RHF, no lower UHF solution (RHF→UHF); ``None`` for ROHF, where it is not analysed.
    """

    method: str
    internal: bool
    external: bool | None

    @property
    def stable(self) -> bool:
        return self.internal and self.external is not False

    @property
    def description(self) -> str:
        """One line for reports: 'stable (...)' or the instabilities found."""
        if self.stable:
            checked = "internal and RHF→UHF" if self.external is not None else "internal"
            return f"stable ({checked} stability analysis)"
        found = []
        if not self.internal:
            found.append(f"{self.method} internal instability: a lower-energy {self.method} solution exists, "
                         "these orbitals are a saddle point")
        if self.external is False:
            found.append("RHF→UHF instability: a lower-energy UHF solution breaks spin symmetry (typical of "
                         "stretched bonds); expect strong static correlation")
        return "; ".join(found)


@dataclass(frozen=True, eq=False)
class ScfSolution:
    """A converged RHF (closed shell) or ROHF (open shell) solution. Energies in Hartree.

    Orbitals are ordered doubly occupied, singly occupied, virtual (by energy inside each class), so the
    Hartree–Fock determinant fills the lowest indices. ``attempts`` lists each solver run with its cycle count;
    more than one means a fallback was needed. :meth:`stability` runs PySCF's stability analysis on first use.
    """

    method: str
    energy: float
    nuclear_repulsion: float
    mo_energy: np.ndarray
    mo_occ: np.ndarray
    mo_coeff: np.ndarray
    attempts: tuple[str, ...]
    _mf: Any = field(repr=False)
    label: str = ""
    _stability: list = field(default_factory=list, repr=False)

    @property
    def n_orbitals(self) -> int:
        return int(self.mo_coeff.shape[1])

    @property
    def n_doubly_occupied(self) -> int:
        return int(np.count_nonzero(self.mo_occ > 1.5))

    @property
    def n_singly_occupied(self) -> int:
        return int(np.count_nonzero((self.mo_occ > 0.5) & (self.mo_occ < 1.5)))

    @property
    def needed_fallback(self) -> bool:
        """True when plain DIIS did not converge and a level shift or the second-order solver was needed."""
        return len(self.attempts) > 1

    def stability(self) -> ScfStability:
        """PySCF's stability analysis (internal; for RHF also RHF→UHF), computed once and kept.

        Warns :class:`~groundkit.errors.ScfInstabilityWarning` when it finds an instability. It costs about as
        much as the SCF itself for mid-sized basis sets, so it runs only when asked (``problem.summary()``,
        ``problem.scf_stability``) or straight after an SCF that needed a fallback.
        """
        if not self._stability:
            result = _analyse_stability(self._mf, self.method)
            self._stability.append(result)
            if not result.stable:
                warnings.warn(f"SCF of {self.label or 'this molecule'} is unstable: {result.description}",
                              ScfInstabilityWarning, stacklevel=2)
        return self._stability[0]

    @property
    def stable(self) -> bool:
        """No instability found by :meth:`stability` (runs it on first use)."""
        return self.stability().stable

    @property
    def instability(self) -> str | None:
        """The instabilities found by :meth:`stability`, or None for a stable solution."""
        result = self.stability()
        return None if result.stable else result.description


@lru_cache(maxsize=512)
def check_basis(basis: str, symbol: str) -> None:
    """Raise :class:`BasisError` unless PySCF has basis ``basis`` for element ``symbol``."""
    from pyscf import gto

    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            shells = gto.basis.load(basis, symbol)
    except Exception as err:  # PySCF raises several types for unknown names
        detail = " ".join(str(err).split())
        raise BasisError(
            f"basis {basis!r} is not available for {symbol} ({type(err).__name__}: {detail}); use a "
            "name from PySCF's basis library, e.g. 'sto-3g', '6-31g', 'cc-pvdz' (list them with "
            "sorted(pyscf.gto.basis.ALIAS))"
        ) from None
    if not shells:
        raise BasisError(f"basis {basis!r} has no functions for {symbol}; choose a basis set that covers it")


@lru_cache(maxsize=512)
def atom_basis_size(basis: str, symbol: str) -> tuple[int, int]:
    """(spherical basis functions, primitive weight) of one atom of ``symbol`` in ``basis``, without any integral.

    The weight, the sum over the atom's shells of primitives times components (2l+1), is the cost measure of the
    SCF time model in :mod:`groundkit.sizing`. Read by PySCF from a one-atom molecule (milliseconds, cached);
    raises :class:`BasisError` like :func:`check_basis`.
    """
    from pyscf import gto

    check_basis(basis, symbol)
    mol = gto.Mole()
    mol.atom = [(symbol, (0.0, 0.0, 0.0))]
    mol.basis = basis
    mol.spin = gto.charge(symbol) % 2
    mol.verbose = 0
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        mol.build(dump_input=False, parse_arg=False)
    weight = sum(mol.bas_nprim(i) * (2 * mol.bas_angular(i) + 1) for i in range(mol.nbas))
    return int(mol.nao_nr()), int(weight)


def pyscf_max_memory() -> float:
    """PySCF's working-memory setting in MB (``pyscf.lib.param.MAX_MEMORY``; env ``PYSCF_MAX_MEMORY``): above it the
    SCF computes its two-electron integrals directly in every cycle instead of storing them."""
    from pyscf import lib

    return float(lib.param.MAX_MEMORY)


def build_mole(spec: MoleculeSpec) -> Any:
    """A PySCF ``Mole`` for the spec; unknown or incomplete basis sets raise :class:`BasisError`."""
    from pyscf import gto
    from pyscf.lib.exceptions import BasisNotFoundError

    mol = gto.Mole()
    mol.atom = [(s, c) for s, c in zip(spec.symbols, spec.coordinates)]
    mol.unit = "Angstrom" if spec.unit == "angstrom" else "Bohr"
    mol.basis = spec.basis
    mol.charge = spec.charge
    mol.spin = spec.multiplicity - 1
    mol.verbose = 0
    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            mol.build(dump_input=False, parse_arg=False)
    except (BasisNotFoundError, KeyError, RuntimeError) as err:
        raise BasisError(
            f"basis {spec.basis!r} is not available for {spec.formula} ({err}); use a name from PySCF's basis "
            "library, e.g. 'sto-3g', '6-31g', 'cc-pvdz' (list them with pyscf.gto.basis.ALIAS)"
        ) from None
    return mol


def _scf_object(mol: Any) -> Any:
    from pyscf import scf

    mf = scf.RHF(mol) if mol.spin == 0 else scf.ROHF(mol)
    mf.conv_tol = SCF_CONV_TOL
    mf.init_guess = SCF_INITIAL_GUESS
    mf.verbose = 0
    return mf


@contextmanager
def scf_threads(limit: int | None = None) -> Iterator[None]:
    """Limit BLAS and OpenMP (PySCF's own kernels) to ``limit`` threads (default :data:`SCF_THREADS`).

    Threaded reductions add in a different order on each run; on a hard SCF (the Ni atom triplet) that rounding
    sends DIIS to different solutions, up to 0.25 Ha apart. With a fixed thread count every run is identical.
    """
    from pyscf import lib, scf  # noqa: F401  (loads PySCF's OpenMP library before its threads are limited)
    from threadpoolctl import threadpool_limits

    with threadpool_limits(limits=SCF_THREADS if limit is None else limit):
        yield


def solve_scf(spec: MoleculeSpec) -> ScfSolution:
    """RHF or ROHF for the spec, retried with a level shift and then a second-order solver if needed (cached).

    Deterministic: a fixed initial guess and :data:`SCF_THREADS` threads, whatever the environment sets. A
    fallback warns :class:`~groundkit.errors.ScfFallbackWarning` and runs the stability analysis at once.
    """
    return workspace().fetch("SCF", spec, lambda: _solve_scf(spec))


def _solve_scf(spec: MoleculeSpec) -> ScfSolution:
    mol = build_mole(spec)
    with scf_threads():
        mf, attempts = _converge(mol)
    if not mf.converged:
        raise ConvergenceError(
            f"SCF for {spec!r} did not converge after: {'; '.join(attempts)}. Try another geometry, "
            "multiplicity or basis set; a wrong multiplicity is the usual cause"
        )
    _order_orbitals(mf)
    solution = ScfSolution(
        method="RHF" if mol.spin == 0 else "ROHF",
        energy=float(mf.e_tot),
        nuclear_repulsion=float(mol.energy_nuc()),
        mo_energy=np.array(mf.mo_energy, dtype=float),
        mo_occ=np.array(mf.mo_occ, dtype=float),
        mo_coeff=np.array(mf.mo_coeff, dtype=float),
        attempts=tuple(attempts),
        _mf=mf,
        label=repr(spec),
    )
    if solution.needed_fallback:
        warnings.warn(
            f"SCF of {spec!r} needed a fallback: {'; '.join(attempts)}. A hard SCF can have several solutions; "
            "the stability analysis follows (see problem.summary())", ScfFallbackWarning, stacklevel=2,
        )
        solution.stability()
    return solution


def _converge(mol: Any) -> tuple[Any, list[str]]:
    """Plain DIIS, then DIIS with a level shift, then the second-order solver, each from the last density."""
    attempts: list[str] = []
    mf = _scf_object(mol)
    mf.max_cycle = SCF_MAX_CYCLES[0]
    mf.kernel()
    attempts.append(_attempt("DIIS", mf))
    if not mf.converged:
        dm = mf.make_rdm1()
        mf = _scf_object(mol)
        mf.level_shift = 0.5
        mf.max_cycle = SCF_MAX_CYCLES[1]
        mf.kernel(dm0=dm)
        attempts.append(_attempt("DIIS with level shift 0.5 Ha", mf))
    if not mf.converged:
        dm = mf.make_rdm1()
        mf = _scf_object(mol).newton()
        mf.max_cycle = SCF_MAX_CYCLES[2]
        mf.kernel(dm0=dm)
        attempts.append(_attempt("second-order (Newton) solver", mf))
    return mf, attempts


def _attempt(name: str, mf: Any) -> str:
    """One line per solver run, e.g. 'DIIS: converged in 9 cycles'."""
    cycles = getattr(mf, "cycles", None)
    if not isinstance(cycles, (int, np.integer)) or cycles <= 0:  # the second-order solver keeps no count
        return f"{name}: {'converged' if mf.converged else 'not converged'}"
    return f"{name}: converged in {cycles} cycles" if mf.converged else f"{name}: not converged after {cycles} cycles"


def _order_orbitals(mf: Any) -> None:
    """The one place orbitals are reordered: doubly occupied, singly occupied, virtual (by energy inside each
    class), so the Hartree–Fock determinant fills the lowest indices; then each orbital's sign is fixed.

    PySCF's object is changed in place so that the baselines see the same orbitals as the active space (for
    ROHF the alpha and beta orbital energies PySCF attaches are reordered alongside).
    """
    from pyscf import lib

    energy = np.asarray(mf.mo_energy, dtype=float)
    order = np.lexsort((energy, -np.asarray(mf.mo_occ, dtype=float)))
    tags = {k: np.asarray(getattr(mf.mo_energy, k))[order] for k in ("mo_ea", "mo_eb")
            if getattr(mf.mo_energy, k, None) is not None}
    mf.mo_energy = lib.tag_array(energy[order], **tags) if tags else energy[order]
    mf.mo_occ = np.asarray(mf.mo_occ, dtype=float)[order]
    # eigen-solvers return either sign of each orbital; fix it so parameters compare between runs and processes
    mf.mo_coeff = canonical_phases(np.asarray(mf.mo_coeff, dtype=float)[:, order])


def _analyse_stability(mf: Any, method: str) -> ScfStability:
    """Run PySCF's stability analysis (thread-limited, so it is deterministic too)."""
    with scf_threads(), warnings.catch_warnings():
        warnings.simplefilter("ignore")
        _, _, internal, external = mf.stability(internal=True, external=method == "RHF", return_status=True)
    return ScfStability(method=method, internal=bool(internal), external=None if external is None else bool(external))


def clear_cache() -> None:
    """Forget every kept SCF solution (and the problems built on them) in the workspace."""
    workspace().clear("SCF")


def active_integrals(
    scf: ScfSolution, core: list[int], active: list[int], mo_coeff: np.ndarray | None = None
) -> tuple[float, np.ndarray, np.ndarray]:
    """Core energy (Ha, with nuclear repulsion), active h1 (n, n) and h2 (n, n, n, n) in chemists' notation.

    The doubly occupied ``core`` orbitals are folded into the constant and into h1 through their Coulomb and
    exchange field, as in a CASCI calculation. ``mo_coeff`` (n_ao, n_mo) replaces the SCF orbitals (natural or
    CASSCF orbitals; ``core`` and ``active`` index its columns).
    """
    from pyscf import ao2mo
    from pyscf import scf as pyscf_scf

    mol = scf._mf.mol
    hcore = scf._mf.get_hcore()
    orbitals = scf.mo_coeff if mo_coeff is None else np.asarray(mo_coeff, dtype=float)
    c_core = orbitals[:, core]
    c_act = orbitals[:, active]
    core_energy = scf.nuclear_repulsion
    veff = np.zeros_like(hcore)
    if core:
        dm_core = 2.0 * c_core @ c_core.T
        vj, vk = pyscf_scf.hf.get_jk(mol, dm_core)
        veff = vj - 0.5 * vk
        core_energy += float(np.einsum("ij,ji->", dm_core, hcore + 0.5 * veff))
    h1 = c_act.T @ (hcore + veff) @ c_act
    n = len(active)
    h2 = ao2mo.restore(1, ao2mo.full(mol, c_act, compact=True), n) if n else np.zeros((0, 0, 0, 0))
    return core_energy, np.ascontiguousarray(h1), np.ascontiguousarray(h2)


# ---------------------------------------------------------------------------------------------------------------
# exact solutions in a determinant space
DENSE_STATE_LIMIT = 500
"""Determinant blocks up to this size are diagonalised in full (LAPACK ``eigh``); larger ones by projected Davidson."""
SPIN_TOLERANCE = 1e-6  # a returned state must have |<S^2> - S(S+1)| below this
RESIDUAL_TOLERANCE = 1e-5  # Hartree; ||H c - E c|| of every returned state of the iterative solver
DAVIDSON_MAX_CYCLE = 400
SPARSE_SPIN_LIMIT = 6_000_000  # S+ and S- kept as sparse matrices up to this many entries (~75 MB)
SPIN_START_SEED = 20_241  # seeds the random spin-S start vector of the iterative solver (same seed, same states)


def lowest_states(
    h1: np.ndarray,
    h2: np.ndarray,
    core_energy: float,
    n_alpha: int,
    n_beta: int,
    spin: float,
    n_states: int = 1,
    *,
    dense: bool | None = None,
    seed: int = SPIN_START_SEED,
) -> list[tuple[float, np.ndarray, float]]:
    """The ``n_states`` lowest eigenstates of total spin ``spin`` (S) in the (n_alpha, n_beta) determinant block.

    Returns (energy in Ha, CI vector in PySCF order, <S^2>) per state, ascending; fewer when the block holds
    fewer states of spin S. No state of another spin can be returned, however many lie lower:

    - blocks of at most ``DENSE_STATE_LIMIT`` determinants (or ``dense=True``) are diagonalised in full; the
      eigenvalues come in ascending order, S^2 is diagonalised inside each degenerate cluster, and the first
      ``n_states`` vectors with S(S+1) are kept (min-max principle: they are the lowest of that spin);
    - larger blocks (or ``dense=False``) are solved by Davidson's method inside the spin-S subspace: every search
      vector is passed through Lowdin's spin projector, so the solver's matrix is H restricted to spin S (H
      commutes with S^2), and its lowest eigenvalues are by definition the lowest of spin S. A seeded random
      spin-S vector joins the start vectors, so no spin-S eigenvector is orthogonal to the search space.

    Every returned state is checked: <S^2> = S(S+1) within ``SPIN_TOLERANCE``, and for the iterative solver a
    residual ||Hc - Ec|| below ``RESIDUAL_TOLERANCE`` Ha; otherwise :class:`ConvergenceError`.
    """
    norb = h1.shape[0]
    allowed = spin_values(norb, n_alpha, n_beta)
    if not any(abs(spin - s) < 1e-9 for s in allowed):
        raise ActiveSpaceError(
            f"total spin S={spin} is impossible for {n_alpha} alpha and {n_beta} beta electrons in {norb} "
            f"orbitals; possible: {', '.join(f'{s:g}' for s in allowed)}"
        )
    if n_states < 1:
        raise ActiveSpaceError(f"n_states={n_states}; ask for at least 1 state")
    n_states = min(n_states, spin_state_count(norb, n_alpha + n_beta, spin))
    n_det = _binom(norb, n_alpha) * _binom(norb, n_beta)
    if dense is None:
        dense = n_det <= DENSE_STATE_LIMIT
    if dense:
        return _dense_lowest_states(h1, h2, core_energy, n_alpha, n_beta, spin * (spin + 1), n_states)
    return _projected_lowest_states(h1, h2, core_energy, n_alpha, n_beta, spin, n_states, seed)


def spin_values(norb: int, n_alpha: int, n_beta: int) -> list[float]:
    """Total spins S present in the (n_alpha, n_beta) block of ``norb`` orbitals: |Sz|, |Sz|+1, ..., S_max."""
    n = n_alpha + n_beta
    sz = abs(n_alpha - n_beta) / 2
    s_max = min(n, 2 * norb - n) / 2
    return [sz + k for k in range(int(round(s_max - sz)) + 1)]


def spin_state_count(norb: int, n_electrons: int, spin: float) -> int:
    """How many states of total spin S one determinant block with |Sz| <= S holds: D(S) - D(S+1).

    D(M) = C(norb, N/2 + M) C(norb, N/2 - M) is the size of the Sz = M block; every spin-S multiplet has one
    member in each block with |M| <= S.
    """
    def block(m: float) -> int:
        return _binom(norb, int(round(n_electrons / 2 + m))) * _binom(norb, int(round(n_electrons / 2 - m)))

    return block(spin) - block(spin + 1)


def _dense_lowest_states(h1, h2, core_energy, n_alpha, n_beta, target, n_states):
    """Full diagonalisation of a determinant block, then selection by <S^2> (exact; ``target`` = S(S+1))."""
    from pyscf import fci

    norb = h1.shape[0]
    shape = (_binom(norb, n_alpha), _binom(norb, n_beta))
    dim = shape[0] * shape[1]
    _, hmat = fci.direct_spin1.pspace(h1, h2, norb, (n_alpha, n_beta), np=dim)  # every determinant, in order
    hmat = 0.5 * (hmat + hmat.T)
    energies, vectors = np.linalg.eigh(hmat)
    apply_s2 = _spin_square_operator(norb, n_alpha, n_beta)
    return _resolve_degenerate(hmat, apply_s2, energies, vectors, core_energy, target, n_states, shape)


def _resolve_degenerate(hmat, apply_s2, energies, vectors, core_energy, target, n_states, shape):
    """Walk the eigenvalues upwards; diagonalise S^2 inside each degenerate cluster so every vector has sharp spin.

    ``energies`` ascending (Ha, without the core energy), ``vectors`` their columns; ``apply_s2`` maps a CI
    array of ``shape`` to S^2 times it. States of spin S(S+1) = ``target`` are kept until ``n_states`` are found.
    """
    kept = []
    k = 0
    dim = len(energies)
    while k < dim and len(kept) < n_states:
        end = k + 1
        while end < dim and abs(energies[end] - energies[k]) < 1e-8:
            end += 1
        block = vectors[:, k:end]
        s2_block = np.column_stack([apply_s2(block[:, j].reshape(shape)).ravel() for j in range(end - k)])
        ss_values, rot = np.linalg.eigh(0.5 * (block.T @ s2_block + s2_block.T @ block))
        for ss, r in zip(ss_values, rot.T):
            if abs(ss - target) < SPIN_TOLERANCE and len(kept) < n_states:
                v = block @ r
                kept.append((float(v @ hmat @ v + core_energy), v.reshape(shape).copy(), float(ss)))
        k = end
    return kept


def _projected_lowest_states(h1, h2, core_energy, n_alpha, n_beta, spin, n_states, seed):
    """Davidson's method on H restricted to spin S: every search vector is spin-projected (see lowest_states)."""
    from pyscf import fci, lib
    from pyscf.fci import cistring

    norb = h1.shape[0]
    nelec = (n_alpha, n_beta)
    shape = (_binom(norb, n_alpha), _binom(norb, n_beta))
    project = _spin_projector(norb, n_alpha, n_beta, spin)
    absorbed = fci.direct_spin1.absorb_h1e(h1, h2, norb, nelec, 0.5)
    links = (cistring.gen_linkstr_index_trilidx(range(norb), n_alpha),
             cistring.gen_linkstr_index_trilidx(range(norb), n_beta))

    def apply_h(x: np.ndarray) -> np.ndarray:
        return fci.direct_spin1.contract_2e(absorbed, x.reshape(shape), norb, nelec, links).ravel()

    hdiag = np.asarray(fci.direct_spin1.make_hdiag(h1, h2, norb, nelec)).ravel()
    # H on the lowest-diagonal determinants (PySCF's pspace): start vectors, and PySCF's own preconditioner
    addresses, h_small = fci.direct_spin1.pspace(h1, h2, norb, nelec, hdiag, min(400, hdiag.size))
    small_energies, small_vectors = np.linalg.eigh(h_small)
    olsen = fci.direct_spin1.make_pspace_precond(hdiag, small_energies, small_vectors, addresses, level_shift=1e-3)

    def precondition(residual: np.ndarray, e0: float, x0: np.ndarray, *_: Any) -> np.ndarray:
        return project(olsen(residual, e0, x0))

    start = _spin_start_vectors(small_vectors, addresses, project, hdiag.size, n_states, seed)
    converged, _, vectors = lib.davidson1(
        lambda xs: [apply_h(x) for x in xs], start, precondition, tol=FCI_CONV_TOL, max_cycle=DAVIDSON_MAX_CYCLE,
        max_space=max(12, 2 * n_states + 6), nroots=n_states, verbose=0,
    )
    if not all(converged):
        raise ConvergenceError(
            f"the spin-projected Davidson solver did not converge {n_states} state(s) of S={spin} in "
            f"{DAVIDSON_MAX_CYCLE} iterations ({shape[0] * shape[1]:,} determinants)"
        )
    found = []
    for x in vectors:
        x = project(np.asarray(x))
        x /= np.linalg.norm(x)
        ci = x.reshape(shape)
        energy = state_energy(h1, h2, core_energy, ci, n_alpha, n_beta)
        ss = spin_square(ci, norb, n_alpha, n_beta)
        residual = float(np.linalg.norm(apply_h(x) - (energy - core_energy) * x))
        if abs(ss - spin * (spin + 1)) > SPIN_TOLERANCE or residual > RESIDUAL_TOLERANCE:
            raise ConvergenceError(
                f"the spin-projected Davidson solver returned a state with <S^2>={ss:.8f} (wanted "
                f"{spin * (spin + 1):g}) and residual {residual:.1e} Ha (accepted below {RESIDUAL_TOLERANCE:g})"
            )
        found.append((energy, ci, ss))
    return sorted(found, key=lambda t: t[0])


def _spin_start_vectors(small_vectors, addresses, project, dim, n_states, seed):
    """Orthonormal spin-S start vectors: the projected eigenvectors of H on the lowest-diagonal determinants,
    lowest first, then one projected seeded random vector, which overlaps every spin-S eigenvector."""
    kept: list[np.ndarray] = []

    def add(v: np.ndarray, threshold: float) -> None:
        v = project(v)
        for u in kept:
            v -= np.dot(u, v) * u
        norm = np.linalg.norm(v)
        if norm > threshold:
            kept.append(v / norm)

    for j in range(small_vectors.shape[1]):
        if len(kept) >= n_states + 2:
            break
        v = np.zeros(dim)
        v[addresses] = small_vectors[:, j]
        add(v, 0.3)
    add(np.random.default_rng(seed).standard_normal(dim), 1e-3)
    return kept


def _spin_projector(norb: int, n_alpha: int, n_beta: int, spin: float):
    """Lowdin's projector onto total spin S inside the (n_alpha, n_beta) block, as a function of a flat CI vector.

    P_S = prod over the other spins S' of the block of (S^2 - S'(S'+1)) / (S(S+1) - S'(S'+1)) (P.-O. Lowdin,
    Phys. Rev. 97, 1509 (1955)); exact, since S^2 has only the eigenvalues S'(S'+1) of ``spin_values`` there.
    For Sz = 0 the spin rotation exp(-i pi S_y) maps determinant (A, B) to (B, A) and multiplies a spin-S state by
    (-1)^S, so (c + (-1)^S c^T) / 2 removes every spin of the other parity first and halves the S^2 products.
    """
    shape = (_binom(norb, n_alpha), _binom(norb, n_beta))
    apply_s2 = _spin_square_operator(norb, n_alpha, n_beta)
    target = spin * (spin + 1)
    others = [s for s in spin_values(norb, n_alpha, n_beta) if abs(s - spin) > 1e-9]
    flip = None
    if n_alpha == n_beta:
        flip = 1.0 if int(round(spin)) % 2 == 0 else -1.0
        others = [s for s in others if int(round(s - spin)) % 2 == 0]
    factors = [s * (s + 1) for s in others]

    def project(vector: np.ndarray) -> np.ndarray:
        v = np.asarray(vector, dtype=float).reshape(shape)
        if flip is not None:
            v = 0.5 * (v + flip * v.T)
        for other in factors:
            v = (apply_s2(v) - other * v) / (target - other)
        return v.ravel()

    return project


def _spin_square_operator(norb: int, n_alpha: int, n_beta: int):
    """S^2 = (S+S- + S-S+)/2 + Sz^2 acting on PySCF-ordered CI arrays of the (n_alpha, n_beta) block.

    S- (one electron from alpha to beta) and S+ are built once as sparse matrices from PySCF's string tables, so
    S+S- = (S-)^T S- and S-S+ = (S+)^T S+; the same terms as PySCF's ``fci.spin_op.contract_ss``, which is
    used instead for blocks whose two matrices would hold more than ``SPARSE_SPIN_LIMIT`` entries.
    """
    from pyscf import fci

    entries = norb * (_binom(norb - 1, n_alpha - 1) * _binom(norb - 1, n_beta)
                      + _binom(norb - 1, n_alpha) * _binom(norb - 1, n_beta - 1))
    if entries > SPARSE_SPIN_LIMIT:
        return lambda ci: fci.spin_op.contract_ss(np.ascontiguousarray(ci, dtype=float), norb, (n_alpha, n_beta))
    moves = [m for m in (_spin_move(norb, n_alpha, n_beta, +1), _spin_move(norb, n_alpha, n_beta, -1)) if m is not None]
    sz_squared = 0.25 * (n_alpha - n_beta) ** 2

    def apply(ci: np.ndarray) -> np.ndarray:
        flat = np.asarray(ci, dtype=float).ravel()
        out = sz_squared * flat
        for move in moves:
            out = out + 0.5 * (move.T @ (move @ flat))
        return out.reshape(np.shape(ci))

    return apply


def _spin_move(norb: int, n_alpha: int, n_beta: int, direction: int):
    """The sparse matrix of S- (``direction`` +1: a+_{i beta} a_{i alpha}) or S+ (-1) on flat CI vectors; None if
    the move leaves no determinant. Sign conventions are PySCF's string tables (the phase common to every
    entry cancels in S^2)."""
    import scipy.sparse
    from pyscf.fci import cistring

    losing, gaining = (n_alpha, n_beta) if direction > 0 else (n_beta, n_alpha)
    if losing == 0 or gaining == norb:
        return None

    def orbital_maps(n_el: int, destroy: bool) -> list[tuple[np.ndarray, np.ndarray, np.ndarray]]:
        """Per orbital i: the strings where a_i (or a+_i) acts, the strings it gives, and the signs."""
        table = (cistring.gen_des_str_index if destroy else cistring.gen_cre_str_index)(range(norb), n_el)
        flat = table.reshape(-1, 4).astype(np.int64)
        source = np.repeat(np.arange(table.shape[0]), table.shape[1])
        orbital = flat[:, 1] if destroy else flat[:, 0]
        maps = []
        for i in range(norb):
            rows = (orbital == i) & (flat[:, 3] != 0)
            maps.append((source[rows], flat[rows, 2], flat[rows, 3].astype(float)))
        return maps

    alpha_maps = orbital_maps(n_alpha, destroy=direction > 0)
    beta_maps = orbital_maps(n_beta, destroy=direction < 0)
    n_b = _binom(norb, n_beta)
    mid = (_binom(norb, n_alpha - direction), _binom(norb, n_beta + direction))
    rows, cols, values = [], [], []
    for (sa, da, ga), (sb, db, gb) in zip(alpha_maps, beta_maps):
        rows.append((da[:, None] * mid[1] + db[None, :]).ravel())
        cols.append((sa[:, None] * n_b + sb[None, :]).ravel())
        values.append((ga[:, None] * gb[None, :]).ravel())
    shape = (mid[0] * mid[1], _binom(norb, n_alpha) * n_b)
    return scipy.sparse.csr_matrix((np.concatenate(values), (np.concatenate(rows), np.concatenate(cols))), shape=shape)


def state_energy(h1, h2, core_energy, ci, n_alpha, n_beta) -> float:
    """<ci|H|ci> / <ci|ci> + core energy (Ha) for a CI vector in PySCF order."""
    from pyscf import fci

    norb = h1.shape[0]
    e = fci.direct_spin1.energy(h1, h2, ci, norb, (n_alpha, n_beta))
    return float(e / np.vdot(ci, ci).real + core_energy)


def spin_square(ci: np.ndarray, norb: int, n_alpha: int, n_beta: int) -> float:
    """<S^2> of a normalised CI vector in PySCF order (dimensionless, S(S+1) for a pure spin state)."""
    from pyscf import fci

    ss, _ = fci.spin_op.spin_square0(ci, norb, (n_alpha, n_beta))
    return float(ss)


def _binom(n: int, k: int) -> int:
    from math import comb

    return comb(n, k) if 0 <= k <= n else 0


# ---------------------------------------------------------------------------------------------------------------
# classical baselines
def natural_occupations(scf: ScfSolution, frozen: list[int]) -> np.ndarray:
    """MP2 natural-orbital occupation numbers (electrons), descending, frozen orbitals counted as 2."""
    from pyscf import mp

    solver = mp.MP2(scf._mf, frozen=frozen or None)
    solver.verbose = 0
    solver.kernel()
    dm = solver.make_rdm1()
    if isinstance(dm, (tuple, list)) or np.asarray(dm).ndim == 3:
        dm = np.asarray(dm[0]) + np.asarray(dm[1])
    occupations = np.linalg.eigvalsh(0.5 * (dm + dm.T))[::-1]
    return np.clip(occupations, 0.0, 2.0)


@dataclass(frozen=True)
class CorrelatedEnergy:
    """One correlated baseline: total energy (Ha), amplitude diagnostics, and every solver start tried.

    ``diagnostics``: ``t1_diagnostic`` (Lee & Taylor's T1 for CCSD), ``largest_t1``, ``largest_t2`` (largest
    amplitude magnitudes) for CCSD and CCSD(T); ``reference_weight`` (c0^2) for CISD. ``attempts`` lists each
    CCSD start in order with its outcome; the one marked 'accepted' (or, when none passed, 'kept') gave
    ``energy``.
    """

    energy: float
    diagnostics: dict[str, float] = field(default_factory=dict)
    attempts: tuple[str, ...] = ()


PlausibilityCheck = Callable[[float], "str | None"]
"""Given a total energy (Ha), the reason it cannot be right, or None when it passes."""

CC_LEVEL_SHIFT = 0.5  # Ha; a preconditioner shift: it changes the iteration, not the CC equations
# CCSD starts, tried in order until one converges to a plausible solution (see docs/baselines.md)
CC_STARTS: tuple[tuple[str, dict[str, Any]], ...] = (
    ("PySCF defaults (MP2 amplitudes, DIIS)", {}),
    (f"MP2 amplitudes, {CC_LEVEL_SHIFT} Ha level shift, DIIS", {"level_shift": CC_LEVEL_SHIFT}),
    (f"MP2 amplitudes, {CC_LEVEL_SHIFT} Ha level shift, no DIIS", {"level_shift": CC_LEVEL_SHIFT, "diis": False}),
    (f"CISD amplitudes, {CC_LEVEL_SHIFT} Ha level shift, DIIS", {"level_shift": CC_LEVEL_SHIFT, "start": "cisd"}),
)


def correlated_baseline(
    scf: ScfSolution, method: str, frozen: list[int], check: PlausibilityCheck | None = None,
    mo_coeff: np.ndarray | None = None,
) -> CorrelatedEnergy:
    """'mp2', 'cisd', 'ccsd' or 'ccsd(t)' (total energy in Ha) with the orbitals in ``frozen`` left out.

    ``mo_coeff`` replaces the SCF orbitals (natural or CASSCF orbitals, semicanonical inside the active blocks);
    the reference determinant then fills its lowest orbitals.

    Open shells use PySCF's unrestricted codes on the ROHF orbitals. CCSD is retried from the starts in
    ``CC_STARTS`` while a start raises, does not converge or gives an energy that ``check`` rejects; when every
    converged start is rejected the first converged one is returned (the caller flags it). Raises
    ``ConvergenceError`` when no start converges.
    """
    from pyscf import ci, mp

    frozen_arg = sorted(frozen) or None
    mf = scf._mf
    mo = _solver_orbitals(scf, mo_coeff)
    if method == "mp2":
        solver = mp.MP2(mf, frozen=frozen_arg, mo_coeff=mo)
        solver.verbose = 0
        solver.kernel()
        return CorrelatedEnergy(float(solver.e_tot))
    if method == "cisd":
        solver = ci.CISD(mf, frozen=frozen_arg, mo_coeff=mo)
        solver.verbose = 0
        solver.max_cycle = CC_MAX_CYCLE
        solver.kernel()
        _require_converged(solver, "CISD")
        c0 = float(np.ravel(solver.ci)[0])
        return CorrelatedEnergy(float(solver.e_tot), {"reference_weight": c0 * c0})
    if method in ("ccsd", "ccsd(t)"):
        solver, attempts = _ccsd_solver(scf, frozen_arg, check, mo)
        diagnostics = _cc_diagnostics(solver)
        if method == "ccsd":
            return CorrelatedEnergy(float(solver.e_tot), diagnostics, attempts)
        with np.errstate(all="ignore"):
            return CorrelatedEnergy(float(solver.e_tot + solver.ccsd_t()), diagnostics, attempts)
    raise ValueError(f"unknown baseline method {method!r}")


def _solver_orbitals(scf: ScfSolution, mo_coeff: np.ndarray | None) -> Any:
    """The ``mo_coeff`` argument of PySCF's correlated solvers: None for the SCF orbitals; for open shells (whose
    solvers are unrestricted) the same orbitals for both spins."""
    if mo_coeff is None:
        return None
    c = np.asarray(mo_coeff, dtype=float)
    return c if scf.method == "RHF" else np.array([c, c])


def _ccsd_solver(scf: ScfSolution, frozen_arg: list[int] | None,
                 check: PlausibilityCheck | None = None, mo: Any = None) -> tuple[Any, tuple[str, ...]]:
    """The accepted CCSD solver for this frozen list and orbitals, and the starts tried (cached on the SCF
    object)."""
    key = (tuple(frozen_arg or ()), None if mo is None else np.asarray(mo).tobytes())
    store = scf._mf.__dict__.setdefault("_groundkit_ccsd", {})
    if key not in store:
        store[key] = _search_ccsd(scf, frozen_arg, check, mo)
    if isinstance(store[key], ConvergenceError):
        raise store[key]
    return store[key]


def _search_ccsd(scf: ScfSolution, frozen_arg: list[int] | None,
                 check: PlausibilityCheck | None, mo: Any = None) -> tuple[Any, tuple[str, ...]] | ConvergenceError:
    """Try the starts of ``CC_STARTS`` in turn; the accepted (or kept) solver and the attempts, or the error."""
    attempts: list[str] = []
    kept: tuple[Any, int] | None = None  # the first converged but rejected solver, and its attempt
    for label, options in CC_STARTS:
        if options.get("start") == "cisd" and scf.method != "RHF":
            continue  # the CISD-to-amplitude conversion in _run_ccsd is the closed-shell one
        try:
            solver = _run_ccsd(scf, frozen_arg, options, mo)
        except Exception as err:  # PySCF fails in many ways on hard cases (e.g. a singular DIIS system)
            attempts.append(f"{label}: {type(err).__name__}: {' '.join(str(err).split())}")
            continue
        if not solver.converged or not np.isfinite(solver.e_tot):
            attempts.append(f"{label}: did not converge in {solver.max_cycle} iterations")
            continue
        objection = check(float(solver.e_tot)) if check is not None else None
        if objection is None:
            attempts.append(f"{label}: accepted")
            return solver, tuple(attempts)
        attempts.append(f"{label}: {solver.e_tot:.8f} Ha rejected ({objection})")
        kept = kept or (solver, len(attempts) - 1)
    if kept is None:
        return ConvergenceError("CCSD did not converge from any start: " + "; ".join(attempts))
    attempts[kept[1]] += "; kept, as no start passed the checks"
    return kept[0], tuple(attempts)


def _run_ccsd(scf: ScfSolution, frozen_arg: list[int] | None, options: dict[str, Any], mo: Any = None) -> Any:
    from pyscf import cc, ci

    solver = cc.CCSD(scf._mf, frozen=frozen_arg, mo_coeff=mo)
    solver.verbose = 0
    solver.max_cycle = CC_MAX_CYCLE
    solver.conv_tol = 1e-9
    solver.level_shift = options.get("level_shift", 0.0)
    if options.get("diis", True) is False:
        solver.diis = False
    t1 = t2 = None
    with warnings.catch_warnings(), np.errstate(all="ignore"):
        warnings.simplefilter("ignore", RuntimeWarning)
        if options.get("start") == "cisd":
            start = ci.CISD(scf._mf, frozen=frozen_arg, mo_coeff=mo)
            start.verbose = 0
            start.max_cycle = CC_MAX_CYCLE
            start.kernel()
            c0, c1, c2 = start.cisdvec_to_amplitudes(start.ci)
            t1 = c1 / c0
            t2 = c2 / c0 - np.einsum("ia,jb->ijab", t1, t1)  # closed shell: C2 = T2 + T1 T1 (alpha-beta block)
        solver.kernel(t1=t1, t2=t2)
    return solver


def _cc_diagnostics(solver: Any) -> dict[str, float]:
    """T1 diagnostic and the largest single and double amplitudes of a converged CCSD solver.

    T1 = sqrt(sum of squared spin-orbital singles / (2 N)), N the correlated electrons: for closed shells
    (PySCF's t1 holds the alpha singles, equal to the beta ones) this is Lee & Taylor's sqrt(|t1|^2 / N), as
    in PySCF's ``get_t1_diagnostic``; for open shells it sums both spins of the unrestricted amplitudes.
    """
    if isinstance(solver.t1, (tuple, list)):  # unrestricted: (t1a, t1b), (t2aa, t2ab, t2bb)
        singles, doubles = [np.asarray(t) for t in solver.t1], [np.asarray(t) for t in solver.t2]
        n_correlated = singles[0].shape[0] + singles[1].shape[0]
        squares = sum(float(np.sum(t * t)) for t in singles)
    else:
        singles, doubles = [np.asarray(solver.t1)], [np.asarray(solver.t2)]
        n_correlated = 2 * singles[0].shape[0]
        squares = 2.0 * float(np.sum(singles[0] ** 2))
    return {
        "t1_diagnostic": float(np.sqrt(squares / (2 * n_correlated))) if n_correlated else 0.0,
        "largest_t1": max((float(np.max(np.abs(t))) for t in singles if t.size), default=0.0),
        "largest_t2": max((float(np.max(np.abs(t))) for t in doubles if t.size), default=0.0),
    }


def _require_converged(solver: Any, name: str) -> None:
    if not getattr(solver, "converged", True):
        raise ConvergenceError(f"{name} did not converge in {solver.max_cycle} iterations")


# ---------------------------------------------------------------------------------------------------------------
# studies: overlaps between geometries and isotope masses
def cross_overlap(spec_a: MoleculeSpec, spec_b: MoleculeSpec) -> np.ndarray:
    """AO overlap <mu(a)|nu(b)> between the basis functions of two geometries, shape (n_ao(a), n_ao(b)).

    Both specs must have the same atoms and basis set, so that the AO lists correspond one to one.
    """
    from pyscf import gto

    return np.asarray(gto.intor_cross("int1e_ovlp", build_mole(spec_a), build_mole(spec_b)), dtype=float)


def most_abundant_isotope_mass(symbol: str) -> float:
    """Mass (u) of the most abundant isotope of an element, from PySCF's table of common isotope masses."""
    from pyscf.data import elements

    return float(elements.COMMON_ISOTOPE_MASSES[elements.charge(symbol)])


def canonical_phases(mo_coeff: np.ndarray) -> np.ndarray:
    """``mo_coeff`` with each column's sign fixed: its largest coefficient (magnitudes rounded to 1e-8, the
    first of equal ones) is positive. Eigen-solvers return either sign, and the choice can change with the
    BLAS thread count; fixing it makes parameters comparable between processes."""
    c = np.array(mo_coeff, dtype=float)
    pivot = np.argmax(np.round(np.abs(c), 8), axis=0)
    signs = np.where(c[pivot, np.arange(c.shape[1])] < 0, -1.0, 1.0)
    return c * signs
