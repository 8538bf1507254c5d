import numpy as np
import pytest

from groundkit.sector.space import Sector, lowest_strings
from groundkit.sector.spin import multiplicity_of, spin_square


@pytest.mark.parametrize("name, expected", [("h2o", 0.0), ("oh", 0.75), ("nh", 2.0)])  # S(S+1), by definition
def test_high_spin_determinant_and_reference(get_problem, name, expected):
    p = get_problem(name)
    hf = Sector(p.n_orbitals, p.n_alpha, p.n_beta).determinant(*lowest_strings(p.n_alpha, p.n_beta))
    assert abs(spin_square(hf, p.n_orbitals, p.n_alpha, p.n_beta) - expected) < 1e-12
    assert abs(spin_square(p.reference.ci, p.n_orbitals, p.n_alpha, p.n_beta) - expected) < 1e-8
    assert abs(multiplicity_of(expected) - p.multiplicity) < 1e-12


def test_open_shell_singlet_determinant_is_half_triplet():
    # |a b> in two orbitals: <S^2> = 1 (equal mix of singlet and Sz=0 triplet), by definition of S^2
    ci = Sector(2, 1, 1).determinant(0b01, 0b10)
    assert abs(spin_square(ci, 2, 1, 1) - 1.0) < 1e-12
    assert abs(spin_square(3.0 * ci, 2, 1, 1) - 1.0) < 1e-12
    assert np.isclose(multiplicity_of(0.0), 1.0)
