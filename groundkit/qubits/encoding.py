"""QubitEncoding: a problem under one mapping (optionally tapered), the bridge from determinants to qubits.

It holds the qubit Hamiltonian, encodes any fermion operator the same way (mapping, then tapering), and embeds
determinant-space CI vectors into the 2^n computational basis so that <psi|H_qubit|psi> equals the engine's energy.
Qubit k is index k of the qubit Hamiltonian; qubit 0 is the most significant bit of a basis-state index.
"""

from __future__ import annotations

import warnings
from functools import cached_property
from typing import Any

import numpy as np
from openfermion import FermionOperator, QubitOperator, get_sparse_operator

from ..errors import SizeLimitError
from ..mapping import QubitMapping
from ..sector.strings import interleaved_signs, make_strings
from ..workspace import workspace
from .tapering import Taper, make_taper
from .transforms import basis_matrix, fermion_to_qubit, hamiltonian_image

QUBIT_STATE_LIMIT = 22  # qubit-level statevectors (2^n amplitudes) only up to this many qubits


class SectorWarning(UserWarning):
    """The exact ground state has weight outside the tapered sector of the reference determinant."""


class QubitEncoding:
    """A problem's Hamiltonian and states under a :class:`~groundkit.mapping.QubitMapping`."""

    def __init__(self, problem: Any, mapping: QubitMapping) -> None:
        self.problem = problem
        self.mapping = mapping
        self.n_modes = 2 * int(problem.n_orbitals)
        self.matrix = basis_matrix(mapping, self.n_modes)
        self._untapered = hamiltonian_image(problem, mapping, self.n_modes)
        self._untapered.compress(abs_tol=1e-12)
        self.taper: Taper | None = None
        if mapping.taper:
            self.taper = make_taper(self._untapered, self.n_modes, self.reference_bits_full)
            self.hamiltonian = _real(self.taper.apply(self._untapered))
        else:
            self.hamiltonian = _real(self._untapered)
        self.n_qubits = self.taper.n_tapered if self.taper else self.n_modes

    # determinants to computational basis states ------------------------------------------------------------
    def occupations(self, alpha: np.ndarray, beta: np.ndarray) -> np.ndarray:
        """Interleaved spin-orbital occupations (rows) of determinants given by alpha and beta strings."""
        n = self.problem.n_orbitals
        occ = np.zeros((alpha.size, self.n_modes), dtype=np.uint8)
        for i in range(n):
            occ[:, 2 * i] = (alpha >> i) & 1
            occ[:, 2 * i + 1] = (beta >> i) & 1
        return occ

    def full_bits(self, occupations: np.ndarray) -> np.ndarray:
        """Untapered qubit bits b = M n (mod 2) for occupation rows."""
        return (occupations.astype(np.int64) @ self.matrix.T.astype(np.int64)) % 2

    @property
    def reference_bits_full(self) -> np.ndarray:
        """Untapered bits of the Hartree–Fock determinant (lowest orbitals filled)."""
        p = self.problem
        alpha = np.array([(1 << p.n_alpha) - 1], dtype=np.int64)
        beta = np.array([(1 << p.n_beta) - 1], dtype=np.int64)
        return self.full_bits(self.occupations(alpha, beta))[0]

    def basis_states(self, alpha: np.ndarray, beta: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """(basis index, phase, in-sector flag) of each determinant (alpha[k], beta[k])."""
        bits = self.full_bits(self.occupations(np.asarray(alpha), np.asarray(beta)))
        if self.taper is None:
            kept, phase, inside = bits, np.ones(bits.shape[0]), np.ones(bits.shape[0], dtype=bool)
        else:
            inside = self.taper.in_sector(bits)
            kept, phase = self.taper.basis_state(bits)
        weights = 1 << np.arange(self.n_qubits - 1, -1, -1, dtype=np.int64)
        return kept.astype(np.int64) @ weights, phase, inside

    @property
    def reference_bits(self) -> tuple[int, ...]:
        """Bits of the Hartree–Fock determinant's image on the (tapered) register, qubit 0 first."""
        index = int(self.basis_states(*self._hf_strings())[0][0])
        return tuple((index >> (self.n_qubits - 1 - q)) & 1 for q in range(self.n_qubits))

    def _hf_strings(self) -> tuple[np.ndarray, np.ndarray]:
        p = self.problem
        return np.array([(1 << p.n_alpha) - 1]), np.array([(1 << p.n_beta) - 1])

    def embed(self, ci: np.ndarray) -> np.ndarray:
        """Statevector (length 2^n_qubits) of a PySCF-ordered CI array; weight outside the sector is dropped
        (see :meth:`conserves_symmetry` for trial states that stay inside it)."""
        if self.n_qubits > QUBIT_STATE_LIMIT:
            raise SizeLimitError(
                f"a statevector on {self.n_qubits} qubits is above the limit of {QUBIT_STATE_LIMIT} qubits"
            )
        alpha, beta = self._sector_strings
        index, phase, inside = self._sector_states
        signed = (np.asarray(ci) * interleaved_signs(alpha, beta)).ravel()
        vector = np.zeros(2 ** self.n_qubits, dtype=complex)
        np.add.at(vector, index[inside], (signed * phase)[inside])
        return vector

    @cached_property
    def _sector_strings(self) -> tuple[np.ndarray, np.ndarray]:
        p = self.problem
        return make_strings(p.n_orbitals, p.n_alpha), make_strings(p.n_orbitals, p.n_beta)

    @cached_property
    def _sector_states(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        alpha, beta = self._sector_strings
        aa, bb = np.meshgrid(alpha, beta, indexing="ij")
        return self.basis_states(aa.ravel(), bb.ravel())

    def conserves_symmetry(self, excitation: Any) -> bool:
        """True when the excitation keeps every determinant inside the tapered sector (always when untapered).

        An excitation flips the occupations of its spin orbitals; under the linear encoding that flips bits
        M·delta, and a Z symmetry keeps its eigenvalue exactly when it covers an even number of flipped bits.
        """
        if self.taper is None:
            return True
        delta = np.zeros(self.n_modes, dtype=np.int64)
        for k in tuple(excitation.creators) + tuple(excitation.annihilators):
            delta[k] ^= 1
        flipped = (self.matrix.astype(np.int64) @ delta) % 2
        return all(int(np.dot(mask, flipped)) % 2 == 0 for mask in self.taper.generators)

    # operators ----------------------------------------------------------------------------------------------
    def encode(self, operator: Any) -> QubitOperator:
        """Image of a fermion operator (FermionOperator or InteractionOperator) on this register."""
        image = fermion_to_qubit(operator, self.mapping, self.n_modes)
        image.compress(abs_tol=1e-12)
        return self.taper.apply(image) if self.taper else image

    def sparse_hamiltonian(self):
        """The qubit Hamiltonian as a scipy.sparse matrix (2^n x 2^n)."""
        if self.n_qubits > QUBIT_STATE_LIMIT:
            raise SizeLimitError(
                f"a {self.n_qubits}-qubit sparse Hamiltonian is above the limit of {QUBIT_STATE_LIMIT} qubits"
            )
        return get_sparse_operator(self.hamiltonian, n_qubits=self.n_qubits).tocsr()

    def number_operator(self) -> QubitOperator:
        """Total electron number N on this register."""
        op = FermionOperator()
        for k in range(self.n_modes):
            op += FermionOperator(((k, 1), (k, 0)))
        return self.encode(op)

    def spin_square_operator(self) -> QubitOperator:
        """S^2 on this register (interleaved spin orbitals)."""
        from openfermion import s_squared_operator

        return self.encode(s_squared_operator(self.problem.n_orbitals))

    def reference_weight_in_sector(self) -> float:
        """Weight of the exact ground state inside the kept sector (1 when untapered)."""
        if self.taper is None:
            return 1.0
        ci = self.problem.reference.ci
        _, _, inside = self._sector_states
        return float(np.sum(ci.ravel()[inside] ** 2))

    def describe(self) -> dict[str, Any]:
        """Mapping, qubits before and after tapering, and the kept sector's symmetry eigenvalues."""
        return {
            "mapping": self.mapping.name,
            "tapered": self.taper is not None,
            "qubits_before": self.n_modes,
            "qubits": self.n_qubits,
            "symmetries": self.taper.stabilizer_labels() if self.taper else [],
            "removed_qubits": list(self.taper.pivots) if self.taper else [],
        }

    def __repr__(self) -> str:
        return f"QubitEncoding({self.mapping!r}, {self.n_qubits} qubits, {len(self.hamiltonian.terms)} Pauli terms)"


def _real(operator: QubitOperator) -> QubitOperator:
    """Drop imaginary round-off from a Hermitian operator's coefficients; terms in sorted order (so nothing
    downstream depends on the hash-seeded order in which OpenFermion built them)."""
    out = QubitOperator()
    for term, c in sorted(operator.terms.items(), key=lambda item: item[0]):
        if abs(c.imag) > 1e-8:
            raise ValueError(f"qubit Hamiltonian term {term} has complex coefficient {c}")
        out.terms[term] = float(c.real)
    return out


def encoding_for(problem: Any, mapping: QubitMapping) -> QubitEncoding:
    """The shared QubitEncoding of a problem under a mapping (kept in the workspace); warns if tapering excludes
    the ground state."""
    def build() -> QubitEncoding:
        encoding = QubitEncoding(problem, mapping)
        if encoding.taper is not None:
            weight = encoding.reference_weight_in_sector()
            if weight < 1 - 1e-8:
                warnings.warn(
                    f"the exact ground state has only {weight:.6f} of its weight in the tapered sector of the "
                    "reference determinant; the tapered Hamiltonian's ground state is another symmetry's",
                    SectorWarning, stacklevel=3,
                )
        return encoding

    key = ((problem.molecule, problem.active_space), mapping)
    return workspace().fetch("encoding", key, build, parents=lambda encoding: (encoding.problem,),
                             valid=lambda encoding: encoding.problem is problem, grows=True)
