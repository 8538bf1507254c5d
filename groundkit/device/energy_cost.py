"""The device cost of one energy of a pipeline: its compiled circuit, shots per measurement group and time.

The shot budget is the sampled estimator's ``shots`` (split over groups by its allocation and grouping), or for
any other estimator the shots for a standard error of 1.6 mHa (chemical accuracy; common practice, no single
source) with qubit-wise commuting groups and shots in proportion to the group standard deviations
(:func:`groundkit.estimators.shot_budget`). Time: :func:`groundkit.device.timing.energy_seconds`.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from ..accuracy import CHEMICAL_ACCURACY
from .device_circuit import DeviceCircuit
from .timing import energy_seconds


@dataclass(frozen=True)
class EnergyCost:
    """Shots for one energy, split over measurement groups, and the estimated seconds on the device."""

    shots: int
    group_shots: tuple[int, ...]
    seconds: float | None


def shot_plan(pipeline: Any, theta: np.ndarray) -> tuple[int, tuple[int, ...], tuple[bool, ...]]:
    """(total shots, shots per group, whether each group needs a basis change) for one energy at ``theta``."""
    from ..estimators import SampledEstimator
    from ..estimators.budget import group_sigmas, shots_for
    from ..estimators.groups import measurement_groups
    from ..estimators.sampled import allocate, statevector

    estimator = pipeline.resolved_components()["estimator"]
    encoding = pipeline.encoding()
    if isinstance(estimator, SampledEstimator):
        grouping, allocation = estimator.grouping, estimator.allocation
    else:
        grouping, allocation = "qwc", "variance"
    _, groups = measurement_groups(encoding.hamiltonian, encoding.n_qubits, grouping)
    if not groups:
        return 0, (), ()
    sigmas = group_sigmas(encoding, statevector(pipeline.objective(), encoding, theta), grouping)
    shots = (int(estimator.shots) if isinstance(estimator, SampledEstimator)
             else max(shots_for(sigmas, CHEMICAL_ACCURACY, allocation), 2 * len(groups)))
    per_group = tuple(int(n) for n in allocate(shots, sigmas, allocation))
    rotated = tuple(any(letter != "Z" for letter in g.basis.values()) for g in groups)
    return int(sum(per_group)), per_group, rotated


def energy_cost(pipeline: Any, theta: np.ndarray, compiled: DeviceCircuit) -> EnergyCost:
    """Shots and seconds on ``compiled.device`` for one energy of ``pipeline`` at ``theta`` (seconds None without
    a device)."""
    shots, per_group, rotated = shot_plan(pipeline, theta)
    if compiled.device is None:
        return EnergyCost(shots, per_group, None)
    seconds = energy_seconds(compiled.duration(), compiled.device.durations, per_group, rotated)
    return EnergyCost(shots, per_group, seconds)
