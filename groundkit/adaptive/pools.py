"""Operator pools: the candidate generators an adaptive trial state chooses from, one at a time.

A pool is a component (a frozen dataclass of options). Given a problem it lists its candidates as fermionic
excitations ``((creators...), (annihilators...))`` over interleaved spin orbitals, each standing for the generator
G = tau - tau^dagger (see ``docs/trial_states.md``). The determinant-space engine evaluates them exactly.

Built in:

- :class:`SinglesDoublesPool` (the default): every Sz-conserving single and double from the reference
  determinant, in UCCSD's order;
- :class:`GeneralisedPool`: generalised singles and doubles, every Sz-conserving move between any spin orbitals;
- :class:`ExcitationPool`: a list you give.

To add a pool, subclass :class:`OperatorPool`, implement :meth:`OperatorPool.candidates` and register it
(``@groundkit.register("pool", "my-pool")``) so ``Adaptive(pool="my-pool")`` finds it; see
``docs/adaptive.md``. A pool whose generators are not fermionic excitations (the qubit pool of Pauli strings,
:mod:`groundkit.adaptive.qubit_pool`) also overrides :meth:`OperatorPool.engine` to supply its own way of
evaluating them.
"""

from __future__ import annotations

from abc import abstractmethod
from collections.abc import Sequence
from dataclasses import dataclass
from itertools import combinations
from typing import Any, ClassVar

from groundkit.component import Component
from groundkit.errors import ComponentError, ExcitationError
from groundkit.registry import register
from groundkit.sector.excitation import Excitation, as_excitation, check_excitations
from groundkit.trial_states.excitation_sets import generalised_singles, reference_doubles, reference_singles


class OperatorPool(Component, role="pool"):
    """Base of operator pools: ``candidates(problem, reference)`` lists the generators to choose from."""

    name: ClassVar[str] = "pool"

    @abstractmethod
    def candidates(self, problem: Any, reference: tuple[int, int]) -> Sequence[Excitation | tuple]:
        """Candidate excitations for ``problem``; ``reference`` is the (alpha string, beta string) grown from."""

    def checked_candidates(self, problem: Any, reference: tuple[int, int]) -> tuple[Excitation, ...]:
        """:meth:`candidates`, checked: N and Sz conserved, indices in range, none repeated, at least one."""
        try:
            operators = tuple(check_excitations(self.candidates(problem, reference), 2 * int(problem.n_orbitals)))
        except ExcitationError as err:
            raise ExcitationError(f"pool {self!r}: {err}") from None
        if not operators:
            raise ComponentError(
                f"pool {self!r} has no operators for this problem ({problem.n_alpha} alpha and {problem.n_beta} "
                f"beta electrons in {problem.n_orbitals} orbitals); choose a pool or active space with empty "
                f"orbitals to move electrons into"
            )
        repeated = sorted({e for e in operators if operators.count(e) > 1})
        if repeated:
            raise ComponentError(f"pool {self!r} lists {tuple(repeated[0])!r} more than once; list each operator once")
        return operators

    def engine(self, problem: Any, reference: tuple[int, int], mapping: Any = None) -> Any:
        """The object that evaluates this pool on ``problem`` (the determinant engine for fermionic pools).

        A pool of non-fermionic generators overrides this and returns an object with the methods of
        :class:`~groundkit.adaptive.engine.DeterminantPoolEngine`.
        """
        from groundkit.adaptive.engine import DeterminantPoolEngine

        return DeterminantPoolEngine(problem, self.checked_candidates(problem, reference), reference)


@register("pool", "singles-doubles", aliases=("sd",), label="singles and doubles from the reference")
@dataclass(frozen=True)
class SinglesDoublesPool(OperatorPool):
    """Every Sz-conserving double, then single, from the reference: the excitations of UCCSD, in its order."""

    name: ClassVar[str] = "singles-doubles"

    def candidates(self, problem: Any, reference: tuple[int, int]) -> list[Excitation]:
        alpha, beta = reference
        n = int(problem.n_orbitals)
        return reference_doubles(alpha, beta, n) + reference_singles(alpha, beta, n)


@register("pool", "generalised", aliases=("generalized",), label="generalised singles and doubles")
@dataclass(frozen=True)
class GeneralisedPool(OperatorPool):
    """Generalised singles and doubles: every Sz-conserving single and double between any spin orbitals.

    Singles p -> q for spatial p < q, alpha then beta; then doubles, see :func:`generalised_doubles`. Each
    generator appears once (the reverse move is the same generator with the opposite sign).
    """

    name: ClassVar[str] = "generalised"

    def candidates(self, problem: Any, reference: tuple[int, int]) -> list[Excitation]:
        n = int(problem.n_orbitals)
        return generalised_singles(n) + generalised_doubles(n)


@register("pool", "excitations", label="your excitations", listed=False)
@dataclass(frozen=True, init=False)
class ExcitationPool(OperatorPool):
    """The excitations you list, ``((creators...), (annihilators...))`` each; checked when built."""

    name: ClassVar[str] = "given"
    operators: tuple[Excitation, ...]

    def __init__(self, operators: Sequence[object]) -> None:
        if isinstance(operators, (str, bytes)) or not hasattr(operators, "__iter__"):
            raise ComponentError(f"ExcitationPool({operators!r}): give a list of (creators, annihilators) pairs")
        checked = tuple(as_excitation(e) for e in operators)
        if not checked:
            raise ComponentError("ExcitationPool([]) is empty; give at least one excitation, e.g. ((2,), (0,))")
        object.__setattr__(self, "operators", checked)

    def __repr__(self) -> str:
        shown = ", ".join(repr((e.creators, e.annihilators)) for e in self.operators[:4])
        more = f", ... ({len(self.operators)} in all)" if len(self.operators) > 4 else ""
        return f"ExcitationPool([{shown}{more}])"

    def candidates(self, problem: Any, reference: tuple[int, int]) -> list[Excitation]:
        return list(self.operators)


def generalised_doubles(n_orbitals: int) -> list[Excitation]:
    """Doubles {p, q} -> {r, s} over all spin orbitals: disjoint pairs, Sz conserved, each generator once.

    Pairs of spin orbitals are taken in ascending order; for two pairs A < B the excitation moves A to B, written
    ``((r, s), (q, p))`` with r < s and p < q (the family form of the reference doubles).
    """
    pairs = list(combinations(range(2 * n_orbitals), 2))
    out = []
    for k, (p, q) in enumerate(pairs):
        for r, s in pairs[k + 1:]:
            if {p, q} & {r, s}:
                continue
            if (p % 2) + (q % 2) != (r % 2) + (s % 2):
                continue
            out.append(Excitation((r, s), (q, p)))
    return out


def as_pool(value: object) -> OperatorPool:
    """An :class:`OperatorPool` from an instance or a registered pool name (``"singles-doubles"``,
    ``"generalised"``, ``"qubit"``, or a user's; case, '-' and '_' ignored), built with default options."""
    from groundkit.component import _shown
    from groundkit.constraints import ComponentOf, Refused

    try:
        return ComponentOf("pool").check(value)
    except Refused as refusal:
        raise ComponentError(f"pool={_shown(value)}: pool must be {refusal}") from None
