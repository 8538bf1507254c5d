"""compare_devices: one pipeline's circuit compiled for several devices, side by side (a pandas DataFrame)."""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

import numpy as np

from ..errors import DeviceError
from .builtins import BUILTIN_DEVICES
from .compile import compile_for_device
from .energy_cost import shot_plan
from .profile import as_device
from .timing import energy_seconds

COLUMNS = ("device", "connectivity", "native_gate", "device_qubits", "qubits", "logical_two_qubit_gates",
           "logical_depth", "two_qubit_gates", "depth", "swaps", "circuit_ns", "shots", "seconds_per_energy",
           "compile_seconds", "note")


def generic_parameters(n_parameters: int, seed: int = 0) -> np.ndarray:
    """Angles (radians) drawn uniformly from (−π, π) with ``seed``: no rotation vanishes by accident, so gate
    counts after rewriting are those of a general point (at θ = 0 whole blocks compile to nothing)."""
    return np.random.default_rng(seed).uniform(-np.pi, np.pi, n_parameters)


def compare_devices(pipeline: Any, devices: Sequence[Any] | None = None, parameters: Any = None) -> Any:
    """pandas DataFrame, one row per device (``None`` is the logical all-to-all register; default: the logical
    register and every built-in profile): counts before and after routing and rewriting, SWAPs, the circuit's
    duration (ns), the shots and seconds of one energy (see :mod:`groundkit.device.energy_cost`) and the
    compilation time (s). ``parameters`` (radians) default to :func:`generic_parameters`. A device too small for
    the register gets a row with a ``note`` instead of counts."""
    import pandas as pd

    from ..circuits import trial_circuit

    chosen = [None, *BUILTIN_DEVICES] if devices is None else list(devices)
    objective = pipeline.objective()
    theta = (generic_parameters(objective.n_parameters) if parameters is None
             else objective.check_parameters(parameters))
    n = pipeline.encoding().n_qubits
    logical = trial_circuit(pipeline, theta)
    shots, per_group, rotated = shot_plan(pipeline, theta)
    rows = []
    for value in chosen:
        profile = as_device(value)
        row: dict[str, Any] = dict.fromkeys(COLUMNS)
        row.update(device=profile.name if profile else "logical", qubits=n, note="",
                   connectivity=profile.connectivity if profile else "all-to-all",
                   native_gate=profile.native_gate if profile else None,
                   device_qubits=profile.n_qubits if profile else n)
        try:
            compiled = compile_for_device(logical, profile, n_qubits=n)
        except DeviceError as err:
            row["note"] = str(err)
            rows.append(row)
            continue
        seconds = None if profile is None else energy_seconds(compiled.duration(), profile.durations, per_group,
                                                              rotated)
        row.update(compiled.counts(), device=row["device"], circuit_ns=compiled.duration(), shots=shots,
                   seconds_per_energy=seconds, compile_seconds=compiled.compile_seconds)
        rows.append(row)
    return pd.DataFrame(rows, columns=list(COLUMNS))
