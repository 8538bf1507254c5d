import numpy as np
import pytest

import groundkit as gk
from groundkit.studies import ScanInputError

from .helpers import h2, pyscf_fci_curve


@pytest.mark.slow
def test_h2_bond_length_matches_the_pyscf_fci_minimum():
    optimum = gk.Pipeline().trial_state(gk.UCCSD()).optimise_geometry(h2, 0.80, tolerance=1e-4)
    r = optimum.parameters[0]
    assert optimum.molecule.distance(0, 1) == pytest.approx(r, abs=1e-12)
    # PySCF FCI (reference library): the optimum is lower than FCI 1e-3 Å either side of it
    below, at, above = pyscf_fci_curve(np.array([r - 1e-3, r, r + 1e-3]))
    assert optimum.energy == pytest.approx(at, abs=1e-8)
    assert at < below and at < above
    assert r == pytest.approx(0.7349, abs=2e-3)  # the dense PySCF FCI minimum found in test_analysis.py
    assert optimum.evaluations == len(optimum.history)


def test_bad_options_are_refused():
    pipeline = gk.Pipeline()
    with pytest.raises(ScanInputError, match="method='newton'"):
        pipeline.optimise_geometry(h2, 0.7, method="newton")
    with pytest.raises(ScanInputError, match="initial"):
        pipeline.optimise_geometry(h2, [np.nan])
    with pytest.raises(ScanInputError, match="MoleculeSpec"):
        pipeline.optimise_geometry(lambda r: None, 0.7)
