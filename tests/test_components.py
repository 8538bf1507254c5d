"""Shorthand names for components and the checks on their options."""

from __future__ import annotations

import numpy as np
import pytest

import groundkit as gk
from groundkit.studies.toml_file import read_study


def test_the_noisy_estimator_has_a_name():
    assert gk.Pipeline().estimator("noisy").components["estimator"] == gk.NoisyEstimator()
    chosen = gk.Pipeline().estimator("noisy", readout=0.0, shots=100, seed=2).components["estimator"]
    assert chosen == gk.NoisyEstimator(readout=0.0, shots=100, seed=2)


def test_named_explicit_trial_states():
    pipeline = gk.Pipeline().trial_state("excitation-list", excitations=[((2, 3), (1, 0))])
    assert pipeline.components["trial_state"] == gk.ExcitationList([((2, 3), (1, 0))])
    pipeline = gk.Pipeline().trial_state("pauli-rotations", strings=["Y0 X1 X2 X3"])
    assert pipeline.components["trial_state"] == gk.PauliRotations(["Y0 X1 X2 X3"])


STUDY = '[molecule]\nsymbols = ["H", "H"]\ncoordinates = [[0, 0, 0], [0, 0, 0.74]]\n'


def test_a_study_file_can_choose_the_noisy_estimator(tmp_path):
    path = tmp_path / "noisy.toml"
    path.write_text(STUDY + '[components]\nestimator = {name = "noisy", two_qubit = 0.001, shots = 500, seed = 4}\n',
                    encoding="utf-8")
    estimator = read_study(path).pipeline.components["estimator"]
    assert estimator == gk.NoisyEstimator(two_qubit=0.001, shots=500, seed=4)


@pytest.mark.parametrize("value", ["false", "true", 0, 1, None, 1.0])
def test_frozen_core_must_be_a_bool(value):
    with pytest.raises(gk.ActiveSpaceError, match=f"frozen_core={value!r}"):
        gk.ActiveSpace(frozen_core=value)
    with pytest.raises(gk.ActiveSpaceError, match="True or False"):
        gk.Pipeline().active_space(frozen_core=value)


def test_frozen_core_takes_bools():
    assert gk.ActiveSpace(frozen_core=np.bool_(True)).frozen_core is True
    assert gk.ActiveSpace(frozen_core=False) == gk.ActiveSpace()


def test_a_study_file_refuses_a_string_for_frozen_core(tmp_path):
    path = tmp_path / "frozen.toml"
    path.write_text(STUDY + '[active_space]\nfrozen_core = "false"\n', encoding="utf-8")
    with pytest.raises(gk.StudyFileError, match="active_space.*frozen_core='false'"):
        read_study(path)


@pytest.mark.parametrize("name, expected", [
    ("puccd", gk.PairDoubles()), ("pair-doubles", gk.PairDoubles()),
    ("hf", gk.ReferenceDeterminant()), ("hartree-fock", gk.ReferenceDeterminant()),
    ("reference-determinant", gk.ReferenceDeterminant()),
])
def test_trial_state_names_from_before_and_after_the_rename(name, expected):
    assert gk.Pipeline().trial_state(name).components["trial_state"] == expected


@pytest.mark.parametrize("name", ["gradient-descent", "GradientDescent", "FixedStepDescent", "fixed_step_descent"])
def test_the_fixed_step_minimiser_keeps_its_former_names(name):
    assert gk.Pipeline().minimiser(name, step=0.3).components["minimiser"] == gk.FixedStepDescent(step=0.3)


def test_a_result_saved_with_former_class_names_still_loads(tmp_path):
    result = gk.Pipeline(gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.74)))).trial_state(
        gk.PairDoubles()).minimiser(gk.FixedStepDescent(step=0.5)).run()
    path = tmp_path / "old.json"
    result.save(path)
    text = path.read_text().replace("PairDoubles(", "PUCCD(").replace("FixedStepDescent(", "GradientDescent(")
    assert "PUCCD(" in text and "GradientDescent(" in text
    path.write_text(text)
    loaded = gk.load_result(path)
    assert loaded.energy == result.energy and loaded.parameters.tolist() == result.parameters.tolist()
