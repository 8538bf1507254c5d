"""Tapering: remove the qubits fixed by Z-type Z2 symmetries of a qubit Hamiltonian.

A Z string S commutes with every term of H exactly when each term has an even number of X or Y factors on S's
qubits, so the symmetries are the null space over GF(2) of the terms' X-part matrix. The generators are brought to
reduced row echelon form: generator k has a pivot qubit q_k that no other generator touches. The Clifford
U_k = (X_{q_k} + S_k)/sqrt(2) maps S_k to X_{q_k} and leaves every other generator alone, so H' = U H U has only I
or X on the pivots; in the sector with S_k = s_k each X_{q_k} becomes s_k and the pivot qubits drop out
(Bravyi, Gambetta, Mezzacapo, Temme, arXiv:1701.08213 (2017)).

A computational basis state |b> of that sector maps to the basis state of its non-pivot bits, with phase
prod_k (s_k if b[q_k] == 0 else 1).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from openfermion import QubitOperator

from ..errors import SymmetryError
from .gf2 import null_space, row_echelon

_PRODUCT = {("X", "Y"): (1j, "Z"), ("Y", "X"): (-1j, "Z"), ("Y", "Z"): (1j, "X"), ("Z", "Y"): (-1j, "X"),
            ("Z", "X"): (1j, "Y"), ("X", "Z"): (-1j, "Y")}


def _multiply(a: tuple, b: tuple) -> tuple[complex, tuple]:
    """Product of two Pauli strings (sorted tuples of (qubit, op)): (phase, string)."""
    ops = dict(a)
    phase: complex = 1.0
    for q, op in b:
        if q not in ops:
            ops[q] = op
        elif ops[q] == op:
            del ops[q]
        else:
            factor, ops[q] = _PRODUCT[(ops[q], op)]
            phase *= factor
    return phase, tuple(sorted(ops.items()))


def x_part_matrix(operator: QubitOperator, n_qubits: int) -> np.ndarray:
    """Rows: terms; entry 1 where the term has X or Y on that qubit."""
    terms = [t for t in operator.terms if t]
    matrix = np.zeros((len(terms), n_qubits), dtype=np.uint8)
    for row, term in enumerate(terms):
        for q, op in term:
            if op in "XY":
                matrix[row, q] = 1
    return matrix


def z2_symmetries(operator: QubitOperator, n_qubits: int) -> np.ndarray:
    """Independent Z-string symmetries (rows of 0/1 masks) in reduced row echelon form."""
    basis = null_space(x_part_matrix(operator, n_qubits))
    if basis.size == 0:
        return np.zeros((0, n_qubits), dtype=np.uint8)
    reduced, _ = row_echelon(basis)
    return reduced


@dataclass(frozen=True)
class Taper:
    """A tapering: symmetry generators (0/1 masks), their pivot qubits and the kept sector's eigenvalues."""

    n_qubits: int
    generators: tuple[tuple[int, ...], ...]
    pivots: tuple[int, ...]
    signs: tuple[int, ...]

    @property
    def kept_qubits(self) -> tuple[int, ...]:
        """Original indices of the qubits that remain, in order (new qubit k = kept_qubits[k])."""
        return tuple(q for q in range(self.n_qubits) if q not in self.pivots)

    @property
    def n_tapered(self) -> int:
        return self.n_qubits - len(self.pivots)

    def stabilizer_labels(self) -> list[str]:
        """Each symmetry as a signed Z string, e.g. '+Z0 Z2 Z4'."""
        out = []
        for mask, s in zip(self.generators, self.signs):
            out.append(("+" if s > 0 else "-") + " ".join(f"Z{q}" for q, bit in enumerate(mask) if bit))
        return out

    def apply(self, operator: QubitOperator) -> QubitOperator:
        """The tapered operator on ``n_tapered`` qubits. It must commute with every generator."""
        terms = dict(operator.terms)
        for mask, pivot in zip(self.generators, self.pivots):
            s_string = tuple((q, "Z") for q, bit in enumerate(mask) if bit)
            new: dict[tuple, complex] = {}
            for term, c in terms.items():
                ops = dict(term)
                if _anticommute(term, s_string):
                    raise SymmetryError(f"operator term {term} breaks the symmetry {s_string}; it cannot be tapered")
                if ops.get(pivot) in ("Y", "Z"):  # anticommutes with X_pivot: U P U = -P X S
                    p1, t1 = _multiply(term, ((pivot, "X"),))
                    p2, t2 = _multiply(t1, s_string)
                    new[t2] = new.get(t2, 0) - c * p1 * p2
                else:
                    new[term] = new.get(term, 0) + c
            terms = new
        position = {q: k for k, q in enumerate(self.kept_qubits)}
        sign_of = dict(zip(self.pivots, self.signs))
        out = QubitOperator()
        for term, c in terms.items():
            factor = c
            kept = []
            for q, op in term:
                if q in sign_of:
                    if op != "X":
                        raise SymmetryError(f"tapering left {op} on pivot qubit {q}; the symmetry search is wrong")
                    factor *= sign_of[q]
                else:
                    kept.append((position[q], op))
            out += QubitOperator(tuple(kept), factor)
        out.compress(abs_tol=1e-12)
        return out

    def basis_state(self, bits: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """Tapered bits (rows) and phases for full-register bits (rows) of states in the kept sector."""
        bits = np.atleast_2d(bits)
        phase = np.ones(bits.shape[0])
        for pivot, s in zip(self.pivots, self.signs):
            if s < 0:
                phase = np.where(bits[:, pivot] == 0, -phase, phase)
        return bits[:, list(self.kept_qubits)], phase

    def in_sector(self, bits: np.ndarray) -> np.ndarray:
        """True for each row of bits whose symmetry eigenvalues are the kept sector's."""
        bits = np.atleast_2d(bits).astype(np.int64)
        ok = np.ones(bits.shape[0], dtype=bool)
        for mask, s in zip(self.generators, self.signs):
            parity = (bits @ np.array(mask, dtype=np.int64)) % 2
            ok &= np.where(parity == 0, 1, -1) == s
        return ok


def _anticommute(a: tuple, b: tuple) -> bool:
    ops = dict(a)
    count = sum(1 for q, op in b if q in ops and ops[q] != op)
    return count % 2 == 1


def make_taper(operator: QubitOperator, n_qubits: int, reference_bits: np.ndarray) -> Taper:
    """Find the Z2 symmetries of ``operator`` and fix the sector of the computational state ``reference_bits``."""
    generators = z2_symmetries(operator, n_qubits)
    if generators.shape[0] == 0:
        raise SymmetryError("the qubit Hamiltonian has no Z2 symmetry left to taper; use taper=False")
    if generators.shape[0] >= n_qubits:
        raise SymmetryError(
            f"tapering would remove all {n_qubits} qubits (the problem is fixed by its symmetries); use taper=False"
        )
    pivots = tuple(int(np.flatnonzero(row)[0]) for row in generators)
    ref = np.asarray(reference_bits, dtype=np.int64)
    signs = tuple(1 if int(ref @ row.astype(np.int64)) % 2 == 0 else -1 for row in generators)
    return Taper(n_qubits, tuple(tuple(int(x) for x in row) for row in generators), pivots, signs)
