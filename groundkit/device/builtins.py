"""Built-in device profiles: generic shapes with illustrative numbers of our own.

The numbers are illustrative only: of the order reported in the 2020s for superconducting devices (tens of ns
for one-qubit gates, a few hundred ns for two-qubit gates, µs readout) and, for the all-to-all profile, for
trapped-ion devices (µs gates, slow but fully connected). None of these profiles is, or is copied from, any
vendor's device; use them to compare shapes and orders of magnitude, and give your own figures for a real one.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from ..registry import register
from .figures import ErrorFigures, GateDurations
from .profile import DeviceProfile

_SLOW = GateDurations(one_qubit=10_000.0, two_qubit=200_000.0, measurement=100_000.0, reset=50_000.0,
                      shot_overhead=1_000.0)
_SLOW_ERRORS = ErrorFigures(one_qubit=5e-5, two_qubit=3e-3, readout=5e-3, t1=None, t2=None)


@register("device", "line-16", label="line of 16 (CNOT)")
@dataclass(frozen=True, repr=False)
class Line16(DeviceProfile):
    """16 qubits in a line, native CNOT."""

    name: str = "line-16"
    connectivity: str = "line"
    size: Any = 16
    native_gate: str = "cnot"


@register("device", "ring-16", label="ring of 16 (CZ)")
@dataclass(frozen=True, repr=False)
class Ring16(DeviceProfile):
    """16 qubits in a ring, native CZ."""

    name: str = "ring-16"
    connectivity: str = "ring"
    size: Any = 16
    native_gate: str = "cz"


@register("device", "grid-4x4", label="4 × 4 grid (CZ)")
@dataclass(frozen=True, repr=False)
class Grid4x4(DeviceProfile):
    """A 4 × 4 square grid, native CZ."""

    name: str = "grid-4x4"
    connectivity: str = "grid"
    size: Any = (4, 4)
    native_gate: str = "cz"


@register("device", "grid-4x4-sqrt-iswap", label="4 × 4 grid (√iSWAP)")
@dataclass(frozen=True, repr=False)
class Grid4x4SqrtIswap(DeviceProfile):
    """A 4 × 4 square grid, native √iSWAP (faster two-qubit gates, 3 per arbitrary two-qubit block)."""

    name: str = "grid-4x4-sqrt-iswap"
    connectivity: str = "grid"
    size: Any = (4, 4)
    native_gate: str = "sqrt-iswap"
    durations: GateDurations = GateDurations(two_qubit=50.0)


@register("device", "heavy-hex-35", label="heavy-hex, 35 qubits (CNOT)")
@dataclass(frozen=True, repr=False)
class HeavyHex35(DeviceProfile):
    """A heavy-hexagon lattice of 2 × 2 hexagons (35 qubits), native CNOT."""

    name: str = "heavy-hex-35"
    connectivity: str = "heavy-hex"
    size: Any = (2, 2)
    native_gate: str = "cnot"


@register("device", "all-to-all-16", label="all-to-all, 16 (CNOT, slow gates)")
@dataclass(frozen=True, repr=False)
class AllToAll16(DeviceProfile):
    """16 fully connected qubits with slow gates (µs to hundreds of µs), native CNOT."""

    name: str = "all-to-all-16"
    connectivity: str = "all-to-all"
    size: Any = 16
    native_gate: str = "cnot"
    errors: ErrorFigures = _SLOW_ERRORS
    durations: GateDurations = _SLOW


BUILTIN_DEVICES = ("line-16", "ring-16", "grid-4x4", "grid-4x4-sqrt-iswap", "heavy-hex-35", "all-to-all-16")
"""Names of the built-in profiles, in the order selectors show them."""
