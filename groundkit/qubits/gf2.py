"""Linear algebra over GF(2) on 0/1 numpy arrays: row echelon form, null space, inverse."""

from __future__ import annotations

import numpy as np


def row_echelon(matrix: np.ndarray) -> tuple[np.ndarray, list[int]]:
    """Reduced row echelon form of a 0/1 matrix and its pivot columns (zero rows dropped)."""
    m = np.array(matrix, dtype=np.uint8) % 2
    rows, cols = m.shape
    pivots: list[int] = []
    r = 0
    for c in range(cols):
        if r == rows:
            break
        hits = np.flatnonzero(m[r:, c]) + r
        if hits.size == 0:
            continue
        m[[r, hits[0]]] = m[[hits[0], r]]
        others = np.flatnonzero(m[:, c])
        others = others[others != r]
        m[others] ^= m[r]
        pivots.append(c)
        r += 1
    return m[:r], pivots


def null_space(matrix: np.ndarray) -> np.ndarray:
    """Basis (rows) of {z : matrix @ z = 0 mod 2}."""
    m = np.atleast_2d(np.array(matrix, dtype=np.uint8))
    cols = m.shape[1]
    reduced, pivots = row_echelon(m) if m.size else (np.zeros((0, cols), np.uint8), [])
    free = [c for c in range(cols) if c not in pivots]
    basis = []
    for f in free:
        z = np.zeros(cols, dtype=np.uint8)
        z[f] = 1
        for row, p in zip(reduced, pivots):
            z[p] = row[f]
        basis.append(z)
    return np.array(basis, dtype=np.uint8).reshape(len(basis), cols)


def inverse(matrix: np.ndarray) -> np.ndarray:
    """Inverse of an invertible square 0/1 matrix over GF(2)."""
    n = matrix.shape[0]
    augmented = np.concatenate([np.array(matrix, dtype=np.uint8) % 2, np.eye(n, dtype=np.uint8)], axis=1)
    reduced, pivots = row_echelon(augmented)
    if pivots[:n] != list(range(n)) or reduced.shape[0] < n:
        raise ValueError("matrix is singular over GF(2)")
    return reduced[:n, n:]
