import numpy as np
import pytest

from ..conftest import diatomic


@pytest.fixture(scope="session")
def h2_pipeline():
    """H2 at 0.7414 Å (NIST CCCBDB r_e, from memory), STO-3G, UCCSD on 4 Jordan–Wigner qubits."""
    return diatomic("H", "H", 0.7414).pipeline()


@pytest.fixture(scope="session")
def h2_theta(h2_pipeline):
    return np.array([0.04, -0.02, 0.11])[: h2_pipeline.objective().n_parameters]
