"""Components as data: round trips of every built-in component, typo'd option names refused everywhere, and the
one message shape of the declared constraints."""

from __future__ import annotations

import json
import math

import cirq
import pytest
import sympy

import groundkit as gk
from groundkit.component import component_from_dict
from groundkit.device import ErrorFigures, GateDurations
from groundkit.registry import entries, lookup
from groundkit.studies.toml_file import read_study

theta, phi = sympy.symbols("theta phi")
CIRCUIT = cirq.Circuit([cirq.X(cirq.LineQubit(0)), cirq.ry(theta).on(cirq.LineQubit(1)),
                        cirq.CNOT(cirq.LineQubit(1), cirq.LineQubit(2)), cirq.rz(2 * phi + 0.25).on(cirq.LineQubit(2))])

EXAMPLES = [
    gk.ActiveSpace(), gk.ActiveSpace(electrons=2, orbitals=3), gk.ActiveSpace(indices=[5, 1, 2]),
    gk.ActiveSpace.auto(low=0.01, high=1.99), gk.ActiveSpace(frozen_core=True),
    gk.ActiveSpace(electrons=2, orbitals=3, orbital_set="casscf"), gk.ActiveSpace.auto(orbital_set="mp2-natural"),
    gk.QubitMapping(), gk.QubitMapping("bravyi-kitaev"), gk.QubitMapping("parity", taper=True),
    gk.UCCSD(), gk.UCCSD(spin_adapted=True, init="mp2"), gk.PairDoubles(), gk.UpCCGSD(k=3),
    gk.ReferenceDeterminant(), gk.ExcitationList([((2, 3), (1, 0)), ((2,), (0,))]),
    gk.HardwareEfficient(layers=1, rotations="rx", entangler="cz", ring=True, init="zeros", jitter=0.0, seed=4),
    gk.PauliRotations(["Y0 X1", "X0 Y1 Z2"]), gk.CircuitTrialState(CIRCUIT, symbols=["phi", "theta"],
                                                                 initial=[0.1, -0.2]),
    gk.CircuitTrialState(CIRCUIT),
    gk.Adaptive(), gk.Adaptive(pool="generalised", gradient_threshold=1e-4, max_operators=6,
                               minimiser=gk.LBFGSB(bounds=(-math.inf, math.inf)), energy_tolerance=1e-9,
                               repeats=False, start_from=[((2,), (0,)), ((3,), (1,))]),
    gk.Adaptive(pool=gk.QubitPool(source="generalised", drop_z=False, mapping="parity"), start_from=["Y0 X2"]),
    gk.Adaptive(pool=gk.ExcitationPool([((2,), (0,)), ((3, 2), (1, 0))])),
    gk.Adaptive(pool=gk.PauliStringPool(["Y0 X1", "X0 Y1"])),
    gk.SinglesDoublesPool(), gk.GeneralisedPool(), gk.QubitPool(), gk.ExcitationPool([((2,), (0,))]),
    gk.PauliStringPool(["Y0 X1"]),
    gk.ExactEstimator(), gk.SampledEstimator(shots=500, grouping="none", allocation="uniform", seed=3,
                                             gradient_step=0.2),
    gk.NoisyEstimator(one_qubit=0.0, two_qubit=0.05, readout=0.0, shots=100, seed=1, gradient_step=0.3),
    gk.NoisyEstimator(errors=ErrorFigures(two_qubit=2e-3, t1=50.0, t2=40.0), durations=GateDurations(two_qubit=200.0),
                      simulator="trajectories", trajectories=20, mitigation=("symmetry", "zne"), zne_fit="linear",
                      zne_scales=(1.0, 2.0, 3.0), calibration_shots=500),
    gk.FixedStepDescent(step=0.3, difference_step=1e-4), gk.Adam(beta1=0.8, step=0.02), gk.BFGS(max_iterations=10),
    gk.LBFGSB(bounds=(-3.0, 3.0), memory=5), gk.COBYLA(initial_step=0.2), gk.NelderMead(adaptive=True),
    gk.SPSA(seed=3, A=5.0, window=10),
    gk.DeviceProfile(), gk.DeviceProfile(name="mine", connectivity="graph", size=None, edges=[(0, 1), (1, 2)],
                                         native_gate="sqrt-iswap", durations=gk.device.GateDurations(reset=0.0)),
    *(gk.registry.build("device", name) for name in gk.device.BUILTIN_DEVICES),
    *(lookup("grouping", name)()
      for name in ("qwc", "qwc-term-order", "commuting", "none", "qwc-overlap", "commuting-overlap")),
    lookup("grouping", "basis-rotation")(threshold=1e-8),
]


@pytest.mark.parametrize("component", EXAMPLES, ids=repr)
def test_round_trip_through_json(component):
    record = component.to_dict()
    text = json.dumps(record, allow_nan=False)  # plain JSON, nothing else
    again = component_from_dict(json.loads(text))
    assert again == component and type(again) is type(component)
    assert type(component).from_dict(record) == component
    assert again.to_dict() == record


def test_every_built_in_component_has_a_round_trip_case():
    covered = {type(c) for c in EXAMPLES}
    for role in ("active_space", "mapping", "trial_state", "estimator", "minimiser", "pool", "device", "grouping"):
        for entry in entries(role):
            if entry.cls.__module__.startswith("groundkit."):
                assert entry.cls in covered, f"{entry.cls.__name__} ({role} {entry.name!r}) has no round-trip case"


def test_a_record_names_the_role_and_the_registered_name():
    assert gk.SampledEstimator(seed=2).to_dict() == {
        "role": "estimator", "name": "sampled",
        "options": {"shots": 10_000, "grouping": "qwc", "allocation": "variance", "seed": 2, "gradient_step": 0.1,
                    "gradient": "shift"}}
    assert gk.LBFGSB(bounds=(-math.inf, 1.0)).to_dict()["options"]["bounds"] == [{"float": "-inf"}, 1.0]
    assert gk.Adaptive().to_dict()["options"]["pool"] == {"role": "pool", "name": "singles-doubles", "options": {}}
    circuit = gk.CircuitTrialState(CIRCUIT).to_dict()["options"]["circuit"]
    assert set(circuit) == {"cirq"} and "FrozenCircuit" in json.dumps(circuit)  # written by cirq.to_json


@pytest.mark.parametrize("record, words", [
    ({"role": "estimator", "name": "sampled"}, "not a component record"),
    ({"role": "estimator", "name": "guess", "options": {}}, "unknown estimator 'guess'"),
    ({"role": "trial_state", "name": "uccsd", "options": {"init": "hf"}}, r"UCCSD\(init='hf'\): init must be"),
    ({"role": "trial_state", "name": "uccsd", "options": {"inti": "mp2"}}, "no option 'inti'"),
    ({"role": "gadget", "name": "x", "options": {}}, "unknown component role 'gadget'"),
    ({"role": "estimator", "name": "sampled", "options": {"seed": {"python": "os.system"}}},
     "is not a component record, a circuit or a number"),
])
def test_bad_records_are_refused(record, words):
    with pytest.raises(gk.ComponentError, match=words):
        component_from_dict(record)


def test_a_record_of_another_role_is_refused():
    with pytest.raises(gk.ComponentError, match="is a estimator record where a trial_state is expected"):
        gk.Pipeline().trial_state(gk.ExactEstimator().to_dict())
    assert gk.Pipeline().trial_state(gk.UpCCGSD(k=2).to_dict()).components["trial_state"] == gk.UpCCGSD(k=2)


# typo'd option names ------------------------------------------------------------------------------------------
REQUIRED = {gk.ExcitationList: {"excitations": [((2,), (0,))]}, gk.ExcitationPool: {"operators": [((2,), (0,))]},
            gk.PauliStringPool: {"strings": ["Y0 X1"]}}


def _built_ins():
    for role in ("active_space", "mapping", "trial_state", "estimator", "minimiser", "pool", "device", "grouping"):
        for entry in entries(role):
            if entry.cls.__module__.startswith("groundkit."):
                yield pytest.param(entry.cls, id=entry.cls.__name__)


@pytest.mark.parametrize("cls", list(_built_ins()))
def test_a_typo_in_any_option_name_is_refused_naming_it(cls):
    accepted = cls.accepted_options()
    error = gk.ActiveSpaceError if cls is gk.ActiveSpace else \
        gk.DeviceError if issubclass(cls, gk.DeviceProfile) else gk.ComponentError
    with pytest.raises(error, match=r"has no option 'zzz_unknown'; accepted options: " + ", ".join(accepted)):
        cls(**REQUIRED.get(cls, {}), zzz_unknown=1)
    if not accepted or len(accepted[0]) < 3:
        return
    first = accepted[0]
    typo = first[:-1] + ("x" if first[-1] != "x" else "y")
    with pytest.raises(error, match=rf"has no option '{typo}' \(did you mean '{first}'\?\)"):
        cls(**REQUIRED.get(cls, {}), **{typo: 1})


@pytest.mark.parametrize("make, error, words", [
    (lambda: gk.SampledEstimator(shotz=10), gk.ComponentError,
     r"SampledEstimator has no option 'shotz' \(did you mean 'shots'\?\); accepted options: shots, grouping"),
    (lambda: gk.QubitMapping("parity", tapering=True), gk.ComponentError,
     r"QubitMapping\('parity'\) has no option 'tapering' \(did you mean 'taper'\?\); accepted options: taper"),
    (lambda: gk.ActiveSpace(elektrons=2), gk.ActiveSpaceError,
     r"ActiveSpace has no option 'elektrons' \(did you mean 'electrons'\?\); accepted options: electrons, orbitals"),
    (lambda: gk.Pipeline().active_space(elektrons=2), gk.ActiveSpaceError, "no option 'elektrons'"),
    (lambda: gk.Pipeline().estimator("sampled", shotz=1), gk.ComponentError, "no option 'shotz'"),
    (lambda: gk.Pipeline().mapping("parity", tapering=True), gk.ComponentError, "no option 'tapering'"),
    (lambda: gk.Pipeline().minimiser("spsa", sed=3), gk.ComponentError, r"did you mean 'seed'"),
    (lambda: gk.Pipeline().trial_state("upccgsd", K=2), gk.ComponentError, r"did you mean 'k'"),
])
def test_the_typos_of_the_bad_input_list(make, error, words):
    with pytest.raises(error, match=words):
        make()


STUDY = '[molecule]\nsymbols = ["H", "H"]\ncoordinates = [[0, 0, 0], [0, 0, 0.74]]\n'


@pytest.mark.parametrize("table, words", [
    ('[active_space]\nelectrons = 2\nelektrons = 2\n', r"active_space.elektrons \(line 6\).*no option 'elektrons'"),
    ('[components]\nestimator = {name = "sampled", shotz = 10}\n',
     r"components.estimator \(line 5\): SampledEstimator has no option 'shotz'"),
    ('[components]\nmapping = {name = "parity", tapering = true}\n', r"components.mapping \(line 5\).*'tapering'"),
    ('[components]\ntrial_state = {name = "adaptive", pool = {name = "qubit", dropz = false}}\n',
     r"QubitPool has no option 'dropz' \(did you mean 'drop_z'\?\)"),
])
def test_typos_in_a_study_file(tmp_path, table, words):
    path = tmp_path / "typo.toml"
    path.write_text(STUDY + table, encoding="utf-8")
    with pytest.raises(gk.StudyFileError, match=words):
        read_study(path)


def test_a_study_file_gives_lists_for_tuple_options(tmp_path):
    path = tmp_path / "lists.toml"
    path.write_text(STUDY + '[active_space]\nindices = [1, 0]\n[components]\nminimiser = {name = "l-bfgs-b", '
                    'bounds = [-3.0, 3.0]}\ntrial_state = {name = "hardware-efficient", rotations = ["ry"]}\n',
                    encoding="utf-8")
    chosen = read_study(path).pipeline.components
    assert chosen["active_space"] == gk.ActiveSpace(indices=(0, 1))
    assert chosen["minimiser"] == gk.LBFGSB(bounds=(-3.0, 3.0))
    assert chosen["trial_state"] == gk.HardwareEfficient(rotations=("ry",))


# one message shape -------------------------------------------------------------------------------------------
@pytest.mark.parametrize("make, words", [
    (lambda: gk.SampledEstimator(shots=0), r"SampledEstimator\(shots=0\): shots must be an integer >= 1"),
    (lambda: gk.SampledEstimator(seed=-1), r"SampledEstimator\(seed=-1\): seed must be None or an integer >= 0"),
    (lambda: gk.NoisyEstimator(seed=-2), r"NoisyEstimator\(seed=-2\): seed must be None or an integer >= 0"),
    (lambda: gk.SPSA(seed=-3), r"SPSA\(seed=-3\): seed must be None or an integer >= 0"),
    (lambda: gk.HardwareEfficient(seed=-4), r"HardwareEfficient\(seed=-4\): seed must be an integer >= 0"),
    (lambda: gk.NoisyEstimator(readout=1.5), r"NoisyEstimator\(readout=1.5\): readout must be None or a finite "
                                             r"number with 0 <= value <= 1"),
    (lambda: gk.UCCSD(spin_adapted="yes"), r"UCCSD\(spin_adapted='yes'\): spin_adapted must be True or False"),
    (lambda: gk.UpCCGSD(k=0), r"UpCCGSD\(k=0\): k must be an integer from 1 to 64"),
    (lambda: gk.COBYLA(initial_step=math.nan), r"COBYLA\(initial_step=nan\): initial_step must be a finite number "
                                              r"> 0 \(radians\)"),
    (lambda: gk.LBFGSB(bounds=(2, 1)), r"LBFGSB\(bounds=\(2, 1\)\): bounds must be None or a pair \(low, high\) "
                                      r"with low < high"),
    (lambda: gk.QubitMapping("parity", taper="no"), r"QubitMapping\('parity'\)\(taper='no'\): taper must be True or"),
    (lambda: gk.Adaptive(max_operators=0), r"Adaptive\(max_operators=0\): max_operators must be None or an integer "
                                           r">= 1"),
])
def test_one_message_shape(make, words):
    with pytest.raises(gk.GroundkitError, match=words):
        make()


def test_signatures_show_the_options():
    import inspect

    assert list(inspect.signature(gk.SampledEstimator).parameters) == list(gk.SampledEstimator.accepted_options())
    assert "shots" in inspect.signature(gk.SampledEstimator).parameters
