"""Shared test molecules. Geometries: experimental equilibrium values from NIST CCCBDB (from memory)."""

from __future__ import annotations

import math

import pytest

import groundkit as gk
from tests.file_round_trip import _saved_files_round_trip, pytest_terminal_summary  # noqa: F401 (every saved file)


def water(basis: str = "sto-3g") -> gk.MoleculeSpec:
    """H2O at r(OH) = 0.9578 Å, angle 104.48° (NIST CCCBDB experimental, from memory)."""
    half = math.radians(104.48) / 2
    x, z = 0.9578 * math.sin(half), 0.9578 * math.cos(half)
    return gk.MoleculeSpec(symbols=("O", "H", "H"), coordinates=((0, 0, 0), (x, 0, z), (-x, 0, z)), basis=basis,
                           name="water")


def diatomic(a: str, b: str, r: float, **options) -> gk.MoleculeSpec:
    """Two atoms on the z axis, ``r`` Å apart."""
    return gk.MoleculeSpec(symbols=(a, b), coordinates=((0, 0, 0), (0, 0, r)), **options)


@pytest.fixture(scope="session")
def h2_bohr() -> gk.MoleculeSpec:
    """H2 at 1.4 bohr, the geometry of Szabo and Ostlund's minimal-basis tables."""
    return diatomic("H", "H", 1.4, unit="bohr")


@pytest.fixture(scope="session")
def lih() -> gk.MoleculeSpec:
    """LiH at 1.5949 Å: r_e as listed by NIST CCCBDB (from memory; Huber-Herzberg via the NIST WebBook: 1.5957 Å)."""
    return diatomic("Li", "H", 1.5949)


@pytest.fixture(scope="session")
def h2o() -> gk.MoleculeSpec:
    return water()


@pytest.fixture(autouse=True)
def _fresh_minimisations():
    """Each test minimises afresh: the workspace answers a repeated exact minimisation from memory (see
    docs/pipeline.md), which would hide the evaluations a test counts or interrupts."""
    gk.workspace().clear("minimisation")
    yield
