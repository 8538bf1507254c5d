"""Time on device (durations from the moment structure), OpenQASM export of routed circuits, compare_devices and
the device fields of a result's resources (saved and loaded; old files without them still load)."""

from __future__ import annotations

import dataclasses

import cirq
import numpy as np
import pandas as pd
import pytest

import groundkit as gk
from groundkit.circuits import circuit_from_openqasm
from groundkit.device import DeviceProfile, GateDurations
from groundkit.device.energy_cost import shot_plan
from groundkit.device.timing import circuit_duration, energy_seconds
from groundkit.persistence import result_from_dict

H2 = gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.7414)), basis="sto-3g")  # NIST r_e
THETA = np.array([0.3, -0.2, 0.5])
DURATIONS = GateDurations(one_qubit=20.0, two_qubit=200.0, measurement=1000.0, reset=500.0, shot_overhead=100.0)


def test_circuit_duration_follows_the_moments():
    q = cirq.LineQubit.range(3)
    circuit = cirq.Circuit([cirq.H(q[0]), cirq.X(q[2]), cirq.CNOT(q[0], q[1]), cirq.Z(q[2]), cirq.CZ(q[1], q[2]),
                            cirq.I(q[0]), cirq.global_phase_operation(1j)])
    # moments as early as possible: {H0, X2}, {CNOT01, Z2}, {CZ12}: 20 + 200 + 200 ns (hand count)
    assert circuit_duration(circuit, DURATIONS) == pytest.approx(420.0)
    assert circuit_duration(cirq.Circuit(cirq.measure(q[0])), DURATIONS) == pytest.approx(1000.0)


def test_energy_seconds_sum_over_groups():
    # shots × (reset + circuit + rotation layer + measurement) + shots × overhead, by hand
    seconds = energy_seconds(420.0, DURATIONS, [10, 30], [True, False])
    expected = 10 * (500 + 420 + 20 + 1000) * 1e-9 + 30 * (500 + 420 + 1000) * 1e-9 + 40 * 100e-6
    assert seconds == pytest.approx(expected, rel=1e-12)
    with pytest.raises(ValueError):
        energy_seconds(1.0, DURATIONS, [1], [True, False])


@pytest.mark.parametrize("device", ["line-16", "grid-4x4-sqrt-iswap"])
def test_openqasm_of_the_routed_circuit_parses_back_to_the_same_state(device):
    compiled = gk.Pipeline(H2).device(device).circuit(THETA)
    text = compiled.openqasm()
    assert text.count("OPENQASM 2.0;") == 1 and "qreg q[16];" in text
    assert "logical qubit -> device qubit at end: " + " ".join(
        f"{i}->q[{q.x}]" for i, q in sorted(compiled.final_placement.items())) in text
    parsed = circuit_from_openqasm(text)  # Cirq's OpenQASM 2.0 importer (reference library)
    again = dataclasses.replace(compiled, circuit=parsed).logical_state()
    assert abs(np.vdot(compiled.logical_state(), again)) == pytest.approx(1.0, abs=1e-10)
    assert gk.openqasm_text(compiled) == text  # the circuits layer's exporter hands a DeviceCircuit over
    three = compiled.openqasm("3.0")
    assert "OPENQASM 3.0;" in three and "qubit[16] q;" in three
    with pytest.raises(gk.DeviceError, match="version '4.0'"):
        compiled.openqasm("4.0")


def test_compare_devices_gives_one_row_per_device():
    small = DeviceProfile(name="three", connectivity="line", size=3)
    table = gk.compare_devices(gk.Pipeline(H2), devices=[None, "line-16", "all-to-all-16", small], parameters=THETA)
    assert list(table["device"]) == ["logical", "line-16", "all-to-all-16", "three"]
    logical = gk.Pipeline(H2).circuit(THETA)
    assert set(table["logical_two_qubit_gates"][:3]) == {logical.two_qubit_gates}
    line = gk.Pipeline(H2).device("line-16").circuit(THETA)
    row = table.iloc[1]
    assert (row["two_qubit_gates"], row["depth"], row["swaps"]) == (line.two_qubit_gates, line.depth, line.swaps)
    assert row["circuit_ns"] == pytest.approx(line.duration())
    assert table.iloc[2]["swaps"] == 0  # all-to-all: nothing to route
    # the slow all-to-all profile takes longer per energy than the line at the same shots
    assert table.iloc[2]["seconds_per_energy"] > row["seconds_per_energy"] > 0
    assert "fewer than the register's 4" in table.iloc[3]["note"] and pd.isna(table.iloc[3]["two_qubit_gates"])


def test_resources_of_a_run_on_a_device_are_saved_and_loaded(tmp_path):
    pipeline = gk.Pipeline(H2).device("grid-4x4")
    result = pipeline.run()
    r = result.resources
    compiled = pipeline.circuit(result.parameters)
    logical = gk.Pipeline(H2).circuit(result.parameters)
    assert r.device == "grid-4x4" and r.swaps == compiled.swaps
    assert (r.two_qubit_gates, r.depth) == (compiled.two_qubit_gates, compiled.depth)
    assert (r.logical_two_qubit_gates, r.logical_depth) == (logical.two_qubit_gates, logical.depth)
    shots, per_group, rotated = shot_plan(pipeline, result.parameters)
    assert r.device_shots == shots == sum(per_group) and len(per_group) == r.measurement_groups
    assert shots == pytest.approx(gk.Pipeline(H2).shot_budget(1.6e-3, result.parameters), abs=2 * len(per_group))
    assert r.device_seconds == pytest.approx(energy_seconds(compiled.duration(), pipeline.device_profile.durations,
                                                            per_group, rotated))
    path = tmp_path / "on-grid.json"
    result.save(str(path))
    loaded = gk.load_result(str(path))
    assert loaded.resources == r
    assert loaded.pipeline().device_profile == pipeline.device_profile
    # a file written before devices: no device fields, loads with None
    data = result.to_dict()
    for key in ("device", "logical_two_qubit_gates", "logical_depth", "swaps", "device_shots", "device_seconds"):
        del data["resources"][key]
    del data["provenance"]["components"]["device"]
    old = result_from_dict(data)
    assert old.resources.device is None and old.resources.swaps is None and old.pipeline().device_profile is None


def test_a_run_without_a_device_keeps_the_old_resources():
    r = gk.Pipeline(H2).run().resources
    assert r.device is None and r.swaps is None and r.device_seconds is None and r.two_qubit_gates > 0
