"""PauliRotations: a product of Pauli-string rotations exp(i·θ_k·P_k) on the reference's basis state.

The state is exp(i·θ_K·P_K)…exp(i·θ_1·P_1)|reference⟩ (the first string acts first), where |reference⟩ is the basis
state of the Hartree–Fock determinant under the pipeline's encoding (``encoding.reference_bits``, tapered
registers included). Each factor is compiled exactly as a basis change, a CNOT ladder, Rz(−2θ) and the undo
(the same gates as :func:`groundkit.circuits.pauli_string_exponential`), so gate counts, OpenQASM export, the
adjoint gradients of :class:`~groundkit.qubit_states.QubitObjective` and sampled estimators all apply unchanged.
A string with an odd number of Y factors is an imaginary matrix, so exp(i·θ·P) is real and keeps real states
real; other strings are allowed too (the statevector is complex).

The objective does not simulate those gates one by one: since P² = 1, exp(i·θ·P)ψ = cos θ·ψ + i·sin θ·Pψ, and Pψ
is a permutation of ψ with phases (:class:`PauliAction`), so :class:`RotationProgram` prepares the state and its
adjoint gradient dE/dθ_k = 2·Re⟨λ_k|i·P_k|ψ_k⟩ with a few vector operations per string (the tests check it against
the gate-by-gate route and Cirq's simulator).

Pauli strings are written as labels such as ``"X0 Y2 X3"`` (letter, then qubit index; sorted by qubit) or as
OpenFermion term tuples ``((0, "X"), (2, "Y"), (3, "X"))``.
"""

from __future__ import annotations

import re
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import cirq
import numpy as np
import sympy

from ..errors import ComponentError
from ..registry import register
from ..workspace import workspace
from .base import QubitTrialState

PauliTerm = tuple[tuple[int, str], ...]
_FACTOR = re.compile(r"([XYZ])(\d+)")


def pauli_term(value: object) -> PauliTerm:
    """The sorted term tuple of a Pauli-string label or term; ComponentError if it is not a non-identity string."""
    if isinstance(value, str):
        parts = value.replace(",", " ").split()
        matches = [_FACTOR.fullmatch(p.strip().upper()) for p in parts]
        if not parts or any(m is None for m in matches):
            raise ComponentError(
                f"Pauli string {value!r} is not of the form 'X0 Y2 X3' (letters X, Y, Z each followed by a qubit "
                f"index, separated by spaces)"
            )
        factors = [(int(m.group(2)), m.group(1)) for m in matches]
    else:
        try:
            factors = [(int(q), str(op).upper()) for q, op in value]  # type: ignore[union-attr]
        except (TypeError, ValueError):
            raise ComponentError(f"Pauli string {value!r}: give a label like 'X0 Y2' or ((0, 'X'), (2, 'Y'))") from None
        if not factors or any(op not in "XYZ" or len(op) != 1 or q < 0 for q, op in factors):
            raise ComponentError(f"Pauli string {value!r}: factors must be (qubit >= 0, 'X' | 'Y' | 'Z'), at least one")
    qubits = [q for q, _ in factors]
    if len(set(qubits)) != len(qubits):
        raise ComponentError(f"Pauli string {value!r} names a qubit twice; give one letter per qubit")
    return tuple(sorted(factors))


def pauli_label(value: object) -> str:
    """The canonical label of a Pauli string, e.g. ``"X0 Y2 X3"``."""
    return " ".join(f"{op}{q}" for q, op in pauli_term(value))


def _to_z(op: str, qubit: cirq.Qid, undo: bool) -> list[cirq.Operation]:
    if op == "X":
        return [cirq.H(qubit)]
    if op == "Y":
        return [cirq.rx(-np.pi / 2 if undo else np.pi / 2)(qubit)]
    return []


def rotation_operations(term: PauliTerm, angle: Any, qubits: Sequence[cirq.Qid]) -> list[cirq.Operation]:
    """exp(i·angle·P) as operations (time order); ``angle`` (radians) may be a sympy expression."""
    targets = [qubits[q] for q, _ in term]
    before = [g for (_, op), qubit in zip(term, targets) for g in _to_z(op, qubit, False)]
    after = [g for (_, op), qubit in zip(term, targets) for g in _to_z(op, qubit, True)]
    ladder = [cirq.CNOT(a, b) for a, b in zip(targets, targets[1:])]
    return before + ladder + [cirq.rz(-2 * angle)(targets[-1])] + ladder[::-1] + after


class PauliAction:
    """A Pauli string acting on flat statevectors of ``n_qubits`` (qubit 0 the most significant bit):
    (P·ψ)[c] = i^(#Y)·(−1)^popcount((c ⊕ x) & z)·ψ[c ⊕ x], x marking X/Y factors and z marking Y/Z factors.

    ``keep=True`` stores the gather indices and factors (2^n each, for repeated use); ``keep=False`` recomputes
    them on each call (for large pools applied once per step).
    """

    def __init__(self, term: PauliTerm, n_qubits: int, keep: bool = True) -> None:
        self.n_qubits, self.flip, self.sign = int(n_qubits), 0, 0
        self.phase: complex = 1.0
        for q, op in term:
            bit = 1 << (self.n_qubits - 1 - q)
            self.flip |= bit if op in "XY" else 0
            self.sign |= bit if op in "YZ" else 0
            self.phase *= 1j if op == "Y" else 1.0
        self._kept = self._tables() if keep else None

    def _tables(self) -> tuple[np.ndarray, np.ndarray]:
        source = np.arange(2 ** self.n_qubits, dtype=np.int64) ^ self.flip
        factors = self.phase * (1.0 - 2.0 * (np.bitwise_count(source & self.sign) & 1))
        return source.astype(np.int32 if self.n_qubits < 31 else np.int64), factors

    def __call__(self, psi: np.ndarray) -> np.ndarray:
        """P·ψ for a flat vector ψ."""
        source, factors = self._kept if self._kept is not None else self._tables()
        return factors * psi[source]


def shared_action(term: PauliTerm, n_qubits: int) -> PauliAction:
    """A kept :class:`PauliAction`, shared by every objective that rotates by the same string on the register
    (in the workspace, kind ``Pauli action``: 12 to 20 bytes per basis state each)."""
    return workspace().fetch("Pauli action", (term, n_qubits), lambda: PauliAction(term, n_qubits))


class RotationProgram:
    """exp(i·θ_K·P_K)…exp(i·θ_1·P_1)|b⟩ on a flat statevector, with adjoint gradients (radians, Hartree)."""

    def __init__(self, terms: Sequence[PauliTerm], reference_bits: Sequence[int], n_qubits: int) -> None:
        self.n_qubits = int(n_qubits)
        self.actions = [shared_action(tuple(term), self.n_qubits) for term in terms]
        self.start = int("".join(str(int(b)) for b in reference_bits) or "0", 2)

    def _check(self, theta: np.ndarray) -> np.ndarray:
        theta = np.asarray(theta, dtype=float)
        if theta.shape != (len(self.actions),):
            raise ComponentError(f"{theta.size} parameters for {len(self.actions)} Pauli rotations")
        return theta

    def state(self, theta: np.ndarray) -> np.ndarray:
        """Statevector (length 2^n) at ``theta``."""
        psi = np.zeros(2 ** self.n_qubits, dtype=complex)
        psi[self.start] = 1.0
        for action, t in zip(self.actions, self._check(theta)):
            psi = np.cos(t) * psi + 1j * np.sin(t) * action(psi)
        return psi

    def energy_and_gradient(self, theta: np.ndarray, apply_h: Any) -> tuple[float, np.ndarray]:
        """(⟨ψ|H|ψ⟩, dE/dθ) by one backward sweep; ``apply_h`` maps a vector to H·vector."""
        theta = self._check(theta)
        psi = self.state(theta)
        lam = apply_h(psi)
        energy = float(np.vdot(psi, lam).real)
        gradient = np.zeros(len(self.actions))
        for k in range(len(self.actions) - 1, -1, -1):
            action, c, s = self.actions[k], np.cos(theta[k]), np.sin(theta[k])
            p_psi = action(psi)
            gradient[k] = 2.0 * float(np.vdot(lam, 1j * p_psi).real)
            psi = c * psi - 1j * s * p_psi  # undo exp(i θ_k P_k) on ψ and λ
            lam = c * lam - 1j * s * action(lam)
        return energy, gradient


@register("trial_state", "pauli-rotations", label="Pauli rotations", listed=False)
@dataclass(frozen=True, init=False)
class PauliRotations(QubitTrialState):
    """``PauliRotations(["Y0 X2", "X0 X1 X2 Y3", ...])``: exp(i·θ_K·P_K)…exp(i·θ_1·P_1)|reference⟩.

    One parameter (radians) per string, in the order given; a string may appear more than once. Parameters
    start at zero (the reference state). The register is the pipeline's (tapered if asked); a string that acts
    beyond it is refused when the objective is built.
    """

    strings: tuple[str, ...]

    def __init__(self, strings: Sequence[object] = ()) -> None:
        if isinstance(strings, (str, bytes)) or not hasattr(strings, "__iter__"):
            raise ComponentError(f"PauliRotations({strings!r}): give a list of Pauli strings such as ['Y0 X2']")
        object.__setattr__(self, "strings", tuple(pauli_label(s) for s in strings))

    def __repr__(self) -> str:
        shown = ", ".join(repr(s) for s in self.strings[:4])
        more = f", ... ({len(self.strings)} in all)" if len(self.strings) > 4 else ""
        return f"PauliRotations([{shown}{more}])"

    def symbols(self) -> tuple[sympy.Symbol, ...]:
        """One symbol per string, named by position and string (e.g. ``p1_X0_Y2``)."""
        return tuple(sympy.Symbol(f"p{k + 1}_{s.replace(' ', '_')}") for k, s in enumerate(self.strings))

    def _checked_register(self, encoding: Any) -> int:
        n = int(encoding.n_qubits)
        widest = max((q for s in self.strings for q, _ in pauli_term(s)), default=-1)
        if widest >= n:
            raise ComponentError(
                f"{self!r}: a string acts on qubit {widest}, but the register of {encoding.mapping!r} has {n} qubits "
                f"(0 ... {n - 1}); build the strings on this pipeline's mapping"
            )
        return n

    def circuit_steps(self, encoding: Any, values: Any) -> list:
        """The gate list at ``values`` (radians): reference X gates, then one Pauli-string exponential per string."""
        from ..circuits.pauli_exponential import pauli_exponential_steps
        from ..circuits.steps import one

        self._checked_register(encoding)
        if len(values) != len(self.strings):
            from ..errors import ParameterError

            raise ParameterError(f"{self!r}: expected {len(self.strings)} values, got {len(values)}")
        steps = [one("x", q) for q, bit in enumerate(encoding.reference_bits) if bit]
        for string, value in zip(self.strings, values):
            steps += pauli_exponential_steps(pauli_term(string), value)
        return steps

    def parametrised_circuit(self, encoding: Any) -> cirq.Circuit:
        from ..circuits.simplify import flatten, reduce_steps
        from ..circuits.steps import operations

        n = self._checked_register(encoding)
        steps = self.circuit_steps(encoding, self.symbols())
        return cirq.Circuit(operations(flatten(reduce_steps(steps)), cirq.LineQubit.range(n)))

    def parameter_symbols(self, encoding: Any, circuit: cirq.AbstractCircuit) -> tuple[sympy.Symbol, ...]:
        """In the order of the strings (the order of application)."""
        return self.symbols()

    def state_program(self, encoding: Any, circuit: cirq.AbstractCircuit, symbols: tuple[sympy.Symbol, ...]
                      ) -> RotationProgram:
        """The exact vector route of :class:`RotationProgram` (the same state as the circuit's gates)."""
        return RotationProgram([pauli_term(s) for s in self.strings], encoding.reference_bits, encoding.n_qubits)
