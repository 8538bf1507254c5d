"""The numbers that describe a device's imperfection and pace: error figures and gate durations.

Both are components (role ``device_figures``) so that a device profile, a noise model and saved results store
them as records. The defaults are illustrative figures of our own, of the order reported for superconducting
devices in the 2020s; they describe no particular device.

Units: probabilities in [0, 1]; T1 and T2 in microseconds; durations in nanoseconds; the per-shot overhead in
microseconds.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

from ..component import Component
from ..constraints import Interval, OrNone, Positive, Probability
from ..errors import DeviceError
from ..registry import register


class DeviceFigures(Component, role="device_figures", error=DeviceError):
    """Base of the figures that describe a device (errors, durations)."""


@register("device_figures", "errors", label="error figures")
@dataclass(frozen=True)
class ErrorFigures(DeviceFigures):
    """Error rates of a device.

    ``one_qubit`` and ``two_qubit``: depolarising probability after each one- and two-qubit gate; ``readout``:
    probability that a measured bit is read flipped (symmetric assignment error); ``t1`` and ``t2``: relaxation
    and dephasing times in microseconds (``None``: no thermal relaxation); T2 ≤ 2·T1.
    """

    one_qubit: float = 1e-4
    two_qubit: float = 5e-3
    readout: float = 1e-2
    t1: float | None = 100.0
    t2: float | None = 80.0

    constraints = {
        "one_qubit": Probability(),
        "two_qubit": Probability(),
        "readout": Interval(float, 0.0, 0.5, closed="both"),
        "t1": OrNone(Positive(unit="µs")),
        "t2": OrNone(Positive(unit="µs")),
    }

    def check_options(self) -> None:
        if (self.t1 is None) != (self.t2 is None):
            raise DeviceError(f"ErrorFigures(t1={self.t1!r}, t2={self.t2!r}): give both T1 and T2, or neither")
        if self.t1 is not None and self.t2 > 2.0 * self.t1:
            raise DeviceError(f"ErrorFigures(t1={self.t1!r}, t2={self.t2!r}): T2 must be at most 2·T1 "
                              f"({2.0 * self.t1!r} µs)")

    def scaled(self, factor: float) -> ErrorFigures:
        """These figures with every error rate multiplied by ``factor`` ≥ 0 (gate and readout probabilities times
        the factor, capped at 1 and 0.5; T1 and T2 divided by it); ``factor=0`` is a noiseless device."""
        if not isinstance(factor, (int, float)) or isinstance(factor, bool) or not factor >= 0 \
                or factor == float("inf"):
            raise DeviceError(f"error factor {factor!r} must be a finite real number >= 0")
        factor = float(factor)
        if factor == 0.0:
            return replace(self, one_qubit=0.0, two_qubit=0.0, readout=0.0, t1=None, t2=None)
        t1 = None if self.t1 is None else self.t1 / factor
        t2 = None if self.t2 is None else self.t2 / factor
        return replace(self, one_qubit=min(1.0, self.one_qubit * factor), two_qubit=min(1.0, self.two_qubit * factor),
                       readout=min(0.5, self.readout * factor), t1=t1, t2=t2)

    @property
    def noiseless(self) -> bool:
        """True when no error of any kind is set."""
        return self.one_qubit == 0 and self.two_qubit == 0 and self.readout == 0 and self.t1 is None


@register("device_figures", "durations", label="gate durations")
@dataclass(frozen=True)
class GateDurations(DeviceFigures):
    """Durations of a device's operations: ``one_qubit``, ``two_qubit``, ``measurement`` and ``reset`` in
    nanoseconds, and ``shot_overhead`` (repetition delay and control latency per shot) in microseconds."""

    one_qubit: float = 35.0
    two_qubit: float = 300.0
    measurement: float = 1500.0
    reset: float = 1000.0
    shot_overhead: float = 200.0

    constraints = {
        "one_qubit": Interval(float, 0.0, None, unit="ns"),
        "two_qubit": Interval(float, 0.0, None, unit="ns"),
        "measurement": Interval(float, 0.0, None, unit="ns"),
        "reset": Interval(float, 0.0, None, unit="ns"),
        "shot_overhead": Interval(float, 0.0, None, unit="µs"),
    }
