"""CNOT networks of linear encodings: |n⟩ → |M·n mod 2⟩ for an invertible 0/1 matrix M.

Under a linear encoding (parity, Bravyi–Kitaev, a user's binary matrix) the image of any fermion operator is the
Jordan–Wigner image conjugated by this permutation of basis states (both send the Fock state |n⟩ to a basis state
with phase +1, see ``groundkit.qubits.transforms``). A trial state's circuit can therefore be compiled in the
Jordan–Wigner frame and followed by one network, instead of compiling every excitation under the encoding.

The network is found by row reduction over GF(2): a CNOT(c→t) adds row c to row t. Rows are first reduced greedily
(the addition that removes the most ones), which gives n−1 CNOTs for the parity encoding, and any remainder by
Gaussian elimination.
"""

from __future__ import annotations

import numpy as np

from ..errors import ComponentError


def _greedy(rows: list[int], ops: list[tuple[int, int]]) -> None:
    n = len(rows)
    while True:
        best, pick = 0, None
        for t in range(n):
            weight = bin(rows[t]).count("1")
            if weight == 1:
                continue
            for c in range(n):
                if c != t:
                    gain = weight - bin(rows[t] ^ rows[c]).count("1")
                    if gain > best:
                        best, pick = gain, (c, t)
        if pick is None:
            return
        c, t = pick
        rows[t] ^= rows[c]
        ops.append(pick)


def _eliminate(rows: list[int], ops: list[tuple[int, int]]) -> None:
    n = len(rows)
    for j in range(n):
        bit = 1 << j
        if not rows[j] & bit:
            pivot = next((p for p in range(j + 1, n) if rows[p] & bit), None)
            if pivot is None:
                raise ComponentError("the encoding's matrix is singular over GF(2); it has no CNOT network")
            rows[j] ^= rows[pivot]
            ops.append((pivot, j))
        for i in range(n):
            if i != j and rows[i] & bit:
                rows[i] ^= rows[j]
                ops.append((j, i))


def encoding_network(matrix: np.ndarray) -> list[tuple[int, int]]:
    """CNOTs ``(control, target)`` in time order taking |n⟩ to |M·n mod 2⟩ (qubit k = bit k of the vectors)."""
    m = np.asarray(matrix, dtype=np.int64) % 2
    n = m.shape[0]
    rows = [int(sum(int(m[i, j]) << j for j in range(n))) for i in range(n)]
    ops: list[tuple[int, int]] = []
    _greedy(rows, ops)
    _eliminate(rows, ops)
    if rows != [1 << i for i in range(n)]:
        raise ComponentError("row reduction of the encoding's matrix did not reach the identity")
    # the additions reduce M to I: E_k…E_1·M = I, so M = E_1…E_k and E_k acts first on |n⟩
    return ops[::-1]
