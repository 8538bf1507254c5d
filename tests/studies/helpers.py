"""Shared pieces of the studies tests: H2 geometries and a dense PySCF FCI curve (reference library)."""

from __future__ import annotations

import numpy as np

import groundkit as gk


def h2(r: float, basis: str = "sto-3g") -> gk.MoleculeSpec:
    """H2 on the z axis, ``r`` Å apart."""
    return gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, r)), basis=basis)


def h2_631g(r: float) -> gk.MoleculeSpec:
    return h2(r, "6-31g")


def pyscf_fci_curve(lengths: np.ndarray, basis: str = "sto-3g") -> np.ndarray:
    """Full-CI energies (Ha) of H2 at each bond length (Å), straight from PySCF (reference library)."""
    from pyscf import fci, gto, scf

    out = []
    for r in lengths:
        mol = gto.M(atom=f"H 0 0 0; H 0 0 {r}", basis=basis, unit="Angstrom", verbose=0)
        mf = scf.RHF(mol).run(conv_tol=1e-12)
        e, _ = fci.FCI(mf).kernel()
        out.append(e)
    return np.array(out)


def comparable(table) -> dict:
    """The columns of a scan table that must agree between two runs of one scan (no timings)."""
    return {
        "value": table["value"].to_numpy(),
        "energy": table["energy"].to_numpy(),
        "reference": table["reference"].to_numpy(),
        "iterations": table["iterations"].to_numpy(),
        "start": list(table["start"]),
        "parameters": [np.asarray(p) for p in table["parameters"]],
    }


def assert_same_scan(a, b, atol: float = 1e-10, same_process: bool = True) -> None:
    """Two scan tables agree point for point (energies and parameters within ``atol``).

    Between processes the SCF solver may return an orbital with the other sign (PySCF's eigen-solver output
    depends on round-off), which flips the sign of the parameters that touch it and changes the sign-flip count
    in ``start``; ``same_process=False`` compares parameters by magnitude and ``start`` by its first word.
    """
    x, y = comparable(a), comparable(b)
    np.testing.assert_array_equal(x["value"], y["value"])
    np.testing.assert_allclose(x["energy"], y["energy"], atol=atol, rtol=0)
    np.testing.assert_allclose(x["reference"], y["reference"], atol=atol, rtol=0)
    np.testing.assert_array_equal(x["iterations"], y["iterations"])
    if same_process:
        assert x["start"] == y["start"]
    else:
        assert [s.split()[0] for s in x["start"]] == [s.split()[0] for s in y["start"]]
    for p, q in zip(x["parameters"], y["parameters"]):
        if same_process:
            np.testing.assert_allclose(p, q, atol=atol, rtol=0)
        else:
            np.testing.assert_allclose(np.abs(p), np.abs(q), atol=atol, rtol=0)
