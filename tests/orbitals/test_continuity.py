"""CASSCF orbitals along bond scans: continued from point to point, jumps reported (PySCF as the reference)."""

from __future__ import annotations

import warnings

import numpy as np
import pytest
from pyscf import gto, mcscf, scf

import groundkit as gk
from groundkit.orbitals import continuity
from tests.conftest import diatomic

CASSCF = gk.ActiveSpace(electrons=6, orbitals=6, orbital_set="casscf")


def _pyscf_continued_scan(bonds) -> list[float]:
    """PySCF's own CASSCF(6,6) scan of N2: each point starts from the previous point's orbitals, projected by
    PySCF's ``mcscf.project_init_guess`` (reference library)."""
    energies, previous = [], None
    for r in bonds:
        mol = gto.M(atom=f"N 0 0 0; N 0 0 {r:.10f}", basis="sto-3g", verbose=0)
        mf = scf.RHF(mol).run(conv_tol=1e-10)
        mc = mcscf.CASSCF(mf, 6, 6)
        mc.conv_tol = 1e-11
        start = None if previous is None else mcscf.project_init_guess(mc, previous[1], previous[0])
        energies.append(mc.kernel(start)[0])
        previous = (mol, mc.mo_coeff)
    return energies


@pytest.mark.slow
def test_n2_casscf_curve_is_continued_and_smooth():
    bonds = np.linspace(0.95, 1.8, 7)
    expected = _pyscf_continued_scan(bonds)
    energies, previous, overlaps = [], None, []
    for r in bonds:  # the path a warm-started scan takes: each CASSCF guided by the previous point's orbitals
        molecule = diatomic("N", "N", float(r))
        problem = gk.Problem(molecule, CASSCF) if previous is None else None
        if previous is not None:
            with continuity.casscf_guide(*previous):
                problem = gk.Problem(molecule, CASSCF)
            space = problem.active_orbitals
            overlaps.append(continuity.active_overlap(previous[0], previous[1], molecule, space.mo_coeff, 4, 6))
        energies.append(problem.reference.energy)
        previous = (molecule, problem.active_orbitals.mo_coeff)
    assert energies == pytest.approx(expected, abs=1e-7)  # PySCF's continued CASSCF scan
    jumps = np.abs(np.diff(energies, 2))
    assert np.max(jumps) <= np.max(np.abs(np.diff(expected, 2))) + 1e-3  # PySCF scan; 1 mHa margin (issue 19)
    assert min(overlaps) > continuity.JUMP_OVERLAP  # the same solution all along: no jump reported


def test_a_scan_hands_casscf_orbitals_on_and_reports_jumps(monkeypatch):
    pipeline = gk.Pipeline().active_space(gk.ActiveSpace(electrons=2, orbitals=2, orbital_set="casscf")).trial_state(
        gk.ReferenceDeterminant())
    scan = pipeline.scan(lambda r: diatomic("Li", "H", r), [1.5, 1.6])
    assert scan.orbital_jumps == {} and "orbital_jump" not in scan.table.columns
    assert scan.points[0].handover["casscf_orbitals"]  # plain data for the next point's CASSCF
    monkeypatch.setattr(continuity, "JUMP_OVERLAP", 1.01)  # no overlap reaches it: every continued point "jumps"
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        scan = pipeline.scan(lambda r: diatomic("Li", "H", r), [1.7, 1.8])
    assert list(scan.orbital_jumps) == [1.8]
    assert any(issubclass(w.category, gk.OrbitalJumpWarning) for w in caught)
    assert "another solution" in scan.table["orbital_jump"].iloc[1]
