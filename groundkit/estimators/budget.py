"""Shot budgets: how many shots a target standard error costs, from the exact group variances.

With N_g proportional to sigma_g the variance of the energy is (sum_g sigma_g)^2 / N, so N = (sum_g sigma_g)^2 /
eps^2 (Wecker, Hastings, Troyer, Phys. Rev. A 92, 042303 (2015); Rubin, Babbush, McClean, New J. Phys. 20,
053020 (2018)). With uniform allocation N_g = N / G, the variance is G sum_g sigma_g^2 / N.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from ..errors import ComponentError, GroundkitError, SymmetryError
from .grouping import as_grouping, grouping_names, groups_for
from .groups import group_moments
from .sampled import ALLOCATIONS, statevector


def group_sigmas(encoding: Any, state: np.ndarray, grouping: Any) -> np.ndarray:
    """Exact standard deviation (Ha) of each measurement group's per-shot value in ``state``."""
    _, groups = groups_for(encoding, grouping)
    return np.sqrt([group_moments(state, g, encoding.n_qubits)[1] for g in groups])


def shots_for(sigmas: np.ndarray, precision: float, allocation: str) -> int:
    """Total shots for standard error ``precision`` (Ha) given group standard deviations."""
    if not (isinstance(precision, (int, float)) and precision > 0 and math.isfinite(precision)):
        raise ComponentError(f"precision={precision!r} must be a positive number of Hartree")
    if allocation not in ALLOCATIONS:
        raise ComponentError(f"unknown allocation {allocation!r}; accepted: {', '.join(ALLOCATIONS)}")
    if allocation == "variance":
        total = float(np.sum(sigmas)) ** 2 / precision**2
    else:
        total = len(sigmas) * float(np.sum(np.square(sigmas))) / precision**2
    return int(math.ceil(total))


def shot_budget(pipeline: Any, precision: float = 1.6e-3, parameters: Any = None, grouping: str = "qwc",
                allocation: str = "variance") -> int:
    """Total shots for one energy estimate with standard error ``precision`` (Ha) at ``parameters``."""
    as_grouping(grouping)
    objective = pipeline.objective()
    theta = objective.initial_parameters() if parameters is None else objective.check_parameters(parameters)
    encoding = pipeline.encoding()
    state = statevector(objective, encoding, theta)
    return shots_for(group_sigmas(encoding, state, grouping), precision, allocation)


def compare_measurements(pipeline: Any, precision: float = 1.6e-3, parameters: Any = None) -> Any:
    """pandas DataFrame: qubits, groups, two-qubit gates the measurement circuits add (worst and mean over the
    groups) and predicted shots per mapping x tapering x grouping x allocation.

    The state is the pipeline's trial state at ``parameters`` (default: its start), embedded in each register;
    where it leaves a tapered symmetry sector the row's shots are None and ``note`` says why.
    """
    import pandas as pd

    from ..mapping import MAPPINGS, QubitMapping
    from .measurement_circuits import measurement_cost

    rows = []
    objective = pipeline.objective()
    theta = objective.initial_parameters() if parameters is None else objective.check_parameters(parameters)
    for name in MAPPINGS:
        for taper in (False, True):
            encoding = pipeline.mapping(QubitMapping(name, taper=taper)).encoding()
            try:
                state, note = statevector(objective, encoding, theta), ""
            except SymmetryError:
                state, note = None, "the state leaves the tapered symmetry sector"
            for grouping in grouping_names():
                try:
                    cost = measurement_cost(encoding, grouping, getattr(pipeline, "device_profile", None))
                    sigmas = None if state is None else group_sigmas(encoding, state, grouping)
                    why = note
                except GroundkitError as exc:  # e.g. a basis rotation that leaves the tapered sector
                    cost, sigmas, why = None, None, str(exc).split(";")[0]
                for allocation in ALLOCATIONS:
                    rows.append({
                        "mapping": name, "tapered": taper, "qubits": encoding.n_qubits, "grouping": grouping,
                        "groups": None if cost is None else cost.groups,
                        "added_two_qubit_worst": None if cost is None else cost.worst,
                        "added_two_qubit_mean": None if cost is None else cost.mean,
                        "allocation": allocation,
                        "shots": None if sigmas is None else shots_for(sigmas, precision, allocation), "note": why,
                    })
    return pd.DataFrame(rows)
