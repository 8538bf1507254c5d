"""The device figures of one minimised point under one mapping: gates, depth, shots, time per shot, noise threshold.

A :class:`FigureTask` is plain data (molecule, components, the minimised parameters, the groupings and devices to
cost), so :func:`figure_task` runs in this process, in a process pool or on a Dask worker like a scan point. One
task serves every grouping, device and mitigation of a (run, mapping, geometry): the circuit is compiled once per
device and the group variances once per grouping.

Time per shot: the sum over the circuit's moments of the longest operation in each (two-qubit gate duration when
a moment holds a two-qubit operation, else the one-qubit duration), plus measurement, reset and the per-shot
overhead (:class:`groundkit.device.GateDurations`). Without a device profile, or with one that does not route,
the circuit is the logical one (all-to-all connectivity, no SWAPs) and the durations are the defaults of
``GateDurations``: illustrative figures, not any particular device.
"""

from __future__ import annotations

import numbers
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from groundkit.errors import GroundkitError
from groundkit.molecule import MoleculeSpec

from .work import pipeline_of

GRADIENT_ESTIMATES_FERMIONIC = 4
"""Energy estimates per parameter for one gradient of a fermionic excitation exp(θG), G³ = −G: E(θ) holds the
frequencies 1 and 2, so an exact shift rule takes 2·2 = 4 estimates (Wierichs, Izaac, Wang, Lin, Quantum 6, 677
(2022); Kottmann, Anand, Aspuru-Guzik, Chem. Sci. 12, 3497 (2021))."""
GRADIENT_ESTIMATES_PAULI = 2
"""Energy estimates per parameter for one gradient of Pauli rotations exp(−iθP/2): the two-term shift rule."""


@dataclass(frozen=True)
class FigureTask:
    """One (run, mapping, geometry): ``components`` by role (the trial state as minimised: an adaptive state's
    grown sequence), ``parameters`` (radians) of the minimised point, the ``groupings`` and ``devices`` (None:
    the logical circuit) to cost, the ``target`` precision (Ha) of a shot budget and the ``mitigations`` of a
    noise threshold (None: no noise threshold asked)."""

    molecule: MoleculeSpec
    components: dict[str, Any]
    parameters: tuple[float, ...]
    groupings: tuple[str, ...]
    devices: tuple[Any, ...]
    target: float
    mitigations: tuple[Any, ...] | None = None
    extras: dict[str, Any] = field(default_factory=dict)


def figure_task(task: FigureTask) -> dict[str, Any]:
    """Plain dict: ``qubits``, ``shots`` (grouping → shots or None), ``shot_notes``, ``devices`` (one dict per
    device: ``two_qubit_gates``, ``depth``, ``swaps``, ``shot_time_us``, ``routed``, ``note``), ``noise`` (per
    device, per mitigation: [threshold or None, note]), ``active_space_error`` (Ha or None) and ``error`` (why
    the mapping cannot serve this run, or None). A GroundkitError of one figure leaves it None with the reason."""
    answer: dict[str, Any] = {"qubits": None, "shots": {}, "shot_notes": {}, "devices": [], "noise": [],
                              "active_space_error": None, "error": None}
    try:
        pipeline = pipeline_of(task.molecule, task.components)
        objective = pipeline.objective()
        theta = objective.check_parameters(np.asarray(task.parameters, dtype=float))
        answer["qubits"] = int(pipeline.encoding().n_qubits)
    except GroundkitError as err:
        answer["error"] = f"{type(err).__name__}: {err}"
        return answer
    answer["active_space_error"] = active_space_error(pipeline)
    for grouping in task.groupings:
        try:
            answer["shots"][grouping] = int(pipeline.shot_budget(precision=task.target, parameters=theta,
                                                                 grouping=grouping))
        except GroundkitError as err:
            answer["shots"][grouping] = None
            answer["shot_notes"][grouping] = f"{type(err).__name__}: {err}"
    for device in task.devices:
        answer["devices"].append(device_figures(pipeline, objective, theta, device))
        if task.mitigations is not None:
            answer["noise"].append([noise_figure(pipeline, device, m, task.target, theta) for m in task.mitigations])
    return answer


def on_device(pipeline: Any, device: Any) -> Any:
    """The pipeline on ``device`` (None: as it is); DeviceError-free until device profiles exist."""
    if device is None:
        return pipeline
    return pipeline.device(device)


def device_figures(pipeline: Any, objective: Any, theta: np.ndarray, device: Any) -> dict[str, Any]:
    """Two-qubit gates, depth, SWAPs (None when not routed), time per shot (µs) of the circuit on ``device``."""
    from groundkit.resources import resources_for

    out: dict[str, Any] = {"two_qubit_gates": None, "depth": None, "swaps": None, "shot_time_us": None,
                           "routed": False, "note": ""}
    try:
        placed = on_device(pipeline, device)
        resources = resources_for(placed, objective, theta)
        circuit = placed.circuit(theta)
    except GroundkitError as err:
        out["note"] = f"{type(err).__name__}: {err}"
        return out
    out["two_qubit_gates"] = resources.two_qubit_gates
    out["depth"] = resources.depth
    swaps = getattr(resources, "swaps", None)
    out["swaps"] = None if swaps is None else int(swaps)
    out["routed"] = swaps is not None
    durations = device_durations(device)
    out["shot_time_us"] = shot_time_us(circuit, durations)
    if device is None:
        out["note"] = "logical circuit (all-to-all, no SWAPs), default gate durations (illustrative)"
    return out


def device_durations(device: Any) -> Any:
    """The device's :class:`~groundkit.device.GateDurations`, or the defaults."""
    from groundkit.device import GateDurations

    durations = getattr(device, "durations", None) if device is not None else None
    return durations if isinstance(durations, GateDurations) else GateDurations()


def shot_time_us(circuit: Any, durations: Any) -> float:
    """Microseconds for one shot of ``circuit`` (a ``DeviceCircuit`` or a Cirq circuit): reset, the circuit (each
    moment as long as its slowest gate; ``groundkit.device.timing``), one basis-change layer, measurement and the
    per-shot overhead."""
    from groundkit.device.timing import US_PER_S, circuit_duration, shot_seconds

    circuit = getattr(circuit, "circuit", circuit)
    return shot_seconds(circuit_duration(circuit, durations), durations, rotated=True) * US_PER_S


def gradient_estimates(pipeline: Any) -> int:
    """Energy estimates per parameter for one gradient on a device (shift rules; see the constants above)."""
    from groundkit.adaptive import Adaptive, PauliStringPool, QubitPool
    from groundkit.qubit_states import QubitTrialState

    trial_state = pipeline.resolved_components()["trial_state"]
    pauli = isinstance(trial_state, QubitTrialState) or (
        isinstance(trial_state, Adaptive) and isinstance(trial_state.pool, (QubitPool, PauliStringPool)))
    return GRADIENT_ESTIMATES_PAULI if pauli else GRADIENT_ESTIMATES_FERMIONIC


def noise_figure(pipeline: Any, device: Any, mitigation: Any, target: float, theta: Any = None) -> list[Any]:
    """[noise threshold (the largest two-qubit error rate within ``target``) or None, note] from
    ``groundkit.noise_threshold`` at the run's parameters ``theta`` (radians)."""
    from types import SimpleNamespace

    from groundkit.adaptive import Adaptive
    from groundkit.noise.threshold import noise_threshold

    options: dict[str, Any] = {}
    if theta is not None and not isinstance(pipeline.resolved_components()["trial_state"], Adaptive):
        options["result"] = SimpleNamespace(parameters=np.asarray(theta, dtype=float), growth=None,
                                            exact_energy=None)
    try:
        value = noise_threshold(on_device(pipeline, device), target=target,
                                mitigation=() if mitigation is None else mitigation, **options)
    except GroundkitError as err:
        return [None, f"{type(err).__name__}: {err}"]
    number = value if isinstance(value, numbers.Real) else next(
        (getattr(value, name) for name in ("two_qubit", "threshold", "factor", "value")
         if isinstance(getattr(value, name, None), numbers.Real)), None)
    if number is None:
        return [None, f"not available: noise_threshold returned {type(value).__name__}, not a number"]
    return [float(number), ""]


def active_space_error(pipeline: Any) -> float | None:
    """What the active space loses (Ha): the exact active-space energy against full-space FCI where affordable,
    else CCSD(T) (``Problem.active_space_error``, computed once per problem); None when it cannot be computed."""
    try:
        value = pipeline.problem().active_space_error
    except GroundkitError:
        return None
    value = getattr(value, "error", value)
    return float(value) if isinstance(value, numbers.Real) and np.isfinite(value) else None
