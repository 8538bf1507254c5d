"""Groupings: how a Hamiltonian is split into measurement groups, as registered components of role ``grouping``.

``SampledEstimator(grouping=...)``, ``shot_budget(grouping=...)`` and ``compare_measurements`` take a registered
name; :func:`groups_for` gives ``(constant, groups)`` for a qubit register (cached per register and grouping).
A grouping built from Pauli strings alone implements :meth:`Grouping.pauli_groups`; one that needs the molecule's
integrals (``needs_integrals``) implements :meth:`Grouping.groups` on an encoding and refuses a bare qubit
operator.
"""

from __future__ import annotations

from typing import Any, ClassVar

from openfermion import QubitOperator

from ..component import Component
from ..errors import ComponentError
from ..registry import lookup, name_of, names


class Grouping(Component, role="grouping"):
    """Base of groupings (frozen dataclasses; options, if any, are fields)."""

    needs_integrals: ClassVar[bool] = False

    def pauli_groups(self, hamiltonian: QubitOperator, n_qubits: int) -> tuple[float, list]:
        """(identity coefficient in Ha, groups) of a qubit operator."""
        raise ComponentError(
            f"grouping {name_of(self)!r} needs the molecule's integrals, and a qubit-only Hamiltonian has none; "
            f"measure it through a pipeline (or pass an encoding), or use one of "
            f"{', '.join(n for n in names('grouping') if not lookup('grouping', n).needs_integrals)}"
        )

    def groups(self, encoding: Any) -> tuple[float, list]:
        """(identity coefficient in Ha, groups) on a qubit register (a :class:`~groundkit.qubits.QubitEncoding`)."""
        return self.pauli_groups(encoding.hamiltonian, encoding.n_qubits)


def as_grouping(value: Any) -> Grouping:
    """A Grouping from an instance or a registered name; ComponentError listing the accepted names."""
    if isinstance(value, Grouping):
        return value
    if not isinstance(value, str):
        raise ComponentError(f"grouping {value!r} is not a name; accepted names: {', '.join(names('grouping'))}")
    return lookup("grouping", value)()


def grouping_names() -> tuple[str, ...]:
    """The registered grouping names, built-ins first."""
    return names("grouping")


def groups_for(encoding: Any, grouping: Any) -> tuple[float, list]:
    """(identity coefficient, groups) of ``encoding``'s Hamiltonian under ``grouping`` (kept in the workspace,
    kind ``measurement groups``, owned by the encoding)."""
    from ..workspace import workspace

    chosen = as_grouping(grouping)
    return workspace().fetch("measurement groups", (id(encoding), repr(chosen)), lambda: chosen.groups(encoding),
                             owner=encoding)
