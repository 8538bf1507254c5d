"""Symmetry verification: keep only shots whose electron number N and spin projection Sz are right.

N = Σ n_p and Sz = ½ Σ (n_{2i} − n_{2i+1}) are diagonal in the computational basis of every untapered linear
encoding: the occupations are n = M⁻¹ b (mod 2) for the qubit bits b (Jordan–Wigner: M = 1; Bravyi–Kitaev,
parity: M⁻¹ over GF(2)). A shot is kept when the check of its register passes (Bonet-Monroig, Sagastizabal,
Singh and O'Brien, Phys. Rev. A 98, 062339 (2018); McArdle, Yuan and Benjamin, Phys. Rev. Lett. 122, 180501
(2019)). The check is modelled as an error-free measurement of N and Sz before each group's basis change (the
projection ΠρΠ / Tr Πρ), so it is available for every measurement group and not only for the Z-basis ones.
Tapered registers have no such readout (the removed qubits carried the symmetries): they are refused.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from ..errors import NoiseError
from ..qubits.gf2 import inverse


def occupation_table(encoding: Any) -> np.ndarray:
    """(2^n, n_modes) occupations of every basis index of an untapered register (qubit 0 most significant)."""
    if encoding.taper is not None:
        raise NoiseError("symmetry verification needs N and Sz readable from the measured bits; a tapered register "
                         "has removed the qubits that carried them: use the mapping without taper=True")
    n = encoding.n_qubits
    index = np.arange(1 << n, dtype=np.int64)
    bits = ((index[:, None] >> (n - 1 - np.arange(n))[None, :]) & 1).astype(np.int64)
    decode = inverse(np.asarray(encoding.matrix, dtype=np.uint8)).astype(np.int64)
    return (bits @ decode.T) % 2


def sector_mask(encoding: Any) -> np.ndarray:
    """Boolean mask over the 2^n basis indices: True where N and Sz equal the problem's."""
    occupations = occupation_table(encoding)
    problem = encoding.problem
    number = occupations.sum(axis=1)
    twice_sz = occupations[:, 0::2].sum(axis=1) - occupations[:, 1::2].sum(axis=1)
    return (number == problem.n_alpha + problem.n_beta) & (twice_sz == problem.n_alpha - problem.n_beta)


def kept_outcomes(outcomes: np.ndarray, mask: np.ndarray) -> np.ndarray:
    """The computational-basis outcome indices that pass the check."""
    outcomes = np.asarray(outcomes, dtype=np.int64)
    return outcomes[mask[outcomes]]
