"""Bookkeeping across the minimisations of one growth: consecutive iteration records and interruptions."""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

from groundkit.minimisers import IterationRecord, MinimiserOutcome


class Watch:
    """Renumbers minimiser records across steps, forwards them to the callback and notes why the growth stopped.

    ``stopped`` becomes a reason once a KeyboardInterrupt (in an energy or the callback) or a StopIteration from
    the callback has been seen; the minimiser itself turns those into a partial outcome.
    """

    def __init__(self, callback: Callable[[IterationRecord], None] | None):
        self.callback = callback
        self.records: list[IterationRecord] = []
        self.evaluations = 0
        self.stopped = ""

    def guard(self, function: Callable[..., Any], *args: Any) -> Any:
        """``function(*args)``, noting a KeyboardInterrupt before passing it on."""
        try:
            return function(*args)
        except KeyboardInterrupt:
            self.stopped = "interrupted (KeyboardInterrupt)"
            raise

    def record(self, record: IterationRecord) -> None:
        """The minimiser's per-iteration callback."""
        renumbered = IterationRecord(
            iteration=len(self.records) + 1, energy=record.energy, parameters=record.parameters,
            gradient_norm=record.gradient_norm, wall_time=record.wall_time,
            evaluations=self.evaluations + record.evaluations,
        )
        self.records.append(renumbered)
        if self.callback is None:
            return
        try:
            self.callback(renumbered)
        except KeyboardInterrupt:
            self.stopped = "interrupted (KeyboardInterrupt)"
            raise
        except StopIteration:
            self.stopped = f"stopped by the callback at iteration {renumbered.iteration}"
            raise

    def finish_minimisation(self, outcome: MinimiserOutcome) -> None:
        """Count one finished minimisation's evaluations."""
        self.evaluations += outcome.evaluations
