"""A user's own ordered list of excitations."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

from groundkit.errors import ExcitationError
from groundkit.registry import register
from groundkit.sector.excitation import Excitation, as_excitation
from groundkit.trial_states.base import TrialState


@register("trial_state", "excitation-list", label="excitation list", listed=False)
@dataclass(frozen=True, init=False)
class ExcitationList(TrialState):
    """Exponentials of the given excitations on the Hartree-Fock determinant, first listed acts first.

    Each entry is ``((creators...), (annihilators...))`` in interleaved spin orbitals, e.g. ``((4, 5), (1, 0))``
    for tau = a+_4 a+_5 a_1 a_0; one parameter per entry.
    """

    excitations_given: tuple[Excitation, ...]

    def __init__(self, excitations: Sequence[object]) -> None:
        if isinstance(excitations, (str, bytes)) or not hasattr(excitations, "__iter__"):
            raise ExcitationError(f"ExcitationList({excitations!r}): give a list of (creators, annihilators) pairs")
        object.__setattr__(self, "excitations_given", tuple(as_excitation(e) for e in excitations))

    def options(self) -> dict[str, Any]:
        """``{"excitations": [...]}``, the constructor's argument."""
        return {"excitations": self.excitations_given}

    def __repr__(self) -> str:
        items = ", ".join(repr((e.creators, e.annihilators)) for e in self.excitations_given)
        return f"ExcitationList([{items}])"

    def excitations(self, problem: Any) -> list[Excitation]:
        """The given excitations (range-checked against the problem by :meth:`plan`)."""
        return list(self.excitations_given)
