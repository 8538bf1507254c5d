"""Adaptive trial states: grow the operator sequence one pool operator at a time (see ``docs/adaptive.md``)."""

from groundkit.adaptive.component import Adaptive
from groundkit.adaptive.costs import GateCounter, gate_counter
from groundkit.adaptive.engine import DeterminantPoolEngine, pool_gradients
from groundkit.adaptive.growth import Growth, grow
from groundkit.adaptive.pools import (
    ExcitationPool,
    GeneralisedPool,
    OperatorPool,
    SinglesDoublesPool,
    as_pool,
    generalised_doubles,
)
from groundkit.adaptive.qubit_pool import PauliPoolEngine, PauliStringPool, QubitPool, generator_strings
from groundkit.adaptive.records import GrowthStep, grown_sequence, grown_trial_state, growth_steps, growth_table
from groundkit.adaptive.runner import run_adaptive

__all__ = [
    "Adaptive",
    "DeterminantPoolEngine",
    "ExcitationPool",
    "GateCounter",
    "GeneralisedPool",
    "Growth",
    "GrowthStep",
    "OperatorPool",
    "PauliPoolEngine",
    "PauliStringPool",
    "QubitPool",
    "SinglesDoublesPool",
    "as_pool",
    "gate_counter",
    "generalised_doubles",
    "generator_strings",
    "grow",
    "grown_sequence",
    "grown_trial_state",
    "growth_steps",
    "growth_table",
    "pool_gradients",
    "run_adaptive",
]
