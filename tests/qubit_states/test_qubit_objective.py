"""QubitObjective's reports: amplitudes by determinant label, <S^2>, <N>, and the run result."""

from __future__ import annotations

import numpy as np
import pytest

import groundkit as gk
from groundkit.qubit_states import HardwareEfficient
from tests.circuits.helpers import H2, random_angles


@pytest.mark.parametrize("mapping", [gk.QubitMapping("jordan-wigner"), gk.QubitMapping("bravyi-kitaev"),
                                     gk.QubitMapping("parity", taper=True)])
def test_amplitudes_follow_the_engine_convention(mapping):
    # an exact state of the engine, embedded, read back through a qubit objective's labels
    pipeline = gk.Pipeline(H2).mapping(mapping)
    engine = pipeline.objective()
    theta = engine.initial_parameters() + 0.3
    qubit = pipeline.trial_state(HardwareEfficient(layers=0, rotations=("rz",))).objective()
    embedded = pipeline.encoding().embed(engine.state(theta))
    qubit.program.state = lambda _: embedded  # the read-out below only needs a statevector
    read = qubit.amplitudes(np.zeros(qubit.n_parameters))
    expected = engine.amplitudes(theta)
    phase = read["20"] / expected["20"]
    for label, value in expected.items():
        assert read[label] == pytest.approx(phase * value, abs=1e-12)


def test_non_determinant_basis_states_are_labelled_by_bits():
    objective = gk.Pipeline(H2).trial_state(HardwareEfficient(layers=1, init="zeros")).objective()
    amplitudes = objective.amplitudes(random_angles(objective.n_parameters, 2), threshold=0.0)
    assert len(amplitudes) == 16
    assert {"20", "ab", "ba", "02"} <= set(amplitudes)
    assert "0000" in amplitudes and "1111" in amplitudes


def test_spin_square_and_particle_number():
    objective = gk.Pipeline(H2).trial_state(HardwareEfficient(layers=1, init="zeros", jitter=0.0)).objective()
    theta = np.zeros(objective.n_parameters)
    assert objective.particle_number(theta) == pytest.approx(0.0, abs=1e-12)
    assert objective.spin_square(theta) == pytest.approx(0.0, abs=1e-12)
    flipped = gk.Pipeline(H2).trial_state(HardwareEfficient(layers=0, rotations=("rx",), init="zeros")).objective()
    one_electron = np.array([np.pi, 0, 0, 0])  # qubit 0 flipped: one alpha electron, a doublet
    assert flipped.particle_number(one_electron) == pytest.approx(1.0, abs=1e-12)
    assert flipped.spin_square(one_electron) == pytest.approx(0.75, abs=1e-12)


def test_run_result_and_persistence(tmp_path):
    result = gk.Pipeline(H2).mapping(gk.QubitMapping("parity", taper=True)).trial_state(
        HardwareEfficient(layers=1)).run()
    assert result.resources.parameters == 4
    assert set(result.amplitudes) <= {"20", "02", "ab", "ba"}
    assert abs(result.amplitudes["20"]) > 0.9
    path = tmp_path / "hea.json"
    result.save(str(path))
    assert gk.load_result(str(path)) == result
