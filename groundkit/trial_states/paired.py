"""Seniority-zero pair doubles (pUCCD in the literature) and k layers of generalised pair doubles and singles
(k-UpCCGSD)."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

from groundkit.constraints import Integer
from groundkit.registry import register
from groundkit.sector.excitation import Excitation
from groundkit.trial_states.base import TrialState
from groundkit.trial_states.excitation_sets import (
    generalised_paired_doubles,
    generalised_singles,
    paired_doubles,
    spin_flip_sharing,
)


@register("trial_state", "pair-doubles", aliases=("puccd",), label="pair doubles (pUCCD)")
@dataclass(frozen=True)
class PairDoubles(TrialState):
    """Pair doubles only: each moves both electrons of a doubly occupied orbital i into an empty orbital a.

    Order: i ascending, then a ascending (spatial orbitals); one parameter per pair move.
    """

    def excitations(self, problem: Any) -> list[Excitation]:
        """Pair moves from the reference."""
        alpha, beta = self.reference(problem)
        return paired_doubles(alpha, beta, int(problem.n_orbitals))


@register("trial_state", "upccgsd", aliases=("k-upccgsd",), label="k-UpCCGSD")
@dataclass(frozen=True, kw_only=True)
class UpCCGSD(TrialState):
    """k layers of generalised pair doubles and generalised singles.

    After Lee, Huggins, Head-Gordon, Whaley, J. Chem. Theory Comput. 15, 311 (2019). Each layer applies, with
    its own parameters, the pair moves p -> q for all spatial p < q, then the singles p -> q (alpha, beta) for all
    p < q. For closed shells the alpha and beta single of one p -> q share a parameter; for open shells they do not.
    """

    k: int = 1

    constraints = {"k": Integer(1, 64)}

    def excitations(self, problem: Any) -> list[Excitation]:
        """k copies of (pair doubles, singles)."""
        n = int(problem.n_orbitals)
        layer = generalised_paired_doubles(n) + generalised_singles(n)
        return layer * self.k

    def sharing(self, problem: Any, excitations: Sequence[Excitation]) -> list[tuple[int, float]]:
        """Separate parameters per layer; alpha/beta singles shared within a layer for closed shells."""
        per_layer = len(excitations) // self.k
        layer = list(excitations[:per_layer])
        if problem.n_alpha == problem.n_beta:
            shared = spin_flip_sharing(layer)
        else:
            shared = [(k, 1.0) for k in range(per_layer)]
        width = max(i for i, _ in shared) + 1 if shared else 0
        return [(i + width * copy, f) for copy in range(self.k) for i, f in shared]
