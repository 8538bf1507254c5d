"""What the active space loses, against PySCF's full-space FCI and CCSD(T) run in each test (reference library)."""

from __future__ import annotations

import numpy as np
import pytest
from pyscf import cc, fci, gto, mcscf, scf

import groundkit as gk
from groundkit import sizing
from groundkit.space_error import AGAINST_CCSD_T, AGAINST_FCI
from tests.conftest import diatomic, water
from tests.outside_references import water as water_atoms


def _pyscf_water():
    mol = gto.M(atom=water_atoms(), basis="sto-3g", verbose=0)
    return scf.RHF(mol).run(conv_tol=1e-10)


def test_active_space_error_is_casci_minus_full_fci():
    mf = _pyscf_water()
    full = fci.FCI(mf).kernel()[0]  # PySCF full-space FCI
    casci = mcscf.CASCI(mf, 4, 4).kernel()[0]  # PySCF CASCI (4e, 4o), canonical orbitals
    problem = gk.build_problem(water(), gk.ActiveSpace(electrons=4, orbitals=4))
    error = problem.active_space_error
    assert error.against == AGAINST_FCI
    assert error.mha == pytest.approx(1000 * (casci - full), abs=1e-5)  # PySCF CASCI and FCI
    assert error.mha > 1.0  # the (4e, 4o) space misses several mHa of water's correlation
    assert "active-space error" in problem.summary() and "full-space FCI" in problem.summary()


def test_full_ccsd_t_stands_in_when_full_fci_is_not_affordable():
    mf = _pyscf_water()
    solver = cc.CCSD(mf).run(conv_tol=1e-9)
    expected = solver.e_tot + solver.ccsd_t()  # PySCF full-space CCSD(T)
    problem = gk.Problem(water(), gk.ActiveSpace(electrons=4, orbitals=4))  # a fresh problem: nothing cached
    assert problem.reference.energy < 0  # the active-space reference first, under the default limits
    with sizing.limits.changed(reference_seconds=1e-9):  # sizing now refuses full-space FCI
        error = problem.active_space_error
    assert error.against == AGAINST_CCSD_T and "CCSD(T) is not exact" in error.note
    assert error.full_energy == pytest.approx(expected, abs=1e-7)  # PySCF CCSD(T)


def test_a_run_does_not_compute_it_unless_asked_and_the_result_keeps_it(tmp_path):
    lih = diatomic("Li", "H", 1.5949)  # NIST CCCBDB experimental r_e (from memory)
    pipeline = lih.pipeline().active_space(gk.ActiveSpace(electrons=2, orbitals=3)).trial_state(gk.UCCSD())
    problem = gk.Problem(lih, gk.ActiveSpace(electrons=2, orbitals=3))
    result = pipeline.run()
    assert result.active_space_error is None
    assert gk.build_problem(lih, gk.ActiveSpace(electrons=2, orbitals=3)).known_active_space_error is None
    asked = result.with_active_space_error()
    mf = scf.RHF(gto.M(atom="Li 0 0 0; H 0 0 1.5949", basis="sto-3g", verbose=0)).run(conv_tol=1e-10)
    expected = mcscf.CASCI(mf, 3, 2).kernel()[0] - fci.FCI(mf).kernel()[0]  # PySCF CASCI and FCI
    assert asked.active_space_error["error_mha"] == pytest.approx(1000 * expected, abs=1e-5)
    assert "active-space error" in asked.summary()
    path = tmp_path / "lih.json"
    asked.save(str(path))
    assert gk.load_result(str(path)).active_space_error == asked.active_space_error
    del problem


def test_scans_and_comparisons_gain_the_column():
    lih = gk.Pipeline().active_space(gk.ActiveSpace(electrons=2, orbitals=3)).trial_state(gk.UCCSD())
    scan = lih.scan(lambda r: diatomic("Li", "H", r), [1.5, 1.7])
    assert "active_space_error_mha" not in scan.table.columns
    table = scan.with_active_space_error().table
    assert np.all(table["active_space_error_mha"] > 0) and set(table["active_space_against"]) == {AGAINST_FCI}
    grid = gk.compare(lih.molecule(diatomic("Li", "H", 1.5)), trial_states=["uccsd"], active_space_error=True)
    assert grid["active_space_error_mha"].iloc[0] == pytest.approx(table["active_space_error_mha"].iloc[0])
