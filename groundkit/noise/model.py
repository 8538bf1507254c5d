"""DeviceNoise: the noise channels that error figures and gate durations put into a circuit.

Applied moment by moment to a (routed, native) circuit without measurements:

- after every one-qubit gate a one-qubit depolarising channel of probability ``errors.one_qubit``, after every
  two-qubit gate a two-qubit depolarising channel of probability ``errors.two_qubit`` (identity gates carry none);
- when T1 and T2 are set, every qubit of the circuit, idle ones included, relaxes for each moment's duration (the
  longest gate of the moment: ``durations.two_qubit`` if it holds a two-qubit gate, else ``durations.one_qubit``;
  a moment of identities only takes no time) through amplitude and phase damping (:mod:`.relaxation`), inserted
  once per stretch between a qubit's gates;
- each measured bit is read through a per-qubit assignment matrix (:meth:`DeviceNoise.assignment`): symmetric,
  flip probability ``errors.readout`` unless ``readout_by_qubit`` gives one per qubit.

The channels are inserted explicitly (moments of channels between the moments of gates), so the same model
applies to folded circuits for zero-noise extrapolation: each inverse gate errs like its forward gate.
"""

from __future__ import annotations

import functools
from dataclasses import dataclass, field
from typing import Any

import cirq
import numpy as np

from ..device.figures import ErrorFigures, GateDurations
from ..errors import NoiseError
from .relaxation import relaxation_channels


@dataclass(frozen=True)
class DeviceNoise:
    """Noise from ``errors`` (:class:`ErrorFigures`) and ``durations`` (:class:`GateDurations`, ns);
    ``readout_by_qubit`` (optional) gives one symmetric flip probability per measured qubit."""

    errors: ErrorFigures
    durations: GateDurations = field(default_factory=GateDurations)
    readout_by_qubit: tuple[float, ...] | None = None

    def __post_init__(self) -> None:
        if not isinstance(self.errors, ErrorFigures):
            raise NoiseError(f"errors={self.errors!r} must be an ErrorFigures")
        if not isinstance(self.durations, GateDurations):
            raise NoiseError(f"durations={self.durations!r} must be a GateDurations")
        if self.readout_by_qubit is not None:
            for q, p in enumerate(self.readout_by_qubit):
                if not 0.0 <= p <= 0.5:
                    raise NoiseError(f"readout_by_qubit[{q}]={p!r} must be a probability in [0, 0.5]")

    @property
    def noiseless(self) -> bool:
        return self.errors.noiseless and not any(self.readout_by_qubit or ())

    def moment_duration(self, moment: cirq.Moment) -> float:
        """Nanoseconds the moment takes: its longest gate (identity gates take none)."""
        sizes = [cirq.num_qubits(op) for op in moment.operations if not _is_identity(op)]
        if not sizes:
            return 0.0
        return self.durations.two_qubit if max(sizes) >= 2 else self.durations.one_qubit

    def noisy(self, circuit: cirq.AbstractCircuit) -> cirq.Circuit:
        """``circuit`` with the gate and relaxation channels inserted.

        Relaxation over consecutive moments composes exactly (amplitude damping γ_a then γ_b is amplitude damping
        1 − (1−γ_a)(1−γ_b), likewise phase damping, and the two commute), so a qubit's relaxation is accumulated
        over the moments since its last gate and inserted once, before its next gate or at the end: the same
        channel as one insertion per moment, with far fewer operations on wide circuits.
        """
        e = self.errors
        qubits = sorted(circuit.all_qubits())
        pending = dict.fromkeys(qubits, 0.0)  # ns of relaxation not yet inserted
        out = cirq.Circuit()

        def flush(targets: list) -> None:
            channels = []
            for q in targets:
                if pending[q] > 0:
                    channels.extend(relaxation_channels(q, pending[q], e.t1, e.t2))
                pending[q] = 0.0
            if channels:
                out.append(_layers(channels), strategy=cirq.InsertStrategy.NEW_THEN_INLINE)

        for moment in circuit:
            acting = [op for op in moment.operations if not _is_identity(op)]
            if e.t1 is not None:
                flush([q for op in acting for q in op.qubits])
            out.append(moment, strategy=cirq.InsertStrategy.NEW_THEN_INLINE)
            channels: list[cirq.Operation] = []
            for op in acting:
                k = cirq.num_qubits(op)
                if k > 2:
                    raise NoiseError(f"gate {op} acts on {k} qubits; the noise model knows one- and two-qubit "
                                     "gates only (decompose the circuit first)")
                p = e.one_qubit if k == 1 else e.two_qubit
                if p > 0:
                    channels.append(depolarising(p, k).on(*op.qubits))
            if channels:
                out.append(_layers(channels), strategy=cirq.InsertStrategy.NEW_THEN_INLINE)
            if e.t1 is not None:
                t = self.moment_duration(moment)
                for q in qubits:
                    pending[q] += t
        if e.t1 is not None:
            flush(qubits)
        return out

    def readout_probability(self, qubit_index: int) -> float:
        if self.readout_by_qubit is not None:
            if qubit_index >= len(self.readout_by_qubit):
                raise NoiseError(f"readout_by_qubit has {len(self.readout_by_qubit)} values; qubit {qubit_index} "
                                 "has none")
            return float(self.readout_by_qubit[qubit_index])
        return float(self.errors.readout)

    def assignment(self, n_qubits: int) -> list[np.ndarray]:
        """Per measured qubit the 2×2 assignment matrix A[read, true] (columns sum to one)."""
        out = []
        for q in range(n_qubits):
            p = self.readout_probability(q)
            out.append(np.array([[1.0 - p, p], [p, 1.0 - p]]))
        return out

    def describe(self) -> dict[str, Any]:
        """Plain data for results: the figures' records."""
        return {"errors": self.errors.to_dict(), "durations": self.durations.to_dict(),
                "readout_by_qubit": None if self.readout_by_qubit is None else list(self.readout_by_qubit)}


class _Depolarising(cirq.DepolarizingChannel):
    """Cirq's depolarising channel with its mixture computed once per (p, n) (simulators ask for it per
    operation, and building 4^n Pauli matrices each time dominated the translation of long circuits)."""

    _MIXTURES: dict[tuple[float, int], tuple] = {}

    def _mixture_(self) -> tuple:
        key = (self.p, self.num_qubits())
        if key not in self._MIXTURES:
            self._MIXTURES[key] = tuple(super()._mixture_())
        return self._MIXTURES[key]


@functools.lru_cache(maxsize=64)
def depolarising(p: float, n_qubits: int) -> cirq.Gate:
    """The n-qubit depolarising channel of probability ``p`` (Cirq's ``depolarize``, mixture cached)."""
    return _Depolarising(p, n_qubits=n_qubits)


def _is_identity(op: cirq.Operation) -> bool:
    return isinstance(op.gate, cirq.IdentityGate)


def _layers(channels: list[cirq.Operation]) -> list[cirq.Moment]:
    """Channels in as few moments as their qubits allow (relaxation after depolarising on the same qubit)."""
    moments: list[list[cirq.Operation]] = []
    used: list[set] = []
    for op in channels:
        qs = set(op.qubits)
        k = len(moments)
        while k > 0 and not (used[k - 1] & qs):
            k -= 1
        if k == len(moments):
            moments.append([])
            used.append(set())
        moments[k].append(op)
        used[k] |= qs
    return [cirq.Moment(m) for m in moments]
