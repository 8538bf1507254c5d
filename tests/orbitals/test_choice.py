"""Orbital sets of the active space against PySCF run inside each test (reference library)."""

from __future__ import annotations

import numpy as np
import pytest
from pyscf import cc, gto, mcscf, mp, scf

import groundkit as gk
from groundkit.errors import ActiveSpaceError, ConvergenceError
from groundkit.orbitals import solvers
from tests.conftest import diatomic, water
from tests.outside_references import water as water_atoms

# (groundkit molecule, PySCF atom string, spin, active electrons, active orbitals)
CASES = {
    "n2-1.1": (diatomic("N", "N", 1.1), "N 0 0 0; N 0 0 1.1", 0, 6, 6),
    "n2-1.6": (diatomic("N", "N", 1.6), "N 0 0 0; N 0 0 1.6", 0, 6, 6),
    "water": (water(), water_atoms(), 0, 4, 4),
    "oh-doublet": (diatomic("O", "H", 0.97, multiplicity=2), "O 0 0 0; H 0 0 0.97", 1, 5, 4),
}


def _pyscf_scf(atom: str, spin: int):
    mol = gto.M(atom=atom, basis="sto-3g", spin=spin, verbose=0)
    mf = (scf.RHF(mol) if spin == 0 else scf.ROHF(mol)).run(conv_tol=1e-10)
    return mol, mf


def _mp2_natural_orbitals(mf) -> np.ndarray:
    """MP2 natural orbitals built here: the spin-summed MP2 1-RDM diagonalised in the MO basis, by occupation."""
    dm = mp.MP2(mf).run().make_rdm1()
    if np.asarray(dm).ndim == 3:
        dm = dm[0] + dm[1]
    values, vectors = np.linalg.eigh(dm)
    return mf.mo_coeff @ vectors[:, ::-1]


@pytest.mark.slow
@pytest.mark.parametrize("name", list(CASES))
def test_casci_in_mp2_natural_orbitals_and_casscf_equal_pyscf(name):
    molecule, atom, spin, n_el, n_orb = CASES[name]
    mol, mf = _pyscf_scf(atom, spin)
    nelecas = ((n_el + spin) // 2, (n_el - spin) // 2)
    casci = mcscf.CASCI(mf, n_orb, nelecas)
    casci.fix_spin_(ss=0.5 * spin * (0.5 * spin + 1))
    expected_casci = casci.kernel(_mp2_natural_orbitals(mf))[0]  # PySCF mcscf.CASCI, same orbitals
    casscf = mcscf.CASSCF(mf, n_orb, nelecas)
    casscf.conv_tol = 1e-11
    expected_casscf = casscf.kernel()[0]  # PySCF mcscf.CASSCF from the canonical orbitals
    natural = gk.build_problem(molecule, gk.ActiveSpace(electrons=n_el, orbitals=n_orb, orbital_set="mp2-natural"))
    optimised = gk.build_problem(molecule, gk.ActiveSpace(electrons=n_el, orbitals=n_orb, orbital_set="casscf"))
    assert natural.reference.energy == pytest.approx(expected_casci, abs=1e-7)  # PySCF mcscf.CASCI
    assert optimised.reference.energy == pytest.approx(expected_casscf, abs=1e-7)  # PySCF mcscf.CASSCF
    assert optimised.active_orbitals.casscf_energy == pytest.approx(expected_casscf, abs=1e-7)  # PySCF
    assert optimised.reference.multiplicity == spin + 1
    # the reference determinant lies above the SCF energy in non-canonical orbitals (variational principle of HF)
    assert optimised.hf_energy > optimised.scf_energy - 1e-9
    assert natural.hf_energy > natural.scf_energy - 1e-9


def test_reference_determinant_check_in_natural_orbitals_is_the_density_energy():
    """The consistency check of non-canonical orbitals: the determinant's energy from the active-space integrals
    equals PySCF's RHF energy functional of its density, computed here (PySCF)."""
    mol, mf = _pyscf_scf(water_atoms(), 0)
    problem = gk.build_problem(water(), gk.ActiveSpace(electrons=4, orbitals=4, orbital_set="ccsd-natural"))
    solver = cc.CCSD(mf).run(conv_tol=1e-9)
    dm = solver.make_rdm1()
    values, vectors = np.linalg.eigh(dm)
    c = mf.mo_coeff @ vectors[:, ::-1]
    density = 2 * c[:, :5] @ c[:, :5].T
    assert problem.hf_energy == pytest.approx(mf.energy_tot(dm=density), abs=1e-8)  # PySCF energy functional
    assert problem.hf_energy > problem.scf_energy  # CCSD natural orbitals mix occupied and empty HF orbitals
    assert problem.reference.energy == pytest.approx(
        mcscf.CASCI(mf, 4, 4).kernel(c)[0], abs=1e-7)  # PySCF mcscf.CASCI in the same orbitals


def test_auto_ranks_natural_orbitals_by_their_occupation_and_explains():
    mol, mf = _pyscf_scf("N 0 0 0; N 0 0 1.6", 0)
    dm = mp.MP2(mf, frozen=[0, 1]).run().make_rdm1()
    occupations = np.sort(np.linalg.eigvalsh(dm[2:, 2:]))[::-1]  # PySCF MP2 natural occupations, frozen 1s
    expected_active = int(np.count_nonzero((occupations > 0.02) & (occupations < 1.98)))
    space = gk.ActiveSpace.auto(orbital_set="mp2-natural")
    resolved = space.resolve(diatomic("N", "N", 1.6), gk.chemistry.solve_scf(diatomic("N", "N", 1.6)))
    assert resolved.n_orbitals == expected_active
    rows = [r for r in resolved.selection_table if r["role"] == "active"]
    assert [r["occupation"] for r in rows] == pytest.approx(
        occupations[(occupations > 0.02) & (occupations < 1.98)], abs=1e-8)  # PySCF
    text = resolved.explain()
    assert "MP2 natural orbitals" in text and "MP2 NO occ" in text
    assert "orbital_set='mp2-natural'" in repr(space)


def test_unknown_orbital_set_is_refused_with_the_accepted_names():
    with pytest.raises(ActiveSpaceError, match="orbital_set.*'canonical'.*'casscf'"):
        gk.ActiveSpace(electrons=2, orbitals=2, orbital_set="natural")


def test_casscf_that_cannot_converge_names_what_was_tried(monkeypatch):
    monkeypatch.setattr(solvers, "CASSCF_MAX_CYCLES", 1)
    molecule = diatomic("N", "N", 1.3)
    with pytest.raises(ConvergenceError, match="did not converge; tried: the given orbitals.*step 0.01.*MP2 natural"):
        gk.build_problem(molecule, gk.ActiveSpace(electrons=6, orbitals=6, orbital_set="casscf"))


def test_circuits_and_baselines_follow_the_chosen_orbitals():
    """A UCCSD run in CASSCF orbitals works end to end; its HF-start energy is the reference determinant's."""
    p = gk.Pipeline(water()).active_space(gk.ActiveSpace(electrons=4, orbitals=4, orbital_set="casscf"))
    objective = p.trial_state(gk.UCCSD()).objective()
    problem = p.problem()
    assert objective.energy(np.zeros(objective.n_parameters)) == pytest.approx(problem.hf_energy, abs=1e-10)
    assert problem.baselines["ccsd"] is not None
    assert problem.baselines["casci"] == pytest.approx(problem.active_orbitals.casscf_energy, abs=1e-8)
