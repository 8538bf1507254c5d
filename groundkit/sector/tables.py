"""Excitation tables: where an excitation operator sends each determinant of the sector, and with which sign.

A determinant is ``|Ia, Ib> = A+ B+ |vac>`` (PySCF's order, see :mod:`groundkit.sector.strings`). Within one spin, a
string is ``a+_{high} ... a+_{low} |vac>``, so ``a+_p`` or ``a_p`` on a string costs (-1) to the number of
occupied orbitals above ``p``. Every Sz-conserving excitation splits into an alpha part and a beta part with an even
number of operators each (:func:`~groundkit.sector.excitation.split_by_spin`), so it acts as a signed partial
permutation of alpha strings times one of beta strings. The table keeps, per spin, the source string indices, their
target indices and signs; the overall reordering sign is folded into one of the two.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import NamedTuple

import numpy as np

from groundkit.errors import ExcitationError
from groundkit.sector.excitation import Excitation, check_excitation, split_by_spin
from groundkit.sector.strings import popcount


class SpinPart(NamedTuple):
    """Signed partial permutation of one spin's strings: ``source[k] -> target[k]`` with ``sign[k]``."""

    source: np.ndarray
    target: np.ndarray
    sign: np.ndarray


class ExcitationTable(NamedTuple):
    """One excitation in the sector: alpha and beta parts (``None`` where the excitation leaves a spin alone).

    ``tau |Ia, Ib> = alpha.sign * beta.sign |alpha.target, beta.target>`` for sources ``(alpha.source,
    beta.source)``; tau sends every other determinant to zero.
    """

    alpha: SpinPart | None
    beta: SpinPart | None

    def keys(self) -> tuple[tuple, tuple]:
        """Index expressions selecting the source block and the target block of a CI array ``ci[ia, ib]``."""
        a, b = self.alpha, self.beta
        if b is None:
            return (a.source,), (a.target,)
        if a is None:
            return (slice(None), b.source), (slice(None), b.target)
        return np.ix_(a.source, b.source), np.ix_(a.target, b.target)

    def weight(self) -> np.ndarray:
        """Sign of tau on each source determinant, shaped to broadcast over the source block."""
        a, b = self.alpha, self.beta
        if b is None:
            return a.sign[:, None]
        if a is None:
            return b.sign[None, :]
        return np.multiply.outer(a.sign, b.sign)


def string_action(strings: np.ndarray, operators: Sequence[tuple[int, bool]]) -> tuple[np.ndarray, np.ndarray]:
    """New strings and signs after applying ``operators`` (leftmost acts last) to every string.

    Returns ``(new, sign)``: ``new`` is -1 where the product annihilates the string, ``sign`` is +1 or -1.
    """
    current = np.asarray(strings, dtype=np.int64).copy()
    alive = np.ones(current.shape, dtype=bool)
    parity = np.zeros(current.shape, dtype=np.int64)
    for orbital, is_creator in reversed(list(operators)):
        bit = np.int64(1) << orbital
        occupied = (current & bit) != 0
        alive &= ~occupied if is_creator else occupied
        parity += popcount(current >> (orbital + 1))
        current = current | bit if is_creator else current & ~bit
    new = np.where(alive, current, -1)
    sign = np.where(parity % 2 == 0, 1.0, -1.0)
    return new, sign


def spin_part(strings: np.ndarray, operators: Sequence[tuple[int, bool]]) -> SpinPart:
    """The :class:`SpinPart` of ``operators`` over the ascending ``strings``."""
    new, sign = string_action(strings, operators)
    source = np.flatnonzero(new >= 0)
    target = np.searchsorted(strings, new[source])
    found = target < strings.size
    if not np.all(found) or not np.array_equal(strings[target], new[source]):
        raise ExcitationError(
            f"operators {list(operators)} (spatial orbital, is_creator) lead out of the strings of this spin; "
            f"an excitation must keep each spin's electron count and stay within the orbitals"
        )
    return SpinPart(source.astype(np.intp), target.astype(np.intp), sign[source])


def excitation_table(
    excitation: Excitation, alpha_strings: np.ndarray, beta_strings: np.ndarray, cache: dict | None = None
) -> ExcitationTable:
    """The :class:`ExcitationTable` of one excitation over the sector's strings (checked, see ``check_excitation``)."""
    check_excitation(excitation)
    cache = {} if cache is None else cache
    reorder_sign, alpha_ops, beta_ops = split_by_spin(excitation)

    def part(spin: str, strings: np.ndarray, ops: list) -> SpinPart | None:
        if not ops:
            return None
        key = (spin, tuple(ops))
        if key not in cache:
            cache[key] = spin_part(strings, ops)
        return cache[key]

    alpha = part("alpha", alpha_strings, alpha_ops)
    beta = part("beta", beta_strings, beta_ops)
    if reorder_sign < 0:
        if alpha is not None:
            alpha = alpha._replace(sign=-alpha.sign)
        else:
            beta = beta._replace(sign=-beta.sign)
    return ExcitationTable(alpha, beta)


def excitation_tables(
    excitations: Sequence[Excitation], alpha_strings: np.ndarray, beta_strings: np.ndarray
) -> list[ExcitationTable]:
    """Tables of every excitation, sharing the spin parts that repeat."""
    cache: dict = {}
    return [excitation_table(e, alpha_strings, beta_strings, cache) for e in excitations]


def determinant_image(table: ExcitationTable, ia: int, ib: int) -> tuple[int, int, float] | None:
    """(ja, jb, sign) with tau |ia, ib> = sign |ja, jb>, or ``None`` when tau annihilates the determinant."""
    ja, jb, sign = ia, ib, 1.0
    for part, index in ((table.alpha, ia), (table.beta, ib)):
        if part is None:
            continue
        where = np.flatnonzero(part.source == index)
        if where.size == 0:
            return None
        if part is table.alpha:
            ja = int(part.target[where[0]])
        else:
            jb = int(part.target[where[0]])
        sign *= float(part.sign[where[0]])
    return ja, jb, sign
