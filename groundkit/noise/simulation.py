"""Simulating a noisy circuit: Cirq's density matrix, or Monte Carlo trajectories on statevectors.

Trajectories (quantum jumps): each run of the statevector simulator draws one Kraus operator per channel with its
Born probability, so the average of |ψ_k⟩⟨ψ_k| over runs tends to the density matrix (Dalibard, Castin and Mølmer,
Phys. Rev. Lett. 68, 580 (1992); Plenio and Knight, Rev. Mod. Phys. 70, 101 (1998)). ``backend='qsim'`` uses
qsimcirq's trajectory simulator, ``'cirq'`` Cirq's own statevector simulator.

Both return states on the logical qubits ``qubits`` (in that order); any other qubit of the circuit (a routing
ancilla) is traced out of the density matrix, and kept as trailing axes of the statevectors.
"""

from __future__ import annotations

from collections.abc import Sequence

import cirq
import numpy as np

from ..errors import NoiseError

BACKENDS = ("cirq", "qsim")


def density_matrix(circuit: cirq.Circuit, qubits: Sequence[cirq.Qid]) -> np.ndarray:
    """Final density matrix (2^n × 2^n) on ``qubits`` from |0…0⟩, the circuit's other qubits traced out.

    Each operation's matrices come from Cirq (``cirq.unitary``, ``cirq.kraus``, cached per gate) and are applied
    to the density-matrix tensor with NumPy as one superoperator Σ K ⊗ K* per operation; this gives the result
    of Cirq's ``DensityMatrixSimulator`` (a test compares them) many times faster on long noisy circuits.
    """
    extra = sorted(circuit.all_qubits() - set(qubits))
    order = list(qubits) + extra
    index = {q: k for k, q in enumerate(order)}
    total = len(order)
    rho = np.zeros((2,) * (2 * total), dtype=np.complex128)
    rho[(0,) * (2 * total)] = 1.0
    cache: dict = {}
    for op in circuit.all_operations():
        if isinstance(op.gate, cirq.IdentityGate):
            continue
        rho = _apply_channel(rho, _operators(op, cache), [index[q] for q in op.qubits], total)
    rho = rho.reshape(2 ** total, 2 ** total)
    if extra:
        n, m = len(qubits), len(extra)
        rho = np.einsum("iaja->ij", rho.reshape(2 ** n, 2 ** m, 2 ** n, 2 ** m))
    return rho


def _operators(op: cirq.Operation, cache: dict) -> np.ndarray:
    """The operation's superoperator S = Σ_K K ⊗ K* as a tensor of shape (2,)*4k (out, out*, in, in*)."""
    key = op.gate if op.gate is not None else op
    try:
        found = cache.get(key)
    except TypeError:  # an unhashable gate
        found, key = None, None
    if found is None:
        k = cirq.num_qubits(op)
        if cirq.has_unitary(op):
            matrices = [np.asarray(cirq.unitary(op), dtype=np.complex128)]
        else:
            matrices = [np.asarray(m, dtype=np.complex128) for m in cirq.kraus(op)]
        found = sum(np.kron(m, m.conj()) for m in matrices).reshape((2,) * (4 * k))
        if key is not None:
            cache[key] = found
    return found


def _apply_channel(rho: np.ndarray, superoperator: np.ndarray, axes: list[int], total: int) -> np.ndarray:
    k = len(axes)
    targets = axes + [total + a for a in axes]
    out = np.tensordot(superoperator, rho, axes=(list(range(2 * k, 4 * k)), targets))
    return np.moveaxis(out, list(range(2 * k)), targets)


def statevector_runs(circuit: cirq.Circuit, qubits: Sequence[cirq.Qid], count: int, seed: int,
                     backend: str = "cirq") -> list[np.ndarray]:
    """``count`` trajectories: final statevectors of shape (2^n, 2^m) (m routing ancillas, often 0)."""
    if backend not in BACKENDS:
        raise NoiseError(f"unknown trajectory backend {backend!r}; accepted: {', '.join(BACKENDS)}")
    extra = sorted(circuit.all_qubits() - set(qubits))
    order = list(qubits) + extra
    n, m = len(qubits), len(extra)
    seed = int(seed) % (2 ** 31)
    if backend == "qsim":
        import qsimcirq

        simulator = qsimcirq.QSimSimulator(qsimcirq.QSimOptions(cpu_threads=2), seed=seed,
                                           circuit_memoization_size=1)
    else:
        simulator = cirq.Simulator(dtype=np.complex128, seed=seed)
    out = []
    for _ in range(count):
        state = np.asarray(simulator.simulate(circuit, qubit_order=order).final_state_vector, dtype=np.complex128)
        out.append(_normalised(state).reshape(2 ** n, 2 ** m))
    return out


def qsim_available() -> bool:
    try:
        import qsimcirq  # noqa: F401
    except ImportError:
        return False
    return True


def _normalised(state: np.ndarray) -> np.ndarray:
    norm = np.linalg.norm(state)
    return state / norm
