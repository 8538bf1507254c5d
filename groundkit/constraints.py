"""Declared option constraints: one mechanism, one message shape, for every component.

A component class declares ``constraints = {"shots": Integer(low=1), "seed": Seed(), ...}``; the component
machinery (:mod:`groundkit.component`) checks every declared option after construction and refuses a bad value
with the role's error (``ComponentError``, or ``ActiveSpaceError`` for active spaces) in one shape::

    SampledEstimator(shots=0): shots must be an integer >= 1

A constraint may also normalise what it accepts (a list to a tuple, a NumPy integer to an int, a name to a
component); the normalised value is stored. After the single options, the class's ``check_options()`` runs
for checks that involve several options.
"""

from __future__ import annotations

import math
import numbers
from collections.abc import Sequence
from typing import Any


class Refused(Exception):
    """Raised by :meth:`Constraint.check`; the component machinery turns it into the role's error."""


class Constraint:
    """Base of constraints: ``check(value)`` returns the (possibly normalised) value or raises :class:`Refused`;
    ``describe()`` says what is accepted, as the end of "x must be ..."."""

    unit: str = ""

    def check(self, value: Any) -> Any:
        raise NotImplementedError

    def describe(self) -> str:
        raise NotImplementedError

    def refuse(self) -> Refused:
        return Refused(self.describe() + (f" ({self.unit})" if self.unit else ""))

    def __repr__(self) -> str:
        return f"{type(self).__name__}({self.describe()!r})"


def _is_integer(value: Any) -> bool:
    return isinstance(value, numbers.Integral) and not isinstance(value, bool)


def _is_real(value: Any) -> bool:
    return isinstance(value, numbers.Real) and not isinstance(value, bool)


class Interval(Constraint):
    """A real number (``kind=float``, ints accepted) or an integer (``kind=int``) between ``low`` and ``high``
    (None: unbounded); ``closed`` is "neither", "left", "right" or "both". Non-finite numbers are refused unless
    ``allow_infinite=True`` (NaN never)."""

    def __init__(self, kind: type, low: float | None = None, high: float | None = None, *, closed: str = "both",
                 unit: str = "", allow_infinite: bool = False) -> None:
        if kind not in (int, float) or closed not in ("neither", "left", "right", "both"):
            raise ValueError(f"Interval({kind!r}, closed={closed!r}): kind is int or float, closed is neither, left, "
                             "right or both")
        self.kind, self.low, self.high, self.closed = kind, low, high, closed
        self.unit, self.allow_infinite = unit, allow_infinite

    def check(self, value: Any) -> Any:
        if self.kind is int:
            if not _is_integer(value):
                raise self.refuse()
            value = int(value)
        else:
            try:
                as_float = float(value) if _is_real(value) else math.nan
            except OverflowError:  # an integer beyond any float
                raise self.refuse() from None
            if math.isnan(as_float):
                raise self.refuse()
            if not self.allow_infinite and not math.isfinite(as_float):
                raise self.refuse()
            value = value if isinstance(value, (int, float)) else float(value)
        if self.low is not None:
            if value < self.low or (value == self.low and self.closed in ("neither", "right")):
                raise self.refuse()
        if self.high is not None:
            if value > self.high or (value == self.high and self.closed in ("neither", "left")):
                raise self.refuse()
        return value

    def describe(self) -> str:
        what = "an integer" if self.kind is int else ("a number" if self.allow_infinite else "a finite number")
        low_op = ">" if self.closed in ("neither", "right") else ">="
        high_op = "<" if self.closed in ("neither", "left") else "<="
        if self.low is not None and self.high is not None:
            if self.kind is int and self.closed == "both":
                return f"{what} from {self.low} to {self.high}"
            left = "<" if low_op == ">" else "<="
            return f"{what} with {self.low:g} {left} value {high_op} {self.high:g}"
        if self.low is not None:
            return f"{what} {low_op} {self.low:g}"
        if self.high is not None:
            return f"{what} {high_op} {self.high:g}"
        return what


def Integer(low: int | None = None, high: int | None = None, *, unit: str = "") -> Interval:  # noqa: N802
    """An integer in [low, high] (either bound may be None)."""
    return Interval(int, low, high, closed="both", unit=unit)


def Positive(*, unit: str = "") -> Interval:  # noqa: N802
    """A finite real number > 0."""
    return Interval(float, 0, None, closed="neither", unit=unit)


def Probability() -> Interval:  # noqa: N802
    """A probability in [0, 1]."""
    return Interval(float, 0, 1, closed="both")


class Bool(Constraint):
    """True or False (NumPy booleans accepted and stored as bool)."""

    def check(self, value: Any) -> Any:
        import numpy as np

        if not isinstance(value, (bool, np.bool_)):
            raise self.refuse()
        return bool(value)

    def describe(self) -> str:
        return "True or False"


class OneOf(Constraint):
    """One of the given strings (exactly)."""

    def __init__(self, *choices: str) -> None:
        self.choices = tuple(choices)

    def check(self, value: Any) -> Any:
        if not isinstance(value, str) or value not in self.choices:
            raise self.refuse()
        return value

    def describe(self) -> str:
        return "one of " + ", ".join(repr(c) for c in self.choices)


class Seed(Constraint):
    """None (fresh randomness each time) or an integer >= 0; a negative seed is refused."""

    def __init__(self, *, optional: bool = True) -> None:
        self.optional = optional

    def check(self, value: Any) -> Any:
        if value is None and self.optional:
            return None
        if not _is_integer(value) or value < 0:
            raise self.refuse()
        return int(value)

    def describe(self) -> str:
        return "None or an integer >= 0" if self.optional else "an integer >= 0"


class OrNone(Constraint):
    """None, or a value accepted by ``inner``."""

    def __init__(self, inner: Constraint) -> None:
        self.inner = inner
        self.unit = inner.unit

    def check(self, value: Any) -> Any:
        if value is None:
            return None
        try:
            return self.inner.check(value)
        except Refused:
            raise self.refuse() from None

    def describe(self) -> str:
        return f"None or {self.inner.describe()}"


class ListOf(Constraint):
    """A sequence (stored as a tuple) of items each accepted by ``item``, with at least ``min_length`` items.
    ``single=True`` accepts one bare string as a one-item sequence."""

    def __init__(self, item: Constraint, *, min_length: int = 0, single: bool = False, unique: bool = False) -> None:
        self.item, self.min_length, self.single, self.unique = item, min_length, single, unique
        self.unit = item.unit

    def check(self, value: Any) -> Any:
        if isinstance(value, str) and self.single:
            value = (value,)
        if isinstance(value, (str, bytes, dict)) or not isinstance(value, (Sequence, tuple, list)) and not \
                _is_array(value):
            raise self.refuse()
        items = []
        for k, v in enumerate(value):
            try:
                items.append(self.item.check(v))
            except Refused:
                raise Refused(f"{self.describe()} (item {k} is {v!r})") from None
        items = tuple(items)
        if len(items) < self.min_length or (self.unique and len(set(items)) != len(items)):
            raise self.refuse()
        return items

    def describe(self) -> str:
        size = "" if not self.min_length else f"{self.min_length} or more " if self.min_length > 1 else "one or more "
        unique = " without repeats" if self.unique else ""
        return f"a list of {size}values, each {self.item.describe()}{unique}"


def _is_array(value: Any) -> bool:
    return type(value).__name__ == "ndarray"


class Pair(Constraint):
    """Two values (stored as a tuple), each accepted by ``item``; ``increasing=True`` needs first < second."""

    def __init__(self, item: Constraint, *, increasing: bool = True, unit: str = "") -> None:
        self.item, self.increasing = item, increasing
        self.unit = unit or item.unit

    def check(self, value: Any) -> Any:
        if isinstance(value, (str, bytes, dict)) or not isinstance(value, (Sequence, tuple, list)) or len(value) != 2:
            raise self.refuse()
        try:
            low, high = (self.item.check(v) for v in value)
        except Refused:
            raise self.refuse() from None
        if self.increasing and not low < high:
            raise self.refuse()
        return (low, high)

    def describe(self) -> str:
        order = " with low < high" if self.increasing else ""
        return f"a pair (low, high){order}, each {self.item.describe()}"


class ComponentOf(Constraint):
    """A component of ``role`` (an instance of the role's classes); a name registered for that role, built with
    its default options; ``{"name": ..., option: ...}`` (as TOML files write it); or a saved record
    ``{"role", "name", "options"}``."""

    def __init__(self, role: str) -> None:
        self.role = role

    def check(self, value: Any) -> Any:
        import difflib

        from .registry import build, fold, is_component_of, role

        if is_component_of(self.role, value):
            return value
        if isinstance(value, dict) and isinstance(value.get("name"), str):
            from .component import component_from_dict

            if set(value) == {"role", "name", "options"}:
                return component_from_dict(value, self.role)
            options = {k: v for k, v in value.items() if k != "name"}
            return build(self.role, value["name"], **options)
        if isinstance(value, str):
            keys = role(self.role).keys
            if fold(value) in keys:
                return build(self.role, value)
            close = difflib.get_close_matches(fold(value), list(keys), n=1)
            hint = f" (did you mean {keys[close[0]].name!r}?)" if close else ""
            raise Refused(self.describe() + hint)
        raise self.refuse()

    def describe(self) -> str:
        from .registry import names

        shown = ", ".join(repr(n) for n in names(self.role))
        return f"a {self.role.replace('_', ' ')} or one of the accepted names {shown}"


class NameOf(Constraint):
    """A name registered for ``role`` (case, spaces, ``-`` and ``_`` ignored), stored as the registered name."""

    def __init__(self, role: str) -> None:
        self.role = role

    def check(self, value: Any) -> Any:
        import difflib

        from .registry import fold, role

        keys = role(self.role).keys
        if isinstance(value, str) and fold(value) in keys:
            return keys[fold(value)].name
        close = difflib.get_close_matches(fold(value), list(keys), n=1) if isinstance(value, str) else []
        hint = f" (did you mean {keys[close[0]].name!r}?)" if close else ""
        raise Refused(self.describe() + hint)

    def describe(self) -> str:
        from .registry import names

        return f"one of the {self.role.replace('_', ' ')} names " + ", ".join(repr(n) for n in names(self.role))


class Instance(Constraint):
    """An instance of ``kind`` (``what`` describes it)."""

    def __init__(self, kind: type | tuple[type, ...], what: str) -> None:
        self.kind, self.what = kind, what

    def check(self, value: Any) -> Any:
        if not isinstance(value, self.kind):
            raise self.refuse()
        return value

    def describe(self) -> str:
        return self.what
