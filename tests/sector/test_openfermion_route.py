"""The engine against an independent route: OpenFermion operators, Jordan-Wigner and expm_multiply on 2^n amplitudes.

This pins the sign between PySCF's alpha-before-beta CI vectors and OpenFermion's interleaved spin orbitals.
"""

import numpy as np
import pytest
import scipy.sparse.linalg
from openfermion import FermionOperator, InteractionOperator, get_sparse_operator, hermitian_conjugated, jordan_wigner

from groundkit.sector.excitation import Excitation
from groundkit.sector.exponential import apply_product
from groundkit.sector.hamiltonian import SectorHamiltonian
from groundkit.sector.space import Sector, lowest_strings
from groundkit.sector.strings import interleaved_index
from groundkit.sector.tables import excitation_tables
from groundkit.trial_states.excitation_sets import generalised_singles, reference_doubles, reference_singles


def qubit_hamiltonian(p):
    """Sparse 2^n matrix of H built by OpenFermion (reference library) from the chemists'-notation integrals."""
    n = p.n_orbitals
    one = np.zeros((2 * n, 2 * n))
    two = np.zeros((2 * n,) * 4)
    for s in (0, 1):
        one[s::2, s::2] = p.h1
        for t in (0, 1):
            # a+_{p s} a+_{r t} a_{q t}... with coefficient (ps|qr)/2 for the term a+_p a+_q a_r a_s
            two[s::2, t::2, t::2, s::2] = 0.5 * p.h2.transpose(0, 2, 3, 1)
    return get_sparse_operator(InteractionOperator(p.core_energy, one, two), n_qubits=2 * n).tocsr()


def embed(sector, ci):
    """CI array -> 2^n statevector in OpenFermion's basis (interleaved sign, qubit 0 most significant)."""
    vector = np.zeros(2 ** sector.n_spin_orbitals)
    signed = ci * sector.interleaved_signs()
    for ia, alpha in enumerate(sector.alpha_strings):
        for ib, beta in enumerate(sector.beta_strings):
            vector[interleaved_index(int(alpha), int(beta), sector.n_orbitals)] = signed[ia, ib]
    return vector


def openfermion_product(excitations, angles, start, n_qubits):
    state = start
    for excitation, theta in zip(excitations, angles):
        tau = FermionOperator(excitation.operator_term())
        generator = get_sparse_operator(jordan_wigner(tau - hermitian_conjugated(tau)), n_qubits=n_qubits)
        state = scipy.sparse.linalg.expm_multiply(theta * generator, state)  # SciPy (reference library)
    return state


def pick(excitations, count, rng):
    return [excitations[k] for k in rng.choice(len(excitations), size=min(count, len(excitations)), replace=False)]


@pytest.mark.parametrize("name", ["lih", "h4", "nh", "oh", "h2o_cas44"])
def test_product_of_excitations_matches_openfermion(get_problem, name):
    p = get_problem(name)
    rng = np.random.default_rng(sum(map(ord, name)))
    sector = Sector(p.n_orbitals, p.n_alpha, p.n_beta)
    alpha, beta = lowest_strings(p.n_alpha, p.n_beta)
    pool = reference_doubles(alpha, beta, p.n_orbitals) + reference_singles(alpha, beta, p.n_orbitals)
    excitations = pick(pool, 5, rng) + pick(generalised_singles(p.n_orbitals), 2, rng) + [Excitation((3, 2), (1, 0))]
    angles = rng.uniform(-np.pi, np.pi, len(excitations))
    h_qubit = qubit_hamiltonian(p)

    reference = sector.determinant(alpha, beta)
    ci = apply_product(reference, excitation_tables(excitations, sector.alpha_strings, sector.beta_strings), angles)
    engine_energy = SectorHamiltonian(p.h1, p.h2, p.n_alpha, p.n_beta, p.core_energy).energy(ci)

    start = np.zeros(2 ** (2 * p.n_orbitals))
    start[interleaved_index(alpha, beta, p.n_orbitals)] = 1.0  # |HF> with coefficient +1 in OpenFermion's basis
    state = openfermion_product(excitations, angles, start, 2 * p.n_orbitals)
    route_energy = float(np.real(state @ (h_qubit @ state)))

    assert abs(engine_energy - route_energy) < 1e-10
    global_sign = sector.interleaved_signs()[sector.index(alpha, beta)]
    np.testing.assert_allclose(global_sign * embed(sector, ci), state, atol=1e-10)


@pytest.mark.parametrize("name", ["h2", "lih", "nh", "oh"])
def test_random_states_same_energy_in_both_bases(get_problem, name):
    p = get_problem(name)
    sector = Sector(p.n_orbitals, p.n_alpha, p.n_beta)
    h_qubit = qubit_hamiltonian(p)
    hamiltonian = SectorHamiltonian(p.h1, p.h2, p.n_alpha, p.n_beta, p.core_energy)
    rng = np.random.default_rng(7)
    for _ in range(3):
        ci = rng.normal(size=sector.shape)
        ci /= np.linalg.norm(ci)
        vector = embed(sector, ci)
        assert abs(hamiltonian.energy(ci) - vector @ (h_qubit @ vector)) < 1e-10
    vector = embed(sector, p.reference.ci)
    assert abs(vector @ (h_qubit @ vector) - p.reference.energy) < 1e-10  # PySCF (reference library) CASCI
