import pytest

from tests.sector.engine_problems import problem


@pytest.fixture(scope="session")
def get_problem():
    """Function name -> problem built once per session (PySCF stand-in for groundkit's Problem)."""
    return problem
