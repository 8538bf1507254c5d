"""Families of excitations in a fixed, documented order (interleaved spin orbitals, 2i = alpha, 2i+1 = beta).

Conventions: a single is ``((a,), (i,))``, tau = a+_a a_i; a double is ``((a, b), (j, i))`` with a < b and i < j,
tau = a+_a a+_b a_j a_i, the textbook form of the amplitude t_ij^ab. Every function returns a new list.
"""

from __future__ import annotations

from itertools import combinations

from groundkit.sector.excitation import Excitation


def spin_orbitals(alpha: int, beta: int, n_orbitals: int) -> tuple[list[int], list[int]]:
    """(occupied, empty) interleaved spin orbitals of the determinant (alpha string, beta string), ascending."""
    occupied, empty = [], []
    for p in range(2 * n_orbitals):
        string = alpha if p % 2 == 0 else beta
        (occupied if string >> (p // 2) & 1 else empty).append(p)
    return occupied, empty


def reference_singles(alpha: int, beta: int, n_orbitals: int) -> list[Excitation]:
    """Singles occupied -> empty, all alpha then all beta; within a spin, occupied i then empty a ascending."""
    occupied, empty = spin_orbitals(alpha, beta, n_orbitals)
    return [Excitation((a,), (i,)) for spin in (0, 1) for i in occupied for a in empty if a % 2 == i % 2 == spin]


def reference_doubles(alpha: int, beta: int, n_orbitals: int) -> list[Excitation]:
    """Sz-conserving doubles occupied -> empty, in three spin blocks: alpha-alpha, beta-beta, alpha-beta.

    Same-spin blocks: occupied pairs i < j ascending, then empty pairs a < b ascending. Alpha-beta block: occupied
    alpha, occupied beta, empty alpha, empty beta, each ascending. Every double is in family form (creators
    ascending, annihilators descending).
    """
    occupied, empty = spin_orbitals(alpha, beta, n_orbitals)
    out = []
    for spin in (0, 1):
        occ = [p for p in occupied if p % 2 == spin]
        emp = [p for p in empty if p % 2 == spin]
        out += [Excitation((a, b), (j, i)) for i, j in combinations(occ, 2) for a, b in combinations(emp, 2)]
    occ_a, occ_b = [p for p in occupied if p % 2 == 0], [p for p in occupied if p % 2 == 1]
    emp_a, emp_b = [p for p in empty if p % 2 == 0], [p for p in empty if p % 2 == 1]
    out += [
        Excitation(tuple(sorted((a, b))), tuple(sorted((i, j), reverse=True)))
        for i in occ_a
        for j in occ_b
        for a in emp_a
        for b in emp_b
    ]
    return out


def paired_doubles(alpha: int, beta: int, n_orbitals: int) -> list[Excitation]:
    """Pair moves from doubly occupied spatial orbital i to empty spatial orbital a (i ascending, then a)."""
    doubly = [i for i in range(n_orbitals) if alpha >> i & 1 and beta >> i & 1]
    vacant = [a for a in range(n_orbitals) if not (alpha >> a & 1 or beta >> a & 1)]
    return [Excitation((2 * a, 2 * a + 1), (2 * i + 1, 2 * i)) for i in doubly for a in vacant]


def generalised_paired_doubles(n_orbitals: int) -> list[Excitation]:
    """Pair moves p -> q for every spatial p < q (q -> p is the same generator with opposite sign)."""
    return [Excitation((2 * q, 2 * q + 1), (2 * p + 1, 2 * p)) for p, q in combinations(range(n_orbitals), 2)]


def generalised_singles(n_orbitals: int) -> list[Excitation]:
    """Singles p -> q for every spatial p < q, alpha then beta for each pair."""
    return [Excitation((2 * q + s,), (2 * p + s,)) for p, q in combinations(range(n_orbitals), 2) for s in (0, 1)]


def canonical(excitation: Excitation) -> tuple[Excitation, float]:
    """The family form of an excitation (creators ascending, annihilators descending) and the sign between them."""
    creators, annihilators = list(excitation.creators), list(excitation.annihilators)
    sign = _sort_sign(creators) * _sort_sign([-q for q in annihilators])
    return Excitation(tuple(sorted(creators)), tuple(sorted(annihilators, reverse=True))), sign


def spin_flip_sharing(excitations: list[Excitation]) -> list[tuple[int, float]]:
    """(parameter, factor) per excitation so that each one and its spin-flipped partner share a parameter.

    The partner's operator is the spin flip of the first one's, so the factor is the sign between the flipped
    operator and the partner's family form. Excitations without a partner in the list get their own parameter.
    """
    position = {e: k for k, e in enumerate(excitations)}
    assigned: dict[int, tuple[int, float]] = {}
    n_parameters = 0
    for k, excitation in enumerate(excitations):
        if k in assigned:
            continue
        assigned[k] = (n_parameters, 1.0)
        partner, sign = canonical(excitation.spin_flipped())
        m = position.get(partner)
        if m is not None and m not in assigned:
            assigned[m] = (n_parameters, sign)
        n_parameters += 1
    return [assigned[k] for k in range(len(excitations))]


def _sort_sign(values: list[int]) -> float:
    inversions = sum(1 for x in range(len(values)) for y in range(x + 1, len(values)) if values[x] > values[y])
    return -1.0 if inversions % 2 else 1.0
