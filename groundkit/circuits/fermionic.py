"""Exact circuits of fermionic trial states: the reference's X gates, then each excitation factor exp(θ·G).

Two constructions (``construction=``):

- ``"compact"`` (default): on an untapered register, the circuit is built in the Jordan–Wigner frame with the
  compact excitation circuits of ``compact.py`` (Yordanov, Arvidsson-Shukur and Barnes, Phys. Rev. A 102, 062612
  (2020)) and followed by one CNOT network taking |n⟩ to |M·n⟩ (``linear_network.py``; none for Jordan–Wigner),
  since every linear encoding's image of an operator is the Jordan–Wigner image conjugated by that network. On a
  tapered register no such frame exists (tapering mixes the qubits by Clifford rotations and removes some), and the
  ladder construction below is used.
- ``"ladder"``: each factor as a product of Pauli-string exponentials with CNOT ladders (the construction below).

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
from .compact import jordan_wigner_excitation
from .linear_network import encoding_network
from .optimise import optimise_circuit
from .pauli_exponential import PauliString, pauli_exponential_steps
from .simplify import flatten, reduce_steps
from .steps import Step, cnot, one, operations

CONSTRUCTIONS = ("compact", "ladder")


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


def checked_construction(construction: str) -> str:
    """The construction name, or ComponentError naming the accepted ones."""
    if construction not in CONSTRUCTIONS:
        raise ComponentError(
            f"construction {construction!r} is not one of {', '.join(repr(c) for c in CONSTRUCTIONS)}: 'compact' "
            "for the compact excitation circuits, 'ladder' for Pauli-string exponentials with CNOT ladders"
        )
    return construction


def _jordan_wigner_terms(excitation: Excitation) -> list[tuple[PauliString, float]]:
    from openfermion import jordan_wigner

    generator = FermionOperator(excitation.operator_term()) - FermionOperator(excitation.adjoint().operator_term())
    return [(tuple(string), float(value.imag)) for string, value in sorted(jordan_wigner(generator).terms.items())
            if string and abs(value) > 1e-14]


def fermionic_steps(encoding: Any, plan: ExcitationPlan, angles: np.ndarray, construction: str = "compact"
                    ) -> list[Step]:
    """Gate list from |0…0⟩ preparing exp(θ_K G_K)…exp(θ_1 G_1)|reference⟩ on the encoding's register."""
    checked_construction(construction)
    angles = np.asarray(angles, dtype=float)
    if angles.shape != (len(plan.excitations),):
        raise ComponentError(f"{angles.size} angles for {len(plan.excitations)} excitations")
    if construction == "ladder" or encoding.taper is not None:
        steps = [one("x", q) for q, bit in enumerate(reference_bits(encoding, plan.reference)) if bit]
        for excitation, angle in zip(plan.excitations, angles):
            for string, c in generator_terms(encoding, excitation):
                steps += pauli_exponential_steps(string, angle * c)
        return steps
    alpha, beta = plan.reference
    occupied = [k for k in range(encoding.n_modes) if ((alpha if k % 2 == 0 else beta) >> (k // 2)) & 1]
    steps = [one("x", k) for k in occupied]
    for excitation, angle in zip(plan.excitations, angles):
        compact = jordan_wigner_excitation(excitation.creators, excitation.annihilators, float(angle))
        if compact is None:  # rank above two: Pauli-string exponentials in the Jordan-Wigner frame
            compact = [s for string, c in _jordan_wigner_terms(excitation)
                       for s in pauli_exponential_steps(string, angle * c)]
        steps += compact
    steps += [cnot(c, t) for c, t in encoding_network(encoding.matrix)]
    return steps


def fermionic_circuit(encoding: Any, plan: ExcitationPlan, angles: np.ndarray, construction: str = "compact"
                      ) -> cirq.Circuit:
    """Circuit from |0…0⟩ on ``cirq.LineQubit.range(n)`` preparing exp(θ_K G_K)…exp(θ_1 G_1)|reference⟩.

    ``angles`` (radians) has one entry per excitation (``plan.angles(parameters)``); the first excitation acts
    first. ``construction`` is "compact" (default) or "ladder" (module docstring). Inverse pairs are removed and the
    result optimised with Cirq's transformers (``optimise.py``). The state equals the encoding's embedding of the
    engine's state up to a global phase.
    """
    steps = flatten(reduce_steps(fermionic_steps(encoding, plan, angles, construction)))
    qubits = cirq.LineQubit.range(encoding.n_qubits)
    return optimise_circuit(cirq.Circuit(operations(steps, qubits)))
