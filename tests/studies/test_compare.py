import numpy as np
import pytest

import groundkit as gk
from groundkit.studies import ScanInputError

from .helpers import h2, pyscf_fci_curve


def test_every_combination_is_a_row():
    pipeline = gk.Pipeline(h2(0.74))
    table = gk.studies.compare(pipeline, mappings=["jordan-wigner", "parity"], trial_states=["uccsd", "puccd"],
                               minimisers=[gk.BFGS(), gk.COBYLA()])
    assert len(table) == 8
    for column in ("mapping", "trial_state", "estimator", "minimiser", "energy", "reference", "error", "error_mha",
                   "within_chemical_accuracy", "qubits", "parameters", "two_qubit_gates", "shot_budget",
                   "converged", "iterations", "wall_time", "failure"):
        assert column in table
    (exact,) = pyscf_fci_curve(np.array([0.74]))  # PySCF FCI on the test's own molecule (reference library)
    assert (table["energy"] - exact).abs().max() < 1e-6  # H2: UCCSD and pUCCD are exact for two electrons
    assert table["within_chemical_accuracy"].all()  # internal consistency: the verdict column agrees
    assert table["shot_budget"].isna().all()  # exact estimator: no shots
    assert set(table["estimator"]) == {"ExactEstimator()"}  # left out: the pipeline's own (default) estimator
    # the mapping does not change the determinant-space energy
    by_mapping = table.groupby(["trial_state", "minimiser"])["energy"].agg(lambda e: e.max() - e.min())
    assert (by_mapping < 1e-12).all()


def test_bad_grids_are_refused():
    with pytest.raises(ScanInputError, match="needs a pipeline with a molecule"):
        gk.studies.compare(gk.Pipeline(), trial_states=["uccsd"])
    with pytest.raises(ScanInputError, match="trial_states is empty"):
        gk.studies.compare(gk.Pipeline(h2(0.74)), trial_states=[])
    with pytest.raises(ScanInputError, match="give a list"):
        gk.studies.compare(gk.Pipeline(h2(0.74)), minimisers="bfgs")
    with pytest.raises(gk.ComponentError, match="unknown trial state"):
        gk.studies.compare(gk.Pipeline(h2(0.74)), trial_states=["nonsense"])
