"""Comparison grids show progress outside notebooks without changing the table."""

import numpy as np
import pytest

import groundkit as gk

from .helpers import pyscf_fci_curve


def test_compare_with_progress_bar_gives_the_same_table(capsys):
    # H2 at 0.7414 angstrom, NIST CCCBDB experimental r_e (from memory)
    h2 = gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.7414))).pipeline()
    quiet = gk.compare(h2, minimisers=["bfgs", "cobyla"])
    shown = gk.compare(h2, minimisers=["bfgs", "cobyla"], progress=True)
    assert "combinations" in capsys.readouterr().err
    assert list(quiet["energy"]) == list(shown["energy"])
    (exact,) = pyscf_fci_curve(np.array([0.7414]))  # PySCF FCI on the test's own molecule (reference library)
    assert all(-1e-10 <= e - exact < 1.6e-3 for e in shown["energy"])  # chemical accuracy: common practice
    assert list(shown["error"]) == pytest.approx([e - exact for e in shown["energy"]], abs=1e-9)  # reported errors
