"""Exact circuits of fermionic trial states: the reference's X gates, then each excitation factor exp(θ·G).

Under a linear encoding (Jordan–Wigner, parity, Bravyi–Kitaev), tapered or not, the image of G = τ − τ† is
i·Σ_k c_k·P_k with real c_k and mutually commuting Pauli strings P_k, so exp(θ·G) = Π_k exp(i·θ·c_k·P_k) exactly,
each factor a Pauli-string exponential. The images are computed once per (encoding, excitation) and checked.
"""

from __future__ import annotations

from typing import Any

import cirq
import numpy as np
from openfermion import FermionOperator

from ..errors import ComponentError, SymmetryError
from ..sector.excitation import Excitation
from ..trial_states.base import ExcitationPlan, excitation_label
from ..workspace import workspace
from .pauli_exponential import PauliString, pauli_string_exponential
from .simplify import cancel_inverse_pairs


def _anticommute(a: PauliString, b: PauliString) -> bool:
    ops = dict(a)
    return sum(1 for q, op in b if q in ops and ops[q] != op) % 2 == 1


def generator_terms(encoding: Any, excitation: Excitation) -> list[tuple[PauliString, float]]:
    """``[(P_k, c_k)]`` with image(τ − τ†) = i·Σ c_k·P_k on the encoding's register, sorted by Pauli string.

    Raises :class:`SymmetryError` when the excitation leaves the tapered sector, :class:`ComponentError` when the
    image is not of that form (which no linear encoding produces).
    """
    return workspace().fetch("excitation image", (id(encoding), excitation),
                             lambda: _generator_terms(encoding, excitation), owner=encoding)


def _generator_terms(encoding: Any, excitation: Excitation) -> list[tuple[PauliString, float]]:
    term = excitation.operator_term()
    generator = FermionOperator(term) - FermionOperator(excitation.adjoint().operator_term())
    try:
        image = encoding.encode(generator)
    except SymmetryError as exc:
        raise SymmetryError(
            f"excitation {excitation_label(excitation)} {tuple(excitation)} leaves the tapered symmetry sector "
            f"of {encoding.mapping!r} ({exc}); compile it on an untapered register (taper=False) or use a trial "
            f"state whose excitations keep the symmetries"
        ) from None
    terms: list[tuple[PauliString, float]] = []
    for string, value in sorted(image.terms.items()):
        if abs(value.real) > 1e-10:
            raise ComponentError(
                f"image of excitation {excitation_label(excitation)} under {encoding.mapping!r} has the Pauli "
                f"term {string} with coefficient {value}, not imaginary; the generator is not anti-Hermitian"
            )
        if abs(value.imag) > 1e-14 and string:  # the identity part of a traceless generator is round-off
            terms.append((tuple(string), float(value.imag)))
    for i, (a, _) in enumerate(terms):
        for b, _ in terms[i + 1:]:
            if _anticommute(a, b):
                raise ComponentError(
                    f"image of excitation {excitation_label(excitation)} under {encoding.mapping!r} has "
                    f"anticommuting Pauli strings {a} and {b}; it cannot be compiled as a product of exponentials"
                )
    return terms


def reference_bits(encoding: Any, reference: tuple[int, int]) -> tuple[int, ...]:
    """Bits (qubit 0 first) of the basis state of a reference determinant (alpha string, beta string)."""
    index, _, inside = encoding.basis_states(np.array([reference[0]]), np.array([reference[1]]))
    if not bool(inside[0]):
        raise SymmetryError(
            f"reference determinant (alpha {reference[0]:#b}, beta {reference[1]:#b}) lies outside the tapered "
            f"sector of {encoding.mapping!r}"
        )
    n = encoding.n_qubits
    return tuple((int(index[0]) >> (n - 1 - q)) & 1 for q in range(n))


def fermionic_circuit(encoding: Any, plan: ExcitationPlan, angles: np.ndarray) -> cirq.Circuit:
    """Circuit from |0…0⟩ on ``cirq.LineQubit.range(n)`` preparing exp(θ_K G_K)…exp(θ_1 G_1)|reference⟩.

    ``angles`` (radians) has one entry per excitation (``plan.angles(parameters)``); the first excitation acts
    first. The state equals the encoding's embedding of the engine's state up to a global phase.
    """
    angles = np.asarray(angles, dtype=float)
    if angles.shape != (len(plan.excitations),):
        raise ComponentError(f"{angles.size} angles for {len(plan.excitations)} excitations")
    qubits = cirq.LineQubit.range(encoding.n_qubits)
    operations: list[cirq.Operation] = [cirq.X(qubits[q]) for q, bit in
                                        enumerate(reference_bits(encoding, plan.reference)) if bit]
    for excitation, angle in zip(plan.excitations, angles):
        for string, c in generator_terms(encoding, excitation):
            operations += pauli_string_exponential(string, angle * c, qubits)
    return cirq.Circuit(cancel_inverse_pairs(operations))
