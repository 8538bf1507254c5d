"""Checks of trial-state options; each failure is a ComponentError naming the value and what is accepted."""

from __future__ import annotations

from groundkit.errors import ComponentError


def check_flag(owner: str, name: str, value: object) -> None:
    """``value`` must be True or False."""
    if not isinstance(value, bool):
        raise ComponentError(f"{owner}({name}={value!r}): {name} must be True or False")


def check_choice(owner: str, name: str, value: object, choices: tuple[str, ...]) -> None:
    """``value`` must be one of ``choices``."""
    if not isinstance(value, str) or value not in choices:
        accepted = ", ".join(repr(c) for c in choices)
        raise ComponentError(f"{owner}({name}={value!r}): {name} must be one of {accepted}")


def check_positive_int(owner: str, name: str, value: object, maximum: int = 64) -> None:
    """``value`` must be an integer in 1..maximum."""
    if isinstance(value, bool) or not isinstance(value, int) or not 1 <= value <= maximum:
        raise ComponentError(f"{owner}({name}={value!r}): {name} must be an integer from 1 to {maximum}")
