"""Circuits: Pauli-string exponentials, exact circuits of fermionic trial states, gate counts, OpenQASM."""

from .fermionic import fermionic_circuit, generator_terms
from .pauli_exponential import pauli_string_exponential
from .qasm import circuit_from_openqasm, openqasm_text
from .resources import circuit_resources
from .simplify import cancel_inverse_pairs
from .trial import state_of, trial_circuit, with_all_qubits

__all__ = ["cancel_inverse_pairs", "circuit_from_openqasm", "circuit_resources", "fermionic_circuit",
           "generator_terms", "openqasm_text", "pauli_string_exponential", "state_of", "trial_circuit",
           "with_all_qubits"]
