"""Checks of minimiser options; each failure is a ComponentError naming the value and what is accepted."""

from __future__ import annotations

import math
from numbers import Real

from groundkit.errors import ComponentError


def _is_real(value: object) -> bool:
    if not isinstance(value, Real) or isinstance(value, bool):
        return False
    try:
        return math.isfinite(float(value))
    except OverflowError:  # an integer beyond the float range
        return False


def check_count(owner: str, name: str, value: object, low: int = 1) -> None:
    """``value`` must be an integer >= ``low``."""
    if isinstance(value, bool) or not isinstance(value, int) or value < low:
        raise ComponentError(f"{owner}({name}={value!r}): {name} must be an integer >= {low}")


def check_positive(owner: str, name: str, value: object, unit: str = "") -> None:
    """``value`` must be a finite number > 0."""
    if not _is_real(value) or float(value) <= 0.0:
        raise ComponentError(f"{owner}({name}={value!r}): {name} must be a finite number > 0{_unit(unit)}")


def check_non_negative(owner: str, name: str, value: object) -> None:
    """``value`` must be a finite number >= 0."""
    if not _is_real(value) or float(value) < 0.0:
        raise ComponentError(f"{owner}({name}={value!r}): {name} must be a finite number >= 0")


def check_half_open(owner: str, name: str, value: object) -> None:
    """``value`` must lie in [0, 1)."""
    if not _is_real(value) or not 0.0 <= float(value) < 1.0:
        raise ComponentError(f"{owner}({name}={value!r}): {name} must lie in [0, 1)")


def check_between(owner: str, name: str, value: object, low: float, high: float, text: str) -> None:
    """``value`` must satisfy low < value <= high (described by ``text``)."""
    if not _is_real(value) or not low < float(value) <= high:
        raise ComponentError(f"{owner}({name}={value!r}): {name} must satisfy {text}")


def check_flag(owner: str, name: str, value: object) -> None:
    """``value`` must be True or False."""
    if not isinstance(value, bool):
        raise ComponentError(f"{owner}({name}={value!r}): {name} must be True or False")


def check_optional_positive(owner: str, name: str, value: object, unit: str = "") -> None:
    """``value`` must be None or a finite number > 0."""
    if value is not None and (not _is_real(value) or float(value) <= 0.0):
        raise ComponentError(f"{owner}({name}={value!r}): {name} must be None or a finite number > 0{_unit(unit)}")


def check_seed(owner: str, value: object) -> None:
    """``value`` must be None or an integer >= 0."""
    if value is not None and (isinstance(value, bool) or not isinstance(value, int) or value < 0):
        raise ComponentError(f"{owner}(seed={value!r}): seed must be None or an integer >= 0")


def check_bounds(owner: str, value: object) -> None:
    """``value`` must be None or a pair (low, high) with low < high; either may be infinite."""
    if value is None:
        return
    ok = isinstance(value, tuple) and len(value) == 2 and all(
        _is_real(v) or (isinstance(v, float) and math.isinf(v)) for v in value
    )
    if not ok or not float(value[0]) < float(value[1]):  # type: ignore[index]
        raise ComponentError(
            f"{owner}(bounds={value!r}): bounds must be None or a tuple (low, high) in radians with low < high"
        )


def _unit(unit: str) -> str:
    return f" ({unit})" if unit else ""
