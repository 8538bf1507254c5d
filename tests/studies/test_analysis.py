from dataclasses import replace

import numpy as np
import pandas as pd
import pytest
from scipy import constants

import groundkit as gk
from groundkit.studies import AnalysisError, ScanResult, harmonic_wavenumber, non_parallelity, spline_minimum

from .helpers import h2, pyscf_fci_curve

H2_EXPERIMENT_BOND = 0.7414  # Å, NIST CCCBDB experimental r_e (from memory): context only, minimal basis
H2_EXPERIMENT_WAVENUMBER = 4401.0  # cm^-1, Huber and Herzberg (from memory): context only, minimal basis
H_MASS = 1.007825  # u, most abundant isotope (PySCF's table of common isotope masses)


def _dense_fci_minimum() -> tuple[float, float, float]:
    """(r in Å, E in Ha, d2E/dr2 in Ha/Å^2) at the minimum of a dense PySCF FCI scan (reference library):
    31 points 0.005 Å apart around the minimum, a quartic fitted through them."""
    r = np.linspace(0.66, 0.81, 31)
    e = pyscf_fci_curve(r)
    fit = np.polynomial.Polynomial.fit(r, e, 4)
    roots = [x.real for x in fit.deriv().roots() if abs(x.imag) < 1e-12 and r[0] < x.real < r[-1]]
    r0 = min(roots, key=fit)
    return r0, float(fit(r0)), float(fit.deriv(2)(r0))


def _wavenumber(curvature: float, mass_a: float, mass_b: float) -> float:
    """cm^-1 from Ha/Å^2 and masses in u (CODATA constants via scipy.constants), written out independently."""
    k = curvature * constants.physical_constants["Hartree energy"][0] / 1e-20
    mu = mass_a * mass_b / (mass_a + mass_b) * constants.physical_constants["atomic mass constant"][0]
    return np.sqrt(k / mu) / (2 * np.pi * constants.c * 100)


@pytest.fixture(scope="module")
def uccsd_scan():
    return gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, np.round(np.arange(0.55, 1.0001, 0.05), 2))


@pytest.fixture(scope="module")
def fci_minimum():
    return _dense_fci_minimum()


@pytest.mark.slow
def test_equilibrium_agrees_with_a_dense_pyscf_fci_scan(uccsd_scan, fci_minimum, capsys):
    r0, e0, _ = fci_minimum
    value, energy = uccsd_scan.equilibrium()
    assert value == pytest.approx(r0, abs=2e-3)  # PySCF FCI (reference library)
    assert energy == pytest.approx(e0, abs=2e-5)  # PySCF FCI (reference library)
    with capsys.disabled():
        print(f"\nH2/STO-3G equilibrium: scan {value:.5f} Å {energy:.8f} Ha; PySCF FCI {r0:.5f} Å {e0:.8f} Ha; "
              f"experiment {H2_EXPERIMENT_BOND} Å (NIST CCCBDB; minimal basis, context only)")


@pytest.mark.slow
def test_harmonic_wavenumber_agrees_with_pyscf(uccsd_scan, fci_minimum, capsys):
    _, _, curvature = fci_minimum
    expected = _wavenumber(curvature, H_MASS, H_MASS)
    found = uccsd_scan.harmonic_wavenumber()
    assert found == pytest.approx(expected, rel=0.03)  # PySCF FCI curvature (reference library)
    with capsys.disabled():
        print(f"H2/STO-3G harmonic wavenumber: scan {found:.1f} cm^-1; PySCF FCI {expected:.1f} cm^-1; "
              f"experiment {H2_EXPERIMENT_WAVENUMBER} cm^-1 (Huber and Herzberg; minimal basis, context only)")


@pytest.mark.slow
def test_heavier_isotopes_lower_the_wavenumber(uccsd_scan):
    hydrogen = uccsd_scan.harmonic_wavenumber()
    deuterium = uccsd_scan.harmonic_wavenumber(masses=(2.014102, 2.014102))  # u, from memory
    assert deuterium / hydrogen == pytest.approx(np.sqrt(H_MASS / 2.014102), rel=1e-12)  # harmonic: ω ∝ μ^-1/2


def test_wavenumber_of_a_known_parabola():
    # 0.5 Ha/Å^2 curvature, unit masses: the conversion written out in _wavenumber
    assert harmonic_wavenumber(0.5, (1.0, 1.0)) == pytest.approx(_wavenumber(0.5, 1.0, 1.0), rel=1e-12)
    x = np.linspace(-0.2, 0.3, 11)
    value, energy = spline_minimum(x, 0.25 * (x - 0.05) ** 2 - 1.0)
    assert value == pytest.approx(0.05, abs=1e-12) and energy == pytest.approx(-1.0, abs=1e-12)


@pytest.mark.slow
def test_non_parallelity_error(uccsd_scan):
    npe = uccsd_scan.non_parallelity()
    # internal consistency (errors against the problems' own references; those references are checked against
    # PySCF FCI in tests/test_cli.py and tests/studies/test_orbitals.py): UCCSD is exact for two electrons
    assert npe["energy"] < 1e-7
    errors = uccsd_scan.table["hf"] - uccsd_scan.table["reference"]
    assert npe["hf"] == pytest.approx(errors.max() - errors.min(), abs=1e-14)
    assert npe["hf"] > 5e-3  # the HF error grows as the bond stretches
    table = pd.DataFrame({"reference": [-1.0, -2.0, -3.0], "energy": [-0.99, -1.98, -2.995], "hf": [0, 0, np.nan]})
    assert non_parallelity(table) == {"energy": pytest.approx(0.015)}  # hf lacks a value: left out


def test_wavenumber_needs_one_diatomic():
    first = gk.Pipeline().scan(h2, [0.7], warm_start=False).points[0]
    linear = gk.MoleculeSpec(symbols=("H", "H", "H"), coordinates=((0, 0, 0), (0, 0, 0.9), (0, 0, 1.8)),
                             multiplicity=2)
    points = tuple(replace(first, index=k, value=0.7 + 0.1 * k, molecule=linear) for k in range(4))
    with pytest.raises(AnalysisError, match="one diatomic"):
        ScanResult(points=points, configuration={}).harmonic_wavenumber()
    with pytest.raises(AnalysisError, match="appears twice"):
        spline_minimum(np.array([0.1, 0.2, 0.2, 0.3]), np.array([1.0, 0.0, 0.0, 1.0]))


def _scipy_spline_minimum(x: np.ndarray, y: np.ndarray) -> tuple[float, float]:
    """Minimum of SciPy's not-a-knot cubic spline through (x, y), found here with SciPy alone."""
    from scipy.interpolate import CubicSpline

    spline = CubicSpline(x, y)
    roots = [r for r in spline.derivative().roots(extrapolate=False) if spline(r, 2) > 0]
    best = min(roots, key=spline)
    return float(best), float(spline(best))


def test_unconverged_points_are_left_out_of_the_fits_with_a_warning(uccsd_scan):
    stopped = gk.Pipeline(h2(0.75)).trial_state(gk.UCCSD()).minimiser(gk.BFGS(max_iterations=1)).run()
    assert not stopped.converged  # a real minimisation, stopped after one iteration
    points = list(uccsd_scan.points)
    points[4] = replace(points[4], result=stopped)
    scan = replace(uccsd_scan, points=tuple(points))
    x = np.array([p.value for p in scan.points])
    y = np.array([p.result.energy for p in scan.points])
    keep = np.arange(len(x)) != 4
    with pytest.warns(gk.errors.ExcludedPointsWarning, match=r"1 point\(s\) .* did not converge .*values 0\.75;"):
        value, energy = scan.equilibrium()
    assert (value, energy) == pytest.approx(_scipy_spline_minimum(x[keep], y[keep]), abs=1e-10)  # SciPy
    used = scan.equilibrium(include_unconverged=True)  # asked for: every point, no warning
    assert used == pytest.approx(_scipy_spline_minimum(x, y), abs=1e-10)  # SciPy (reference library)
    assert abs(used[0] - value) > 1e-5  # the stopped point moves the minimum
    with pytest.warns(gk.errors.ExcludedPointsWarning, match="values 0.75"):
        left_out = scan.harmonic_wavenumber()
    whole = replace(uccsd_scan, points=tuple(p for k, p in enumerate(uccsd_scan.points) if k != 4))
    assert left_out == pytest.approx(whole.harmonic_wavenumber(), abs=1e-9)  # internal consistency
    assert scan.equilibrium(column="hf") == pytest.approx(uccsd_scan.equilibrium(column="hf"))  # baselines: all
    with pytest.raises(AnalysisError, match="include_unconverged=1"):
        scan.equilibrium(include_unconverged=1)
