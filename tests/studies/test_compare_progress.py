"""Comparison grids show progress outside notebooks without changing the table."""

import groundkit as gk


def test_compare_with_progress_bar_gives_the_same_table(capsys):
    h2 = gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.7414))).pipeline()  # NIST CCCBDB
    quiet = gk.compare(h2, minimisers=["bfgs", "cobyla"])
    shown = gk.compare(h2, minimisers=["bfgs", "cobyla"], progress=True)
    assert "combinations" in capsys.readouterr().err
    assert list(quiet["energy"]) == list(shown["energy"])
    assert all(abs(e) < 1.6e-3 for e in shown["error"])  # full CI reference from PySCF; chemical accuracy
