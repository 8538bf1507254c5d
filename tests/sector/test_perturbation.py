import numpy as np
import pytest
from pyscf import gto, mp, scf

from groundkit.sector.hamiltonian import SectorHamiltonian
from groundkit.sector.perturbation import first_order_amplitudes, orbital_energies
from groundkit.sector.space import Sector, lowest_strings
from groundkit.sector.tables import determinant_image, excitation_tables
from groundkit.trial_states.excitation_sets import reference_doubles, reference_singles
from tests.sector.engine_problems import GEOMETRIES


def closed_shell_scf(name):
    mol = gto.M(atom=GEOMETRIES[name][0], basis="sto-3g", verbose=0)
    mf = scf.RHF(mol)
    mf.conv_tol = 1e-12
    mf.kernel()
    return mf


@pytest.mark.parametrize("name", ["lih", "h2o", "h4"])
def test_fock_diagonal_is_rhf_orbital_energies_and_first_order_gives_mp2(get_problem, name):
    p = get_problem(name)
    mf = closed_shell_scf(name)
    alpha, beta = lowest_strings(p.n_alpha, p.n_beta)
    energies = orbital_energies(p.h1, p.h2, alpha, beta)
    np.testing.assert_allclose(energies[0::2], mf.mo_energy, atol=1e-6)  # PySCF (reference library) RHF mo_energy
    np.testing.assert_allclose(energies[1::2], mf.mo_energy, atol=1e-6)

    sector = Sector(p.n_orbitals, p.n_alpha, p.n_beta)
    excitations = reference_doubles(alpha, beta, p.n_orbitals) + reference_singles(alpha, beta, p.n_orbitals)
    tables = excitation_tables(excitations, sector.alpha_strings, sector.beta_strings)
    reference = sector.determinant(alpha, beta)
    h_reference = SectorHamiltonian(p.h1, p.h2, p.n_alpha, p.n_beta).apply(reference)
    index = sector.index(alpha, beta)
    angles = first_order_amplitudes(excitations, tables, index, h_reference, energies)
    assert np.all(angles[len(reference_doubles(alpha, beta, p.n_orbitals)):] == 0.0)
    # Second-order energy sum_k theta_k <D_k|H|phi>, against PySCF's MP2 correlation energy
    couplings = []
    for table in tables:
        ja, jb, sign = determinant_image(table, *index)
        couplings.append(sign * h_reference[ja, jb])
    e2 = float(np.dot(angles, couplings))
    e_mp2 = mp.MP2(mf).kernel()[0]  # PySCF (reference library) MP2 correlation energy, no frozen core
    assert abs(e2 - e_mp2) < 1e-8
