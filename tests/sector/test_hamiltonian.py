import numpy as np
import pytest

from groundkit.sector.hamiltonian import SectorHamiltonian
from groundkit.sector.space import Sector, lowest_strings

NAMES = ["h2", "lih", "h2o", "h2o_cas44", "h4", "nh", "oh"]


def hamiltonian(p, dense=None):
    return SectorHamiltonian(p.h1, p.h2, p.n_alpha, p.n_beta, p.core_energy, dense=dense)


@pytest.mark.parametrize("name", NAMES)
def test_hartree_fock_determinant_energy_is_the_scf_energy(get_problem, name):
    p = get_problem(name)
    sector = Sector(p.n_orbitals, p.n_alpha, p.n_beta)
    hf = sector.determinant(*lowest_strings(p.n_alpha, p.n_beta))
    assert abs(hamiltonian(p).energy(hf) - p.hf_energy) < 1e-9  # PySCF (reference library) RHF/ROHF e_tot


@pytest.mark.parametrize("name", NAMES)
def test_reference_ci_vector_has_the_casci_energy(get_problem, name):
    p = get_problem(name)
    assert abs(hamiltonian(p).energy(p.reference.ci) - p.reference.energy) < 1e-10  # PySCF (reference library) CASCI


@pytest.mark.parametrize("name", ["lih", "h2o", "nh"])
def test_dense_and_contracted_routes_agree(get_problem, name):
    p = get_problem(name)
    rng = np.random.default_rng(11)
    ci = rng.normal(size=Sector(p.n_orbitals, p.n_alpha, p.n_beta).shape)
    dense, direct = hamiltonian(p, dense=True), hamiltonian(p, dense=False)
    assert dense.dense and not direct.dense
    np.testing.assert_allclose(dense.apply(ci), direct.apply(ci), atol=1e-12)
    np.testing.assert_allclose(np.diag(dense._matrix), direct.diagonal().ravel(), atol=1e-12)
