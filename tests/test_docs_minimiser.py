"""docs/minimisers.md and DEVELOPERS.md tell minimiser authors what the code expects: the worked example runs."""

from __future__ import annotations

import re
from pathlib import Path

import pytest

import groundkit as gk
from groundkit.minimisers import BUILT_IN, Minimiser

ROOT = Path(__file__).resolve().parents[1]


def example_class():
    """Execute the Python block under '## Writing a minimiser' in docs/minimisers.md; returns its class."""
    text = (ROOT / "docs" / "minimisers.md").read_text(encoding="utf-8")
    section = text[text.index("## Writing a minimiser"):]
    code = re.search(r"```python\n(.*?)```", section, re.DOTALL).group(1)
    namespace: dict = {}
    exec(compile(code, "docs/minimisers.md", "exec"), namespace)
    return namespace["Halving"]


def test_the_documented_minimiser_runs_a_pipeline_to_full_ci():
    from pyscf import fci, gto, scf

    halving = example_class()
    try:
        mol = gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.7414)))  # NIST CCCBDB r_e
        result = mol.pipeline().trial_state(gk.UCCSD()).minimiser("halving", step=0.2).run()  # by its name
        assert result.provenance["components"]["minimiser"] == halving(step=0.2).to_dict()
        pyscf_mol = gto.M(atom="H 0 0 0; H 0 0 0.7414", basis="sto-3g", verbose=0)
        exact = fci.FCI(scf.RHF(pyscf_mol).run(conv_tol=1e-12)).kernel()[0]  # PySCF (reference library)
        assert result.converged and "below tolerance" in result.stop_reason
        assert result.energy == pytest.approx(exact, abs=1e-8)  # two electrons: UCCSD reaches full CI
        with pytest.raises(gk.ComponentError, match=r"Halving\(step=-1.0\): step must be a finite number > 0"):
            halving(step=-1.0)  # the declared constraint is checked at construction
    finally:
        gk.unregister("minimiser", "halving")


def test_developers_guide_names_the_methods_the_code_calls():
    text = (ROOT / "DEVELOPERS.md").read_text(encoding="utf-8")
    bullet = text[text.index("- **A minimiser**"):text.index("- **An estimator**")]
    assert "search(session, x0)" in bullet and "constraints" in bullet and "check_options" in bullet
    assert "register" in bullet.lower() and "BUILT_IN" not in bullet
    assert all(hasattr(Minimiser, name) for name in ("search", "check_options", "minimise"))
    assert isinstance(BUILT_IN, tuple)
