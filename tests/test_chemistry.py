import numpy as np
import pytest
from pyscf import gto, mcscf, scf

import groundkit as gk
from groundkit import chemistry

from .conftest import diatomic


def _pyscf_mol(spec: gk.MoleculeSpec):
    return gto.M(atom=list(zip(spec.symbols, spec.coordinates)), basis=spec.basis, charge=spec.charge,
                 spin=spec.multiplicity - 1, unit=spec.unit, verbose=0)


def test_rhf_matches_pyscf(h2o):
    solution = chemistry.solve_scf(h2o)
    mf = scf.RHF(_pyscf_mol(h2o)).run(conv_tol=1e-10)
    assert solution.method == "RHF"
    assert solution.energy == pytest.approx(mf.e_tot, abs=1e-8)  # PySCF (reference library)


def test_open_shell_uses_rohf():
    nh2 = gk.MoleculeSpec.from_xyz("N 0 0 0\nH 0.8018 0 0.6370\nH -0.8018 0 0.6370", multiplicity=2)
    solution = chemistry.solve_scf(nh2)
    mf = scf.ROHF(_pyscf_mol(nh2)).run(conv_tol=1e-10)
    assert solution.method == "ROHF" and solution.n_singly_occupied == 1
    assert solution.energy == pytest.approx(mf.e_tot, abs=1e-8)  # PySCF (reference library)


def test_scf_is_cached(h2o):
    assert chemistry.solve_scf(h2o) is chemistry.solve_scf(h2o)


def test_unconverged_scf_is_retried(monkeypatch):
    spec = diatomic("N", "N", 1.0977)  # NIST CCCBDB experimental r_e (from memory)
    chemistry.clear_cache()
    monkeypatch.setattr(chemistry, "SCF_MAX_CYCLES", (2, 300, 100))
    with pytest.warns(gk.ScfFallbackWarning, match="needed a fallback"):
        solution = chemistry.solve_scf(spec)
    chemistry.clear_cache()
    assert len(solution.attempts) >= 2 and "level shift" in solution.attempts[1] and solution.needed_fallback
    assert solution.attempts[0] == "DIIS: not converged after 2 cycles"
    mf = scf.RHF(_pyscf_mol(spec)).run(conv_tol=1e-10)
    assert solution.energy == pytest.approx(mf.e_tot, abs=1e-8)  # PySCF (reference library)


def test_scf_that_never_converges_raises_clear_error(monkeypatch):
    spec = diatomic("N", "N", 1.0977)
    chemistry.clear_cache()
    monkeypatch.setattr(chemistry, "SCF_MAX_CYCLES", (1, 1, 1))
    with pytest.raises(gk.ConvergenceError, match="did not converge after"):
        chemistry.solve_scf(spec)
    chemistry.clear_cache()


def test_active_integrals_match_pyscf_casci(h2o):
    solution = chemistry.solve_scf(h2o)
    core_energy, h1, h2 = chemistry.active_integrals(solution, [0, 1], [2, 3, 4, 5, 6])
    mf = scf.RHF(_pyscf_mol(h2o))
    mf.mo_coeff, mf.mo_occ, mf.mo_energy = solution.mo_coeff, solution.mo_occ, solution.mo_energy
    mc = mcscf.CASCI(mf, 5, 6)
    ref_h1, ref_ecore = mc.get_h1eff()
    ref_h2 = mcscf.casci.ao2mo.restore(1, mc.get_h2eff(), 5)
    assert core_energy == pytest.approx(ref_ecore, abs=1e-10)  # PySCF CASCI (reference library)
    assert np.allclose(h1, ref_h1, atol=1e-10)
    assert np.allclose(h2, ref_h2, atol=1e-10)


# orbital order: reordered exactly once (DESIGN.md §5.13) --------------------------------------------------------
def _atom(symbol: str, multiplicity: int, basis: str = "sto-3g") -> gk.MoleculeSpec:
    return gk.MoleculeSpec(symbols=(symbol,), coordinates=((0, 0, 0),), multiplicity=multiplicity, basis=basis)


def _pyscf_singly_occupied(spec: gk.MoleculeSpec) -> tuple[float, np.ndarray, np.ndarray]:
    """PySCF's own ROHF (built in the test): energy, its singly occupied orbitals and the AO overlap matrix.

    One thread: an open d shell has several equivalent ROHF solutions, and threaded sums pick among them.
    """
    from threadpoolctl import threadpool_limits

    with threadpool_limits(limits=1):
        mf = scf.ROHF(_pyscf_mol(spec)).run(conv_tol=1e-10)
    assert mf.converged
    return float(mf.e_tot), mf.mo_coeff[:, mf.mo_occ == 1], mf.get_ovlp()


@pytest.mark.parametrize("symbol, multiplicity, basis, n_docc, n_socc", [
    ("Cr", 7, "sto-3g", 9, 6),  # 3d5 4s1; PySCF's ROHF puts the empty 4p below the half-filled 3d
    ("Mn", 6, "6-31g", 10, 5),  # PySCF's ROHF puts three empty orbitals below four singly occupied ones
    ("Ti", 3, "6-31g", 10, 2),  # 3d2 4s2; one empty orbital below the two singly occupied 3d
])
def test_open_shell_orbitals_are_reordered_once(symbol, multiplicity, basis, n_docc, n_socc):
    spec = _atom(symbol, multiplicity, basis)
    e_rohf, c_socc, overlap = _pyscf_singly_occupied(spec)
    solution = chemistry.solve_scf(spec)
    n_virtual = solution.n_orbitals - n_docc - n_socc
    occupations = "".join(str(int(o)) for o in solution.mo_occ)
    assert occupations == "2" * n_docc + "1" * n_socc + "0" * n_virtual  # doubly, singly, empty (DESIGN.md §5.13)
    assert int(np.count_nonzero(solution.mo_occ == 1)) == multiplicity - 1  # high-spin ROHF (from memory)
    problem = spec.pipeline().active_space(electrons=n_socc, orbitals=n_socc).problem()
    c_act = solution.mo_coeff[:, list(problem.active_orbitals.active)]
    # cosines of the principal angles between the window and PySCF's singly occupied orbitals: all 1
    cosines = np.linalg.svd(c_act.T @ overlap @ c_socc, compute_uv=False)
    assert cosines.min() > 1 - 1e-6  # PySCF ROHF orbitals (reference library)
    assert problem.hf_energy == pytest.approx(e_rohf, abs=1e-8)  # PySCF ROHF energy (reference library)
    assert problem.reference.energy <= problem.hf_energy + 1e-10  # variational principle


def test_reordered_orbitals_reach_pyscf_through_the_baselines():
    """The orbitals PySCF's object holds after the reorder are groundkit's (the baselines use that object)."""
    solution = chemistry.solve_scf(_atom("Cr", 7))
    assert np.array_equal(solution._mf.mo_coeff, solution.mo_coeff)  # internal consistency
    assert np.array_equal(solution._mf.mo_occ, solution.mo_occ)  # internal consistency
    mf = solution._mf
    dm = mf.make_rdm1()
    assert mf.energy_tot(dm) == pytest.approx(solution.energy, abs=1e-8)  # PySCF energy of the stored orbitals


# determinism and fallbacks (DESIGN.md §5.15) ----------------------------------------------------------------------
NI_SCRIPT = """
import warnings
import groundkit as gk
from groundkit import chemistry
spec = gk.MoleculeSpec(symbols=("Ni",), coordinates=((0, 0, 0),), multiplicity=3)
with warnings.catch_warnings(record=True) as caught:
    warnings.simplefilter("always")
    solution = chemistry.solve_scf(spec)
names = sorted({type(w.message).__name__ for w in caught})
print(repr(solution.energy), solution.attempts[-1], ",".join(names), sep="|")
"""


@pytest.mark.slow
def test_hard_scf_is_the_same_for_every_thread_count():
    """Ni atom triplet in STO-3G: DIIS fails, the fallback converges; the same energy in every process."""
    import os
    import subprocess
    import sys

    rows = []
    for threads in ("1", "2", "2"):
        env = dict(os.environ, OPENBLAS_NUM_THREADS=threads, OMP_NUM_THREADS=threads, MKL_NUM_THREADS=threads)
        out = subprocess.run([sys.executable, "-c", NI_SCRIPT], env=env, capture_output=True, text=True, check=True)
        energy, last, names = out.stdout.strip().splitlines()[-1].split("|")
        rows.append((float(energy), last, names))
    energies = [r[0] for r in rows]
    assert max(energies) - min(energies) < 1e-8, energies  # determinism: no outside value needed
    assert all(r[1].endswith("converged") and "not" not in r[1] for r in rows)  # the state claimed: converged
    assert all("ScfFallbackWarning" in r[2] for r in rows)
    from threadpoolctl import threadpool_limits

    mol = gto.M(atom="Ni 0 0 0", basis="sto-3g", spin=2, verbose=0)
    with threadpool_limits(limits=1):  # the documented recipe, rebuilt here from PySCF alone on one thread
        mf = scf.ROHF(mol).set(conv_tol=1e-10, init_guess="minao", max_cycle=100).run()
        mf = scf.ROHF(mol).set(conv_tol=1e-10, level_shift=0.5, max_cycle=300).run(mf.make_rdm1())
        mf = scf.ROHF(mol).newton().set(conv_tol=1e-10, max_cycle=100).run(mf.make_rdm1())
    assert mf.converged and energies[0] == pytest.approx(mf.e_tot, abs=1e-8)  # PySCF ROHF (reference library)


def test_scf_runs_with_the_fixed_thread_count(monkeypatch):
    """Inside the SCF, BLAS and OpenMP (PySCF's own kernels) run on SCF_THREADS threads, whatever the caller set."""
    from pyscf import lib
    from threadpoolctl import threadpool_info, threadpool_limits

    seen = []
    converge = chemistry._converge

    def spy(mol):
        seen.append((lib.num_threads(), [p["num_threads"] for p in threadpool_info()]))
        return converge(mol)

    monkeypatch.setattr(chemistry, "_converge", spy)
    chemistry.clear_cache()
    with threadpool_limits(limits=2):
        chemistry.solve_scf(diatomic("H", "H", 0.7414))  # NIST CCCBDB experimental r_e (from memory)
    chemistry.clear_cache()
    assert seen and seen[0][0] == chemistry.SCF_THREADS and set(seen[0][1]) == {chemistry.SCF_THREADS}
