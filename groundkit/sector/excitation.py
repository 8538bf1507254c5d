"""Excitations over interleaved spin orbitals and their validation.

An excitation is a pair of tuples of interleaved spin-orbital indices ``(creators, annihilators)`` (2i = alpha of
spatial orbital i, 2i+1 = beta). It stands for the operator

    tau = a+_{c0} a+_{c1} ... a_{a0} a_{a1} ...

written exactly as the OpenFermion term ``((c0, 1), (c1, 1), ..., (a0, 0), (a1, 0), ...)``: the rightmost
annihilator acts first. Its generator is ``G = tau - tau^dagger``, real and antisymmetric.
"""

from __future__ import annotations

from collections.abc import Iterable
from typing import NamedTuple

from groundkit.errors import ExcitationError


class Excitation(NamedTuple):
    """Creators and annihilators (interleaved spin-orbital indices) of one excitation operator."""

    creators: tuple[int, ...]
    annihilators: tuple[int, ...]

    @property
    def rank(self) -> int:
        """1 for a single, 2 for a double."""
        return len(self.creators)

    def operator_term(self) -> tuple[tuple[int, int], ...]:
        """The OpenFermion term tuple of tau, e.g. ``((4, 1), (5, 1), (0, 0), (1, 0))``."""
        return tuple((p, 1) for p in self.creators) + tuple((q, 0) for q in self.annihilators)

    def adjoint(self) -> Excitation:
        """The excitation whose operator is tau^dagger."""
        return Excitation(tuple(reversed(self.annihilators)), tuple(reversed(self.creators)))

    def spin_flipped(self) -> Excitation:
        """The same excitation with alpha and beta exchanged on every index."""
        return Excitation(tuple(p ^ 1 for p in self.creators), tuple(q ^ 1 for q in self.annihilators))


def _as_index_tuple(value: object, what: str, raw: object) -> tuple[int, ...]:
    try:
        items = tuple(value)  # type: ignore[arg-type]
    except TypeError:
        items = (value,)
    out = []
    for item in items:
        if isinstance(item, bool) or not isinstance(item, int) and not hasattr(item, "__index__"):
            raise ExcitationError(
                f"excitation {raw!r}: {what} index {item!r} is not an integer; use spin-orbital indices 0, 1, 2, ..."
            )
        out.append(int(item.__index__()))
    return tuple(out)


def as_excitation(value: object) -> Excitation:
    """Turn ``((c0, c1), (a0, a1))`` (or an :class:`Excitation`) into a checked :class:`Excitation`.

    Checks that hold without a problem: integer indices, non-negative, equal numbers of creators and annihilators
    (particle number), equal numbers of alpha creators and alpha annihilators (Sz), no index repeated.
    """
    if isinstance(value, Excitation):
        creators, annihilators = value
    else:
        try:
            creators, annihilators = value  # type: ignore[misc]
        except (TypeError, ValueError):
            raise ExcitationError(
                f"excitation {value!r} is not a pair (creators, annihilators), e.g. ((4, 5), (0, 1)) or ((2,), (0,))"
            ) from None
    creators = _as_index_tuple(creators, "creator", value)
    annihilators = _as_index_tuple(annihilators, "annihilator", value)
    excitation = Excitation(creators, annihilators)
    check_excitation(excitation)
    return excitation


def check_excitation(excitation: Excitation, n_spin_orbitals: int | None = None) -> None:
    """Raise :class:`ExcitationError` unless the excitation conserves N and Sz, repeats no index and fits the range."""
    creators, annihilators = excitation
    if not creators:
        raise ExcitationError(f"excitation {tuple(excitation)!r} is empty; give at least one creator and annihilator")
    if len(creators) != len(annihilators):
        raise ExcitationError(
            f"excitation {tuple(excitation)!r} does not conserve particle number: {len(creators)} creator(s) and "
            f"{len(annihilators)} annihilator(s); give as many of each"
        )
    negative = [p for p in creators + annihilators if p < 0]
    if negative:
        raise ExcitationError(f"excitation {tuple(excitation)!r}: index {negative[0]} is negative; indices start at 0")
    everything = creators + annihilators
    repeated = sorted({p for p in everything if everything.count(p) > 1})
    if repeated:
        raise ExcitationError(
            f"excitation {tuple(excitation)!r} repeats spin orbital(s) {repeated}; every index may appear once"
        )
    alpha_created = sum(1 for p in creators if p % 2 == 0)
    alpha_removed = sum(1 for q in annihilators if q % 2 == 0)
    if alpha_created != alpha_removed:
        raise ExcitationError(
            f"excitation {tuple(excitation)!r} does not conserve Sz: it creates {alpha_created} and removes "
            f"{alpha_removed} alpha (even-index) electron(s); alpha and beta counts must each balance"
        )
    if n_spin_orbitals is not None:
        everything = creators + annihilators
        outside = [p for p in everything if p >= n_spin_orbitals]
        if outside:
            raise ExcitationError(
                f"excitation {tuple(excitation)!r}: spin orbital {outside[0]} is out of range; this problem has "
                f"{n_spin_orbitals} spin orbitals (indices 0 to {n_spin_orbitals - 1})"
            )


def check_excitations(excitations: Iterable[object], n_spin_orbitals: int) -> list[Excitation]:
    """Checked excitations for a problem with ``n_spin_orbitals`` spin orbitals."""
    out = []
    for value in excitations:
        excitation = as_excitation(value)
        check_excitation(excitation, n_spin_orbitals)
        out.append(excitation)
    return out


def split_by_spin(excitation: Excitation) -> tuple[int, list[tuple[int, bool]], list[tuple[int, bool]]]:
    """Sign and the alpha and beta parts of tau, each a list of (spatial orbital, is_creator) in operator order.

    Moving every alpha operator to the left of every beta operator (keeping each spin's order) costs the returned
    sign. Each part holds an even number of operators, so the beta part commutes with alpha creators.
    """
    term = excitation.operator_term()
    alpha = [(p // 2, dagger == 1) for p, dagger in term if p % 2 == 0]
    beta = [(p // 2, dagger == 1) for p, dagger in term if p % 2 == 1]
    swaps = 0
    betas_seen = 0
    for p, _ in term:
        if p % 2 == 1:
            betas_seen += 1
        else:
            swaps += betas_seen
    return (-1 if swaps % 2 else 1), alpha, beta
