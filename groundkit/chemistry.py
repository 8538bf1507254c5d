"""The chemistry layer: every call into PySCF lives here (SCF, integrals, classical baselines, FCI solves).

Functions take and return plain numbers and arrays; PySCF objects stay private to this module. SCF solutions
are cached per :class:`~groundkit.molecule.MoleculeSpec`, so repeated calls for one molecule cost nothing.
"""

from __future__ import annotations

import warnings
from collections import OrderedDict
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import dataclass, field
from functools import lru_cache
from typing import TYPE_CHECKING, Any

import numpy as np

from .errors import BasisError, ConvergenceError, ScfFallbackWarning, ScfInstabilityWarning

if TYPE_CHECKING:  # pragma: no cover
    from .molecule import MoleculeSpec

SCF_CACHE_SIZE = 64
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


_SCF_CACHE: OrderedDict[MoleculeSpec, ScfSolution] = OrderedDict()  # type: ignore[name-defined]


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
    cached = _SCF_CACHE.get(spec)
    if cached is not None:
        _SCF_CACHE.move_to_end(spec)
        return cached
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
    _SCF_CACHE[spec] = solution
    while len(_SCF_CACHE) > SCF_CACHE_SIZE:
        _SCF_CACHE.popitem(last=False)
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
    """Forget every cached SCF solution."""
    _SCF_CACHE.clear()


def active_integrals(
    scf: ScfSolution, core: list[int], active: list[int]
) -> tuple[float, np.ndarray, np.ndarray]:
    """Core energy (Ha, with nuclear repulsion), active h1 (n, n) and h2 (n, n, n, n) in chemists' notation.

    The doubly occupied ``core`` orbitals are folded into the constant and into h1 through their Coulomb and
    exchange field, as in a CASCI calculation.
    """
    from pyscf import ao2mo
    from pyscf import scf as pyscf_scf

    mol = scf._mf.mol
    hcore = scf._mf.get_hcore()
    c_core = scf.mo_coeff[:, core]
    c_act = scf.mo_coeff[:, active]
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
def lowest_states(
    h1: np.ndarray,
    h2: np.ndarray,
    core_energy: float,
    n_alpha: int,
    n_beta: int,
    spin: float,
    n_states: int = 1,
) -> list[tuple[float, np.ndarray, float]]:
    """The ``n_states`` lowest eigenstates of total spin ``spin`` (S) in the (n_alpha, n_beta) determinant block.

    Returns (energy in Ha, CI vector in PySCF order, <S^2>) per state, ascending. States of other total spin
    are excluded: when the plain Davidson solver's lowest states do not all have <S^2> = S(S+1) (within 1e-6),
    a spin penalty steers it, every state is checked again, and more roots are requested until enough pass.
    Blocks of at most 200 determinants are diagonalised in full.
    """
    from pyscf import fci

    norb = h1.shape[0]
    target = spin * (spin + 1)
    n_det = _binom(norb, n_alpha) * _binom(norb, n_beta)
    if n_det <= 200:
        return _dense_lowest_states(h1, h2, core_energy, n_alpha, n_beta, target, n_states)
    shape = (_binom(norb, n_alpha), _binom(norb, n_beta))
    # the plain solver first: when its lowest states already have spin S they are the answer
    n_roots, penalty = min(n_states, n_det), False
    while True:
        solver = fci.direct_spin1.FCI()
        solver.conv_tol = FCI_CONV_TOL
        solver.max_cycle = 300
        solver.verbose = 0
        if penalty:
            fci.addons.fix_spin_(solver, shift=0.5, ss=target)
        _, vectors = solver.kernel(h1, h2, norb, (n_alpha, n_beta), nroots=n_roots)
        vectors = [vectors] if n_roots == 1 else list(vectors)
        found = []
        for ci in vectors:
            ci = np.asarray(ci).reshape(shape)
            ss = spin_square(ci, norb, n_alpha, n_beta)
            found.append((state_energy(h1, h2, core_energy, ci, n_alpha, n_beta), ci, ss))
        kept = sorted((f for f in found if abs(f[2] - target) < 1e-6), key=lambda t: t[0])
        if not penalty and len(kept) == len(found):
            return kept[:n_states]
        if penalty and (len(kept) >= n_states or n_roots >= n_det):
            return kept[:n_states]
        if not penalty:
            penalty = True
        else:
            n_roots = min(2 * n_roots, n_det)


def _dense_lowest_states(h1, h2, core_energy, n_alpha, n_beta, target, n_states):
    """Full diagonalisation of a small determinant block, then selection by <S^2> (exact, for tests too)."""
    from pyscf import fci

    norb = h1.shape[0]
    shape = (_binom(norb, n_alpha), _binom(norb, n_beta))
    dim = shape[0] * shape[1]
    _, hmat = fci.direct_spin1.pspace(h1, h2, norb, (n_alpha, n_beta), np=dim)  # every determinant, in order
    hmat = 0.5 * (hmat + hmat.T)
    s2 = np.empty((dim, dim))
    for k in range(dim):
        unit = np.zeros(dim)
        unit[k] = 1.0
        s2[:, k] = fci.spin_op.contract_ss(unit.reshape(shape), norb, (n_alpha, n_beta)).ravel()
    energies, vectors = np.linalg.eigh(hmat)
    return _resolve_degenerate(hmat, s2, energies, vectors, core_energy, target, n_states, shape)


def _resolve_degenerate(hmat, s2, energies, vectors, core_energy, target, n_states, shape):
    """Diagonalise S^2 inside each degenerate energy cluster so that every vector has sharp spin."""
    kept = []
    k = 0
    dim = len(energies)
    while k < dim and len(kept) < n_states:
        end = k + 1
        while end < dim and abs(energies[end] - energies[k]) < 1e-8:
            end += 1
        block = vectors[:, k:end]
        ss_values, rot = np.linalg.eigh(block.T @ s2 @ block)
        for ss, r in zip(ss_values, rot.T):
            if abs(ss - target) < 1e-6 and len(kept) < n_states:
                v = block @ r
                kept.append((float(v @ hmat @ v + core_energy), v.reshape(shape).copy(), float(ss)))
        k = end
    return kept


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


def correlated_baseline(scf: ScfSolution, method: str, frozen: list[int]) -> float:
    """Total energy (Ha) of 'mp2', 'cisd', 'ccsd' or 'ccsd(t)' with the orbitals in ``frozen`` left out.

    Open shells use PySCF's unrestricted codes on the ROHF orbitals. Raises ``ConvergenceError`` when the
    iterative method does not converge.
    """
    from pyscf import ci, mp

    frozen_arg = sorted(frozen) or None
    mf = scf._mf
    if method == "mp2":
        solver = mp.MP2(mf, frozen=frozen_arg)
        solver.verbose = 0
        solver.kernel()
        return float(solver.e_tot)
    if method == "cisd":
        solver = ci.CISD(mf, frozen=frozen_arg)
        solver.verbose = 0
        solver.max_cycle = CC_MAX_CYCLE
        solver.kernel()
        _require_converged(solver, "CISD")
        return float(solver.e_tot)
    if method in ("ccsd", "ccsd(t)"):
        solver = _ccsd_solver(scf, frozen_arg)
        if method == "ccsd":
            return float(solver.e_tot)
        return float(solver.e_tot + solver.ccsd_t())
    raise ValueError(f"unknown baseline method {method!r}")


def _ccsd_solver(scf: ScfSolution, frozen_arg: list[int] | None) -> Any:
    key = tuple(frozen_arg or ())
    store = scf._mf.__dict__.setdefault("_groundkit_ccsd", {})
    if key not in store:
        from pyscf import cc

        solver = cc.CCSD(scf._mf, frozen=frozen_arg)
        solver.verbose = 0
        solver.max_cycle = CC_MAX_CYCLE
        solver.conv_tol = 1e-9
        solver.kernel()
        _require_converged(solver, "CCSD")
        store[key] = solver
    return store[key]


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
