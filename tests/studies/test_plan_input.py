"""Bad input to gk.plan: each a PlanInputError (a ValueError) naming the value and what is accepted, raised before
any SCF."""

from __future__ import annotations

import pytest

import groundkit as gk
from groundkit.studies.plan_input import PlanLimits, plan_choices, plan_limits
from tests.studies.helpers import h2

GEOMETRIES = (gk.BondStretch(h2(0.74)), [0.74, 1.0])


@pytest.mark.parametrize("choices, words", [
    ({"mapping": []}, "choices['mapping'] is empty"),
    ({"trial_states": ()}, "choices['trial_states'] is empty"),
    ({"colour": ["red"]}, "unknown role 'colour'"),
    ({"mapping": ["parity"], "mappings": ["jordan-wigner"]}, "name the role 'mapping' twice"),
    (["uccsd"], "give a dict role"),
    ({"mapping": ["not-a-mapping"]}, "unknown mapping 'not-a-mapping'"),
    ({"grouping": ["colouring"]}, "grouping 'colouring' is not known"),
    ({"tapering": ["yes"]}, "tapering 'yes'; accepted: True or False"),
])
def test_bad_choices(choices, words):
    with pytest.raises(gk.PlanInputError, match=words.replace("(", r"\(").replace("[", r"\[")):
        gk.plan(GEOMETRIES, choices)


@pytest.mark.parametrize("limits, words", [
    ({"qubits": 0}, "limit qubits=0"),
    ({"device_hours": -1.0}, "limit device_hours=-1.0"),
    ({"qubits": 4.5}, "a count cap must be a whole number"),
    ({"shots_per_energy": float("nan")}, "a cap must be a finite number"),
    ({"qubits": True}, "limit qubits=True"),
    ({"depth": 10}, "unknown limit 'depth'"),
    ({"two_qubit_gates": 100, "routed_two_qubit_gates": 50}, "limits contradict each other"),
    ("12 qubits", "give None or a dict"),
])
def test_bad_limits(limits, words):
    with pytest.raises(gk.PlanInputError, match=words):
        gk.plan(GEOMETRIES, {"trial_state": ["uccsd"]}, limits=limits)


def test_contradictory_noise_request():
    with pytest.raises(gk.PlanInputError, match="noise_threshold=False, but limits ask for a noise threshold"):
        gk.plan(GEOMETRIES, {"trial_state": ["uccsd"]}, limits={"noise_threshold": 2.0}, noise_threshold=False)
    with pytest.raises(gk.PlanInputError, match="mitigations, which only change the noise threshold"):
        gk.plan(GEOMETRIES, {"mitigation": ["readout"]})


def test_geometries_of_different_molecules_are_refused():
    lih = gk.MoleculeSpec(symbols=("Li", "H"), coordinates=((0, 0, 0), (0, 0, 1.6)), basis="sto-3g")
    with pytest.raises(gk.PlanInputError, match="has symbols \\('Li', 'H'\\) but the first has \\('H', 'H'\\)"):
        gk.plan([h2(0.74), lih], {"trial_state": ["uccsd"]})
    with pytest.raises(gk.PlanInputError, match="has basis '6-31g'"):
        gk.plan([h2(0.74), h2(0.9, "6-31g")], {"trial_state": ["uccsd"]})


@pytest.mark.parametrize("geometries", [[], "H 0 0 0", (lambda r: h2(r),), 42])
def test_bad_geometries(geometries):
    with pytest.raises(gk.PlanInputError, match="give a pair \\(geometry function, values\\)"):
        gk.plan(geometries, {"trial_state": ["uccsd"]})


def test_a_geometry_that_cannot_be_built_is_refused():
    def broken(r):
        if r > 1:
            raise RuntimeError("no such bond")
        return h2(r)

    with pytest.raises(gk.PlanInputError, match="the geometry of value 1.5 cannot be built"):
        gk.plan((broken, [0.74, 1.5]), {"trial_state": ["uccsd"]})


@pytest.mark.parametrize("target", [0, -1e-3, float("inf"), "1.6 mHa", True])
def test_bad_target(target):
    with pytest.raises(gk.PlanInputError, match="target="):
        gk.plan(GEOMETRIES, {"trial_state": ["uccsd"]}, target=target)


def test_an_unknown_device_name_is_refused_with_the_registered_ones():
    with pytest.raises(gk.PlanInputError, match="line-5") as refusal:
        plan_choices({"device": ["line-5"]})
    assert "grid-4x4" in str(refusal.value)  # the refusal lists the registered device names


def test_choices_and_limits_accepted_forms():
    options = plan_choices({"mappings": "parity", "tapering": [False, True], "trial_state": gk.UCCSD()})
    assert [m.name for m in options["mapping"]] == ["parity"] and options["tapering"] == [False, True]
    assert options["grouping"] == ["qwc"] and options["device"] == [None]
    assert plan_limits({"shots": 1e6, "qubits": 8.0}) == PlanLimits(qubits=8, shots_per_energy=1e6)
    assert not plan_limits(None)
