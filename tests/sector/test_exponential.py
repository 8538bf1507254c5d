import numpy as np
import pytest
import scipy.linalg

from groundkit.errors import ParameterError
from groundkit.sector.excitation import Excitation
from groundkit.sector.exponential import apply_exponential, apply_generator, apply_product
from groundkit.sector.space import Sector
from groundkit.sector.steps import Steps
from groundkit.sector.tables import excitation_tables

EXCITATIONS = [
    Excitation((4,), (0,)),
    Excitation((7,), (3,)),
    Excitation((4, 5), (1, 0)),
    Excitation((4, 7), (3, 0)),
    Excitation((6, 5), (1, 2)),
    Excitation((2, 6), (4, 0)),
    Excitation((7, 3, 6), (5, 1, 0)),
]


@pytest.fixture
def sector():
    return Sector(4, 2, 2)


def dense(sector, table):
    columns = []
    for k in range(sector.size):
        e = np.zeros(sector.size)
        e[k] = 1.0
        columns.append(apply_generator(e.reshape(sector.shape), table).ravel())
    return np.array(columns).T


def test_generator_is_antisymmetric_and_cubes_to_minus_itself(sector):
    for table in excitation_tables(EXCITATIONS, sector.alpha_strings, sector.beta_strings):
        g = dense(sector, table)
        assert np.abs(g).sum() > 0
        np.testing.assert_array_equal(g, -g.T)
        np.testing.assert_allclose(g @ g @ g, -g, atol=1e-15)


def test_exponential_equals_matrix_exponential(sector):
    rng = np.random.default_rng(3)
    ci = rng.normal(size=sector.shape)
    for table in excitation_tables(EXCITATIONS, sector.alpha_strings, sector.beta_strings):
        theta = rng.uniform(-3, 3)
        expected = scipy.linalg.expm(theta * dense(sector, table)) @ ci.ravel()  # SciPy (reference library)
        np.testing.assert_allclose(apply_exponential(ci, table, theta).ravel(), expected, atol=1e-13)


@pytest.mark.parametrize("flat_budget", [0, 10**9])
def test_product_order_norm_and_no_mutation(sector, flat_budget):
    rng = np.random.default_rng(5)
    ci = rng.normal(size=sector.shape)
    ci /= np.linalg.norm(ci)
    before = ci.copy()
    tables = excitation_tables(EXCITATIONS, sector.alpha_strings, sector.beta_strings)
    angles = rng.uniform(-np.pi, np.pi, len(tables))
    out = apply_product(ci, Steps(tables, sector.shape, flat_budget), angles)
    np.testing.assert_array_equal(ci, before)
    assert abs(np.linalg.norm(out) - 1.0) < 1e-12
    expected = ci
    for table, theta in zip(tables, angles):
        expected = scipy.linalg.expm(theta * dense(sector, table)) @ expected.ravel()  # SciPy (reference library)
    np.testing.assert_allclose(out.ravel(), expected, atol=1e-12)
    reversed_order = apply_product(ci, tables[::-1], angles[::-1])
    assert np.abs(reversed_order - out).max() > 1e-3


def test_angle_count_must_match(sector):
    tables = excitation_tables(EXCITATIONS[:2], sector.alpha_strings, sector.beta_strings)
    with pytest.raises(ParameterError, match="3 angles given for 2 excitation tables"):
        apply_product(sector.determinant(3, 3), tables, [0.1, 0.2, 0.3])
