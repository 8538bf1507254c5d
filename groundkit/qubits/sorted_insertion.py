"""Partition the Pauli strings of a qubit operator into groups measured together, deterministically.

Order of terms (documented, independent of the process): by descending |coefficient| rounded to 1e-12 Ha, ties by
the Pauli string itself (OpenFermion term tuples ``((qubit, 'X'|'Y'|'Z'), ...)`` compared as tuples). Dict and set
iteration orders, which change with ``PYTHONHASHSEED`` for strings, never decide anything.

Sorted insertion (Crawford, van Straaten, Wang, Parks, Campbell, Brierley, Quantum 5, 385 (2021)): each term, in
that order, joins the first existing group all of whose members it is compatible with, else opens a new group.
Compatible means qubit-wise commuting (on every qubit the same Pauli or an identity) or commuting (an even number
of qubits where both act with different Paulis). The identity term is left out: it needs no measurement.
"""

from __future__ import annotations

import numpy as np
from openfermion import QubitOperator

COMPATIBILITIES = ("qubitwise", "commuting")


def term_key(term: tuple) -> tuple:
    """The tie-breaking key of a Pauli string: the term tuple itself (qubit indices, then 'X' < 'Y' < 'Z')."""
    return tuple(term)


def ordered_terms(operator: QubitOperator, by_magnitude: bool = True) -> list[tuple]:
    """Non-identity terms by descending |coefficient| (rounded to 1e-12), ties by :func:`term_key`; with
    ``by_magnitude=False`` by :func:`term_key` alone."""
    terms = [t for t in operator.terms if t]
    if not by_magnitude:
        return sorted(terms, key=term_key)
    return sorted(terms, key=lambda t: (-round(abs(complex(operator.terms[t])), 12), term_key(t)))


def masks(term: tuple) -> tuple[int, int]:
    """X and Z bit masks of a Pauli string (bit q for qubit q; Y sets both)."""
    x = z = 0
    for q, op in term:
        if op in "XY":
            x |= 1 << q
        if op in "YZ":
            z |= 1 << q
    return x, z


def clashes(compatibility: str, xs: np.ndarray, zs: np.ndarray, x: int, z: int) -> np.ndarray:
    """For Pauli strings with X/Z masks ``xs``, ``zs`` (int64 arrays, :func:`masks`), True where a string is not
    compatible (``"qubitwise"`` or ``"commuting"``) with the string of masks ``x``, ``z``."""
    if compatibility == "qubitwise":
        overlap = (xs | zs) & (x | z)
        return (((xs ^ x) | (zs ^ z)) & overlap) != 0
    return (np.bitwise_count((xs & z) ^ (zs & x)) & 1) == 1


def sorted_insertion(operator: QubitOperator, compatibility: str = "qubitwise",
                     by_magnitude: bool = True) -> list[list[tuple]]:
    """Groups of terms (each in insertion order) by first fit over :func:`ordered_terms`."""
    if compatibility not in COMPATIBILITIES:
        raise ValueError(f"unknown compatibility {compatibility!r}; accepted: {', '.join(COMPATIBILITIES)}")
    terms = ordered_terms(operator, by_magnitude)
    n = len(terms)
    xs = np.zeros(n, dtype=np.int64)
    zs = np.zeros(n, dtype=np.int64)
    owner = np.full(n, -1, dtype=np.int64)
    groups: list[list[tuple]] = []
    for k, term in enumerate(terms):
        x, z = masks(term)
        if groups:
            clash = clashes(compatibility, xs[:k], zs[:k], x, z)
            blocked = np.bincount(owner[:k][clash], minlength=len(groups))
            free = np.flatnonzero(blocked == 0)
            chosen = int(free[0]) if free.size else -1
        else:
            chosen = -1
        if chosen < 0:
            chosen = len(groups)
            groups.append([])
        groups[chosen].append(term)
        xs[k], zs[k], owner[k] = x, z, chosen
    return groups
