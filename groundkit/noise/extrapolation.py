"""Zero-noise extrapolation: fits of energies at scaled noise, evaluated at zero noise, with their uncertainty.

Richardson extrapolation (Temme, Bravyi and Gambetta, Phys. Rev. Lett. 119, 180509 (2017)) is the polynomial
through all points, evaluated at λ = 0 (Lagrange coefficients); ``linear`` is the least-squares straight line;
``exponential`` fits E(λ) = a + b·exp(−cλ) (Giurgica-Tiron et al., arXiv:2005.10921; for a global depolarising
channel E(λ) is exactly of this form). The standard error propagates the points' standard errors through the fit
(exactly for the linear fits, by a numerical Jacobian for the exponential one).
"""

from __future__ import annotations

import warnings
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..errors import NoiseError

FITS = ("linear", "richardson", "exponential")


@dataclass(frozen=True)
class Extrapolation:
    """A zero-noise extrapolation: ``value`` ± ``standard_error`` (Ha) from ``energies`` at ``scales``."""

    fit: str
    value: float
    standard_error: float
    scales: tuple[float, ...]
    energies: tuple[float, ...]
    errors: tuple[float, ...]
    parameters: tuple[float, ...]

    def to_dict(self) -> dict[str, Any]:
        return {"fit": self.fit, "value": self.value, "standard_error": self.standard_error,
                "scales": list(self.scales), "energies": list(self.energies), "errors": list(self.errors),
                "parameters": list(self.parameters)}


def _zero_value(fit: str, scales: np.ndarray, energies: np.ndarray, sigma: np.ndarray) -> tuple[float, tuple]:
    if fit == "richardson":
        coefficients = np.array([np.prod([s / (s - r) for s in scales if s != r]) for r in scales])
        return float(coefficients @ energies), tuple(np.polyfit(scales, energies, len(scales) - 1))
    if fit == "linear":
        slope, intercept = np.polyfit(scales, energies, 1)
        return float(intercept), (float(slope), float(intercept))
    from scipy.optimize import OptimizeWarning, curve_fit

    def model(x: np.ndarray, a: float, b: float, c: float) -> np.ndarray:
        return a + b * np.exp(-c * x)

    slope = (energies[-1] - energies[0]) / (scales[-1] - scales[0])
    spread = max(abs(energies[-1] - energies[0]), 1e-12)
    c0 = max(abs(slope) / spread, 1e-3)
    guess = (energies[-1] + np.sign(slope) * spread, -np.sign(slope) * spread * np.exp(c0 * scales[0]), c0)
    try:
        with warnings.catch_warnings():  # no covariance from exactly determined fits: the error is propagated below
            warnings.simplefilter("ignore", OptimizeWarning)
            (a, b, c), _ = curve_fit(model, scales, energies, p0=guess, maxfev=20000)
    except (RuntimeError, ValueError) as err:
        raise NoiseError(f"the exponential zero-noise fit did not converge ({err}); use fit 'linear' or "
                         "'richardson'") from None
    return float(a + b), (float(a), float(b), float(c))


def extrapolate(scales: Any, energies: Any, errors: Any, fit: str) -> Extrapolation:
    """The zero-noise value of ``energies`` (Ha) at noise ``scales`` by ``fit`` ('linear', 'richardson',
    'exponential'), with its standard error from the points' standard ``errors``."""
    if fit not in FITS:
        raise NoiseError(f"unknown zero-noise fit {fit!r}; accepted: {', '.join(FITS)}")
    x, y, s = (np.asarray(v, dtype=float) for v in (scales, energies, errors))
    need = 3 if fit == "exponential" else 2
    if len(set(x.tolist())) < need or len(set(x.tolist())) != x.size:
        raise NoiseError(f"the {fit} zero-noise fit needs at least {need} distinct scale factors; got {x.tolist()}")
    value, parameters = _zero_value(fit, x, y, s)
    jacobian = np.empty(x.size)
    for k in range(x.size):
        step = max(abs(s[k]), 1e-7)
        shifted = y.copy()
        shifted[k] += step
        jacobian[k] = (_zero_value(fit, x, shifted, s)[0] - value) / step
    stderr = float(np.sqrt(np.sum((jacobian * s) ** 2)))
    return Extrapolation(fit, value, stderr, tuple(x.tolist()), tuple(y.tolist()), tuple(s.tolist()),
                         tuple(float(p) for p in parameters))
