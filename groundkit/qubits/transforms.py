"""Fermion-to-qubit transforms (OpenFermion's) and the binary matrix each linear encoding applies to occupations.

Under Jordan–Wigner, parity and Bravyi–Kitaev, the Fock state |n> (spin-orbital occupations, interleaved) maps to
the computational basis state |b> with b = M n (mod 2) and phase +1 when creators are applied in OpenFermion's
order; ``basis_matrix`` reads M off the images of the number operators, n_i -> (1 - Z_F(i)) / 2.
"""

from __future__ import annotations

from functools import lru_cache

import numpy as np
from openfermion import FermionOperator, QubitOperator

from ..mapping import MAPPINGS
from .gf2 import inverse


def fermion_to_qubit(operator, mapping: str, n_modes: int) -> QubitOperator:
    """Image of a FermionOperator (or InteractionOperator) under ``mapping`` on ``n_modes`` qubits."""
    import openfermion as of

    if mapping == "jordan-wigner":
        return of.jordan_wigner(operator)
    fermion = operator if isinstance(operator, FermionOperator) else of.get_fermion_operator(operator)
    if mapping == "bravyi-kitaev":
        return of.bravyi_kitaev(fermion, n_qubits=n_modes)
    if mapping == "parity":
        return of.binary_code_transform(fermion, of.parity_code(n_modes))
    raise ValueError(f"unknown mapping {mapping!r}; accepted: {', '.join(MAPPINGS)}")


@lru_cache(maxsize=64)
def basis_matrix(mapping: str, n_modes: int) -> np.ndarray:
    """0/1 matrix M (n_modes x n_modes) with qubit bits b = M n mod 2 for occupations n."""
    parity_sets = np.zeros((n_modes, n_modes), dtype=np.uint8)
    for i in range(n_modes):
        image = fermion_to_qubit(FermionOperator(((i, 1), (i, 0))), mapping, n_modes)
        for term, coefficient in image.terms.items():
            if term:
                if any(op != "Z" for _, op in term) or abs(coefficient + 0.5) > 1e-12:
                    raise ValueError(f"{mapping} is not a linear encoding: n_{i} -> {image}")
                for q, _ in term:
                    parity_sets[i, q] = 1
    return inverse(parity_sets)
