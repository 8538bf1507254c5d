"""Error figures and gate durations: ranges, the T2 ≤ 2·T1 bound, scaling and records."""

import pytest

from groundkit.component import component_from_dict
from groundkit.device import ErrorFigures, GateDurations
from groundkit.errors import DeviceError


def test_records_round_trip() -> None:
    for figures in (ErrorFigures(), ErrorFigures(t1=None, t2=None), GateDurations(two_qubit=40.0)):
        assert component_from_dict(figures.to_dict()) == figures


@pytest.mark.parametrize("options", [
    {"two_qubit": 1.5}, {"one_qubit": -1e-3}, {"readout": 0.7}, {"t1": -5.0, "t2": 1.0},
    {"t1": 10.0, "t2": 30.0},  # T2 <= 2 T1 for any qubit (textbook bound, from memory)
    {"t1": None},
])
def test_bad_error_figures_are_refused(options: dict) -> None:
    with pytest.raises(DeviceError):
        ErrorFigures(**options)


def test_negative_duration_is_refused() -> None:
    with pytest.raises(DeviceError, match="two_qubit"):
        GateDurations(two_qubit=-1.0)


def test_scaling() -> None:
    figures = ErrorFigures(one_qubit=1e-3, two_qubit=1e-2, readout=2e-2, t1=100.0, t2=50.0)
    doubled = figures.scaled(2.0)
    assert doubled.two_qubit == pytest.approx(2e-2) and doubled.t1 == pytest.approx(50.0)
    assert figures.scaled(0.0).noiseless and not figures.noiseless
    assert figures.scaled(1000.0).two_qubit == 1.0 and figures.scaled(1000.0).readout == 0.5
    with pytest.raises(DeviceError):
        figures.scaled(-1.0)
