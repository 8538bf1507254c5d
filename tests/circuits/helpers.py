"""Shared pieces of the circuit tests: molecules, random angles, Cirq statevectors."""

from __future__ import annotations

import numpy as np

import groundkit as gk
from groundkit.circuits.fermionic import generator_terms
from groundkit.errors import SymmetryError

MAPPINGS = ("jordan-wigner", "bravyi-kitaev", "parity")

# experimental equilibrium bond lengths as listed by NIST CCCBDB (from memory); for LiH, Huber-Herzberg via the
# NIST WebBook reads 1.5957 Å
H2 = gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.7414)), name="H2")
LIH = gk.MoleculeSpec(symbols=("Li", "H"), coordinates=((0, 0, 0), (0, 0, 1.5949)), name="LiH")


def lih_pipeline() -> gk.Pipeline:
    """LiH in STO-3G, (2e, 4o) active space: both pi orbitals in, so no degenerate set is cut (8 spin orbitals)."""
    return gk.Pipeline(LIH).active_space(electrons=2, orbitals=4)


def sector_keeping(pipeline: gk.Pipeline) -> gk.ExcitationList:
    """UCCSD's excitations that keep the (tapered) symmetry sector of the pipeline's encoding."""
    encoding = pipeline.encoding()
    plan = gk.UCCSD().plan(pipeline.problem())
    kept = []
    for excitation in plan.excitations:
        try:
            generator_terms(encoding, excitation)
        except SymmetryError:
            continue
        kept.append(excitation)
    return gk.ExcitationList(kept)


def random_angles(n: int, seed: int) -> np.ndarray:
    """Angles in radians, uniform in (-1, 1)."""
    return np.random.default_rng(seed).uniform(-1.0, 1.0, n)
