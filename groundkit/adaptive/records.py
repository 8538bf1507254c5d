"""Growth records: one per step of an adaptive run, as plain data that a RunResult saves to JSON.

Step 0 is the starting state (Hartree-Fock, or the ``start_from`` sequence minimised); step k >= 1 adds one
operator and re-minimises every parameter. Energies and errors in Hartree, gradients in Hartree per radian.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import asdict, dataclass
from typing import Any

from groundkit.errors import ComponentError
from groundkit.qubit_states.pauli_rotations import PauliRotations, pauli_label
from groundkit.sector.excitation import Excitation, as_excitation
from groundkit.trial_states.base import excitation_label
from groundkit.trial_states.custom import ExcitationList

Operator = Excitation | str
"""A grown operator: a fermionic excitation, or a Pauli-string label such as ``"X0 Y2 X3"`` (qubit pools)."""
OperatorRecord = tuple[tuple[int, ...], tuple[int, ...]] | str


def operator_record(operator: Operator) -> OperatorRecord:
    """The record form: ``(creators, annihilators)`` for an excitation, the label for a Pauli string."""
    if isinstance(operator, str):
        return pauli_label(operator)
    return (tuple(operator.creators), tuple(operator.annihilators))


def operator_of(record: object) -> Operator:
    """The operator of a record form (a Pauli-string label, or a ``[creators, annihilators]`` pair)."""
    return pauli_label(record) if isinstance(record, str) else as_excitation(record)


def operator_label(operator: Operator) -> str:
    """Readable name: the excitation's label, or the Pauli string itself."""
    return pauli_label(operator) if isinstance(operator, str) else excitation_label(operator)


def trial_state_of(sequence: Iterable[object]) -> ExcitationList | PauliRotations:
    """The fixed trial state of a grown sequence: ExcitationList of excitations, PauliRotations of Pauli strings."""
    operators = [op if isinstance(op, Excitation) else operator_of(op) for op in sequence]
    strings = [op for op in operators if isinstance(op, str)]
    if strings and len(strings) != len(operators):
        raise ComponentError("a grown sequence mixes Pauli strings and fermionic excitations; use one kind")
    return PauliRotations(strings) if strings else ExcitationList(operators)


@dataclass(frozen=True)
class GrowthStep:
    """One growth step.

    ``operators`` are the operators this step appended (one for k >= 1; the ``start_from`` sequence, possibly
    empty, for step 0), each as ``[creators, annihilators]`` (fermionic pools) or as a Pauli-string label such as
    ``"X0 Y2 X3"`` (qubit pools); ``label`` names them. ``gradient`` is the chosen
    operator's energy gradient at zero and ``gradient_norm`` the Euclidean norm over the pool at that moment (None
    for step 0). ``energy`` is after re-minimisation and ``error`` is energy minus the exact reference.
    ``two_qubit_gates`` counts the grown circuit's two-qubit gates (None until the qubit layer compiles it).
    """

    step: int
    operators: tuple[OperatorRecord, ...]
    label: str
    gradient: float | None
    gradient_norm: float | None
    energy: float
    error: float
    parameters: int
    two_qubit_gates: int | None
    iterations: int
    minimiser_converged: bool
    wall_time: float

    def to_dict(self) -> dict[str, Any]:
        """Plain JSON-ready values (excitations as nested lists, Pauli strings as labels)."""
        data = asdict(self)
        data["operators"] = [op if isinstance(op, str) else [list(op[0]), list(op[1])] for op in self.operators]
        return data

    @classmethod
    def from_dict(cls, data: dict[str, Any]) -> GrowthStep:
        """Rebuild from :meth:`to_dict` output."""
        values = dict(data)
        values["operators"] = tuple(operator_record(operator_of(op)) for op in values["operators"])
        return cls(**values)

    @property
    def generators(self) -> tuple[Operator, ...]:
        """The appended operators: excitations, or Pauli-string labels."""
        return tuple(operator_of(op) for op in self.operators)

    @property
    def excitations(self) -> tuple[Excitation, ...]:
        """The appended operators as excitations (ComponentError for a step of a Pauli-string pool)."""
        if any(isinstance(op, str) for op in self.operators):
            raise ComponentError(f"growth step {self.step} appended Pauli strings, not excitations; use .generators")
        return tuple(as_excitation(op) for op in self.operators)


def growth_steps(result: Any) -> tuple[GrowthStep, ...]:
    """The growth records of a RunResult as :class:`GrowthStep` objects (ComponentError if it has none)."""
    growth = getattr(result, "growth", ())
    if not growth:
        raise ComponentError(f"{result!r} has no growth records; it is not the result of an Adaptive run")
    return tuple(GrowthStep.from_dict(step) for step in growth)


def grown_sequence(result: Any) -> tuple[Operator, ...]:
    """The operator sequence an Adaptive run grew (excitations, or Pauli-string labels for qubit pools), first
    applied first; parameters follow ``result.parameters``."""
    return tuple(op for step in growth_steps(result) for op in step.generators)


def grown_trial_state(result: Any) -> ExcitationList | PauliRotations:
    """A fixed trial state of the grown sequence (ExcitationList, or PauliRotations for a qubit pool), e.g. for
    a neighbouring geometry with ``result.parameters``."""
    return trial_state_of(grown_sequence(result))


def growth_table(result: Any) -> str:
    """Plain-text table of the growth: step, operator, gradient, energy, error (mHa), parameters, gates."""
    lines = [f"{'step':>4}  {'operator':<22}{'gradient':>11}{'energy/Ha':>17}{'error/mHa':>11}{'params':>7}"
             f"{'2q gates':>9}"]
    for s in growth_steps(result):
        gradient = "" if s.gradient is None else f"{s.gradient:+.2e}"
        gates = "—" if s.two_qubit_gates is None else str(s.two_qubit_gates)
        lines.append(f"{s.step:>4}  {s.label:<22}{gradient:>11}{s.energy:>17.10f}{1000 * s.error:>11.4f}"
                     f"{s.parameters:>7}{gates:>9}")
    lines.append(f"stop: {result.stop_reason}")
    return "\n".join(lines)
