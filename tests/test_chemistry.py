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
    solution = chemistry.solve_scf(spec)
    chemistry.clear_cache()
    assert len(solution.attempts) >= 2 and "level shift" in solution.attempts[1]
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
