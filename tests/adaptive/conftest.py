"""Shared pipelines for the adaptive tests: hydrogen chains in STO-3G (strongly correlated when stretched)."""

from __future__ import annotations

import pytest

import groundkit as gk
from groundkit.adaptive import Adaptive
from tests.outside_references import OutsideReference, chain, pyscf_exact


def hydrogen_chain(n_atoms: int, spacing: float) -> gk.MoleculeSpec:
    """Linear chain of ``n_atoms`` hydrogen atoms ``spacing`` angstrom apart along z, STO-3G."""
    return gk.MoleculeSpec(symbols=("H",) * n_atoms, coordinates=tuple((0.0, 0.0, spacing * k) for k in range(n_atoms)),
                           basis="sto-3g")


@pytest.fixture(scope="session")
def h4_stretched() -> gk.Pipeline:
    """H4 chain at 1.5 angstrom spacing: 8 spin orbitals, 36 determinants, strongly correlated."""
    return gk.Pipeline(hydrogen_chain(4, 1.5))


@pytest.fixture(scope="session")
def h4_exact() -> OutsideReference:
    """PySCF RHF and full CI of the same H4 chain, built in the test (reference library): 167 mHa of correlation."""
    return pyscf_exact(chain(4, 1.5))


@pytest.fixture(scope="session")
def h4_grown(h4_stretched) -> gk.RunResult:
    """The default adaptive run on the stretched H4 chain (shared by several tests)."""
    return h4_stretched.trial_state(Adaptive()).run()


@pytest.fixture(scope="session")
def h4_uccsd(h4_stretched) -> gk.RunResult:
    return h4_stretched.trial_state(gk.UCCSD()).minimiser(gk.BFGS(tolerance=1e-7)).run()


@pytest.fixture(scope="session")
def get_problem():
    """Function name -> problem built straight from PySCF, once per session (see tests/sector/engine_problems.py)."""
    from tests.sector.engine_problems import problem

    return problem
