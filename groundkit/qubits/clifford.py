"""A Clifford circuit that maps every Pauli string of a commuting set to a signed Z string.

Pauli strings are rows of a symplectic tableau over GF(2): bits ``x[q]``, ``z[q]`` (Y sets both) and a sign bit.
Conjugation P -> U P U† by H, S, CNOT (and CZ = H CNOT H) updates the rows with the rules of Aaronson and
Gottesman, Phys. Rev. A 70, 052328 (2004). The circuit is found by Gaussian elimination on the X block, one
pivot at a time (the construction of Gokhale et al., arXiv:1907.13623, and Yen, Verteletskyi, Izmaylov,
J. Chem. Theory Comput. 16, 2400 (2020), in its simplest sequential form):

1. take the first row with a non-zero X part and its first qubit q with x[q] = 1;
2. clear every other X bit of that row with CNOT(q -> r);
3. clear every Z bit of that row outside q with CZ(q, r);
4. the row is now ±X_q or ±Y_q: S on q turns Y into X, then H on q gives ±Z_q.

Every other row commutes with ±Z_q, so its x[q] is 0, and no later step sets it again (later gates act on other
pivots, and CZ only changes Z bits). After at most n pivots every row is a Z string. The gates are in circuit
order: apply them to the state, then measure every qubit in the Z basis.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

Gate = tuple[str, tuple[int, ...]]  # ("H" | "S" | "CNOT" | "CZ", qubits)


@dataclass
class Tableau:
    """Rows of Pauli strings on ``n`` qubits: x, z (bool, rows x n) and sign (bool: True for a minus sign)."""

    x: np.ndarray
    z: np.ndarray
    sign: np.ndarray

    @classmethod
    def from_terms(cls, terms: list[tuple], n_qubits: int) -> Tableau:
        """Tableau of OpenFermion term tuples ((qubit, 'X'|'Y'|'Z'), ...), all with sign +."""
        x = np.zeros((len(terms), n_qubits), dtype=bool)
        z = np.zeros((len(terms), n_qubits), dtype=bool)
        for row, term in enumerate(terms):
            for q, op in term:
                x[row, q] = op in "XY"
                z[row, q] = op in "YZ"
        return cls(x, z, np.zeros(len(terms), dtype=bool))

    def apply(self, gate: Gate) -> None:
        """Conjugate every row by one gate (P -> U P U†)."""
        name, qubits = gate
        x, z, r = self.x, self.z, self.sign
        if name == "H":
            (a,) = qubits
            r ^= x[:, a] & z[:, a]
            x[:, a], z[:, a] = z[:, a].copy(), x[:, a].copy()
        elif name == "S":
            (a,) = qubits
            r ^= x[:, a] & z[:, a]
            z[:, a] ^= x[:, a]
        elif name == "CNOT":
            a, b = qubits
            r ^= x[:, a] & z[:, b] & ~(x[:, b] ^ z[:, a])
            x[:, b] ^= x[:, a]
            z[:, a] ^= z[:, b]
        elif name == "CZ":
            a, b = qubits
            for step in (("H", (b,)), ("CNOT", (a, b)), ("H", (b,))):
                self.apply(step)
        else:
            raise ValueError(f"unknown Clifford gate {name!r}; accepted: H, S, CNOT, CZ")


def diagonalising_gates(terms: list[tuple], n_qubits: int) -> tuple[list[Gate], np.ndarray, np.ndarray]:
    """(gates, z masks, signs) for mutually commuting Pauli strings ``terms``.

    After the gates, term t equals ``signs[t]`` times the Z string on the qubits where ``z_masks[t]`` (bool rows)
    is set. ValueError when two terms anticommute.
    """
    tableau = Tableau.from_terms(terms, n_qubits)
    _check_commuting(tableau, terms)
    gates: list[Gate] = []

    def emit(gate: Gate) -> None:
        gates.append(gate)
        tableau.apply(gate)

    while True:
        rows = np.flatnonzero(tableau.x.any(axis=1))
        if rows.size == 0:
            break
        row = int(rows[0])
        q = int(np.flatnonzero(tableau.x[row])[0])
        for r in np.flatnonzero(tableau.x[row]):
            if r != q:
                emit(("CNOT", (q, int(r))))
        for r in np.flatnonzero(tableau.z[row]):
            if r != q:
                emit(("CZ", (q, int(r))))
        if tableau.z[row, q]:
            emit(("S", (q,)))
        emit(("H", (q,)))
    return gates, tableau.z.copy(), np.where(tableau.sign, -1.0, 1.0)


def _check_commuting(tableau: Tableau, terms: list[tuple]) -> None:
    x, z = tableau.x.astype(np.int64), tableau.z.astype(np.int64)
    odd = (x @ z.T + z @ x.T) % 2
    if np.any(odd):
        i, j = (int(v) for v in np.argwhere(odd)[0])
        raise ValueError(f"Pauli strings {terms[i]} and {terms[j]} anticommute; they cannot be measured together")
