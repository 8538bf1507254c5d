"""The CircuitTrialState examples of docs/circuits.md, read from the document and run."""

from __future__ import annotations

import re
from pathlib import Path

import pytest

import groundkit as gk
from tests.circuits.helpers import H2
from tests.outside_references import diatomic, pyscf_exact

DOC = Path(__file__).parents[2] / "docs" / "circuits.md"


@pytest.fixture(scope="module")
def namespace() -> dict:
    section = DOC.read_text().split("### CircuitTrialState", 1)[1].split("### QubitObjective", 1)[0]
    blocks = re.findall(r"```python\n(.*?)```", section, re.S)
    assert len(blocks) == 2
    names: dict = {}
    for block in blocks:
        exec(compile(block, str(DOC), "exec"), names)
    return names


def test_user_circuit_reaches_the_exact_energy(namespace):
    result = namespace["result"]
    molecule = namespace["h2"]
    assert (molecule.basis, molecule.distance(0, 1)) == ("sto-3g", pytest.approx(0.7414))  # the document's H2
    exact = pyscf_exact(diatomic("H", "H", 0.7414)).exact  # PySCF FCI on the test's own molecule (reference library)
    assert result.converged
    assert result.energy == pytest.approx(exact, abs=1e-6)  # one angle spans the two-determinant singlet space
    assert result.error == pytest.approx(result.energy - exact, abs=1e-9)  # the reported error, against PySCF
    assert result.within_chemical_accuracy  # 1.6 mHa, common practice


def test_subclass_follows_the_register(namespace):
    rotations = namespace["Rotations"]()
    tapered = gk.Pipeline(H2).mapping(gk.QubitMapping("parity", taper=True)).trial_state(rotations)
    assert tapered.objective().n_parameters == 1
    assert gk.Pipeline(H2).trial_state(rotations).objective().n_parameters == 4
