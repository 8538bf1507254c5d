"""Fermion-to-qubit transforms through a mapping value, and the binary matrix each linear encoding applies.

Under Jordan–Wigner, parity and Bravyi–Kitaev (and any :class:`~groundkit.mapping.LinearMapping`), the Fock state
|n> (spin-orbital occupations, interleaved) maps to the computational basis state |b> with b = M n (mod 2) and
phase +1 when creators are applied in OpenFermion's order; :func:`matrix_from_number_operators` reads M off the
images of the number operators, n_i -> (1 - Z_F(i)) / 2.
"""

from __future__ import annotations

from typing import Any

import numpy as np
from openfermion import FermionOperator, QubitOperator

from ..errors import ComponentError
from ..mapping import QubitMapping
from ..workspace import workspace
from .gf2 import inverse
from .linear_images import from_jordan_wigner


def _as_mapping(mapping: QubitMapping | str) -> QubitMapping:
    return mapping if isinstance(mapping, QubitMapping) else QubitMapping(mapping)


def fermion_to_qubit(operator: Any, mapping: QubitMapping | str, n_modes: int) -> QubitOperator:
    """Image of a FermionOperator (or InteractionOperator) under ``mapping`` (a value or a name) on ``n_modes``
    qubits, before any tapering."""
    return _as_mapping(mapping).transform(operator, n_modes)


def hamiltonian_image(problem: Any, mapping: QubitMapping, n_modes: int) -> QubitOperator:
    """The problem's Hamiltonian under ``mapping`` before tapering (a new operator).

    The Jordan–Wigner image is computed once per problem (kept in the workspace, kind ``Jordan–Wigner image``);
    the built-in linear encodings and :class:`~groundkit.mapping.LinearMapping` subclasses that keep its
    transform are carried from it by one Clifford conjugation (:mod:`groundkit.qubits.linear_images`), so a
    second mapping of the same problem costs milliseconds. Any other mapping uses its own ``transform``.
    """
    from openfermion import jordan_wigner

    from ..mapping import BravyiKitaev, JordanWigner, LinearMapping, Parity

    method = type(mapping).transform
    if method not in (JordanWigner.transform, Parity.transform, LinearMapping.transform, BravyiKitaev.transform):
        return fermion_to_qubit(problem.fermion_hamiltonian(), mapping, n_modes)
    image = workspace().fetch("Jordan–Wigner image", (problem.molecule, problem.active_space),
                              lambda: jordan_wigner(problem.fermion_hamiltonian()), owner=problem)
    if method is JordanWigner.transform:
        out = QubitOperator()
        out.terms = dict(image.terms)
        return out
    return from_jordan_wigner(image, basis_matrix(mapping, n_modes))


def basis_matrix(mapping: QubitMapping | str, n_modes: int) -> np.ndarray:
    """0/1 matrix M (n_modes x n_modes) with qubit bits b = M n mod 2 for occupations n, checked (cached)."""
    value = _as_mapping(mapping).untapered()
    try:
        hash(value)
    except TypeError:  # a user mapping with unhashable options: compute afresh
        return _checked_matrix(value, int(n_modes))
    return workspace().fetch("basis matrix", (value, int(n_modes)), lambda: _checked_matrix(value, int(n_modes)))


def _checked_matrix(mapping: QubitMapping, n_modes: int) -> np.ndarray:
    matrix = np.asarray(mapping.basis_matrix(n_modes))
    if matrix.shape != (n_modes, n_modes) or not np.all((matrix == 0) | (matrix == 1)):
        raise ComponentError(
            f"{mapping!r}.basis_matrix({n_modes}) gave shape {matrix.shape}; expected a {n_modes} x {n_modes} "
            "matrix of zeros and ones"
        )
    matrix = matrix.astype(np.uint8)
    try:
        inverse(matrix)
    except ValueError:
        raise ComponentError(f"{mapping!r}.basis_matrix({n_modes}) is singular over GF(2); an encoding must be "
                             "invertible (each basis state the image of one occupation)") from None
    return matrix


def matrix_from_number_operators(mapping: QubitMapping, n_modes: int) -> np.ndarray:
    """M read off the images of n_i under ``mapping.transform``; ComponentError when the encoding is not linear."""
    parity_sets = np.zeros((n_modes, n_modes), dtype=np.uint8)
    for i in range(n_modes):
        image = mapping.transform(FermionOperator(((i, 1), (i, 0))), n_modes)
        for term, coefficient in image.terms.items():
            if term:
                if any(op != "Z" for _, op in term) or abs(coefficient + 0.5) > 1e-12:
                    raise ComponentError(
                        f"{mapping!r} is not a linear encoding (n_{i} -> {image}); the embedding of determinants, "
                        "tapering and circuits need b = M n (mod 2)"
                    )
                for q, _ in term:
                    if q >= n_modes:
                        raise ComponentError(f"{mapping!r} maps n_{i} onto qubit {q} of {n_modes}")
                    parity_sets[i, q] = 1
    try:
        return inverse(parity_sets)
    except ValueError:
        raise ComponentError(f"{mapping!r}: the number operators' images are not independent; not an "
                             "encoding of the occupations") from None


def linear_code(mapping: QubitMapping, n_modes: int) -> Any:
    """OpenFermion's ``BinaryCode`` of a linear mapping: encoder M, linear decoder M^-1 (mod 2)."""
    from openfermion import BinaryCode, linearize_decoder

    matrix = basis_matrix(mapping, n_modes)
    return BinaryCode(matrix.astype(int), linearize_decoder(inverse(matrix).astype(int)))
