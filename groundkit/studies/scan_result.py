"""ScanResult: the points of a scan, each a run result (or the reason it failed), as plain data.

Energies in Hartree; ``value`` is whatever the geometry function took (a bond length in angstrom, an angle in
degrees, ...); analysis of bond lengths uses the molecules' own interatomic distances in angstrom.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

import numpy as np

from groundkit.molecule import MoleculeSpec
from groundkit.result import RunResult
from groundkit.upcalls import upcall


@dataclass(frozen=True, eq=False)
class ScanPoint:
    """One point of a scan: its value, molecule, result (None when it failed) and how it was started.

    ``start`` says 'cold' or 'warm (...)' with what was carried over; ``orbital_match`` is the smallest overlap
    of matched active orbitals with the previous point (None for a cold start); ``wall_time`` in seconds;
    ``handover`` is the plain data that warm-starts the next point; ``earlier_failures`` holds the failure
    messages of earlier attempts at this point (oldest first) when a resume retried it (``retry_failed``).
    """

    index: int
    value: float
    molecule: MoleculeSpec | None
    result: RunResult | None
    failure: str | None = None
    start: str = "cold"
    orbital_match: float | None = None
    wall_time: float = 0.0
    handover: dict | None = field(default=None, repr=False)
    earlier_failures: tuple[str, ...] = ()
    orbital_jump: str | None = None
    """CASSCF orbitals only: why this point's CASSCF solution is not the continuation of the previous point's
    (see :mod:`groundkit.orbitals.continuity`); None when it continued or was not checked."""

    @property
    def ok(self) -> bool:
        """True when the point has a result."""
        return self.result is not None


@dataclass(frozen=True, eq=False)
class ScanResult:
    """Outcome of ``Pipeline.scan``: points in the order of the values given.

    ``configuration`` describes the pipeline's components; ``warm_start`` the chaining used ('off', or the
    number of warm-started chains).
    """

    points: tuple[ScanPoint, ...]
    configuration: dict[str, str]
    warm_start: str = "off"

    @property
    def values(self) -> np.ndarray:
        return np.array([p.value for p in self.points], dtype=float)

    @property
    def failures(self) -> dict[float, str]:
        """value -> failure message of every point without a result."""
        return {p.value: str(p.failure) for p in self.points if not p.ok}

    @property
    def orbital_jumps(self) -> dict[float, str]:
        """value -> report of every point whose CASSCF solution jumped away from the previous point's."""
        return {p.value: p.orbital_jump for p in self.points if p.orbital_jump}

    @property
    def table(self) -> Any:
        """pandas DataFrame, one row per point: value, energy, reference, error (Ha), error_mha, one column per
        baseline (Ha), suspect (comma-separated baselines that failed a plausibility check at that point),
        verdict ('within', 'outside' or 'uncertain', see ``RunResult.verdict``), converged, iterations,
        parameters, wall_time (s), stderr (Ha, sampled estimators only), start, orbital_match, failure.
        The stderr column appears when some point has a non-zero standard error; ``active_space_error_mha`` and
        ``active_space_against`` when some point has its active-space error (:meth:`with_active_space_error`)."""
        import pandas as pd

        baseline_names: list[str] = []
        for p in self.points:
            if p.ok:
                baseline_names += [k for k in p.result.baselines if k not in baseline_names]
        rows = []
        any_stderr = False
        any_space = any(p.ok and p.result.active_space_error for p in self.points)
        for p in self.points:
            r = p.result
            row: dict[str, Any] = {"value": p.value}
            row["energy"] = r.energy if r else np.nan
            row["reference"] = r.reference.energy if r else np.nan
            row["error"] = r.error if r else np.nan
            row["error_mha"] = 1000 * r.error if r else np.nan
            if any_space:
                space = r.active_space_error if r else None
                row["active_space_error_mha"] = space["error_mha"] if space else np.nan
                row["active_space_against"] = space["against"] if space else ""
            for name in baseline_names:
                b = r.baselines.get(name) if r else None
                row[name] = np.nan if b is None else b
            row["suspect"] = ", ".join(k for k in r.baselines if k in r.suspect_baselines) if r else ""
            row["verdict"] = r.verdict if r else None
            row["converged"] = bool(r.converged) if r else False
            row["iterations"] = r.iterations if r else 0
            row["parameters"] = np.array(r.parameters) if r else np.zeros(0)
            row["wall_time"] = p.wall_time
            stderr = r.standard_error if r else None
            any_stderr = any_stderr or bool(stderr)
            row["stderr"] = np.nan if stderr is None else stderr
            row["start"] = p.start
            row["orbital_match"] = np.nan if p.orbital_match is None else p.orbital_match
            row["failure"] = p.failure
            if self.orbital_jumps:
                row["orbital_jump"] = p.orbital_jump or ""
            rows.append(row)
        table = pd.DataFrame(rows)
        if not any_stderr:
            table = table.drop(columns="stderr")
        return table

    def with_active_space_error(self) -> ScanResult:
        """This scan with every point's active-space error computed (full-space FCI where affordable, else
        CCSD(T); see :mod:`groundkit.space_error`), in this process. Returns a new scan; failed points stay."""
        from dataclasses import replace

        points = tuple(replace(p, result=p.result.with_active_space_error()) if p.ok else p for p in self.points)
        return replace(self, points=points)

    # analysis -------------------------------------------------------------------------------------------------
    def equilibrium(self, column: str = "energy", include_unconverged: bool = False) -> tuple[float, float]:
        """(value, energy in Ha) at the minimum of a cubic spline through the successful points of ``column``.

        For ``"energy"`` the points whose minimisation did not converge are left out, with an
        ``ExcludedPointsWarning`` naming them, unless ``include_unconverged=True``."""
        from .analysis import fit_mask, spline_minimum

        keep = fit_mask(self, column, include_unconverged)
        table = self.table
        return spline_minimum(table["value"].to_numpy()[keep], table[column].to_numpy(dtype=float)[keep],
                              what=column)

    def harmonic_wavenumber(self, masses: tuple[float, float] | None = None, column: str = "energy",
                            include_unconverged: bool = False) -> float:
        """Harmonic wavenumber (cm^-1) of a diatomic bond scan from the spline's curvature at its minimum.

        ``masses`` are the two atoms' masses in u (default: the most abundant isotopes). The bond length is
        taken from each point's molecule (angstrom), whatever the scan's values are. Unconverged points are left
        out as in :meth:`equilibrium`.
        """
        from .analysis import diatomic_wavenumber

        return diatomic_wavenumber(self, masses=masses, column=column, include_unconverged=include_unconverged)

    def non_parallelity(self) -> dict[str, float]:
        """Non-parallelity error (Ha) against the exact reference: max(error) − min(error) along the curve, for
        the trial state ('energy') and every baseline with a value at every successful point."""
        from .analysis import non_parallelity

        return non_parallelity(self.table)

    # output ---------------------------------------------------------------------------------------------------
    def plot(self, ax: Any = None, baselines: tuple[str, ...] = ("hf",)) -> Any:
        """Energy and exact reference (and the named baselines) against the scan value; returns the axes.

        Given a file path instead of axes (``scan.plot("curve.png")``), saves a PNG there and returns the path.
        """
        import os

        if isinstance(ax, (str, os.PathLike)):
            return upcall("png:scan", self, ax, baselines)
        import matplotlib.pyplot as plt

        if ax is None:
            _, ax = plt.subplots()
        table = self.table
        ax.plot(table["value"], table["reference"], "-", color="black", label="exact reference")
        for name in baselines:
            if name in table:
                ax.plot(table["value"], table[name], "--", label=name)
        label = self.configuration.get("trial_state", "trial state")
        ax.plot(table["value"], table["energy"], "o", label=label)
        ax.set_xlabel("scan value")
        ax.set_ylabel("energy / Ha")
        ax.legend()
        return ax

    def summary(self) -> str:
        """Plain-text table of value, energy, reference, error (mHa), verdict, iterations and start of every
        point; the verdict column reads 'within', 'outside' or 'uncertain' (chemical accuracy at 2 sigma)."""
        lines = [f"{'value':>12}{'energy/Ha':>18}{'reference/Ha':>18}{'error/mHa':>12}  {'verdict':<10}{'iter':>6}"
                 "  start"]
        for p in self.points:
            if p.ok:
                r = p.result
                lines.append(f"{p.value:>12.6g}{r.energy:>18.10f}{r.reference.energy:>18.10f}"
                             f"{1000 * r.error:>12.4f}  {r.verdict:<10}{r.iterations:>6}  {p.start}")
            else:
                lines.append(f"{p.value:>12.6g}  failed: {p.failure}")
        return "\n".join(lines)

    def pipeline(self) -> Any:
        """The scan's Pipeline (components only, no molecule), rebuilt from its points' component records."""
        from .scan_persistence import scan_pipeline

        return scan_pipeline(self)

    def geometry(self) -> Any:
        """A geometry function giving back each point's stored molecule for its value (picklable)."""
        from .scan_persistence import StoredGeometries

        return StoredGeometries(self)

    def rerun(self, *, checkpoint: str | None = None, executor: Any = None) -> ScanResult:
        """Run the scan again from its records: ``self.pipeline().scan(self.geometry(), self.values,
        warm_start=...)`` with the stored warm-start chaining."""
        from .scan_persistence import warm_start_setting

        return self.pipeline().scan(self.geometry(), list(self.values), checkpoint=checkpoint, executor=executor,
                                    warm_start=warm_start_setting(self.warm_start))

    def save(self, path: str) -> None:
        """Write the scan as JSON, atomically (schema 'groundkit.scan-result', version 1)."""
        from .scan_persistence import save_scan

        save_scan(self, path)

    def _repr_html_(self) -> str:
        return upcall("html:scan", self)

    def __repr__(self) -> str:
        ok = sum(1 for p in self.points if p.ok)
        return f"ScanResult({len(self.points)} points, {ok} with results, warm_start={self.warm_start!r})"
