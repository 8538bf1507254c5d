"""The noise threshold: the largest error rates at which a configuration still reaches a target accuracy.

At the configuration's optimal parameters θ* (from an exact-estimator run, or a given result), every error rate
of the figures is scaled by one factor f (:meth:`ErrorFigures.scaled`: gate and readout probabilities times f, T1
and T2 divided by f), and the (mitigated) noisy energy E_f(θ*) is compared with the exact reference. The search
brackets f by factors of 4 from f = 1 and then bisects on log f until the bracket is narrower than ``tolerance``
(relative). Every evaluation uses the same seed (common random numbers), so the search is reproducible and the
decisions along it are consistent. The threshold is quoted as the two-qubit error rate base.two_qubit · f.

The confidence statement comes from the sampling statistics of the two bracketing evaluations: the one-sided
normal probability that the passing one truly lies within the target and the failing one truly outside.
Illustrative figures are illustrative: a threshold holds for this noise model, not for any particular device.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from ..device.figures import ErrorFigures, GateDurations
from ..errors import NoiseError
from ..result import CHEMICAL_ACCURACY


@dataclass(frozen=True)
class NoiseThreshold:
    """Result of :func:`noise_threshold`; rates are probabilities, errors in Ha."""

    two_qubit: float
    """Largest two-qubit error rate found within the target (base.two_qubit × factor); 0 when none."""
    factor: float
    failing_factor: float | None
    target: float
    mitigation: tuple[str, ...]
    base: dict[str, Any]
    error: float | None
    standard_error: float
    confidence: str
    reason: str = ""
    evaluations: tuple[tuple[float, float, float], ...] = field(default=())
    """(factor, error Ha, standard error Ha) of every evaluation, in the order made."""

    def to_dict(self) -> dict[str, Any]:
        return {"two_qubit": self.two_qubit, "factor": self.factor, "failing_factor": self.failing_factor,
                "target": self.target, "mitigation": list(self.mitigation), "base": self.base, "error": self.error,
                "standard_error": self.standard_error, "confidence": self.confidence, "reason": self.reason,
                "evaluations": [list(e) for e in self.evaluations]}


def optimal_configuration(pipeline: Any, result: Any = None) -> tuple[Any, np.ndarray]:
    """(pipeline with a fixed trial state, θ*): from ``result`` if given, else from an exact-estimator run. A grown
    adaptive state becomes the fixed sequence of its growth records."""
    from ..adaptive import Adaptive
    from ..adaptive.records import grown_trial_state

    if result is None:
        result = pipeline.estimator("exact").run()
    theta = np.asarray(result.parameters, dtype=float)
    if isinstance(pipeline.resolved_components()["trial_state"], Adaptive) or result.growth:
        pipeline = pipeline.trial_state(grown_trial_state(result))
        energy = pipeline.objective().energy(theta)
        if result.exact_energy is not None and abs(energy - result.exact_energy) > 1e-8:
            raise NoiseError("the grown sequence of this adaptive result does not reproduce its energy "
                             f"({energy:.10f} against {result.exact_energy:.10f} Ha)")
    return pipeline, theta


class ThresholdSearch:
    """The noisy error E_f(θ*) − E_exact as a function of the factor f, for one configuration."""

    def __init__(self, pipeline: Any, *, target: float = CHEMICAL_ACCURACY, mitigation: Any = (),
                 errors: ErrorFigures | None = None, durations: GateDurations | None = None, result: Any = None,
                 seed: int = 0, **estimator_options: Any) -> None:
        from ..estimators import NoisyEstimator
        from .device_link import device_inputs

        if not (isinstance(target, (int, float)) and target > 0 and math.isfinite(target)):
            raise NoiseError(f"target={target!r} must be a positive number of Hartree (e.g. 1.6e-3)")
        device = device_inputs(pipeline)
        self.base = errors if errors is not None else (device.errors if device is not None else ErrorFigures())
        self.durations = durations if durations is not None else (device.durations if device is not None
                                                                  else GateDurations())
        if not isinstance(self.base, ErrorFigures):
            raise NoiseError(f"errors={self.base!r} must be an ErrorFigures")
        if self.base.noiseless:
            raise NoiseError("the base error figures are all zero: there is no rate to scale")
        self.target = float(target)
        self.seed = seed
        self.options = dict(estimator_options, mitigation=mitigation, seed=seed, durations=self.durations)
        NoisyEstimator(**self.options)  # options checked before any work
        self.mitigation = NoisyEstimator(**self.options).mitigation
        self.pipeline, self.theta = optimal_configuration(pipeline, result)
        self.reference = self.pipeline.problem().reference.energy
        self.exact_error = float(self.pipeline.objective().energy(self.theta) - self.reference)
        self.evaluations: list[tuple[float, float, float]] = []

    def error_at(self, factor: float) -> tuple[float, float]:
        """(error, standard error) in Ha of the noisy energy at θ* with every rate scaled by ``factor``."""
        from ..estimators import NoisyEstimator

        if factor == 0:
            return self.exact_error, 0.0
        estimator = NoisyEstimator(errors=self.base.scaled(factor), **self.options)
        value, stderr = estimator.bind(self.pipeline).estimate(self.theta)
        out = (float(value - self.reference), float(stderr))
        self.evaluations.append((float(factor), *out))
        return out

    def passes(self, factor: float) -> bool:
        return abs(self.error_at(factor)[0]) <= self.target

    def run(self, tolerance: float = 0.1, smallest: float = 1e-4) -> NoiseThreshold:
        """Bracket and bisect (on log f) to a relative bracket width ``tolerance``."""
        if not abs(self.exact_error) <= self.target:
            return self._result(0.0, None, f"the configuration misses the target without noise (error "
                                           f"{1000 * self.exact_error:.3f} mHa at its optimal parameters)")
        largest = 1.0 / max(self.base.two_qubit, self.base.one_qubit, 2 * self.base.readout, 1e-300)
        low, high = 0.0, None
        factor = min(1.0, largest)
        if self.passes(factor):
            low = factor
            while high is None and low < largest:
                factor = min(4.0 * low, largest)
                if self.passes(factor):
                    low = factor
                else:
                    high = factor
            if high is None:
                return self._result(low, None, "within the target up to the largest rates the figures allow")
        else:
            high = factor
            while low == 0.0 and high > smallest:
                factor = high / 4.0
                if self.passes(factor):
                    low = factor
                else:
                    high = factor
            if low == 0.0:
                return self._result(0.0, high, f"outside the target even at {smallest:g} times the base rates")
        while high / low > 1.0 + tolerance:
            middle = math.sqrt(low * high)
            if self.passes(middle):
                low = middle
            else:
                high = middle
        return self._result(low, high, "")

    def _at(self, factor: float | None) -> tuple[float, float] | None:
        for f, e, s in reversed(self.evaluations):
            if factor is not None and f == factor:
                return e, s
        return None

    def _result(self, low: float, high: float | None, reason: str) -> NoiseThreshold:
        at_low = self._at(low) if low > 0 else (self.exact_error, 0.0)
        at_high = self._at(high)
        parts = []
        if at_low is not None and low > 0:
            parts.append(_side("within", low * self.base.two_qubit, at_low, self.target))
        if at_high is not None:
            parts.append(_side("outside", high * self.base.two_qubit, at_high, self.target))
        confidence = "; ".join(parts) if parts else "no noisy evaluation within the target"
        return NoiseThreshold(
            two_qubit=float(low * self.base.two_qubit), factor=float(low), failing_factor=high, target=self.target,
            mitigation=tuple(self.mitigation), base=self.base.to_dict(),
            error=None if at_low is None else at_low[0], standard_error=0.0 if at_low is None else at_low[1],
            confidence=confidence, reason=reason, evaluations=tuple(self.evaluations))


def _side(kind: str, rate: float, at: tuple[float, float], target: float) -> str:
    error, stderr = at
    text = f"two-qubit rate {rate:.3g}: error {1000 * error:+.3f}"
    if stderr <= 0:
        return text + f" mHa, {kind} {1000 * target:g} mHa (exact expectation)"
    z = (target - abs(error)) / stderr if kind == "within" else (abs(error) - target) / stderr
    probability = 0.5 * (1.0 + math.erf(z / math.sqrt(2.0)))
    return text + f" ± {1000 * stderr:.3f} mHa, {kind} {1000 * target:g} mHa with one-sided confidence " \
                  f"{100 * probability:.1f} %"


def noise_threshold(pipeline: Any, target: float = CHEMICAL_ACCURACY, mitigation: Any = (), *,
                    errors: ErrorFigures | None = None, durations: GateDurations | None = None, result: Any = None,
                    tolerance: float = 0.1, seed: int = 0, **estimator_options: Any) -> NoiseThreshold:
    """The largest two-qubit error rate (all rates of ``errors`` scaled together) at which the noisy, optionally
    mitigated energy at the configuration's optimal parameters stays within ``target`` Ha of the exact reference.

    ``errors``/``durations`` default to the pipeline's device profile, else the illustrative ``ErrorFigures()``
    and ``GateDurations()``; ``result`` gives the optimal parameters (else an exact-estimator run finds them);
    ``estimator_options`` go to :class:`~groundkit.estimators.NoisyEstimator` (``shots``, ``simulator``,
    ``trajectories``, ``zne_fit``, ...). See :class:`NoiseThreshold` and docs/noise.md.
    """
    search = ThresholdSearch(pipeline, target=target, mitigation=mitigation, errors=errors, durations=durations,
                             result=result, seed=seed, **estimator_options)
    return search.run(tolerance=tolerance)
