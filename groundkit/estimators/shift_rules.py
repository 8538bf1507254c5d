"""Parameter-shift gradients: exact derivatives from energies at shifted angles, so sampled energies give them.

- A fermionic excitation factor exp(phi G) with G = tau - tau† has G^3 = -G, so E(phi) holds frequencies 1 and 2
  only, and the four-term rule is exact (Anselmetti, Wierichs, Gogolin, Parrish, New J. Phys. 23, 113010 (2021),
  written here for exp(phi G), i.e. half their angle):
  dE/dphi = d+ [E(phi + pi/4) - E(phi - pi/4)] - d- [E(phi + 3pi/4) - E(phi - 3pi/4)], d± = (sqrt2 ± 1)/(2 sqrt2).
- A Pauli rotation exp(-i a theta P / 2) (cirq.rx/ry/rz with an angle a·theta + b) whose parameter drives no other
  gate has frequency a, and the two-term rule is exact:
  dE/dtheta = a [E(theta + pi/(2a)) - E(theta - pi/(2a))] / 2 (Mitarai et al., PRA 98, 032309 (2018);
  Schuld et al., PRA 99, 032331 (2019)).

Shared parameters follow the chain rule over the excitation angles they drive. A parameter no rule covers (a
symbol in several gates, a gate that is not a plain rotation) is differentiated by central differences. With
independent estimates of standard error s_i the gradient's standard error is sqrt(sum_i w_i^2 s_i^2).
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

import numpy as np

Estimate = Callable[[np.ndarray], tuple[float, float]]  # register state -> (energy, standard error)

_D_PLUS = (np.sqrt(2) + 1) / (2 * np.sqrt(2))
_D_MINUS = (np.sqrt(2) - 1) / (2 * np.sqrt(2))
FOUR_TERM = ((np.pi / 4, _D_PLUS), (-np.pi / 4, -_D_PLUS), (3 * np.pi / 4, -_D_MINUS), (-3 * np.pi / 4, _D_MINUS))


def _combine(estimate: Estimate, points: list[tuple[np.ndarray, float]]) -> tuple[float, float]:
    value, variance = 0.0, 0.0
    for state, weight in points:
        e, s = estimate(state)
        value += weight * e
        variance += (weight * s) ** 2
    return value, variance


def fermionic_shift_gradient(objective: Any, encoding: Any, theta: np.ndarray,
                             estimate: Estimate) -> tuple[np.ndarray, np.ndarray]:
    """(gradient in Ha/rad, its standard error) of an :class:`~groundkit.objective.Objective` by the four-term
    rule on every excitation angle."""
    from ..sector.exponential import apply_product

    plan = objective.plan
    angles = plan.angles(objective.check_parameters(theta))
    gradient = np.zeros(plan.n_parameters)
    variance = np.zeros(plan.n_parameters)
    for k, (index, scale) in enumerate(zip(plan.parameter_index, plan.scale)):
        points = []
        for shift, weight in FOUR_TERM:
            shifted = angles.copy()
            shifted[k] += shift
            points.append((encoding.embed(apply_product(objective.reference_state, objective.steps, shifted)), weight))
        value, var = _combine(estimate, points)
        gradient[index] += scale * value
        variance[index] += scale**2 * var
    return gradient, np.sqrt(variance)


def rotation_frequencies(objective: Any) -> list[float | None]:
    """Per parameter of a :class:`~groundkit.qubit_states.QubitObjective`: the factor a when the parameter
    drives exactly one cirq.rx/ry/rz gate with angle a·theta + b, else None (no two-term rule)."""
    import cirq
    import sympy

    found: list[float | None] = []
    operations = list(objective.circuit.all_operations())
    for symbol in objective.symbols:
        using = [op for op in operations if symbol in cirq.parameter_symbols(op)]
        a = None
        if len(using) == 1 and isinstance(using[0].gate, (cirq.Rx, cirq.Ry, cirq.Rz)):
            rads = sympy.sympify(using[0].gate._rads)
            slope = sympy.diff(rads, symbol)
            if rads.free_symbols == {symbol} and not slope.free_symbols and float(slope) != 0.0:
                a = float(slope)
        found.append(a)
    return found


def qubit_shift_gradient(objective: Any, encoding: Any, theta: np.ndarray, estimate: Estimate,
                         step: float) -> tuple[np.ndarray, np.ndarray]:
    """(gradient, standard error) of a qubit objective: two-term rule where it holds, central differences of
    ``step`` radians elsewhere."""
    theta = objective.check_parameters(theta)
    gradient = np.zeros(theta.size)
    error = np.zeros(theta.size)
    for m, a in enumerate(rotation_frequencies(objective)):
        if a is None:
            offsets = [(step, 1 / (2 * step)), (-step, -1 / (2 * step))]
        else:
            offsets = [(np.pi / (2 * a), a / 2), (-np.pi / (2 * a), -a / 2)]
        points = []
        for shift, weight in offsets:
            shifted = theta.copy()
            shifted[m] += shift
            points.append((objective.register_state(shifted, encoding), weight))
        gradient[m], var = _combine(estimate, points)
        error[m] = np.sqrt(var)
    return gradient, error


def shift_gradient(objective: Any, encoding: Any, theta: np.ndarray, estimate: Estimate,
                   step: float = 0.1) -> tuple[np.ndarray, np.ndarray, str]:
    """(gradient in Ha/rad, standard error, method) by the rule that fits the objective: 'four-term' for
    fermionic excitations, 'two-term' (or central differences per parameter) for qubit circuits, else
    'differences' (central differences of ``step`` radians on every parameter)."""
    from ..objective import Objective
    from ..qubit_states.objective import QubitObjective

    if isinstance(objective, Objective):
        return (*fermionic_shift_gradient(objective, encoding, theta, estimate), "four-term")
    if isinstance(objective, QubitObjective):
        return (*qubit_shift_gradient(objective, encoding, theta, estimate, step), "two-term")
    theta = np.asarray(theta, dtype=float)
    gradient, error = np.zeros(theta.size), np.zeros(theta.size)
    for m in range(theta.size):
        points = []
        for sign in (1, -1):
            shifted = theta.copy()
            shifted[m] += sign * step
            points.append((objective.register_state(shifted, encoding), sign / (2 * step)))
        gradient[m], var = _combine(estimate, points)
        error[m] = np.sqrt(var)
    return gradient, error, "differences"
