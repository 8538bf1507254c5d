"""Analysis of potential-energy curves: spline minimum, harmonic wavenumber, non-parallelity error.

Units: energies in Hartree, bond lengths in angstrom, wavenumbers in cm^-1, masses in u. Physical constants are
CODATA values from ``scipy.constants``.
"""

from __future__ import annotations

import warnings
from typing import Any

import numpy as np
from scipy import constants
from scipy.interpolate import CubicSpline

from groundkit.baselines import METHODS
from groundkit.chemistry import most_abundant_isotope_mass
from groundkit.errors import ExcludedPointsWarning

from .errors import AnalysisError

MIN_SPLINE_POINTS = 4

HARTREE_J = constants.physical_constants["Hartree energy"][0]  # J (CODATA, via SciPy)
ATOMIC_MASS_KG = constants.physical_constants["atomic mass constant"][0]  # kg per u (CODATA, via SciPy)
ANGSTROM_M = constants.angstrom  # m


def fit_mask(scan: Any, column: str = "energy", include_unconverged: bool = False) -> np.ndarray:
    """Which points of ``scan`` a fit of ``column`` uses: the points with a result, and for the trial state's
    ``"energy"`` only those whose minimisation converged (unless ``include_unconverged``). Leaving points out
    warns (``ExcludedPointsWarning``) with their values; a baseline column uses every point with a result."""
    if not isinstance(include_unconverged, bool):
        raise AnalysisError(f"include_unconverged={include_unconverged!r}; accepted: True or False")
    ok = np.array([p.ok for p in scan.points], dtype=bool)
    if column != "energy" or include_unconverged:
        return ok
    converged = np.array([p.ok and bool(p.result.converged) for p in scan.points], dtype=bool)
    left_out = [p.value for p, c, o in zip(scan.points, converged, ok) if o and not c]
    if left_out:
        warnings.warn(
            f"{len(left_out)} point(s) whose minimisation did not converge left out of the {column} fit: values "
            f"{', '.join(f'{v:g}' for v in left_out)}; pass include_unconverged=True to use them",
            ExcludedPointsWarning, stacklevel=3,
        )
    return converged


def curve_spline(x: np.ndarray, y: np.ndarray, what: str = "energy") -> CubicSpline:
    """Cubic spline (not-a-knot ends) through the finite (x, y) pairs, x ascending and distinct."""
    x, y = np.asarray(x, dtype=float), np.asarray(y, dtype=float)
    keep = np.isfinite(x) & np.isfinite(y)
    x, y = x[keep], y[keep]
    if x.size < MIN_SPLINE_POINTS:
        raise AnalysisError(
            f"{what}: {x.size} point(s) with values; a spline minimum needs at least {MIN_SPLINE_POINTS}"
        )
    order = np.argsort(x, kind="stable")
    x, y = x[order], y[order]
    if np.any(np.diff(x) <= 0):
        repeated = x[1:][np.diff(x) <= 0][0]
        raise AnalysisError(f"{what}: scan value {repeated!r} appears twice; the values must be distinct")
    return CubicSpline(x, y)


def spline_minimum(x: np.ndarray, y: np.ndarray, what: str = "energy") -> tuple[float, float]:
    """(x, y) at the lowest interior minimum of a cubic spline through the points."""
    x_min, y_min, _ = _minimum(curve_spline(x, y, what), what)
    return x_min, y_min


def _minimum(spline: CubicSpline, what: str) -> tuple[float, float, float]:
    """(x, y, d2y/dx2) at the spline's lowest interior minimum; ``AnalysisError`` when it lies at an end."""
    lo, hi = spline.x[0], spline.x[-1]
    slope, curvature = spline.derivative(1), spline.derivative(2)
    roots = [float(r) for r in np.atleast_1d(slope.roots(extrapolate=False)) if lo < r < hi]
    minima = [r for r in roots if curvature(r) > 0]
    if not minima:
        lowest = spline.x[int(np.argmin(spline(spline.x)))]
        raise AnalysisError(
            f"{what}: the curve has no minimum inside the scan [{lo:g}, {hi:g}] (lowest point at {lowest:g}); "
            "extend the scan past the minimum"
        )
    best = min(minima, key=lambda r: float(spline(r)))
    return best, float(spline(best)), float(curvature(best))


def harmonic_wavenumber(curvature: float, masses: tuple[float, float]) -> float:
    """Wavenumber (cm^-1) of a harmonic oscillator: curvature in Ha/Å², masses of the two atoms in u."""
    if curvature <= 0:
        raise AnalysisError(f"curvature {curvature!r} Ha/Å² is not positive; no harmonic wavenumber")
    m1, m2 = (float(m) for m in masses)
    if not (m1 > 0 and m2 > 0):
        raise AnalysisError(f"masses {masses!r} must be positive numbers in u")
    force = curvature * HARTREE_J / ANGSTROM_M**2  # N/m
    reduced = m1 * m2 / (m1 + m2) * ATOMIC_MASS_KG  # kg
    omega = np.sqrt(force / reduced)  # rad/s
    return float(omega / (2 * np.pi * constants.c) / 100.0)  # cm^-1


def diatomic_wavenumber(scan: Any, masses: tuple[float, float] | None = None, column: str = "energy",
                        include_unconverged: bool = False) -> float:
    """Harmonic wavenumber (cm^-1) of a diatomic scan, the bond length taken from each point's molecule; the
    points used are those of :func:`fit_mask`."""

    keep = fit_mask(scan, column, include_unconverged)
    points = [p for p, k in zip(scan.points, keep) if k]
    symbols = {p.molecule.symbols for p in points}
    if len(symbols) != 1 or len(next(iter(symbols), ())) != 2:
        found = sorted("".join(s) for s in symbols)
        raise AnalysisError(f"harmonic_wavenumber needs a scan of one diatomic molecule; found {found}")
    (a, b), = symbols
    if masses is None:
        masses = (most_abundant_isotope_mass(a), most_abundant_isotope_mass(b))
    elif len(tuple(masses)) != 2:
        raise AnalysisError(f"masses {masses!r}: give two masses in u, one per atom ({a}, {b})")
    energies = scan.table[column].to_numpy(dtype=float)[keep]
    lengths = np.array([p.molecule.distance(0, 1) for p in points])
    _, _, curvature = _minimum(curve_spline(lengths, energies, column), column)
    return harmonic_wavenumber(curvature, tuple(masses))


def non_parallelity(table: Any) -> dict[str, float]:
    """max(E − E_exact) − min(E − E_exact) (Ha) along the curve for 'energy' and each baseline column (the
    baseline names are those of :data:`groundkit.baselines.METHODS`, the one list of them)."""

    reference = table["reference"].to_numpy(dtype=float)
    ok = np.isfinite(reference)
    columns = ["energy"] + [c for c in table.columns if c in METHODS]
    out = {}
    for column in columns:
        values = table[column].to_numpy(dtype=float)
        if ok.any() and np.all(np.isfinite(values[ok])):
            error = values[ok] - reference[ok]
            out[column] = float(error.max() - error.min())
    return out
