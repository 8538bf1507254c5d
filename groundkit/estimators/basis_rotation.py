"""Basis-rotation grouping: a low-rank (double) factorisation of the Hamiltonian, one orbital basis per group.

OpenFermion's ``low_rank_two_body_decomposition`` writes the two-electron part as
sum_l lambda_l (sum_pq g^l_pq a+_p a_q)^2 plus a one-body correction (Motta et al., arXiv:1808.02625; Huggins
et al., npj Quantum Information 7, 23 (2021)). Each g^l (spin-symmetric, real) is diagonalised in the spatial
orbitals, g^l = U diag(d) U^T, so the square is lambda_l (sum_k d_k Ñ_k)^2 with Ñ_k the number operators of the
rotated orbitals; the one-body part (with the correction) is diagonalised the same way. Group 0 is the one-body
part, group l the l-th square. Each group is measured by rotating the state with the orbital rotation U^T
(OpenFermion's ``givens_decomposition_square``: U^T = D G_K ... G_1, each Givens rotation exp(theta (a+_j a_i -
a+_i a_j)) on the alpha and the beta spin orbital, written on the register by the encoding) and reading
occupations in the computational basis; the measured operator is the encoded polynomial in the number
operators, Z strings only under any linear encoding. The final phases D commute with the occupations and are
left out. Truncation: eigenvalues are kept while the dropped part stays below ``threshold`` (Ha, OpenFermion's
measure), so with the default the groups sum to the Hamiltonian to round-off.

The rotations need the orbital integrals: a qubit-only Hamiltonian is refused. A rotation that breaks a tapered
symmetry (it mixes orbitals of different point-group symmetry) cannot be measured on the tapered register, and
is refused with a :class:`~groundkit.errors.SymmetryError` naming the group.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any, ClassVar

import numpy as np
from openfermion import FermionOperator, QubitOperator, givens_decomposition_square, low_rank_two_body_decomposition

from ..constraints import Interval
from ..errors import ComponentError, SymmetryError
from ..registry import register
from ..sector.excitation import Excitation
from . import pauli_groupings  # noqa: F401  (the Pauli groupings are registered, and listed, first)
from .basis_change import PauliRotationChange
from .grouping import Grouping
from .groups import z_group


@dataclass(frozen=True)
class Factorisation:
    """Constant (Ha), then per group: spatial rotation U (columns: new orbitals), weights d, prefactor, power."""

    constant: float
    rotations: list[np.ndarray]
    weights: list[np.ndarray]
    prefactors: list[float]
    powers: list[int]


def _spatial(matrix: np.ndarray, what: str) -> np.ndarray:
    """The alpha block of a spin-orbital matrix (interleaved), checked to be spin-symmetric."""
    a, b = matrix[0::2, 0::2], matrix[1::2, 1::2]
    if np.abs(a - b).max() > 1e-9 or np.abs(matrix[0::2, 1::2]).max() > 1e-9:
        raise ComponentError(f"{what} of the factorisation is not spin-symmetric; basis-rotation grouping needs "
                             "spin-restricted integrals")
    return np.real(a)


def blocks(matrix: np.ndarray, tol: float = 1e-10) -> list[np.ndarray]:
    """Index sets of the connected blocks of a symmetric matrix (entries above ``tol`` couple two orbitals)."""
    from scipy.sparse.csgraph import connected_components

    count, labels = connected_components(np.abs(matrix) > tol, directed=False)
    return [np.flatnonzero(labels == c) for c in range(count)]


def block_eigh(matrix: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Eigenvalues and eigenvectors (columns) found block by block, so no eigenvector mixes orbitals that the
    matrix does not couple (degenerate orbitals of different symmetry stay apart)."""
    n = matrix.shape[0]
    values, vectors = np.zeros(n), np.zeros((n, n))
    for index in blocks(matrix):
        d, u = np.linalg.eigh(matrix[np.ix_(index, index)])
        values[index] = d
        vectors[np.ix_(index, index)] = u
    return values, vectors


def factorise(problem: Any, threshold: float = 1e-12) -> Factorisation:
    """The low-rank factorisation of a problem's Hamiltonian into diagonalisable groups."""
    operator = problem.fermion_hamiltonian()
    eigenvalues, squares, correction, _ = low_rank_two_body_decomposition(
        operator.two_body_tensor, truncation_threshold=threshold, spin_basis=True)
    one_body = _spatial(np.real(operator.one_body_tensor + correction), "the one-body part")
    d, u = block_eigh(one_body)
    rotations, weights, prefactors, powers = [u], [d], [1.0], [1]
    for k, (value, square) in enumerate(zip(eigenvalues, squares)):
        d, u = block_eigh(_spatial(np.asarray(square), f"square {k}"))
        rotations.append(u)
        weights.append(d)
        prefactors.append(float(np.real(value)))
        powers.append(2)
    return Factorisation(float(operator.constant), rotations, weights, prefactors, powers)


def _rotation_steps(encoding: Any, rotation: np.ndarray, group: int) -> tuple[tuple[tuple, float], ...]:
    """Pauli rotations realising the orbital rotation U^T on the register (final phases dropped)."""

    steps: list[tuple[tuple, float]] = []
    for index in blocks(rotation):
        if index.size < 2:
            continue
        local = rotation[np.ix_(index, index)]
        decomposition, _ = givens_decomposition_square(np.array(local.T, dtype=complex))
        for layer in decomposition:
            for i, j, theta, phi in layer:
                steps += _givens_steps(encoding, int(index[i]), int(index[j]), float(theta), float(phi), group)
    return tuple(steps)


def _givens_steps(encoding: Any, i: int, j: int, theta: float, phi: float, group: int) -> list[tuple[tuple, float]]:
    """One Givens rotation of orbitals i, j (OpenFermion's convention) on both spins as Pauli rotations."""
    from ..circuits.fermionic import generator_terms

    phase = float(np.real(np.exp(1j * phi)))
    if abs(abs(phase) - 1.0) > 1e-9:
        raise ComponentError(f"Givens rotation ({i}, {j}) of group {group} has the complex phase {phi}; a real "
                             "orbital rotation was expected")
    steps: list[tuple[tuple, float]] = []
    for spin in (0, 1):
        p, q = 2 * i + spin, 2 * j + spin
        if phase < 0:  # e^{i phi} = -1 on orbital j, applied first: (-1)^{n_q} = exp(i pi n_q)
            for string, c in _encoded(encoding, FermionOperator(((q, 1), (q, 0))), group).terms.items():
                if string:
                    steps.append((tuple(string), float(np.pi * np.real(c))))
        if abs(theta) < 1e-15:
            continue
        try:
            terms = generator_terms(encoding, Excitation((q,), (p,)))
        except SymmetryError:
            raise _broken(encoding, group) from None
        steps += [(string, theta * c) for string, c in terms]
    return steps


def _encoded(encoding: Any, operator: FermionOperator, group: int) -> QubitOperator:
    try:
        return encoding.encode(operator)
    except SymmetryError:
        raise _broken(encoding, group) from None


def _broken(encoding: Any, group: int) -> SymmetryError:
    return SymmetryError(
        f"the orbital rotation of basis-rotation group {group} mixes orbitals of different symmetry and leaves the "
        f"tapered sector of {encoding.mapping!r}; measure on an untapered register (taper=False) or use another "
        "grouping ('qwc', 'commuting')"
    )


def measured_operator(weights: np.ndarray, prefactor: float, power: int) -> FermionOperator:
    """prefactor * (sum_k d_k (n_k,alpha + n_k,beta))^power in the rotated orbitals (as plain number operators)."""
    linear = FermionOperator()
    for k, d in enumerate(weights):
        for spin in (0, 1):
            m = 2 * k + spin
            linear += FermionOperator(((m, 1), (m, 0)), float(d))
    out = linear if power == 1 else linear * linear
    return prefactor * out


@register("grouping", "basis-rotation", aliases=("low-rank",),
          label="basis rotation (low-rank factorisation, Givens networks)")
@dataclass(frozen=True)
class BasisRotation(Grouping):
    """One group per factor of the low-rank factorisation; ``threshold`` (Ha) bounds the truncated part."""

    threshold: float = 1e-12

    needs_integrals: ClassVar[bool] = True
    constraints = {"threshold": Interval(float, 0.0, 1.0, closed="left", unit="Ha")}

    def groups(self, encoding: Any) -> tuple[float, list]:
        problem = getattr(encoding, "problem", None)
        if problem is None or not hasattr(problem, "fermion_hamiltonian"):
            return self.pauli_groups(encoding.hamiltonian, encoding.n_qubits)
        factors = factorise(problem, self.threshold)
        constant, groups = factors.constant, []
        for g, (u, d, prefactor, power) in enumerate(zip(factors.rotations, factors.weights, factors.prefactors,
                                                          factors.powers)):
            change = PauliRotationChange(_rotation_steps(encoding, u, g))
            diagonal = _encoded(encoding, measured_operator(d, prefactor, power), g)
            diagonal.compress(abs_tol=1e-14)
            part, group = z_group(change, diagonal, encoding.n_qubits, label=f"factor {g}")
            constant += part
            if group.coefficients.size:
                groups.append(group)
        return constant, groups
