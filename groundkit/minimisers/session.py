"""Bookkeeping of one search: counted and cached objective calls, the best point seen, iteration records.

A :class:`Session` sits between a minimiser and the objective. Every call that reaches the objective counts as
one evaluation; repeated calls at an identical point are answered from a small cache, so SciPy's per-iteration
callback can be given the energy (and gradient) already computed at its point without evaluating again.
"""

from __future__ import annotations

import math
import time
from collections import OrderedDict
from collections.abc import Callable

import numpy as np

from groundkit.errors import ParameterError

from .records import IterationRecord

CACHE_SIZE = 256  # points kept; a line search or a simplex uses far fewer between two iterations

EnergyFunction = Callable[[np.ndarray], float]
GradientFunction = Callable[[np.ndarray], "tuple[float, np.ndarray]"]
Callback = Callable[[IterationRecord], None]


class Halt(Exception):
    """Ends a search early with a reason (non-finite energy, a callback asking to stop)."""

    def __init__(self, reason: str):
        super().__init__(reason)
        self.reason = reason


class Session:
    """Counts, caches and records for one call of ``Minimiser.minimise``.

    ``difference_step`` (radians), when given, replaces a missing ``energy_and_gradient`` by central
    differences: 2n + 1 energy evaluations per gradient.
    """

    def __init__(
        self, energy: EnergyFunction, energy_and_gradient: GradientFunction | None = None,
        callback: Callback | None = None, difference_step: float | None = None,
    ):
        self._energy = energy
        self._energy_and_gradient = energy_and_gradient
        self._callback = callback
        self._difference_step = difference_step
        self._cache: OrderedDict[bytes, tuple[float, np.ndarray | None]] = OrderedDict()
        self._mark = time.perf_counter()
        self.records: list[IterationRecord] = []
        self.evaluations = 0
        self.best_energy = math.inf
        self.best_parameters: np.ndarray | None = None

    @property
    def iteration(self) -> int:
        """Number of iterations recorded so far."""
        return len(self.records)

    def lookup(self, x: np.ndarray) -> tuple[float, np.ndarray | None] | None:
        """Energy and gradient (or None) already computed at exactly ``x``, or None."""
        hit = self._cache.get(_key(x))
        if hit is None and self.best_parameters is not None and np.array_equal(x, self.best_parameters):
            return self.best_energy, None  # a best point older than the cache (COBYLA's reports it)
        return hit

    def energy(self, x: np.ndarray) -> float:
        """E(x) in Hartree, from the cache when this exact point was evaluated already."""
        x = _point(x)
        hit = self.lookup(x)
        if hit is not None:
            return hit[0]
        return self._count(x, float(self._energy(x.copy())), None)

    def energy_and_gradient(self, x: np.ndarray) -> tuple[float, np.ndarray]:
        """E(x) (Hartree) and dE/dx (Hartree per radian)."""
        x = _point(x)
        hit = self.lookup(x)
        if hit is not None and hit[1] is not None:
            return hit[0], hit[1].copy()
        if self._energy_and_gradient is not None:
            value, gradient = self._energy_and_gradient(x.copy())
            gradient = np.array(gradient, dtype=float).reshape(-1)
            if gradient.shape != x.shape:
                raise ParameterError(
                    f"energy_and_gradient returned a gradient of {gradient.size} entries for {x.size} parameters"
                )
            self._count(x, float(value), gradient)
            return float(value), gradient.copy()
        return self._differences(x)

    def record(self, x: np.ndarray, energy: float, gradient_norm: float | None = None) -> IterationRecord:
        """Close an iteration at ``x``: store its record, then hand it to the callback."""
        now = time.perf_counter()
        record = IterationRecord(
            iteration=self.iteration + 1, energy=float(energy), parameters=x,
            gradient_norm=None if gradient_norm is None else float(gradient_norm),
            wall_time=now - self._mark, evaluations=self.evaluations,
        )
        self.records.append(record)
        try:
            if self._callback is not None:
                self._callback(record)
        except StopIteration:
            raise Halt(f"stopped by the callback at iteration {record.iteration}") from None
        finally:
            self._mark = time.perf_counter()
        return record

    def _differences(self, x: np.ndarray) -> tuple[float, np.ndarray]:
        h = self._difference_step
        if h is None:
            raise RuntimeError("no gradient available and no difference_step set")  # the minimiser checks first
        value = self.energy(x)
        gradient = np.empty_like(x)
        for i in range(x.size):
            shift = np.zeros_like(x)
            shift[i] = h
            gradient[i] = (self.energy(x + shift) - self.energy(x - shift)) / (2.0 * h)
        self._cache[_key(x)] = (value, gradient)
        return value, gradient.copy()

    def _count(self, x: np.ndarray, value: float, gradient: np.ndarray | None) -> float:
        self.evaluations += 1
        if not math.isfinite(value):
            raise Halt(f"the energy is not finite ({value!r}) at evaluation {self.evaluations}")
        if gradient is not None and not np.all(np.isfinite(gradient)):
            raise Halt(f"the gradient is not finite at evaluation {self.evaluations}")
        self._cache[_key(x)] = (value, None if gradient is None else gradient.copy())
        if len(self._cache) > CACHE_SIZE:
            self._cache.popitem(last=False)
        if value < self.best_energy:
            self.best_energy, self.best_parameters = value, x.copy()
        return value


def _point(x: np.ndarray) -> np.ndarray:
    return np.array(x, dtype=float).reshape(-1)


def _key(x: np.ndarray) -> bytes:
    return (np.asarray(x, dtype=float) + 0.0).tobytes()  # + 0.0 folds -0.0 into 0.0
