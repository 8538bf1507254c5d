"""gk.plan against PySCF full CI and against the same pipelines composed by hand (run, resources, shot budget,
device time); the recommendation against a brute-force minimum; sharing; resume."""

from __future__ import annotations

import math
import os

import cirq
import numpy as np
import pytest

import groundkit as gk
from groundkit.device import GateDurations
from groundkit.studies.plan_figures import GRADIENT_ESTIMATES_FERMIONIC
from tests.outside_references import diatomic, pyscf_exact
from tests.studies.helpers import h2
from tests.studies.plan_cases import H2_LENGTHS, LIH_LENGTHS, LIH_SPACE, h2_plan, lih, lih_plan

pytestmark = [pytest.mark.slow,
              # (2e, 3o) of LiH/STO-3G takes one of the two degenerate pi orbitals, as PySCF's CASCI window does
              pytest.mark.filterwarnings("ignore::groundkit.DegenerateBoundaryWarning")]


def hand_shot_time_us(circuit, durations: GateDurations) -> float:
    """One shot, written out here: the operations packed as early as possible, every moment lasting its slowest
    gate, then one basis-change layer, measurement, reset and overhead."""
    packed = cirq.Circuit(list(circuit.circuit.all_operations()), strategy=cirq.InsertStrategy.EARLIEST)
    ns = 0.0
    for moment in packed:
        ops = list(moment.operations)
        if ops:
            ns += durations.two_qubit if any(len(op.qubits) == 2 for op in ops) else durations.one_qubit
    return (ns + durations.one_qubit + durations.measurement + durations.reset) / 1000 + durations.shot_overhead


def hand_row(molecules, mapping, trial_state, grouping, target, active_space=None):
    """The figures of one configuration from pipelines composed by hand, one un-shared scan per mapping."""
    pipeline = gk.Pipeline().mapping(mapping).trial_state(trial_state)
    if active_space is not None:
        pipeline = pipeline.active_space(active_space)
    scan = pipeline.scan(gk.studies.plan_input.MoleculeList(tuple(molecules)), list(range(len(molecules))))
    errors, hours, worst = [], 0.0, {"qubits": 0, "two_qubit_gates": 0, "depth": 0, "shots": 0}
    for point in scan.points:
        result = point.result
        p = pipeline.molecule(point.molecule)
        shots = p.shot_budget(precision=target, parameters=result.parameters, grouping=grouping)
        circuit = p.circuit(result.parameters)
        evaluations = max(1, result.history.evaluations[-1] if result.history.evaluations else 0)
        estimates = evaluations * (1 + GRADIENT_ESTIMATES_FERMIONIC * len(result.parameters))
        hours += estimates * shots * hand_shot_time_us(circuit, GateDurations()) / 3.6e9
        errors.append(result.error)
        for name, value in (("qubits", result.resources.qubits), ("two_qubit_gates", result.resources.two_qubit_gates),
                            ("depth", result.resources.depth), ("shots", shots)):
            worst[name] = max(worst[name], value)
    return scan, errors, hours, worst


def row_of(plan, mapping_text, trial_text, grouping="qwc"):
    rows = [r for r in plan.rows if r["mapping"] == mapping_text and r["trial_state"] == trial_text
            and r["grouping"] == grouping]
    assert len(rows) == 1, [r["configuration"] for r in plan.rows]
    return rows[0]


@pytest.mark.parametrize("mapping, text", [("jordan-wigner", "jordan-wigner"),
                                           (gk.QubitMapping("parity", taper=True), "parity (tapered)")])
@pytest.mark.parametrize("grouping", ["qwc", "none"])
def test_h2_rows_equal_pipelines_composed_by_hand(mapping, text, grouping):
    plan = h2_plan()
    row = row_of(plan, text, "UCCSD", grouping)
    molecules = [h2(r) for r in H2_LENGTHS]
    scan, errors, hours, worst = hand_row(molecules, mapping, gk.UCCSD(), grouping, plan.target)
    assert row["worst_error_mha"] == pytest.approx(1000 * max(abs(e) for e in errors), abs=1e-9)
    assert row["non_parallelity_mha"] == pytest.approx(1000 * (max(errors) - min(errors)), abs=1e-9)
    assert row["qubits"] == worst["qubits"]
    assert row["two_qubit_gates"] == worst["two_qubit_gates"]
    assert row["depth"] == worst["depth"]
    assert row["shots_per_energy"] == worst["shots"]
    assert row["evaluations"] == sum(p.result.history.evaluations[-1] for p in scan.points)
    assert row["device_hours"] == pytest.approx(hours, rel=1e-12)
    assert row["meets_target"] and row["meets"] and row["reason"] == ""


def test_h2_uccsd_is_exact_against_pyscf_fci():
    plan = h2_plan()
    row = row_of(plan, "jordan-wigner", "UCCSD")
    curve = plan.curve(row["configuration"]).table
    outside = np.array([pyscf_exact(diatomic("H", "H", r)).exact for r in H2_LENGTHS])  # PySCF (reference library)
    assert np.max(np.abs(curve["energy"].to_numpy() - outside)) < 1e-7  # UCCSD is exact for two electrons
    assert row["worst_error_mha"] < 1e-4


def test_h2_hartree_fock_rows_miss_the_target_by_the_pyscf_correlation_energy():
    plan = h2_plan()
    row = row_of(plan, "jordan-wigner", "ReferenceDeterminant")
    outside = [pyscf_exact(diatomic("H", "H", r)) for r in H2_LENGTHS]  # PySCF (reference library)
    assert row["worst_error_mha"] == pytest.approx(1000 * max(o.correlation for o in outside), abs=1e-5)
    assert not row["meets_target"] and "misses 1.6 mHa at 3 of 3 geometries" in row["reason"]


def test_lih_rows_against_pyscf_casci_and_by_hand():
    plan = lih_plan()
    outside = np.array([pyscf_exact(diatomic("Li", "H", r), active=(2, 3)).exact  # PySCF CASCI (reference library)
                        for r in LIH_LENGTHS])
    for trial, name in ((gk.UCCSD(), "UCCSD"), (gk.PairDoubles(), "PairDoubles")):
        for mapping in ("jordan-wigner", "bravyi-kitaev"):
            row = row_of(plan, mapping, name)
            energies = plan.curve(row["configuration"]).table["energy"].to_numpy()
            assert row["worst_error_mha"] == pytest.approx(1000 * np.max(np.abs(energies - outside)), abs=1e-6)
            scan, errors, hours, worst = hand_row([lih(r) for r in LIH_LENGTHS], mapping, trial, "qwc",
                                                  plan.target, LIH_SPACE)
            assert row["device_hours"] == pytest.approx(hours, rel=1e-12)
            assert (row["two_qubit_gates"], row["shots_per_energy"]) == (worst["two_qubit_gates"], worst["shots"])
    uccsd = row_of(plan, "jordan-wigner", "UCCSD")
    assert uccsd["worst_error_mha"] < 1e-3  # (2e, 3o) UCCSD is exact: two electrons (common practice)


def test_work_is_shared_across_mappings_and_groupings():
    plan = h2_plan()
    # runs: (HF, UCCSD) × (untapered, tapered); 16 configurations
    assert plan.shared["configurations"] == 16
    assert plan.shared["runs"] == 4
    assert plan.shared["minimisations"] == 4 * len(H2_LENGTHS)
    assert plan.shared["minimisations_unshared"] == 16 * len(H2_LENGTHS)
    assert len({r["run"] for r in plan.rows}) == 4


def test_recommendation_is_the_brute_force_minimum_and_checkable_by_hand():
    plan = h2_plan()
    meeting = [r for r in plan.rows if r["meets_target"] and r["within_limits"]]
    cheapest = min(meeting, key=lambda r: (r["device_hours"], r["two_qubit_gates"], r["worst_error_mha"],
                                           r["configuration"]))
    choice = plan.recommend()
    assert choice.configuration == cheapest["configuration"]
    # by hand: the determinant misses the target everywhere; UCCSD holds it, and a tapered register (2 qubits) costs
    # fewer gates and less time than the 4-qubit one, so the winner is a tapered UCCSD
    assert choice.row["trial_state"] == "UCCSD" and "(tapered)" in choice.row["mapping"]
    assert choice.runner_up is not None and choice.runner_up in choice.justification
    assert "ReferenceDeterminant" in choice.runner_up and "misses" in choice.justification


def test_limits_move_the_recommendation_and_say_why():
    untapered_only = {"mapping": ["jordan-wigner"], "trial_state": [gk.UCCSD()]}
    geometries = (gk.BondStretch(h2(0.74)), [0.74, 1.4])
    loose = gk.plan(geometries, untapered_only)
    assert loose.rows[0]["meets"]
    cap = gk.plan(geometries, untapered_only, limits={"qubits": 2, "device_hours": loose.rows[0]["device_hours"] / 2})
    row = cap.rows[0]
    assert row["meets_target"] and not row["within_limits"] and not row["meets"]
    assert "qubits 4 above the limit 2" in row["reason"] and "device time" in row["reason"]
    choice = cap.recommend()
    assert choice.configuration is None and "No configuration holds 1.6 mHa" in choice.justification


def test_invalid_combinations_are_skipped_with_the_reason():
    plan = gk.plan((gk.BondStretch(h2(0.74)), [0.74, 1.0]),
                   {"active_space": [None, gk.ActiveSpace(electrons=2, orbitals=5)], "trial_state": [gk.UCCSD()]})
    assert len(plan.rows) == 1 and len(plan.skipped) == 1
    assert "ActiveSpaceError" in plan.skipped[0]["reason"]
    assert "electrons=2, orbitals=5" in plan.skipped[0]["configuration"]


def test_noise_threshold_column_only_when_asked():
    geometries = (gk.BondStretch(h2(0.74)), [0.74, 1.0])
    without = gk.plan(geometries, {"trial_state": [gk.UCCSD()]})
    assert "noise_threshold" not in without.table.columns
    asked = gk.plan(geometries, {"trial_state": [gk.UCCSD()]}, noise_threshold=True)
    assert "noise_threshold" in asked.table.columns
    if getattr(gk, "noise_threshold", None) is None:  # the piece of issue 17 is not in this groundkit yet
        assert asked.rows[0]["noise_threshold"] is None
        assert "not available" in asked.rows[0]["notes"]


def test_logical_circuit_timing_is_stated_in_the_notes():
    row = h2_plan().rows[0]
    assert "logical circuit" in row["notes"] and "illustrative" in row["notes"]
    assert row["swaps"] is None


def test_a_plan_killed_mid_way_resumes_to_the_same_table(tmp_path):
    geometries = (gk.BondStretch(h2(0.74)), [0.6, 0.74, 1.0, 1.4])
    choices = {"mapping": ["jordan-wigner", "parity"], "trial_state": [gk.UCCSD(), gk.PairDoubles()]}
    whole = gk.plan(geometries, choices, checkpoint=str(tmp_path / "plan"))
    runs = sorted((tmp_path / "plan" / "runs").iterdir())
    assert len(runs) == 2
    # the kill: the second half of one run and the last point of the other were never written
    for name in ("point-00002.json", "point-00003.json"):
        os.remove(runs[0] / name)
    os.remove(runs[1] / "point-00003.json")
    resumed = gk.plan(geometries, choices, checkpoint=str(tmp_path / "plan"))
    assert resumed.table.equals(whole.table)
    again = gk.plan(geometries, choices)  # no checkpoint at all: the same table again
    assert again.table.drop(columns=["notes"]).equals(whole.table.drop(columns=["notes"]))


def assert_same_plan(a, b):
    """Equal tables up to floating-point noise between processes (shots are ceilings of computed variances)."""
    assert list(a.columns) == list(b.columns) and len(a) == len(b)
    for column in a.columns:
        left, right = list(a[column]), list(b[column])
        if column in ("worst_error_mha", "non_parallelity_mha", "device_hours", "shots_per_energy", "shot_time_us"):
            assert right == pytest.approx(left, rel=1e-5, abs=1e-7), column
        else:
            assert left == right, column


def test_processes_and_a_dask_cluster_give_the_serial_plan():
    geometries = (gk.BondStretch(h2(0.74)), [0.74, 1.4])
    choices = {"mapping": ["jordan-wigner"], "trial_state": [gk.UCCSD(), gk.PairDoubles()]}
    serial = gk.plan(geometries, choices)
    assert_same_plan(serial.table, gk.plan(geometries, choices, executor="processes").table)
    distributed = pytest.importorskip("distributed")
    cluster = distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=True, host="127.0.0.1",
                                       dashboard_address=None)
    try:
        with distributed.Client(cluster) as client:
            assert_same_plan(serial.table, gk.plan(geometries, choices, executor=client).table)
    finally:
        cluster.close()
    assert not math.isnan(serial.rows[0]["device_hours"])


def test_mapping_dependent_states_get_a_run_per_mapping():
    geometries = (gk.BondStretch(h2(0.74)), [0.74, 1.2])
    plan = gk.plan(geometries, {"mapping": ["jordan-wigner", "parity"], "tapering": [False, True],
                                "trial_state": [gk.Adaptive()]})
    # an adaptive fermionic pool grows the same sequence under every untapered mapping: one shared run; a tapered
    # register runs per mapping
    assert plan.shared["runs"] == 3 and len(plan.rows) == 4 and not plan.skipped
    assert all("pool-gradient measurements not counted" in r["notes"] for r in plan.rows)
    assert all(r["worst_error_mha"] < 1e-3 for r in plan.rows)  # exact for two electrons (common practice)
    hardware = gk.plan(([h2(0.74)]), {"mapping": ["jordan-wigner", "parity"],
                                      "trial_state": [gk.HardwareEfficient(layers=1)]})
    assert hardware.shared["runs"] == 2  # qubit trial states depend on the register
    assert hardware.rows[0]["run"] != hardware.rows[1]["run"]
