"""Quantum cost of a grown operator sequence: the one place that asks the qubit layer for circuit figures.

Gate counts come from the same route as every fixed trial state's resources (``groundkit.resources``): the
gate list of the sequence's circuit, compiled under the pipeline's mapping, counted by
``groundkit.circuits.counting.trial_resources`` (equal to the built Cirq circuit's counts). Without the
circuit layer, :func:`gate_counter` returns None and every count stays None ("not known", never a guess).
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
        from groundkit.circuits.counting import trial_resources
    except ImportError:
        return None

    def count(sequence: Sequence[Operator], parameters: np.ndarray) -> int | None:
        trial_state = trial_state_of(sequence)  # ExcitationList, or PauliRotations for a qubit pool
        value = trial_resources(pipeline.trial_state(trial_state), np.asarray(parameters, dtype=float)).get(
            "two_qubit_gates")
        return None if value is None else int(value)

    return count
