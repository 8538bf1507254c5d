"""Quantum cost of a grown operator sequence: the one place that asks the qubit layer for circuit figures.

Gate counts come from the same route as every fixed trial state's resources (``groundkit.resources``): the
pipeline's circuit of the sequence, compiled under its mapping, counted by ``groundkit.circuits``'
``circuit_resources``. Until that compiler lands, :func:`gate_counter` returns None and every count stays None
("not known", never a guess).
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from typing import Any

import numpy as np

from groundkit.adaptive.records import Operator, trial_state_of

GateCounter = Callable[[Sequence[Operator], np.ndarray], "int | None"]
"""(operator sequence, parameters in radians) -> two-qubit gates of the circuit preparing that state."""


def gate_counter(pipeline: Any) -> GateCounter | None:
    """A counter of two-qubit gates for sequences grown on ``pipeline``, or None while no circuit compiler exists."""
    try:
        from groundkit.circuits import circuit_resources
    except ImportError:
        return None

    def count(sequence: Sequence[Operator], parameters: np.ndarray) -> int | None:
        trial_state = trial_state_of(sequence)  # ExcitationList, or PauliRotations for a qubit pool
        # logical counts (no routing inside the growth loop; routed counts come with the result's resources)
        circuit = pipeline.trial_state(trial_state).device(None).circuit(np.asarray(parameters, dtype=float))
        value = circuit_resources(circuit).get("two_qubit_gates")
        return None if value is None else int(value)

    return count
