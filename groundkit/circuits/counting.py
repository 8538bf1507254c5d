"""Gate counts of a trial state's circuit read off its gate list, without building Cirq objects.

The counts are those of ``trial_circuit`` (the optimised Cirq circuit) at parameters where no rotation angle is
a multiple of 2π, which random parameters are with probability one (tests/circuits/test_counting.py compares them
for every trial-state kind and mapping). At special angles (e.g. all zero) Cirq may drop rotations that became the
identity, so the built circuit can be shallower there; its two-qubit count never changes.

- two-qubit gates: the two-qubit steps left after inverse pairs are removed (``simplify.reduce_steps``);
- depth: the longest chain when every run of single-qubit gates counts as one gate (Cirq merges each run into
  one ``PhasedXZGate``) and every gate is placed as early as possible; identity gates on idle qubits are left out.
"""

from __future__ import annotations

from collections.abc import Iterable
from typing import Any

import numpy as np

from .simplify import Item, reduce_steps
from .steps import Step


def item_counts(items: Iterable[Item]) -> dict[str, int]:
    """``{"two_qubit_gates", "depth", "one_qubit_gates"}`` of reduced counting items."""
    level: dict[int, int] = {}
    two = one = depth = 0
    for item in items:
        qubits = item.qubits if isinstance(item, Step) else item[0].qubits
        if isinstance(item, Step) and len(qubits) >= 2:
            two += 1
        else:
            one += 1
        layer = max((level.get(q, 0) for q in qubits), default=0) + 1
        for q in qubits:
            level[q] = layer
        depth = max(depth, layer)
    return {"two_qubit_gates": two, "depth": depth, "one_qubit_gates": one}


def step_counts(steps: Iterable[Step]) -> dict[str, int]:
    """Counts of a raw gate list after the same reduction as the built circuit."""
    return item_counts(reduce_steps(steps))


def trial_resources(source: Any, theta: Any = None, *, construction: str = "compact") -> dict[str, int]:
    """``{"two_qubit_gates": ..., "depth": ...}`` of ``trial_circuit(source, theta, construction=...)`` from the
    trial state's gate list (fermionic trial states and Pauli rotations build no Cirq object; other qubit trial
    states are read from their own circuit)."""
    from ..qubit_states.base import QubitTrialState
    from ..trial_states.base import TrialState
    from .fermionic import checked_construction, fermionic_steps
    from .steps import steps_of_operations
    from .trial import fermionic_parts, qubit_values, source_parts

    checked_construction(construction)
    encoding, trial_state = source_parts(source)
    if isinstance(trial_state, TrialState):
        plan, angles = fermionic_parts(encoding, trial_state, theta)
        steps = fermionic_steps(encoding, plan, angles, construction)
    elif isinstance(trial_state, QubitTrialState):
        import cirq

        steps = None
        if theta is not None:  # a gate list straight from the values, when the trial state gives one
            steps = trial_state.circuit_steps(encoding, np.asarray(theta, dtype=float))
        if steps is None:
            circuit, symbols, values = qubit_values(encoding, trial_state, theta)
            steps = trial_state.circuit_steps(encoding, values)
        if steps is None:
            steps = steps_of_operations(circuit.all_operations(), cirq.LineQubit.range(encoding.n_qubits))
    else:
        from ..errors import ComponentError
        raise ComponentError(f"trial state {trial_state!r} is neither a fermionic TrialState nor a QubitTrialState")
    counts = step_counts(steps)
    return {"two_qubit_gates": counts["two_qubit_gates"], "depth": counts["depth"]}
