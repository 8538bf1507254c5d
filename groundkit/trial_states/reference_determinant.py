"""The reference determinant alone: no parameters."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from groundkit.registry import register
from groundkit.sector.excitation import Excitation
from groundkit.trial_states.base import TrialState


@register("trial_state", "reference-determinant", aliases=("hf", "hartree-fock"),
          label="reference determinant (Hartree–Fock)")
@dataclass(frozen=True)
class ReferenceDeterminant(TrialState):
    """The Hartree-Fock determinant (lowest n_alpha alpha and n_beta beta orbitals); zero parameters."""

    def excitations(self, problem: Any) -> list[Excitation]:
        """No excitations."""
        return []
