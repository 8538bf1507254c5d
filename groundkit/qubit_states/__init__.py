"""Qubit-level trial states: parametrised circuits acting on the qubit register directly."""

from .base import QubitTrialState
from .custom import CircuitTrialState
from .hardware_efficient import HardwareEfficient
from .objective import QubitObjective
from .pauli_rotations import PauliRotations, pauli_label, pauli_term

__all__ = ["CircuitTrialState", "HardwareEfficient", "PauliRotations", "QubitObjective", "QubitTrialState",
           "pauli_label", "pauli_term"]
