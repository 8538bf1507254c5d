"""The exact reference against outside sources: a textbook table, PySCF's own solvers, OpenFermion's route."""

import numpy as np
import pytest
import scipy.sparse
from openfermion import get_sparse_operator, jordan_wigner, jw_get_ground_state_at_particle_number
from pyscf import ao2mo, fci, gto, mcscf, scf
from pyscf.fci import cistring

import groundkit as gk
from groundkit import chemistry
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


def _pyscf_casci(spec, n_orbitals, n_electrons):
    """PySCF CASCI without any spin penalty: the lowest state of the whole (N, Sz) block, and its <S^2>.

    When that <S^2> is the requested S(S+1), the state is, by the min-max principle, the lowest of that spin.
    """
    mc = mcscf.CASCI(_pyscf_scf(spec), n_orbitals, n_electrons)
    mc.fcisolver.conv_tol = 1e-12
    mc.verbose = 0
    mc.kernel()
    ss, _ = mc.fcisolver.spin_square(mc.ci, n_orbitals, mc.nelecas)
    return mc.e_tot, ss


def _pyscf_active_hamiltonian(spec, n_orbitals, n_electrons):
    """h1, h2 (chemists' notation), core energy and (n_alpha, n_beta) of PySCF's CASCI window, in Ha."""
    mc = mcscf.CASCI(_pyscf_scf(spec), n_orbitals, n_electrons)
    h1, core_energy = mc.get_h1eff()
    return h1, ao2mo.restore(1, mc.get_h2eff(), n_orbitals), core_energy, mc.nelecas


def _dense_block_states(h1, h2, core_energy, nelec, spin, k):
    """Diagonalise the whole determinant block densely (PySCF's Slater-Condon matrix, NumPy's eigh) and read
    <S^2> of each eigenvector (PySCF's S^2, diagonalised inside each degenerate cluster).

    Returns the k lowest energies with <S^2> = S(S+1), and <S^2> of the block's own lowest state.
    """
    norb = h1.shape[0]
    shape = (cistring.num_strings(norb, nelec[0]), cistring.num_strings(norb, nelec[1]))
    dim = shape[0] * shape[1]
    address, h_small = fci.direct_spin1.pspace(h1, h2, norb, nelec, np=dim)
    matrix = np.zeros((dim, dim))
    matrix[np.ix_(address, address)] = h_small
    energies, vectors = np.linalg.eigh(matrix)
    wanted, block_spin, start = [], None, 0
    while len(wanted) < k:
        stop = start + 1
        while stop < dim and energies[stop] - energies[start] < 1e-7:
            stop += 1
        cluster = vectors[:, start:stop]
        s2 = np.column_stack([fci.spin_op.contract_ss(c.reshape(shape), norb, nelec).ravel() for c in cluster.T])
        spins = np.linalg.eigvalsh(0.5 * (cluster.T @ s2 + s2.T @ cluster))
        block_spin = spins[0] if block_spin is None else block_spin
        wanted += [energies[start] + core_energy] * int(np.sum(np.abs(spins - spin * (spin + 1)) < 1e-6))
        start = stop
    return wanted[:k], block_spin


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
    e_casci, ss_casci = _pyscf_casci(nh2, 6, 7)
    assert ss_casci == pytest.approx(0.75, abs=1e-6)  # the block's lowest state is a doublet (PySCF)
    assert problem.reference.energy == pytest.approx(e_casci, abs=1e-8)  # PySCF CASCI (reference library)


def test_charged_species_matches_pyscf_fci():
    a = 1.02 / 3 ** 0.5  # ammonium NH4+, tetrahedral, r(NH) = 1.02 Å (a test geometry, from memory)
    ammonium = gk.MoleculeSpec(symbols=("N", "H", "H", "H", "H"), charge=1, coordinates=(
        (0, 0, 0), (a, a, a), (-a, -a, a), (-a, a, -a), (a, -a, -a)))
    problem = ammonium.pipeline().problem()
    mf = _pyscf_scf(ammonium)
    solver = fci.FCI(mf)
    solver.conv_tol = 1e-12
    e_fci, ci = solver.kernel()
    ss, _ = fci.spin_op.spin_square0(ci, mf.mo_coeff.shape[1], mf.mol.nelec)
    assert ss == pytest.approx(0.0, abs=1e-6)  # the block's lowest state is a singlet, so the lowest singlet (PySCF)
    assert problem.n_electrons == 10 and problem.n_determinants == 15876  # C(9,5)^2
    assert problem.reference.energy == pytest.approx(e_fci, abs=1e-8)  # PySCF FCI (reference library)


@pytest.mark.parametrize("electrons, orbitals", [(6, 6), (10, 8)])
def test_active_space_case_matches_pyscf_casci(electrons, orbitals):
    n2 = diatomic("N", "N", 1.0977)  # NIST CCCBDB experimental r_e (from memory)
    problem = n2.pipeline().active_space(electrons=electrons, orbitals=orbitals).problem()
    assert problem.n_qubits == 2 * orbitals
    e_casci, ss_casci = _pyscf_casci(n2, orbitals, electrons)
    assert ss_casci == pytest.approx(0.0, abs=1e-6)  # the block's lowest state is a singlet (PySCF)
    assert problem.reference.energy == pytest.approx(e_casci, abs=1e-8)  # PySCF CASCI (reference library)


def _atom(symbol, **options):
    return gk.MoleculeSpec(symbols=(symbol,), coordinates=((0, 0, 0),), **options)


def _methylene():
    """CH2 at r(CH) = 1.08 Å, 134° (near the triplet ground state's geometry; a test geometry, from memory)."""
    half = np.radians(134.0) / 2
    x, z = 1.08 * np.sin(half), 1.08 * np.cos(half)
    return gk.MoleculeSpec(symbols=("C", "H", "H"), coordinates=((0, 0, 0), (x, 0, z), (-x, 0, z)), basis="6-31g")


def _water_cation():
    return gk.MoleculeSpec(symbols=water().symbols, coordinates=water().coordinates, charge=1, multiplicity=2)


# (molecule, CASCI window, requested S, S(S+1) of the block's own lowest state). Geometries are test geometries
# near the experimental ones (O2 1.21 Å, OH 0.9697 Å; from memory), N2 stretched to 3 Å, H2O+ at the neutral
# water geometry. The block's lowest spin is computed and asserted in the test. O2 at 1.21 Å is issue 12's case:
# its Sz = 0 block holds the triplet ground state, then two singlets 4-5 mHa apart; the one-root spin-penalised
# solver used to return the upper one.
DENSE_CASES = [
    pytest.param(lambda: diatomic("O", "O", 1.21, basis="6-31g"), 6, 8, 0.0, 2.0, id="O2-singlet-6-31G-8e6o"),
    pytest.param(lambda: diatomic("O", "O", 1.21, basis="cc-pvdz"), 6, 8, 0.0, 2.0, id="O2-singlet-ccpVDZ-8e6o",
                 marks=pytest.mark.slow),
    pytest.param(lambda: diatomic("O", "O", 1.21, basis="6-31g"), 8, 12, 0.0, 2.0, id="O2-singlet-6-31G-12e8o",
                 marks=pytest.mark.slow),
    pytest.param(_methylene, 6, 6, 0.0, 2.0, id="CH2-singlet-under-triplet-6e6o"),
    pytest.param(lambda: _atom("O", basis="6-31g"), 4, 6, 0.0, 2.0, id="O-atom-singlet-under-3P-6e4o"),
    pytest.param(lambda: diatomic("N", "N", 3.0), 6, 6, 0.0, 12.0, id="N2-3A-singlet-under-septet-6e6o"),
    pytest.param(lambda: diatomic("O", "H", 0.9697, basis="6-31g", multiplicity=2), 7, 7, 0.5, 0.75,
                 id="OH-doublet-7e7o", marks=pytest.mark.slow),
    pytest.param(lambda: _atom("N", basis="6-31g", multiplicity=4), 8, 5, 1.5, 3.75, id="N-atom-quartet-5e8o"),
    pytest.param(_water_cation, 7, 9, 0.5, 0.75, id="H2O+-doublet-cation-9e7o"),
    pytest.param(lambda: diatomic("O", "O", 1.21, basis="6-31g", multiplicity=3), 6, 8, 1.0, 2.0,
                 id="O2-triplet-6-31G-8e6o"),
]


@pytest.mark.parametrize("make, orbitals, electrons, spin, block_ground", DENSE_CASES)
def test_reference_is_the_lowest_state_of_its_spin_in_the_whole_block(make, orbitals, electrons, spin, block_ground):
    """The whole determinant block diagonalised densely in this test, from PySCF's integrals, <S^2> per state."""
    spec = make()
    h1, h2, core_energy, nelec = _pyscf_active_hamiltonian(spec, orbitals, electrons)
    lowest, block_spin = _dense_block_states(h1, h2, core_energy, nelec, spin, k=3)
    assert block_spin == pytest.approx(block_ground, abs=1e-6)  # the case's premise: which spin lies lowest (PySCF)
    problem = spec.pipeline().active_space(electrons=electrons, orbitals=orbitals).problem()
    assert (problem.n_alpha, problem.n_beta) == tuple(nelec)
    assert problem.reference.spin_square == pytest.approx(spin * (spin + 1), abs=1e-8)
    assert problem.reference.energy == pytest.approx(lowest[0], abs=1e-8)  # PySCF, dense diagonalisation (this test)
    # both of groundkit's routes (whole-block and spin-projected Davidson) on PySCF's own integrals
    for dense in (True, False):
        states = chemistry.lowest_states(h1, h2, core_energy, *nelec, spin, 3, dense=dense)
        assert [s[0] for s in states] == pytest.approx(lowest, abs=1e-8)  # PySCF, dense diagonalisation (this test)
        assert all(abs(s[2] - spin * (spin + 1)) < 1e-6 for s in states)


def test_the_o2_singlets_are_far_enough_apart_for_the_check_to_bite():
    """The second singlet lies 4.24 mHa above the first (issue 12), far outside the 1e-8 Ha tolerance above."""
    h1, h2, core_energy, nelec = _pyscf_active_hamiltonian(diatomic("O", "O", 1.21, basis="6-31g"), 6, 8)
    (first, second), _ = _dense_block_states(h1, h2, core_energy, nelec, 0.0, k=2)
    assert second - first == pytest.approx(4.244e-3, abs=2e-6)  # PySCF, dense diagonalisation (this test)


def test_summary_shows_the_spin_of_the_reference():
    spec = diatomic("O", "O", 1.21, basis="6-31g")
    h1, h2, core_energy, nelec = _pyscf_active_hamiltonian(spec, 6, 8)
    (lowest,), _ = _dense_block_states(h1, h2, core_energy, nelec, 0.0, k=1)
    text = spec.pipeline().active_space(electrons=8, orbitals=6).problem().summary()
    assert "multiplicity 1, <S^2> = 0.000000" in text
    assert f"exact reference: {lowest:.7f}" in text  # PySCF, dense diagonalisation (this test)


def test_more_states_than_the_spin_holds_gives_all_of_them():
    """Two electrons in two orbitals: the Sz = 0 block holds three singlets and one triplet (D(0) - D(1) = 3)."""
    h2_mol = diatomic("H", "H", 0.7414)  # NIST CCCBDB experimental r_e (from memory)
    h1, h2, core_energy, nelec = _pyscf_active_hamiltonian(h2_mol, 2, 2)
    expected, _ = _dense_block_states(h1, h2, core_energy, nelec, 0.0, k=3)
    for dense in (True, False):
        states = chemistry.lowest_states(h1, h2, core_energy, *nelec, 0.0, 5, dense=dense)
        assert [s[0] for s in states] == pytest.approx(expected, abs=1e-10)  # PySCF, dense diagonalisation


def test_the_iterative_route_refuses_to_return_an_unchecked_state(monkeypatch):
    """The residual check after the spin-projected Davidson run is live: with a zero tolerance it must refuse."""
    h1, h2, core_energy, nelec = _pyscf_active_hamiltonian(water(), 4, 4)
    monkeypatch.setattr(chemistry, "RESIDUAL_TOLERANCE", 0.0)
    with pytest.raises(gk.ConvergenceError, match="residual"):
        chemistry.lowest_states(h1, h2, core_energy, *nelec, 0.0, dense=False)


def test_the_iterative_route_is_reproducible():
    h1, h2, core_energy, nelec = _pyscf_active_hamiltonian(diatomic("O", "O", 1.21, basis="6-31g"), 6, 8)
    first, second = (chemistry.lowest_states(h1, h2, core_energy, *nelec, 0.0, 2, dense=False) for _ in range(2))
    for a, b in zip(first, second):  # same seed, same states (up to the last bits of threaded sums)
        assert a[0] == pytest.approx(b[0], abs=1e-12)
        assert np.allclose(a[1], b[1], atol=1e-9)


def test_an_impossible_spin_is_refused():
    h1, h2, core_energy, nelec = _pyscf_active_hamiltonian(diatomic("H", "H", 0.7414), 2, 2)
    with pytest.raises(gk.ActiveSpaceError, match="S=2.*possible: 0, 1"):
        chemistry.lowest_states(h1, h2, core_energy, *nelec, 2.0)


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
    spec = make()
    problem = spec.pipeline().active_space(**space).problem()
    assert problem.hf_energy == pytest.approx(_pyscf_scf(spec).e_tot, abs=1e-8)  # PySCF RHF/ROHF run in this test
    assert problem.hf_energy == pytest.approx(problem.scf_energy, abs=1e-8)  # internal consistency


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
