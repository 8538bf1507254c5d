import numpy as np
import pytest

from groundkit.sector.adjoint import energy_and_angle_gradient
from groundkit.sector.exponential import apply_product
from groundkit.sector.hamiltonian import SectorHamiltonian
from groundkit.sector.space import Sector, lowest_strings
from groundkit.sector.steps import Steps
from groundkit.sector.tables import excitation_tables
from groundkit.trial_states.excitation_sets import generalised_singles, reference_doubles, reference_singles


@pytest.mark.parametrize("name", ["lih", "nh", "h2o_cas44"])
@pytest.mark.parametrize("flat_budget", [0, 10**9])
def test_adjoint_gradient_equals_central_differences(get_problem, name, flat_budget):
    p = get_problem(name)
    sector = Sector(p.n_orbitals, p.n_alpha, p.n_beta)
    alpha, beta = lowest_strings(p.n_alpha, p.n_beta)
    excitations = (
        reference_doubles(alpha, beta, p.n_orbitals)
        + reference_singles(alpha, beta, p.n_orbitals)
        + generalised_singles(p.n_orbitals)[:6]
    )
    steps = Steps(excitation_tables(excitations, sector.alpha_strings, sector.beta_strings), sector.shape, flat_budget)
    assert (steps.kept_pairs > 0) == (flat_budget > 0)
    hamiltonian = SectorHamiltonian(p.h1, p.h2, p.n_alpha, p.n_beta)
    reference = sector.determinant(alpha, beta)
    rng = np.random.default_rng(2)
    angles = rng.uniform(-1.0, 1.0, len(excitations))
    angles[::7] = 0.0
    energy, gradient = energy_and_angle_gradient(reference, steps, angles, hamiltonian.apply)
    assert abs(energy - (hamiltonian.energy(apply_product(reference, steps, angles)))) < 1e-12
    h = 1e-5
    for k in range(len(angles)):
        up, down = angles.copy(), angles.copy()
        up[k] += h
        down[k] -= h
        numeric = (
            hamiltonian.energy(apply_product(reference, steps, up))
            - hamiltonian.energy(apply_product(reference, steps, down))
        ) / (2 * h)
        assert abs(numeric - gradient[k]) < 1e-6, k


def test_no_excitations_gives_reference_energy(get_problem):
    p = get_problem("h2")
    sector = Sector(p.n_orbitals, p.n_alpha, p.n_beta)
    hamiltonian = SectorHamiltonian(p.h1, p.h2, p.n_alpha, p.n_beta)
    energy, gradient = energy_and_angle_gradient(sector.determinant(1, 1), [], [], hamiltonian.apply)
    assert gradient.shape == (0,)
    assert abs(energy + p.core_energy - p.hf_energy) < 1e-10  # PySCF (reference library) RHF e_tot
