"""A study task records what groundkit refuses (a GroundkitError) as a failed row and raises everything else."""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import pytest

import groundkit as gk
from groundkit.studies.batch import run_study
from groundkit.studies.toml_file import read_study

from .helpers import h2


@dataclass(frozen=True)
class Broken(gk.TrialState):
    """A trial state with a programming error in it."""

    def excitations(self, problem):
        return [((2, 3), (1, 0))][problem.n_orbitals]  # IndexError: a bug, not bad input


@dataclass(frozen=True)
class Refused(gk.TrialState):
    """A trial state groundkit refuses: its excitation does not conserve the electron count."""

    def excitations(self, problem):
        return [((2, 3), (0,))]


def test_a_programming_error_in_a_scan_point_is_raised():
    with pytest.raises(IndexError):
        gk.Pipeline().trial_state(Broken()).scan(h2, [0.7, 0.8])


def test_a_programming_error_in_a_compare_cell_is_raised():
    with pytest.raises(IndexError):
        gk.compare(gk.Pipeline(h2(0.74)), trial_states=[gk.UCCSD(), Broken()])


def test_a_programming_error_in_a_batch_scan_is_raised(tmp_path):
    path = tmp_path / "study.toml"
    path.write_text('[molecule]\nsymbols = ["H", "H"]\ncoordinates = [[0, 0, 0], [0, 0, 0.74]]\n'
                    '[scan]\nbond = [0, 1]\nvalues = [0.7, 0.8]\n', encoding="utf-8")
    study = read_study(path)
    study = dataclasses.replace(study, pipeline=study.pipeline.trial_state(Broken()))
    with pytest.raises(IndexError):
        run_study(study, progress=False)


def test_a_refused_trial_state_becomes_a_failed_row_and_the_study_goes_on():
    scan = gk.Pipeline().trial_state(Refused()).scan(h2, [0.7, 0.8])
    assert all(p.failure.startswith("ExcitationError") for p in scan.points)
    table = gk.compare(gk.Pipeline(h2(0.74)), trial_states=[gk.UCCSD(), Refused()])
    assert table["failure"].isna()[0] and table["failure"][1].startswith("ExcitationError")
    assert table["energy"].isna()[1] and table["energy"][0] < -1.1
