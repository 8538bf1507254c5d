"""Problem-level checks of the SCF: the HF-energy assertion, fallbacks and stability in ``summary()``."""

import warnings

import numpy as np
import pytest
from pyscf import gto, scf

import groundkit as gk
from groundkit import chemistry
from groundkit import problem as problem_module

from .conftest import diatomic


def _pyscf_rhf(r: float):
    """H2/STO-3G RHF built in the test by PySCF itself."""
    mol = gto.M(atom=f"H 0 0 0; H 0 0 {r}", basis="sto-3g", verbose=0)
    return scf.RHF(mol).run(conv_tol=1e-10)


# the HF determinant's energy is the SCF energy, checked for every problem built (DESIGN.md §5.3, §5.13) ---------
def test_inconsistent_integrals_raise_naming_both_energies(monkeypatch):
    original = chemistry.active_integrals

    def shifted(scf_solution, core, active, *orbitals):
        core_energy, h1, h2 = original(scf_solution, core, active, *orbitals)
        return core_energy + 1e-6, h1, h2  # a fault of one µHa in the core energy

    monkeypatch.setattr(chemistry, "active_integrals", shifted)
    spec = diatomic("Li", "H", 1.5949)  # NIST CCCBDB experimental r_e (from memory)
    with pytest.raises(gk.IntegralConsistencyError) as caught:
        gk.Problem(spec, gk.ActiveSpace(electrons=2, orbitals=2))
    message = str(caught.value)
    e_scf = chemistry.solve_scf(spec).energy
    assert f"{e_scf:.10f}" in message and f"{e_scf + 1e-6:.10f}" in message and "internal error" in message
    assert not issubclass(gk.IntegralConsistencyError, gk.GroundkitError)  # an internal fault surfaces in studies
    # in natural orbitals the check compares with PySCF's energy of the determinant's density instead
    with pytest.raises(gk.IntegralConsistencyError, match="energy of that determinant's density"):
        gk.Problem(spec, gk.ActiveSpace(electrons=2, orbitals=2, orbital_set="ccsd-natural"))


def test_consistent_integrals_pass_the_check(h2o):
    problem = gk.Problem(h2o, gk.ActiveSpace(electrons=4, orbitals=4))
    mf = scf.RHF(gto.M(atom=list(zip(h2o.symbols, h2o.coordinates)), basis="sto-3g", verbose=0)).run(conv_tol=1e-10)
    assert problem.hf_energy == pytest.approx(mf.e_tot, abs=1e-8)  # PySCF RHF energy (reference library)


def test_determinant_energy_matches_pyscf_for_an_excited_determinant(h2o):
    """The vectorised Slater–Condon sum against PySCF's FCI energy of a single-determinant CI vector."""
    from pyscf import fci

    problem = gk.Problem(h2o, gk.ActiveSpace(electrons=4, orbitals=4))
    alpha, beta = [0, 2], [1, 3]
    norb = problem.n_orbitals
    strings = fci.cistring.make_strings(range(norb), 2)
    ci = np.zeros((len(strings), len(strings)))
    ci[list(strings).index(0b0101), list(strings).index(0b1010)] = 1.0
    expected = fci.direct_spin1.energy(problem.h1, problem.h2, ci, norb, (2, 2)) + problem.core_energy
    got = problem_module.determinant_energy(problem.h1, problem.h2, problem.core_energy, alpha, beta)
    assert got == pytest.approx(expected, abs=1e-10)  # PySCF FCI (reference library)


# stability and fallbacks in the summary (DESIGN.md §5.15) ----------------------------------------------------------
def test_stretched_h2_is_rhf_to_uhf_unstable_and_the_summary_says_so():
    r = 2.5  # Å: far beyond the Coulson–Fischer point of H2, where the RHF solution becomes UHF-unstable
    mf = _pyscf_rhf(r)
    _, _, internal, external = mf.stability(internal=True, external=True, return_status=True)
    assert internal and not external  # PySCF stability analysis (reference library)
    uhf = scf.UHF(mf.mol)
    dm_a, dm_b = np.diag([1.0, 0.0]), np.diag([0.0, 1.0])  # alpha on one atom, beta on the other
    uhf.conv_tol = 1e-10
    uhf.kernel(dm0=np.array((dm_a, dm_b)))
    assert uhf.converged
    assert uhf.e_tot < mf.e_tot - 1e-3  # PySCF UHF lies below RHF: the instability is real
    problem = diatomic("H", "H", r).pipeline().problem()
    with pytest.warns(gk.ScfInstabilityWarning, match="RHF→UHF"):
        text = problem.summary()
    assert "SCF stability: UNSTABLE" in text and "RHF→UHF" in text
    assert problem.scf.stable is False and "UHF" in problem.scf.instability
    assert problem.scf_stability.internal and problem.scf_stability.external is False


def test_equilibrium_h2_is_stable_and_warns_nothing():
    r = 0.7414  # NIST CCCBDB experimental r_e (from memory)
    mf = _pyscf_rhf(r)
    _, _, internal, external = mf.stability(internal=True, external=True, return_status=True)
    assert internal and external  # PySCF stability analysis (reference library)
    chemistry.clear_cache()
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        problem = gk.Problem(diatomic("H", "H", r))
        text = problem.summary()
    assert not [w for w in caught if issubclass(w.category, gk.ScfWarning)]
    assert "SCF stability: stable (internal and RHF→UHF stability analysis)" in text
    assert problem.scf.stable and problem.scf.instability is None and not problem.scf.needed_fallback
    assert "DIIS: converged in" in text


def test_open_shell_stability_is_internal_only():
    """ROHF: the internal analysis, as PySCF's own ROHF stability analysis reports it."""
    nh2 = gk.MoleculeSpec.from_xyz("N 0 0 0\nH 0.8018 0 0.6370\nH -0.8018 0 0.6370", multiplicity=2)
    mol = gto.M(atom="N 0 0 0; H 0.8018 0 0.6370; H -0.8018 0 0.6370", basis="sto-3g", spin=1, verbose=0)
    _, _, internal, _ = scf.ROHF(mol).run(conv_tol=1e-10).stability(return_status=True)
    stability = gk.Problem(nh2).scf_stability
    assert stability.internal == internal  # PySCF stability analysis (reference library)
    assert stability.external is None and stability.method == "ROHF"


def test_a_fallback_is_named_in_the_summary(monkeypatch):
    spec = diatomic("N", "N", 1.0977)  # NIST CCCBDB experimental r_e (from memory)
    chemistry.clear_cache()
    monkeypatch.setattr(chemistry, "SCF_MAX_CYCLES", (2, 300, 100))
    try:
        with pytest.warns(gk.ScfFallbackWarning, match="DIIS: not converged after 2 cycles"):
            problem = gk.Problem(spec, gk.ActiveSpace(electrons=6, orbitals=6))
        text = problem.summary()
    finally:
        chemistry.clear_cache()
    assert "after a fallback: DIIS: not converged after 2 cycles; DIIS with level shift 0.5 Ha: converged" in text
    mf = scf.RHF(gto.M(atom="N 0 0 0; N 0 0 1.0977", basis="sto-3g", verbose=0)).run(conv_tol=1e-10)
    assert problem.scf_energy == pytest.approx(mf.e_tot, abs=1e-8)  # PySCF RHF energy (reference library)
