"""Small plans shared by the plan tests (computed once per test session): H2 over three bond lengths and LiH in a
(2e, 3o) active space over two, both STO-3G."""

from __future__ import annotations

from functools import cache

import groundkit as gk
from tests.studies.helpers import h2

H2_LENGTHS = (0.6, 0.74, 1.4)  # Å; 0.74 near the CCCBDB equilibrium 0.7414 Å (from memory)
LIH_LENGTHS = (1.6, 2.4)  # Å; 1.6 near the CCCBDB equilibrium 1.5949 Å (from memory)
LIH_SPACE = gk.ActiveSpace(electrons=2, orbitals=3)


def lih(r: float) -> gk.MoleculeSpec:
    return gk.MoleculeSpec(symbols=("Li", "H"), coordinates=((0, 0, 0), (0, 0, r)), basis="sto-3g")


H2_CHOICES = {"mapping": ["jordan-wigner", "parity"], "tapering": [False, True],
              "trial_state": [gk.ReferenceDeterminant(), gk.UCCSD()], "grouping": ["qwc", "none"]}


@cache
def h2_plan() -> gk.PlanResult:
    """H2: (JW, parity) × (±tapering) × (Hartree–Fock determinant, UCCSD) × (qwc, none) = 16 configurations."""
    return gk.plan((gk.BondStretch(h2(0.74)), list(H2_LENGTHS)), H2_CHOICES)


@cache
def lih_plan() -> gk.PlanResult:
    """LiH (2e, 3o): (JW, Bravyi–Kitaev) × (UCCSD, pair doubles) in one active space."""
    return gk.plan([lih(r) for r in LIH_LENGTHS],
                   {"active_space": [LIH_SPACE], "mapping": ["jordan-wigner", "bravyi-kitaev"],
                    "trial_state": [gk.UCCSD(), gk.PairDoubles()]})
