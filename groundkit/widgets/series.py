"""Plain data behind the charts: what the live view and the amplitude chart draw, read off records or results.

Tests compare these with ``RunResult.history`` and the amplitudes, so the charts are checked without pixels.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

LEADING_DETERMINANTS = 8


@dataclass
class EnergySeries:
    """Energy (Ha) per iteration, the exact reference, the classical baselines and a standard error (Ha)."""

    iterations: list[int] = field(default_factory=list)
    energies: list[float] = field(default_factory=list)
    gradient_norms: list[float | None] = field(default_factory=list)
    reference: float | None = None
    baselines: dict[str, float] = field(default_factory=dict)
    standard_error: float = 0.0
    standard_errors: list[float | None] = field(default_factory=list)  # per iteration, the error bars

    def add(self, record: Any) -> None:
        """Append one ``IterationRecord``."""
        error = getattr(record, "standard_error", None)
        self.standard_errors.append(None if error is None else float(error))
        self.iterations.append(int(record.iteration))
        self.energies.append(float(record.energy))
        norm = record.gradient_norm
        self.gradient_norms.append(None if norm is None else float(norm))

    @classmethod
    def from_result(cls, result: Any) -> EnergySeries:
        """The series of a finished run, from its history."""
        history = result.history
        return cls(iterations=list(range(1, len(history) + 1)), energies=list(history.energies),
                   gradient_norms=list(history.gradient_norms), reference=result.reference.energy,
                   baselines=known_baselines(result.baselines, result.suspect_baselines),
                   standard_error=float(result.standard_error),
                   standard_errors=list(history.standard_errors) if len(history.standard_errors) == len(history)
                   else [None] * len(history))

    def error_bars(self) -> list[float] | None:
        """One error bar (Ha) per iteration: the iteration's own standard error; where unknown (files written
        before they were recorded) the final one; None when every bar would be zero."""
        bars = [self.standard_error if e is None else e for e in self.standard_errors]
        bars += [self.standard_error] * (len(self.energies) - len(bars))
        return bars if any(b > 0 for b in bars) else None


@dataclass
class AmplitudeSeries:
    """Leading determinants (occupation strings) with the trial state's and the exact state's amplitudes."""

    labels: list[str]
    trial: list[float]
    exact: list[float]

    @classmethod
    def from_amplitudes(cls, trial: dict[str, float], exact: dict[str, float],
                        count: int = LEADING_DETERMINANTS) -> AmplitudeSeries:
        """The ``count`` determinants of largest weight in either state, largest exact weight first."""
        labels = sorted(set(trial) | set(exact),
                        key=lambda k: (-max(abs(exact.get(k, 0.0)), abs(trial.get(k, 0.0))), k))[:count]
        return cls(labels=labels, trial=[float(trial.get(k, 0.0)) for k in labels],
                   exact=[float(exact.get(k, 0.0)) for k in labels])

    @classmethod
    def from_result(cls, result: Any, count: int = LEADING_DETERMINANTS) -> AmplitudeSeries:
        return cls.from_amplitudes(result.amplitudes, result.reference.amplitudes, count)


def known_baselines(baselines: Any, suspect: Any = ()) -> dict[str, float]:
    """Baselines with a value, without 'casci' (in the active space it is the exact reference itself); the names
    in ``suspect`` (failed a plausibility check) are labelled 'name (suspect)'."""
    return {(f"{k} (suspect)" if k in suspect else k): float(v) for k, v in dict(baselines).items()
            if v is not None and k != "casci"}
