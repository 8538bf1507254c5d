"""Generators G = tau - tau^dagger and their exact exponentials on CI arrays.

tau sends each source determinant D to one target D' = sign * tau D, and tau^dagger sends D' back, so G acts on
each pair (D, D') as the 2x2 block [[0, -sign], [sign, 0]]. Hence G^3 = -G and

    exp(theta G) = 1 + sin(theta) G + (1 - cos(theta)) G^2,

a plane rotation by theta on every pair and the identity elsewhere. The public functions take and return real CI
arrays of shape (alpha strings, beta strings) and never modify their input.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np

from groundkit.errors import ParameterError
from groundkit.sector.steps import Buffer, Step, Steps
from groundkit.sector.tables import ExcitationTable


def apply_generator(ci: np.ndarray, table: ExcitationTable) -> np.ndarray:
    """G ci for the excitation of ``table`` (a new array)."""
    source, target = table.keys()
    weight = table.weight()
    out = np.zeros_like(np.asarray(ci, dtype=float))
    out[target] = weight * ci[source]
    out[source] = -weight * ci[target]
    return out


def rotate_inplace(buffer: Buffer, step: Step, theta: float) -> None:
    """Apply exp(theta G) of ``step`` to the buffer in place."""
    if theta == 0.0:
        return
    work = buffer.view(step.kind)
    source, target = step.index()
    weight = math.sin(theta) * step.signs()
    c = math.cos(theta)
    x = work[source]
    y = work[target]
    work[source] = c * x - weight * y
    work[target] = c * y + weight * x


def apply_exponential(ci: np.ndarray, table: ExcitationTable, theta: float) -> np.ndarray:
    """exp(theta G) ci (a new array); theta in radians."""
    return apply_product(ci, [table], [theta])


def as_steps(tables: Steps | Sequence[ExcitationTable], shape: tuple[int, int]) -> Steps:
    """``tables`` prepared as :class:`Steps` (returned unchanged if they already are)."""
    return tables if isinstance(tables, Steps) else Steps(list(tables), shape)


def apply_product(
    ci: np.ndarray, tables: Steps | Sequence[ExcitationTable], angles: Sequence[float]
) -> np.ndarray:
    """exp(angles[-1] G[-1]) ... exp(angles[0] G[0]) ci: the first table acts first (a new array)."""
    buffer = Buffer(ci)
    steps = as_steps(tables, buffer.ci.shape)
    if len(steps) != len(angles):
        raise ParameterError(f"{len(angles)} angles given for {len(steps)} excitation tables; give one per table")
    for step, theta in zip(steps.steps, angles):
        rotate_inplace(buffer, step, float(theta))
    return buffer.settle()
