"""RunResult: everything one minimisation produced, beside its exact reference, as plain data.

A RunResult holds numbers, strings and arrays only (no live PySCF or engine objects), so it can be saved as JSON
(:mod:`groundkit.persistence`) and rebuilt equal. Energies in Hartree; errors in reports in mHa.
"""

from __future__ import annotations

from dataclasses import dataclass, field, fields
from typing import Any

import numpy as np

from .accuracy import CHEMICAL_ACCURACY  # re-exported: gk.CHEMICAL_ACCURACY, groundkit.result.CHEMICAL_ACCURACY
from .upcalls import upcall

VERDICT_WORDING = {
    "within": "within chemical accuracy",
    "outside": "outside chemical accuracy",
    "uncertain": "chemical accuracy uncertain at 2 sigma",
}
"""The one wording of each verdict (see :attr:`RunResult.verdict`), used by summaries, HTML, widgets, tables and
the command line alike."""


def verdict_of(error: float, standard_error: float = 0.0) -> str:
    """'within', 'outside' or 'uncertain': |error| against chemical accuracy (1.6 mHa) at two standard errors
    (both in Ha). With a zero standard error the verdict is 'within' or 'outside'."""
    margin = 2.0 * standard_error
    if abs(error) + margin <= CHEMICAL_ACCURACY:
        return "within"
    if abs(error) - margin > CHEMICAL_ACCURACY:
        return "outside"
    return "uncertain"


def verdict_text(verdict: str) -> str:
    """The wording of a verdict, e.g. 'chemical accuracy uncertain at 2 sigma'."""
    return VERDICT_WORDING[verdict]


def noise_text(noise: dict[str, Any]) -> str:
    """One line: the noise model's rates, the simulator and the mitigation of a noisy result."""
    errors = noise.get("noise_model", {}).get("errors", {}).get("options", {})
    rates = ", ".join(f"{k} {v:.3g}" for k, v in errors.items() if isinstance(v, (int, float)))
    mitigation = ", ".join(noise.get("mitigation", [])) or "none"
    return f"{rates}; {noise.get('simulator')}; mitigation {mitigation}; kept {noise.get('kept_fraction', 1):.3f}"


@dataclass(frozen=True)
class History:
    """Per-iteration record of a minimisation: energy (Ha), gradient norm (Ha/rad, None where unknown),
    wall time of the iteration (s), cumulative objective evaluations and the energy's standard error (Ha; empty
    in files written before it was recorded)."""

    energies: tuple[float, ...] = ()
    gradient_norms: tuple[float | None, ...] = ()
    wall_times: tuple[float, ...] = ()
    evaluations: tuple[int, ...] = ()
    standard_errors: tuple[float | None, ...] = ()  # Ha per iteration: 0 for exact energies, None where unknown

    def __len__(self) -> int:
        return len(self.energies)

    @property
    def total_time(self) -> float:
        """Seconds spent in all iterations."""
        return float(sum(self.wall_times))


@dataclass(frozen=True)
class ReferenceRecord:
    """The exact reference the result is measured against (same active space, N, Sz and S)."""

    energy: float
    multiplicity: int
    spin_square: float
    amplitudes: dict[str, float] = field(default_factory=dict)
    method: str = ""


@dataclass(frozen=True)
class Resources:
    """Quantum cost of the trial state. Fields not yet known are None.

    ``two_qubit_gates`` and ``depth`` are of the circuit as run: on the pipeline's device after routing and
    native-gate rewriting, else the logical circuit. With a device: ``device`` (its name), ``swaps`` (SWAPs the
    router inserted), ``logical_two_qubit_gates`` / ``logical_depth`` (all-to-all, before routing), and
    ``device_seconds``: estimated time on the device for one energy at ``device_shots`` shots (see
    docs/devices.md).
    """

    qubits: int
    parameters: int
    pauli_terms: int | None = None
    measurement_groups: int | None = None
    two_qubit_gates: int | None = None
    depth: int | None = None
    device: str | None = None
    logical_two_qubit_gates: int | None = None
    logical_depth: int | None = None
    swaps: int | None = None
    device_shots: int | None = None
    device_seconds: float | None = None
    measurement_two_qubit_gates_worst: int | None = None  # added by the worst group's basis change
    measurement_two_qubit_gates_mean: float | None = None  # mean over the groups


@dataclass(frozen=True, eq=False)
class RunResult:
    """Outcome of ``Pipeline.run()``: the final energy beside the exact reference and the classical baselines."""

    energy: float
    parameters: np.ndarray
    history: History
    converged: bool
    stop_reason: str
    reference: ReferenceRecord
    baselines: dict[str, float | None]
    amplitudes: dict[str, float]
    fidelity: float
    spin_square: float
    particle_number: float
    resources: Resources
    provenance: dict[str, Any]
    parameter_labels: tuple[str, ...] = ()
    standard_error: float = 0.0
    """Standard error (Ha) of ``energy``; zero for exact estimators."""
    exact_energy: float | None = None
    """Exact energy (Ha) of the final parameters; equals ``energy`` for exact estimators."""
    growth: tuple[dict[str, Any], ...] = ()
    """Adaptive runs only: one plain-data record per growth step (see ``groundkit.adaptive.GrowthStep``)."""
    suspect_baselines: dict[str, str] = field(default_factory=dict)
    """Baseline -> why its value failed a plausibility check (see docs/baselines.md); absent when it passed."""
    baseline_notes: dict[str, str] = field(default_factory=dict)
    """Baseline -> why it is missing or suspect, or how it was found; absent when there is nothing to say."""
    noise: dict[str, Any] | None = None
    """Noisy runs only: the noise model, simulator, mitigation, kept fraction and any zero-noise fit of the final
    estimate (plain data, see docs/noise.md); None for other estimators."""
    active_space_error: dict[str, Any] | None = None
    """What the active space loses (``groundkit.space_error.SpaceError.to_dict``: ``error_mha``, ``against``,
    energies in Ha), when it was computed: see :meth:`with_active_space_error`; None otherwise."""
    orbital_optimisation: dict[str, Any] | None = None
    """Orbital-optimised runs only: macro iterations, the final orbital gradient and the rotation's size."""

    def baseline_status(self, name: str) -> str:
        """'missing', 'suspect' or 'ok' for one baseline."""
        if self.baselines.get(name) is None:
            return "missing"
        return "suspect" if name in self.suspect_baselines else "ok"

    @property
    def error(self) -> float:
        """energy − exact reference energy (Ha); positive for a variational state."""
        return self.energy - self.reference.energy

    @property
    def within_chemical_accuracy(self) -> bool:
        """True when the :attr:`verdict` is 'within': |error| + 2 standard errors <= 1.6 mHa (chemical accuracy;
        common practice, no single source). For exact estimators that is |error| <= 1.6 mHa; a sampled result
        whose interval straddles the threshold is not claimed within (its verdict says 'uncertain')."""
        return self.verdict == "within"

    @property
    def estimator_bias(self) -> float | None:
        """energy − exact energy of the same parameters (Ha): statistical error plus any noise bias."""
        return None if self.exact_energy is None else self.energy - self.exact_energy

    @property
    def kept_fraction(self) -> float | None:
        """Noisy runs: fraction of shots (or probability) kept by symmetry post-selection; None otherwise."""
        return None if self.noise is None else self.noise.get("kept_fraction")

    @property
    def verdict(self) -> str:
        """'within', 'outside' or 'uncertain': chemical accuracy judged at two standard errors."""
        return verdict_of(self.error, self.standard_error)

    @property
    def iterations(self) -> int:
        return len(self.history)

    def summary(self) -> str:
        """Plain-text table: energy, reference, error, verdict, baselines, state, resources, convergence."""
        conf = self.provenance.get("configuration", {})
        stderr = f" ± {1000 * self.standard_error:.4f}" if self.standard_error else ""
        lines = [
            f"{conf.get('molecule', 'molecule')}",
            f"  active space   {conf.get('active_space', '')}",
            f"  trial state    {conf.get('trial_state', '')}    minimiser {conf.get('minimiser', '')}",
            "",
            f"{'energy':<28}{self.energy:>18.10f} Ha",
            f"{'exact reference':<28}{self.reference.energy:>18.10f} Ha  (multiplicity {self.reference.multiplicity})",
            f"{'error':<28}{1000 * self.error:>18.4f}{stderr} mHa",
            f"{'verdict':<28}{verdict_text(self.verdict)} (1.6 mHa)",
            *([f"{'exact energy, same params':<28}{self.exact_energy:>18.10f} Ha  (estimator bias "
               f"{1000 * self.estimator_bias:+.4f} mHa)"]
              if self.exact_energy is not None and abs(self.exact_energy - self.energy) > 1e-12 else []),
            *([f"{'noise':<28}{noise_text(self.noise)}"] if self.noise is not None else []),
            *([f"{'active-space error':<28}{self.active_space_error['error_mha']:>18.4f} mHa  (exact active space "
               f"vs {self.active_space_error['against']})"] if self.active_space_error else []),
            f"{'fidelity with exact state':<28}{self.fidelity:>18.6f}",
            f"{'<S^2> / <N>':<28}{self.spin_square:>18.6f} / {self.particle_number:.6f}",
            "",
            f"{'baseline':<28}{'energy/Ha':>18}  {'vs exact/mHa':>12}  check",
        ]
        for name, value in self.baselines.items():
            status = self.baseline_status(name)
            why = self.suspect_baselines.get(name, "") if status == "suspect" else self.baseline_notes.get(name, "")
            check = f"  {'SUSPECT' if status == 'suspect' else status}{': ' + why if why and status != 'ok' else ''}"
            if value is None:
                lines.append(f"  {name:<26}{'—':>18}  {'':>12}{check}")
            else:
                lines.append(f"  {name:<26}{value:>18.10f}  {1000 * (value - self.reference.energy):>12.4f}{check}")
        r = self.resources
        known = {f.name: getattr(r, f.name) for f in fields(r) if getattr(r, f.name) is not None}
        lines += ["", "resources      " + ", ".join(f"{k.replace('_', ' ')} {v}" for k, v in known.items())]
        lines.append(f"minimisation   {self.iterations} iterations, {self.history.total_time:.2f} s, "
                     f"{'converged' if self.converged else 'NOT converged'}: {self.stop_reason}")
        return "\n".join(lines)

    def with_active_space_error(self) -> RunResult:
        """This result with :attr:`active_space_error` filled: rebuilds the pipeline's problem (cached when it is
        still in memory) and computes the active-space error (full-space FCI or CCSD(T), see
        :mod:`groundkit.space_error`). Returns a new result; this one is unchanged."""
        from dataclasses import replace

        if self.active_space_error is not None:
            return self
        return replace(self, active_space_error=self.pipeline().problem().active_space_error.to_dict())

    def to_dict(self) -> dict[str, Any]:
        """JSON-ready dict (see :mod:`groundkit.persistence` for the schema)."""
        from .persistence import result_to_dict

        return result_to_dict(self)

    def pipeline(self) -> Any:
        """The Pipeline that made this result (molecule and every component, rebuilt from the provenance's
        records); running it again reproduces the energy for deterministic components. ResultFileError for
        results saved before component records existed."""
        from .persistence import result_pipeline

        return result_pipeline(self)

    def save(self, path: str) -> None:
        """Write this result as JSON, atomically (a temporary file, then a rename)."""
        from .persistence import save_result

        save_result(self, path)

    def show(self) -> Any:
        """A notebook widget: energy by iteration beside the exact reference, and the leading determinants."""
        return upcall("show:result", self)

    def plot(self, path: str) -> str:
        """Save energy by iteration and the leading determinants as a PNG at ``path``; returns the path."""
        return upcall("png:result", self, path)

    def _repr_html_(self) -> str:
        return upcall("html:result", self)

    def __eq__(self, other: object) -> bool:
        if not isinstance(other, RunResult):
            return NotImplemented
        return self.to_dict() == other.to_dict()

    def __repr__(self) -> str:
        return (f"RunResult(energy={self.energy:.10f} Ha, error={1000 * self.error:+.4f} mHa, "
                f"converged={self.converged}, iterations={self.iterations}, parameters={len(self.parameters)})")
