"""Qubit Hamiltonians, tapering and determinant embedding against OpenFermion, PySCF and the engine."""

import numpy as np
import pytest
import scipy.sparse.linalg
from openfermion import QubitOperator, get_sparse_operator, jordan_wigner
from pyscf import fci, gto, mcscf, scf

import groundkit as gk
from groundkit.qubits import make_taper, qubitwise_commute, qwc_groups, z2_symmetries
from groundkit.sector.strings import make_strings

from .. import outside_references as outside
from ..conftest import diatomic, water

NH2_XYZ = "N 0 0 0\nH 0.8018 0 0.6370\nH -0.8018 0 0.6370"
MAPPINGS = [(m, t) for m in ("jordan-wigner", "bravyi-kitaev", "parity") for t in (False, True)]


def _pipelines():
    return {
        "h2o(4,4)": water().pipeline().active_space(electrons=4, orbitals=4),
        "nh2 frozen core": gk.MoleculeSpec.from_xyz(NH2_XYZ, multiplicity=2).pipeline().active_space(frozen_core=True),
    }


def test_h2_jordan_wigner_has_15_terms_and_tapers_to_one_qubit():
    h2 = diatomic("H", "H", 0.7414).pipeline()  # NIST CCCBDB experimental r_e (from memory)
    hamiltonian = h2.qubit_hamiltonian()
    # OpenFermion's jordan_wigner (reference library) on an InteractionOperator written out in the test from
    # PySCF's MO integrals: the same 15 Pauli strings (identity included) with the same coefficients
    expected = outside.openfermion_jordan_wigner(outside.diatomic("H", "H", 0.7414))
    assert len(expected.terms) == 15  # common practice, no single source: 15 terms for H2 in a minimal basis
    assert set(hamiltonian.terms) == set(expected.terms)
    for term, coefficient in expected.terms.items():
        assert hamiltonian.terms[term] == pytest.approx(coefficient, abs=1e-10)  # OpenFermion on PySCF integrals
    assert hamiltonian == pytest.approx(jordan_wigner(h2.problem().fermion_hamiltonian()))  # internal consistency
    tapered = h2.mapping("jordan-wigner", taper=True)
    assert tapered.encoding().n_qubits == 1
    lowest = np.linalg.eigvalsh(get_sparse_operator(tapered.qubit_hamiltonian(), n_qubits=1).toarray())[0]
    e_fci = outside.pyscf_exact(outside.diatomic("H", "H", 0.7414)).exact
    assert lowest == pytest.approx(e_fci, abs=1e-10)  # PySCF FCI on the test's own molecule (reference library)


@pytest.mark.parametrize("name", list(_pipelines()))
@pytest.mark.parametrize("mapping, taper", MAPPINGS)
def test_embedded_random_states_have_the_engine_energy(name, mapping, taper):
    pipeline = _pipelines()[name].mapping(mapping, taper=taper)
    problem = pipeline.problem()
    encoding = pipeline.encoding()
    hamiltonian = encoding.sparse_hamiltonian()
    rng = np.random.default_rng(11)
    shape = (len(make_strings(problem.n_orbitals, problem.n_alpha)), len(make_strings(problem.n_orbitals,
                                                                                        problem.n_beta)))
    inside = encoding._sector_states[2].reshape(shape)
    for _ in range(3):
        ci = rng.normal(size=shape) * inside  # a random state of the kept symmetry sector
        ci /= np.linalg.norm(ci)
        vector = encoding.embed(ci)
        e_pyscf = fci.direct_spin1.energy(problem.h1, problem.h2, ci, problem.n_orbitals,
                                          (problem.n_alpha, problem.n_beta)) + problem.core_energy
        assert np.linalg.norm(vector) == pytest.approx(1.0, abs=1e-12)
        # PySCF's CI energy function on the problem's integrals: checks the mapping and the embedding (the
        # integrals themselves are checked against PySCF in tests/test_chemistry.py)
        assert np.vdot(vector, hamiltonian @ vector).real == pytest.approx(e_pyscf, abs=1e-9)


def _pyscf_lowest_of_block(spec, n_orbitals, n_electrons):
    """Energy (Ha) and <S^2> of the lowest state of the (N, Sz) block, from PySCF CASCI without a spin penalty."""
    mol = gto.M(atom=list(zip(spec.symbols, spec.coordinates)), basis=spec.basis, charge=spec.charge,
                spin=spec.multiplicity - 1, unit=spec.unit, verbose=0)
    mf = scf.RHF(mol) if mol.spin == 0 else scf.ROHF(mol)
    mf.conv_tol = 1e-10
    mf.kernel()
    assert mf.converged
    mc = mcscf.CASCI(mf, n_orbitals, n_electrons)
    mc.fcisolver.conv_tol = 1e-12
    mc.verbose = 0
    mc.kernel()
    return mc.e_tot, mc.fcisolver.spin_square(mc.ci, n_orbitals, mc.nelecas)[0]


# the same molecules and windows as _pipelines(), built in PySCF: (molecule, CASCI orbitals, electrons, S(S+1))
_PYSCF_WINDOWS = {
    "h2o(4,4)": (water, 4, 4, 0.0),
    "nh2 frozen core": (lambda: gk.MoleculeSpec.from_xyz(NH2_XYZ, multiplicity=2), 6, 7, 0.75),
}


@pytest.fixture(scope="module")
def pyscf_lowest():
    return {name: _pyscf_lowest_of_block(make(), n, e) + (ss,) for name, (make, n, e, ss) in _PYSCF_WINDOWS.items()}


@pytest.mark.parametrize("name", list(_pipelines()))
@pytest.mark.parametrize("mapping, taper", MAPPINGS)
def test_lowest_eigenvalue_in_the_sector_is_the_exact_reference(name, mapping, taper, pyscf_lowest):
    pipeline = _pipelines()[name].mapping(mapping, taper=taper)
    problem, encoding = pipeline.problem(), pipeline.encoding()
    index, _, inside = encoding._sector_states
    rows = np.unique(index[inside])
    block = encoding.sparse_hamiltonian()[rows][:, rows]
    lowest = (np.linalg.eigvalsh(block.toarray())[0] if block.shape[0] < 500
              else scipy.sparse.linalg.eigsh(block, k=1, which="SA")[0][0])
    e_casci, ss_casci, ss_wanted = pyscf_lowest[name]
    assert ss_casci == pytest.approx(ss_wanted, abs=1e-6)  # the block's lowest state has the problem's spin (PySCF)
    assert lowest == pytest.approx(e_casci, abs=1e-8)  # PySCF CASCI run in this test (reference library)
    assert lowest == pytest.approx(problem.reference.energy, abs=1e-8)  # internal consistency


def test_tapering_reports_the_kept_sector():
    encoding = water().pipeline().active_space(electrons=4, orbitals=4).mapping("parity", taper=True).encoding()
    info = encoding.describe()
    assert info["qubits_before"] == 8 and info["qubits"] == 4 and len(info["symmetries"]) == 4
    assert all(s[0] in "+-" for s in info["symmetries"])
    assert encoding.reference_weight_in_sector() == pytest.approx(1.0, abs=1e-10)


def test_qwc_groups_partition_the_terms():
    hamiltonian = water().pipeline().active_space(electrons=4, orbitals=4).qubit_hamiltonian()
    groups = qwc_groups(hamiltonian)
    flat = [t for g in groups for t in g]
    assert sorted(flat) == sorted(t for t in hamiltonian.terms if t)
    assert all(qubitwise_commute(a, b) for g in groups for a in g for b in g)


def test_statistics_of_a_small_operator():
    op = QubitOperator("", 1.0) + QubitOperator("Z0 Z1", 0.5) + QubitOperator("X0 X1", -0.25)
    stats = gk.qubits.pauli_statistics(op, 2)
    assert (stats.pauli_terms, stats.largest_weight, stats.measurement_groups) == (3, 2, 2)
    assert stats.one_norm == pytest.approx(0.75)


# bad input ------------------------------------------------------------------------------------------------------
def test_unknown_mapping_lists_the_accepted_ones():
    with pytest.raises(gk.ComponentError, match="jordan-wigner, bravyi-kitaev, parity"):
        gk.QubitMapping("superfast")


def test_tapering_without_symmetry_is_refused():
    op = QubitOperator("X0", 0.3) + QubitOperator("Z0", 0.7)  # no Z string commutes with both terms
    assert z2_symmetries(op, 1).shape[0] == 0
    with pytest.raises(gk.SymmetryError, match="no Z2 symmetry"):
        make_taper(op, 1, np.array([0]))


def test_tapering_every_qubit_away_is_refused():
    h2 = diatomic("H", "H", 0.7414).pipeline().active_space(electrons=2, orbitals=1).mapping("parity", taper=True)
    with pytest.raises(gk.SymmetryError, match="remove all 2 qubits"):
        h2.encoding()
