"""Occupation strings of one spin, determinant labels and the sign between orderings.

A string is an integer whose bit ``i`` is set when spatial orbital ``i`` holds an electron of that spin. Strings
come in ascending integer order, the order PySCF's ``cistring.make_strings`` uses, so a CI vector ``ci[ia, ib]``
here and in PySCF's FCI code index the same determinants.

Sign conventions. PySCF's determinant ``|Ia, Ib>`` is ``A+ B+ |vac>`` with all alpha creators (descending orbital
index) to the left of all beta creators (descending). OpenFermion's basis state ``|n0 n1 ...>`` is
``(a+_0)^n0 (a+_1)^n1 ... |vac>`` over interleaved spin orbitals (2i = alpha i, 2i+1 = beta i). The two differ by
:func:`interleaved_signs`, one sign per determinant.
"""

from __future__ import annotations

from itertools import combinations

import numpy as np


def make_strings(n_orbitals: int, n_electrons: int) -> np.ndarray:
    """All strings with ``n_electrons`` bits set among ``n_orbitals``, ascending (int64 array)."""
    if n_electrons < 0 or n_electrons > n_orbitals:
        return np.zeros(0, dtype=np.int64)
    values = [sum(1 << i for i in occ) for occ in combinations(range(n_orbitals), n_electrons)]
    return np.array(sorted(values), dtype=np.int64)


def occupied(string: int) -> list[int]:
    """Orbital indices set in ``string``, ascending."""
    return [i for i in range(int(string).bit_length()) if string >> i & 1]


def popcount(values: np.ndarray) -> np.ndarray:
    """Number of set bits of each entry of an int64 array."""
    values = np.asarray(values, dtype=np.int64)
    count = np.zeros(values.shape, dtype=np.int64)
    v = values.copy()
    while np.any(v):
        count += v & 1
        v >>= 1
    return count


def determinant_label(alpha: int, beta: int, n_orbitals: int) -> str:
    """Occupation string per spatial orbital: '2' both spins, 'a' alpha only, 'b' beta only, '0' empty."""
    chars = []
    for i in range(n_orbitals):
        a, b = alpha >> i & 1, beta >> i & 1
        chars.append("2" if a and b else "a" if a else "b" if b else "0")
    return "".join(chars)


def interleaved_signs(alpha_strings: np.ndarray, beta_strings: np.ndarray) -> np.ndarray:
    """Sign s[ia, ib] with ``ci_interleaved = s * ci_pyscf`` (see module docstring).

    The sign is (-1)^(na(na-1)/2 + nb(nb-1)/2) from reversing each block, times (-1)^k where k counts pairs
    (alpha in orbital i, beta in orbital j) with j < i, the transpositions that interleave the two blocks.
    """
    alpha_strings = np.asarray(alpha_strings, dtype=np.int64)
    beta_strings = np.asarray(beta_strings, dtype=np.int64)
    n_alpha = int(popcount(alpha_strings[:1])[0]) if alpha_strings.size else 0
    n_beta = int(popcount(beta_strings[:1])[0]) if beta_strings.size else 0
    pairs = np.zeros((alpha_strings.size, beta_strings.size), dtype=np.int64)
    width = int(max(alpha_strings.max(initial=0), beta_strings.max(initial=0))).bit_length()
    for i in range(width):
        alpha_has_i = (alpha_strings >> i) & 1
        beta_below_i = popcount(beta_strings & ((1 << i) - 1))
        pairs += np.outer(alpha_has_i, beta_below_i)
    constant = (n_alpha * (n_alpha - 1) // 2 + n_beta * (n_beta - 1) // 2) % 2
    return np.where((pairs + constant) % 2 == 0, 1.0, -1.0)


def interleaved_index(alpha: int, beta: int, n_orbitals: int) -> int:
    """Index of the determinant in the 2^(2n) Jordan-Wigner basis (qubit 0 is the most significant bit)."""
    n_qubits = 2 * n_orbitals
    index = 0
    for i in range(n_orbitals):
        if alpha >> i & 1:
            index |= 1 << (n_qubits - 1 - 2 * i)
        if beta >> i & 1:
            index |= 1 << (n_qubits - 2 - 2 * i)
    return index
