"""HardwareEfficient: layers of single-qubit rotations and entangling gates on the qubit register.

The trade's hardware-efficient form (Kandala, Mezzacapo, Temme, Takita, Brink, Chow, Gambetta, Nature 549, 242
(2017)): a rotation layer on every qubit, then ``layers`` times an entangler followed by another rotation layer.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import cirq
import numpy as np
import sympy

from ..constraints import Bool, Integer, Interval, ListOf, OneOf, Seed
from ..registry import register
from .base import QubitTrialState

ROTATIONS = {"rx": cirq.rx, "ry": cirq.ry, "rz": cirq.rz}
ENTANGLERS = ("cz", "cnot")
STARTS = ("reference", "zeros")


@register("trial_state", "hardware-efficient", label="hardware-efficient")
@dataclass(frozen=True, kw_only=True)
class HardwareEfficient(QubitTrialState):
    """``HardwareEfficient(layers=2, rotations=("ry", "rz"), entangler="cnot", ring=False, init="reference")``.

    - ``layers``: number of entangler + rotation layers after the first rotation layer;
    - ``rotations``: the rotations on each qubit in every rotation layer, from "rx", "ry", "rz", applied in order;
    - ``entangler``: "cz" or "cnot", a ladder on neighbouring qubits (k, k+1); ``ring=True`` closes it with
      (n−1, 0) when there are more than two qubits;
    - ``init``: the basis state the circuit starts from: "reference" (X gates on the Hartree–Fock determinant's
      image) or "zeros" (|0…0⟩);
    - ``jitter`` and ``seed``: initial parameters are ``jitter`` times standard normal numbers from ``seed``
      (radians). At zero angles a CZ ladder leaves the starting basis state alone (a stationary point when it is
      the reference); a CNOT ladder permutes it.

    Parameters: n_qubits · len(rotations) · (layers + 1); two-qubit gates: layers · (n_qubits − 1), or n_qubits per
    layer for a ring.
    """

    layers: int = 2
    rotations: tuple[str, ...] = ("ry", "rz")
    entangler: str = "cnot"
    ring: bool = False
    init: str = "reference"
    jitter: float = 0.1
    seed: int = 0

    constraints = {
        "layers": Integer(0, 64),
        "rotations": ListOf(OneOf(*ROTATIONS), min_length=1, single=True),
        "entangler": OneOf(*ENTANGLERS),
        "ring": Bool(),
        "init": OneOf(*STARTS),
        "jitter": Interval(float, 0.0, None, unit="radians"),
        "seed": Seed(optional=False),
    }

    def _pairs(self, n: int) -> list[tuple[int, int]]:
        pairs = [(k, k + 1) for k in range(n - 1)]
        if self.ring and n > 2:
            pairs.append((n - 1, 0))
        return pairs

    def parametrised_circuit(self, encoding: Any) -> cirq.Circuit:
        n = int(encoding.n_qubits)
        qubits = cirq.LineQubit.range(n)
        circuit = cirq.Circuit()
        if self.init == "reference":
            circuit.append(cirq.X(qubits[q]) for q, bit in enumerate(encoding.reference_bits) if bit)
        two_qubit = cirq.CZ if self.entangler == "cz" else cirq.CNOT
        for layer in range(self.layers + 1):
            if layer:
                circuit.append(two_qubit(qubits[a], qubits[b]) for a, b in self._pairs(n))
            for q in range(n):
                for name in self.rotations:
                    circuit.append(ROTATIONS[name](sympy.Symbol(f"L{layer}_q{q}_{name}"))(qubits[q]))
        return circuit

    def parameter_symbols(self, encoding: Any, circuit: cirq.AbstractCircuit) -> tuple[sympy.Symbol, ...]:
        """Layer by layer, qubit by qubit, rotation by rotation (the order of application)."""
        n = int(encoding.n_qubits)
        return tuple(sympy.Symbol(f"L{layer}_q{q}_{name}") for layer in range(self.layers + 1)
                     for q in range(n) for name in self.rotations)

    def initial_parameters(self, encoding: Any, n_parameters: int) -> np.ndarray:
        return float(self.jitter) * np.random.default_rng(self.seed).standard_normal(n_parameters)
