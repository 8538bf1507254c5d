"""Circuits: compact excitation circuits, Pauli-string exponentials, exact circuits of trial states, Cirq
optimisation, gate counts without building circuits, OpenQASM."""

from .compact import jordan_wigner_excitation, qubit_double, qubit_single
from .counting import trial_resources
from .fermionic import CONSTRUCTIONS, fermionic_circuit, generator_terms
from .optimise import optimise_circuit
from .pauli_exponential import pauli_string_exponential
from .qasm import circuit_from_openqasm, openqasm_text
from .resources import circuit_resources
from .simplify import cancel_inverse_pairs
from .trial import state_of, trial_circuit, with_all_qubits

__all__ = ["CONSTRUCTIONS", "cancel_inverse_pairs", "circuit_from_openqasm", "circuit_resources",
           "fermionic_circuit", "generator_terms", "jordan_wigner_excitation", "openqasm_text", "optimise_circuit",
           "pauli_string_exponential", "qubit_double", "qubit_single", "state_of", "trial_circuit",
           "trial_resources", "with_all_qubits"]
