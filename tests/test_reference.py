"""The exact reference against outside sources: a textbook table, PySCF's own solvers, OpenFermion's route."""

import numpy as np
import pytest
import scipy.sparse
from openfermion import get_sparse_operator, jordan_wigner, jw_get_ground_state_at_particle_number
from pyscf import fci, gto, mcscf, scf

import groundkit as gk
from groundkit.sector.strings import interleaved_index

from .conftest import diatomic, water

NH2_XYZ = "N 0 0 0\nH 0.8018 0 0.6370\nH -0.8018 0 0.6370"  # r = 1.024 Å, 103.4° (from memory)


def _pyscf_scf(spec):
    mol = gto.M(atom=list(zip(spec.symbols, spec.coordinates)), basis=spec.basis, charge=spec.charge,
                spin=spec.multiplicity - 1, unit=spec.unit, verbose=0)
    mf = scf.RHF(mol) if mol.spin == 0 else scf.ROHF(mol)
    mf.conv_tol = 1e-10
    mf.kernel()
    assert mf.converged
    return mf


def _pyscf_casci(spec, n_orbitals, n_electrons, ss):
    mc = mcscf.CASCI(_pyscf_scf(spec), n_orbitals, n_electrons)
    mc.fix_spin_(shift=0.5, ss=ss)
    mc.fcisolver.conv_tol = 1e-12
    mc.verbose = 0
    mc.kernel()
    return mc.e_tot


def test_h2_minimal_basis_textbook_values(h2_bohr):
    problem = gk.Pipeline(h2_bohr).problem()
    assert problem.scf_energy == pytest.approx(-1.1167, abs=1e-4)  # Szabo & Ostlund, Modern Quantum Chem. (memory)
    assert problem.reference.energy == pytest.approx(-1.1373, abs=1e-4)  # Szabo & Ostlund, full CI (from memory)


def test_open_shell_doublet_matches_pyscf_casci():
    nh2 = gk.MoleculeSpec.from_xyz(NH2_XYZ, multiplicity=2)
    problem = gk.Pipeline(nh2).active_space(frozen_core=True).problem()
    assert (problem.n_alpha, problem.n_beta) == (4, 3)
    assert problem.reference.multiplicity == 2
    assert problem.reference.spin_square == pytest.approx(0.75, abs=1e-8)
    assert problem.reference.energy == pytest.approx(_pyscf_casci(nh2, 6, 7, 0.75), abs=1e-8)  # PySCF CASCI


def test_charged_species_matches_pyscf_fci():
    a = 1.02 / 3 ** 0.5  # ammonium NH4+, tetrahedral, r(NH) = 1.02 Å (a test geometry, from memory)
    ammonium = gk.MoleculeSpec(symbols=("N", "H", "H", "H", "H"), charge=1, coordinates=(
        (0, 0, 0), (a, a, a), (-a, -a, a), (-a, a, -a), (a, -a, -a)))
    problem = ammonium.pipeline().problem()
    mf = _pyscf_scf(ammonium)
    solver = fci.FCI(mf)
    solver.conv_tol = 1e-12
    e_fci, _ = solver.kernel()
    assert problem.n_electrons == 10 and problem.n_determinants == 15876  # C(9,5)^2
    assert problem.reference.energy == pytest.approx(e_fci, abs=1e-8)  # PySCF FCI (reference library)


@pytest.mark.parametrize("electrons, orbitals", [(6, 6), (10, 8)])
def test_active_space_case_matches_pyscf_casci(electrons, orbitals):
    n2 = diatomic("N", "N", 1.0977)  # NIST CCCBDB experimental r_e (from memory)
    problem = n2.pipeline().active_space(electrons=electrons, orbitals=orbitals).problem()
    assert problem.n_qubits == 2 * orbitals
    assert problem.reference.energy == pytest.approx(_pyscf_casci(n2, orbitals, electrons, 0), abs=1e-8)  # PySCF


@pytest.mark.parametrize("electrons, orbitals", [(8, 6), (12, 8)])
def test_singlet_request_is_not_given_the_lower_triplet(electrons, orbitals):
    """O2: the lowest state of the Sz = 0 block is the triplet; a singlet request must get the singlet."""
    o2 = diatomic("O", "O", 1.2075)  # NIST CCCBDB experimental r_e (from memory)
    problem = o2.pipeline().active_space(electrons=electrons, orbitals=orbitals).problem()
    # the plain lowest eigenstate of the Sz = 0 block, without any spin filter (PySCF FCI)
    solver = fci.direct_spin1.FCI()
    solver.conv_tol = 1e-12
    e_block, ci_block = solver.kernel(problem.h1, problem.h2, orbitals, (electrons // 2, electrons // 2),
                                      ecore=problem.core_energy)
    ss_block, _ = fci.spin_op.spin_square0(ci_block, orbitals, (electrons // 2, electrons // 2))
    assert ss_block == pytest.approx(2.0, abs=1e-6)  # the block's lowest state is a triplet, S(S+1) = 2
    assert problem.reference.multiplicity == 1
    assert problem.reference.spin_square == pytest.approx(0.0, abs=1e-8)
    assert problem.reference.energy > e_block + 1e-3
    assert problem.reference.energy == pytest.approx(_pyscf_casci(o2, orbitals, electrons, 0), abs=1e-8)  # PySCF


def test_dense_and_iterative_solvers_agree_on_the_singlet():
    """Two routes inside PySCF: full diagonalisation of the block and the spin-penalised Davidson solver."""
    from groundkit import chemistry

    o2 = diatomic("O", "O", 1.2075)
    p = o2.pipeline().active_space(electrons=8, orbitals=6).problem()
    dense = chemistry._dense_lowest_states(p.h1, p.h2, p.core_energy, 4, 4, 0.0, 3)
    solver = fci.direct_spin1.FCI()
    fci.addons.fix_spin_(solver, shift=0.5, ss=0.0)
    solver.conv_tol = 1e-12
    e, _ = solver.kernel(p.h1, p.h2, 6, (4, 4), ecore=p.core_energy, nroots=3)
    assert [s[0] for s in dense] == pytest.approx(list(e), abs=1e-8)  # PySCF FCI with spin penalty


def test_lowest_states_are_ascending_and_spin_pure(h2o):
    problem = h2o.pipeline().active_space(electrons=4, orbitals=4).problem()
    states = problem.lowest_states(3)
    energies = [s.energy for s in states]
    assert energies == sorted(energies)
    assert all(abs(s.spin_square) < 1e-6 for s in states)
    assert states[0].energy == problem.reference.energy


@pytest.mark.parametrize("make, space", [
    (lambda: water(), dict(electrons=4, orbitals=4)),
    (lambda: water(), dict()),
    (lambda: gk.MoleculeSpec.from_xyz(NH2_XYZ, multiplicity=2), dict(frozen_core=True)),
    (lambda: diatomic("O", "O", 1.2075, multiplicity=3), dict(electrons=8, orbitals=6)),
])
def test_hf_determinant_energy_equals_scf_energy(make, space):
    problem = make().pipeline().active_space(**space).problem()
    assert problem.hf_energy == pytest.approx(problem.scf_energy, abs=1e-8)  # PySCF SCF energy


@pytest.mark.parametrize("make, space", [
    (lambda: water(), dict(electrons=4, orbitals=4)),
    (lambda: gk.MoleculeSpec.from_xyz(NH2_XYZ, multiplicity=2), dict(frozen_core=True)),
])
def test_reference_is_an_eigenvector_of_the_jordan_wigner_hamiltonian(make, space):
    """Pins the sign between PySCF's alpha-before-beta CI vectors and interleaved spin orbitals (OpenFermion)."""
    problem = make().pipeline().active_space(**space).problem()
    hamiltonian = get_sparse_operator(jordan_wigner(problem.fermion_hamiltonian()), n_qubits=problem.n_qubits)
    ground = problem.reference.ground
    residuals = {}
    for name, ci in (("interleaved", ground.interleaved_ci()), ("pyscf order", ground.ci)):
        vector = np.zeros(2 ** problem.n_qubits)
        for ia, a in enumerate(ground.strings()[0]):
            for ib, b in enumerate(ground.strings()[1]):
                vector[interleaved_index(int(a), int(b), problem.n_orbitals)] = ci[ia, ib]
        assert np.linalg.norm(vector) == pytest.approx(1.0, abs=1e-12)
        residuals[name] = np.linalg.norm(hamiltonian @ vector - problem.reference.energy * vector)
    assert residuals["interleaved"] < 1e-7  # OpenFermion Jordan–Wigner operator (reference library)
    assert residuals["pyscf order"] > 1e-3  # ignoring the sign rule must be caught


def test_independent_route_through_openfermionpyscf(tmp_path, lih):
    """openfermionpyscf builds its own integrals; its Hamiltonian and energies must agree with ours."""
    from openfermion import MolecularData
    from openfermionpyscf import run_pyscf

    data = MolecularData(geometry=list(zip(lih.symbols, lih.coordinates)), basis="sto-3g", multiplicity=1,
                         charge=0, filename=str(tmp_path / "lih"), data_directory=str(tmp_path))
    data = run_pyscf(data, run_scf=True, run_fci=True)
    problem = lih.pipeline().problem()
    assert problem.scf_energy == pytest.approx(data.hf_energy, abs=1e-8)  # openfermionpyscf / PySCF
    assert problem.reference.energy == pytest.approx(data.fci_energy, abs=1e-8)  # openfermionpyscf / PySCF FCI
    sparse = get_sparse_operator(data.get_molecular_hamiltonian())
    e_of, _ = jw_get_ground_state_at_particle_number(scipy.sparse.csc_matrix(sparse), 4)
    assert problem.reference.energy == pytest.approx(e_of, abs=1e-8)  # OpenFermion sparse ground state


def test_amplitudes_are_labelled_and_sorted(h2_bohr):
    amplitudes = h2_bohr.pipeline().problem().reference.amplitudes
    labels = list(amplitudes)
    assert labels == ["20", "02"]
    assert amplitudes["20"] > 0 > amplitudes["02"]  # H2 ground state: c0 |1σg²> − c1 |1σu²> (textbook form)
    assert sum(a * a for a in amplitudes.values()) == pytest.approx(1.0, abs=1e-12)
