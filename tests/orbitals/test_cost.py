"""Orbital-preparation cost limits: an oversized CASSCF is refused before the SCF with figures."""

import pytest

import groundkit as gk
from groundkit.errors import SizeLimitError
from groundkit.orbitals.cost import casscf_cost
from tests.conftest import diatomic


def test_casscf_cost_grows_with_the_active_space():
    # counting (common practice, no single source): determinants grow as C(n, n_alpha)^2
    small, large = casscf_cost(28, 6, 3, 3), casscf_cost(28, 14, 7, 7)
    assert large[0] > 100 * small[0] and large[1] > small[1]


def test_oversized_casscf_refused_with_figures():
    molecule = diatomic("N", "N", 1.1, basis="cc-pvdz")
    pipeline = gk.Pipeline(molecule).active_space(gk.ActiveSpace(electrons=10, orbitals=10, orbital_set="casscf"))
    with gk.limits.changed(scf_seconds=1.0):
        with pytest.raises(SizeLimitError, match=r"CASSCF orbitals in \(10e, 10o\).*predicted memory"):
            pipeline.problem()
