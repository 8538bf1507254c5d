"""docs/components.md: the worked example under 'Adding your own' runs, and its classes work by name."""

from __future__ import annotations

import re
from pathlib import Path

import numpy as np
import openfermion as of
import pytest

import groundkit as gk
from tests import outside_references as outside

ROOT = Path(__file__).resolve().parents[1]


@pytest.fixture(scope="module")
def example():
    text = (ROOT / "docs" / "components.md").read_text(encoding="utf-8")
    section = text[text.index("## Adding your own"):]
    code = re.search(r"```python\n(.*?)```", section, re.DOTALL).group(1)
    namespace: dict = {}
    exec(compile(code, "docs/components.md", "exec"), namespace)
    yield namespace
    gk.unregister("trial_state", "lowest-pairs")
    gk.unregister("mapping", "prefix-parity")


def test_the_documented_example_reaches_full_ci(example):
    exact = outside.pyscf_exact(outside.diatomic("H", "H", 0.7414)).exact
    result = example["result"]
    assert result.converged and result.energy == pytest.approx(exact, abs=1e-9)  # PySCF FCI (reference library)
    assert result.resources.qubits == 1  # internal consistency: tapering removes the symmetry qubits


def test_the_documented_matrix_mapping_is_openfermions_parity_code(example):
    assert np.array_equal(example["prefix_parity_matrix"](8), of.parity_code(8).encoder.toarray())  # OpenFermion
    pipeline = gk.Pipeline(example["h2"]).mapping("prefix-parity")
    built_in = gk.Pipeline(example["h2"]).mapping("parity")
    assert pipeline.qubit_hamiltonian() == built_in.qubit_hamiltonian()  # internal consistency


def test_the_documented_classes_round_trip(example):
    state = example["LowestPairs"](virtuals=2)
    assert gk.component_from_dict(state.to_dict()) == state
    with pytest.raises(gk.ComponentError, match=r"LowestPairs\(virtuals=0\): virtuals must be an integer >= 1"):
        example["LowestPairs"](virtuals=0)
