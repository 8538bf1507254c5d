"""The qubit pool: individual Pauli strings of the mapped fermionic generators (Tang, Shkolnikov, Barron, Grimsley,
Mayhall, Barnes, Economou, PRX Quantum 2, 020310 (2021)).

Each generator G = tau - tau^dagger of a fermionic source pool is encoded with the pipeline's encoding (mapping,
then tapering), G -> i * sum_k c_k P_k with real c_k; the pool holds every distinct string P_k, with its Z factors
removed (``drop_z=True``, as Tang et al. do) or kept. Under the linear encodings every such P_k has an odd number of
Y factors, so i P_k is real antisymmetric and exp(theta i P_k) keeps the real reference real.

Pool gradients: appending exp(i theta P) to psi changes the energy at theta = 0 by

    dE/dtheta = i <psi|[H, P]|psi> = -2 Im <H psi|P psi>     (Hartree per radian),

one H.psi for the whole pool, then one gather of psi per string (a Pauli string permutes basis states with phases).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any, ClassVar

import numpy as np
from openfermion import FermionOperator

from groundkit.adaptive.pools import OperatorPool, SinglesDoublesPool
from groundkit.constraints import Bool, ComponentOf, OrNone
from groundkit.errors import ComponentError
from groundkit.mapping import QubitMapping
from groundkit.qubit_states.objective import QubitObjective
from groundkit.qubit_states.pauli_rotations import PauliAction, PauliRotations, pauli_label, pauli_term
from groundkit.registry import register
from groundkit.sector.excitation import Excitation
from groundkit.sector.space import lowest_strings


def generator_strings(encoding: Any, excitations: Sequence[Excitation], drop_z: bool = True) -> tuple[str, ...]:
    """Distinct Pauli-string labels of the images of tau - tau^dagger, in the order first met.

    Excitations that leave a tapered register's sector are skipped (as fixed trial states do there); with
    ``drop_z`` the Z factors of each string are removed. Strings left as the identity are skipped.
    """
    seen: dict[str, None] = {}
    for excitation in excitations:
        if not encoding.conserves_symmetry(excitation):
            continue
        generator = FermionOperator(excitation.operator_term()) - FermionOperator(excitation.adjoint().operator_term())
        for term, value in sorted(encoding.encode(generator).terms.items()):
            kept = tuple((q, op) for q, op in term if not (drop_z and op == "Z"))
            if abs(value) > 1e-10 and kept:
                seen.setdefault(pauli_label(kept), None)
    return tuple(seen)


@register("pool", "qubit", label="Pauli strings of mapped singles and doubles")
@dataclass(frozen=True, kw_only=True)
class QubitPool(OperatorPool):
    """Pauli strings of the mapped generators of a fermionic ``source`` pool (Tang et al., PRX Quantum 2, 020310).

    - ``source``: the fermionic pool split into strings (an OperatorPool or a name; default singles and doubles
      from the reference; ``"generalised"`` for generalised singles and doubles);
    - ``drop_z``: remove the Z factors of each string (True, as Tang et al.), or keep the strings whole;
    - ``mapping``: None builds the strings under the pipeline's mapping; a QubitMapping (or name) that differs
      from the pipeline's is refused when the growth starts (the strings would act on another register).
    """

    name: ClassVar[str] = "qubit"
    source: OperatorPool | str = SinglesDoublesPool()
    drop_z: bool = True
    mapping: QubitMapping | str | None = None

    constraints = {"source": ComponentOf("pool"), "drop_z": Bool(), "mapping": OrNone(ComponentOf("mapping"))}

    def check_options(self) -> None:
        if isinstance(self.source, (QubitPool, PauliStringPool)):
            raise ComponentError(f"QubitPool(source={self.source!r}): the source must be a fermionic pool")

    def candidates(self, problem: Any, reference: tuple[int, int]) -> Sequence[Excitation]:
        """The source pool's (checked) excitations, before they are mapped and split."""
        return self.source.checked_candidates(problem, reference)

    def strings(self, encoding: Any, reference: tuple[int, int]) -> tuple[str, ...]:
        """The pool's Pauli strings on ``encoding``'s register."""
        return generator_strings(encoding, self.candidates(encoding.problem, reference), self.drop_z)

    def engine(self, problem: Any, reference: tuple[int, int], mapping: Any = None) -> PauliPoolEngine:
        mapping = mapping if mapping is not None else QubitMapping()
        if self.mapping is not None and self.mapping != mapping:
            raise ComponentError(
                f"{self!r} is built on {self.mapping!r} but the pipeline maps with {mapping!r}; give "
                f"QubitPool(mapping=None) to use the pipeline's mapping, or map the pipeline the same way"
            )
        from groundkit.qubits import encoding_for

        encoding = encoding_for(problem, mapping)
        strings = self.strings(encoding, reference)
        if not strings:
            raise ComponentError(
                f"{self!r} has no Pauli strings under {mapping!r}: every generator of {self.source!r} leaves the "
                f"tapered sector or maps to the identity; use taper=False or another source pool"
            )
        return PauliPoolEngine(encoding, strings, reference)


@register("pool", "pauli-strings", label="your Pauli strings", listed=False)
@dataclass(frozen=True, init=False)
class PauliStringPool(OperatorPool):
    """The Pauli strings you list (labels like ``"Y0 X2"``), on the pipeline's register; checked when built."""

    name: ClassVar[str] = "pauli-strings"
    strings: tuple[str, ...]

    def __init__(self, strings: Sequence[object]) -> None:
        if isinstance(strings, (str, bytes)) or not hasattr(strings, "__iter__"):
            raise ComponentError(f"PauliStringPool({strings!r}): give a list of Pauli strings such as ['Y0 X2']")
        labels = tuple(pauli_label(s) for s in strings)
        if not labels:
            raise ComponentError("PauliStringPool([]) is empty; give at least one Pauli string, e.g. 'Y0 X2'")
        repeated = sorted({s for s in labels if labels.count(s) > 1})
        if repeated:
            raise ComponentError(f"PauliStringPool lists {repeated[0]!r} more than once; list each string once")
        object.__setattr__(self, "strings", labels)

    def __repr__(self) -> str:
        shown = ", ".join(repr(s) for s in self.strings[:4])
        more = f", ... ({len(self.strings)} in all)" if len(self.strings) > 4 else ""
        return f"PauliStringPool([{shown}{more}])"

    def candidates(self, problem: Any, reference: tuple[int, int]) -> Sequence[Excitation]:
        """None: this pool's operators are Pauli strings, not fermionic excitations."""
        return ()

    def engine(self, problem: Any, reference: tuple[int, int], mapping: Any = None) -> PauliPoolEngine:
        from groundkit.qubits import encoding_for

        encoding = encoding_for(problem, mapping if mapping is not None else QubitMapping())
        return PauliPoolEngine(encoding, self.strings, reference)


class PauliPoolEngine:
    """A pool of Pauli strings on one encoding: their actions built once, gradients in one H.psi and one gather each.

    Grown states are :class:`~groundkit.qubit_states.PauliRotations` on the Hartree-Fock basis state.
    """

    def __init__(self, encoding: Any, strings: Sequence[str], reference: tuple[int, int]):
        problem = encoding.problem
        if tuple(reference) != lowest_strings(problem.n_alpha, problem.n_beta):
            raise ComponentError(
                f"reference {tuple(reference)!r}: the Pauli-string pool grows from the Hartree-Fock determinant "
                f"{lowest_strings(problem.n_alpha, problem.n_beta)!r} only"
            )
        self.encoding = encoding
        self.operators: tuple[str, ...] = tuple(pauli_label(s) for s in strings)
        self.labels = self.operators
        n = int(encoding.n_qubits)
        widest = max(q for s in self.operators for q, _ in pauli_term(s))
        if widest >= n:
            raise ComponentError(
                f"Pauli string pool: a string acts on qubit {widest}, but the register of {encoding.mapping!r} has "
                f"{n} qubits (0 ... {n - 1})"
            )
        self.actions = [PauliAction(pauli_term(s), n, keep=False) for s in self.operators]

    def __len__(self) -> int:
        return len(self.operators)

    def trial_state(self, sequence: Sequence[object]) -> PauliRotations:
        """exp(i theta_K P_K) ... exp(i theta_1 P_1)|HF> of ``sequence`` (Pauli-string labels; first acts first)."""
        foreign = [op for op in sequence if not isinstance(op, str)]
        if foreign:
            raise ComponentError(
                f"operator {tuple(foreign[0])!r} is a fermionic excitation, but a Pauli-string pool grows "
                f"sequences of Pauli strings; give start_from as labels such as 'Y0 X2'"
            )
        return PauliRotations(list(sequence))

    def gradients(self, objective: QubitObjective, parameters: np.ndarray) -> np.ndarray:
        """dE/dtheta = -2 Im <H psi|P_k psi> (Hartree per radian) of each string appended at zero.

        ``objective`` is the QubitObjective of :meth:`trial_state` of the current sequence.
        """
        psi = objective.state(parameters)
        h_psi = objective.hamiltonian @ psi
        return np.array([-2.0 * float(np.vdot(h_psi, action(psi)).imag) for action in self.actions])
