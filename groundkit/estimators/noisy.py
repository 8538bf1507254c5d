"""NoisyEstimator: the trial circuit under a device's noise, simulated by density matrix or trajectories, with
optional error mitigation.

Noise (``groundkit.noise.model``): depolarising channels after one- and two-qubit gates, thermal relaxation of
every qubit for each moment's duration when T1 and T2 are set, per-qubit readout assignment errors. The figures
are ``errors=ErrorFigures(...)`` and ``durations=GateDurations(...)``; the older shorthand ``one_qubit=``,
``two_qubit=``, ``readout=`` (defaults 1e-3, 1e-2, 1e-2) still works and means ``ErrorFigures(one_qubit,
two_qubit, readout, t1=None, t2=None)``; giving both forms is refused. A pipeline with a device profile uses the
profile's figures and its routed native circuit instead (``groundkit.noise.device_link``).

Simulation: ``simulator='density-matrix'`` (exact mixed state, up to ``NOISY_QUBIT_LIMIT`` qubits) or
``'trajectories'`` (``trajectories`` Monte Carlo statevector runs, up to the statevector limit; ``backend``
'qsim' when qsimcirq is installed, else 'cirq'). Without ``shots`` the energy is the expectation under the noise
(for trajectories: their average, with its standard error); with ``shots`` it is sampled group by group.

Mitigation (``mitigation=`` any of 'readout', 'zne', 'symmetry', combinable): tensored readout mitigation
calibrated on the same model (``calibration_shots`` per calibration state, default ``shots``; exact without
shots); zero-noise extrapolation by unitary folding at ``zne_scales`` with the ``zne_fit`` 'linear',
'richardson' or 'exponential'; symmetry verification (post-selection on N and Sz). See docs/noise.md.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import cirq
import numpy as np

from ..constraints import ComponentOf, Integer, Interval, ListOf, OneOf, OrNone, Probability, Seed
from ..device.figures import ErrorFigures, GateDurations
from ..errors import ComponentError, NoiseError, SizeLimitError
from ..registry import register
from .base import Estimator, Measurement, central_differences
from .groups import measurement_groups
from .sampled import allocate

NOISY_QUBIT_LIMIT = 10  # density matrices of 4^n entries: 10 qubits = 16 MB, and Cirq's simulation time grows fast
MITIGATIONS = ("readout", "zne", "symmetry")
SIMULATORS = ("density-matrix", "trajectories")
LEGACY_DEFAULTS = {"one_qubit": 1e-3, "two_qubit": 1e-2, "readout": 1e-2}


@register("estimator", "noisy", label="noisy circuit (gate, relaxation and readout errors)")
@dataclass(frozen=True)
class NoisyEstimator(Estimator):
    """``NoisyEstimator(errors=ErrorFigures(...), durations=GateDurations(...), simulator='density-matrix',
    shots=None, mitigation=(), seed=None)``; see the module docstring and docs/noise.md. Energies in Ha."""

    one_qubit: float | None = None
    two_qubit: float | None = None
    readout: float | None = None
    shots: int | None = None
    seed: int | None = None
    gradient_step: float = 0.1
    errors: ErrorFigures | None = None
    durations: GateDurations | None = None
    simulator: str = "density-matrix"
    trajectories: int = 100
    backend: str | None = None
    mitigation: tuple[str, ...] = ()
    zne_scales: tuple[float, ...] = (1.0, 3.0, 5.0)
    zne_fit: str = "richardson"
    calibration_shots: int | None = None

    exact = False

    constraints = {
        "one_qubit": OrNone(Probability()),
        "two_qubit": OrNone(Probability()),
        "readout": OrNone(Probability()),
        "shots": OrNone(Integer(1)),
        "seed": Seed(),
        "gradient_step": Interval(float, 0.0, np.pi, closed="neither", unit="radians"),
        "errors": OrNone(ComponentOf("device_figures")),
        "durations": OrNone(ComponentOf("device_figures")),
        "simulator": OneOf(*SIMULATORS),
        "trajectories": Integer(2),
        "backend": OrNone(OneOf("cirq", "qsim")),
        "mitigation": ListOf(OneOf(*MITIGATIONS), single=True, unique=True),
        "zne_scales": ListOf(Interval(float, 1.0, None), min_length=2, unique=True),
        "zne_fit": OneOf("linear", "richardson", "exponential"),
        "calibration_shots": OrNone(Integer(1)),
    }

    def check_options(self) -> None:
        legacy = {k: getattr(self, k) for k in LEGACY_DEFAULTS if getattr(self, k) is not None}
        if self.errors is not None and legacy:
            raise ComponentError(f"NoisyEstimator got errors={self.errors!r} and {legacy}: give the error rates once, "
                                 "in errors=ErrorFigures(...)")
        if self.errors is not None and not isinstance(self.errors, ErrorFigures):
            raise ComponentError(f"NoisyEstimator errors={self.errors!r} must be an ErrorFigures")
        if self.durations is not None and not isinstance(self.durations, GateDurations):
            raise ComponentError(f"NoisyEstimator durations={self.durations!r} must be a GateDurations")
        if "zne" in self.mitigation and self.zne_fit == "exponential" and len(self.zne_scales) < 3:
            raise ComponentError(f"zne_fit='exponential' needs 3 or more zne_scales; got {list(self.zne_scales)}")

    def figures(self) -> ErrorFigures:
        """The error figures this estimator applies without a device profile."""
        if self.errors is not None:
            return self.errors
        rates = {k: LEGACY_DEFAULTS[k] if getattr(self, k) is None else getattr(self, k) for k in LEGACY_DEFAULTS}
        try:
            return ErrorFigures(**rates, t1=None, t2=None)
        except ValueError as err:
            raise ComponentError(f"NoisyEstimator: {err}") from None

    def bind(self, pipeline: Any, objective: Any = None) -> NoisyMeasurement:
        from ..noise.device_link import device_inputs

        objective = pipeline.objective() if objective is None else objective
        return self.measure(objective, pipeline.encoding(), device=device_inputs(pipeline))

    def measure(self, objective: Any, encoding: Any = None, device: Any = None) -> NoisyMeasurement:
        if encoding is None:
            raise ComponentError("NoisyEstimator needs the qubit register: bind it through a pipeline")
        from ..qubits.encoding import QUBIT_STATE_LIMIT

        limit = NOISY_QUBIT_LIMIT if self.simulator == "density-matrix" else QUBIT_STATE_LIMIT
        if encoding.n_qubits > limit:
            hint = " or simulator='trajectories'" if self.simulator == "density-matrix" else ""
            raise SizeLimitError(
                f"noisy simulation ({self.simulator}) of {encoding.n_qubits} qubits is above the limit of {limit} "
                f"qubits; use a smaller active space or tapering{hint}, or the SampledEstimator"
            )
        return NoisyMeasurement(self, objective, encoding, device)


class NoisyMeasurement(Measurement):
    """A NoisyEstimator bound to one objective and register; ``record()`` describes the last estimate."""

    exact = False
    provides_gradient = True

    def __init__(self, options: NoisyEstimator, objective: Any, encoding: Any, device: Any = None) -> None:
        from ..noise.model import DeviceNoise
        from ..noise.readings import GroupReader
        from ..noise.readout import calibrate, mitigation_weights
        from ..noise.simulation import qsim_available
        from ..noise.symmetry import sector_mask

        self.options = options
        self.objective = objective
        self.encoding = encoding
        self.device = device
        self.n_qubits = encoding.n_qubits
        # explicit errors= / durations= win over a device profile's figures (the routed circuit is kept)
        errors = options.errors if options.errors is not None else (
            device.errors if device is not None else options.figures())
        durations = options.durations if options.durations is not None else (
            device.durations if device is not None else GateDurations())
        self.noise = DeviceNoise(errors, durations)
        self.rng = np.random.default_rng(options.seed)
        self.backend = options.backend or ("qsim" if qsim_available() else "cirq")
        if self.backend == "qsim" and not qsim_available():
            raise NoiseError("backend='qsim' needs qsimcirq, which is not installed; use backend='cirq'")
        self.constant, self.groups = measurement_groups(encoding.hamiltonian, self.n_qubits, "qwc")
        assignment = self.noise.assignment(self.n_qubits)
        self.calibration = None
        weights = None
        if "readout" in options.mitigation:
            shots = options.calibration_shots or options.shots
            self.calibration = calibrate(self.noise, self.n_qubits, shots, self.rng)
            weights = mitigation_weights(self.calibration)
        mask = sector_mask(encoding) if "symmetry" in options.mitigation else None
        self.reader = GroupReader(self.constant, self.groups, self.n_qubits, assignment, weights, mask)
        self._record: dict[str, Any] | None = None
        self._trajectories = options.trajectories

    # circuits ----------------------------------------------------------------------------------------------
    def circuit(self, theta: np.ndarray) -> tuple[cirq.Circuit, list[cirq.Qid]]:
        """(noiseless circuit, logical qubits in register order): the routed one with a device profile."""
        if self.device is not None:
            return self.device.circuit(theta)
        from ..circuits import trial_circuit

        return trial_circuit((self.encoding, self.objective.trial_state), theta), cirq.LineQubit.range(self.n_qubits)

    def noisy_circuit(self, theta: np.ndarray) -> cirq.Circuit:
        """The trial circuit with the noise model's channels."""
        return self.noise.noisy(self.circuit(theta)[0])

    def density_matrix(self, theta: np.ndarray) -> np.ndarray:
        """Final density matrix (2^n × 2^n, qubit 0 most significant) of the noisy circuit."""
        from ..noise.simulation import density_matrix

        circuit, qubits = self.circuit(theta)
        return density_matrix(self.noise.noisy(circuit), qubits)

    # estimates ---------------------------------------------------------------------------------------------
    def estimate(self, theta: np.ndarray) -> tuple[float, float]:
        circuit, qubits = self.circuit(theta)
        if "zne" not in self.options.mitigation:
            reading = self.read(circuit, qubits)
            self._record = self._describe(reading.kept_fraction, None)
            return reading.energy, reading.standard_error
        from ..noise.extrapolation import extrapolate
        from ..noise.folding import fold

        scales, energies, errors, kept = [], [], [], []
        for scale in self.options.zne_scales:
            folded, achieved = fold(circuit, scale)
            reading = self.read(folded, qubits)
            scales.append(achieved)
            energies.append(reading.energy)
            errors.append(reading.standard_error)
            kept.append(reading.kept_fraction)
        result = extrapolate(scales, energies, errors, self.options.zne_fit)
        self._record = self._describe(float(kept[0]), result.to_dict())
        return result.value, result.standard_error

    def read(self, circuit: cirq.Circuit, qubits: list[cirq.Qid]) -> Any:
        """The :class:`~groundkit.noise.readings.Reading` of one noiseless circuit under the noise."""
        from ..noise.simulation import density_matrix, statevector_runs

        noisy = self.noise.noisy(circuit)
        shots = self.options.shots
        if self.options.simulator == "density-matrix":
            states, density, count = [density_matrix(noisy, qubits)], True, 1
        else:
            count = self.options.trajectories
            if shots is not None:
                count = min(count, shots // len(self.groups))
                if count < 2:
                    raise NoiseError(f"shots={shots} are too few for trajectories over {len(self.groups)} "
                                     f"measurement groups; give at least {2 * len(self.groups)} (one shot per group "
                                     "and trajectory, two trajectories)")
            self._trajectories = count
            seed = int(self.rng.integers(2 ** 31))
            states, density = statevector_runs(noisy, qubits, count, seed, self.backend), False
        if shots is None:
            return self.reader.exact(states, density)
        per_state = shots // count
        minimum = 1 if count > 1 else 2
        if per_state < minimum * len(self.groups):
            raise NoiseError(f"shots={shots} are too few for {len(self.groups)} measurement groups; give at least "
                             f"{minimum * len(self.groups)}")
        allocation = allocate(per_state, np.ones(len(self.groups)), "uniform", minimum=minimum)
        return self.reader.sampled(states, density, allocation, self.rng)

    def _describe(self, kept_fraction: float, extrapolation: dict | None) -> dict[str, Any]:
        o = self.options
        return {
            "noise_model": self.noise.describe(),
            "device": None if self.device is None else self.device.name,
            "simulator": o.simulator,
            "trajectories": None if o.simulator == "density-matrix" else self._trajectories,
            "backend": None if o.simulator == "density-matrix" else self.backend,
            "shots": o.shots,
            "mitigation": list(o.mitigation),
            "kept_fraction": float(kept_fraction),
            "extrapolation": extrapolation,
            "calibration": None if self.calibration is None else [np.asarray(a).tolist() for a in self.calibration],
        }

    def record(self) -> dict[str, Any] | None:
        """Plain data of the noise model, mitigation and kept fraction of the last estimate."""
        return self._record

    def energy_and_gradient(self, theta: np.ndarray) -> tuple[float, np.ndarray]:
        """Noisy energy and central finite-difference gradient (2P + 1 noisy estimates)."""
        return self.energy(theta), central_differences(self.energy, theta, self.options.gradient_step)
