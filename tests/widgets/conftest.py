"""Small runs for the widget tests: H2 at its experimental bond length (NIST CCCBDB, from memory)."""

from __future__ import annotations

import pytest

import groundkit as gk


def hydrogen(r: float = 0.7414) -> gk.MoleculeSpec:
    return gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, r)), name="hydrogen")


@pytest.fixture(scope="session")
def h2_pipeline() -> gk.Pipeline:
    return gk.Pipeline(hydrogen())


@pytest.fixture(scope="session")
def lih_pipeline() -> gk.Pipeline:
    # r_e as listed by NIST CCCBDB (from memory; Huber-Herzberg via the NIST WebBook: 1.5957 Å)
    lih = gk.MoleculeSpec(symbols=("Li", "H"), coordinates=((0, 0, 0), (0, 0, 1.5949)), name="lithium hydride")
    return gk.Pipeline(lih).active_space(electrons=2, orbitals=3)
