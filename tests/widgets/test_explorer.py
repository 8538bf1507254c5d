"""The configuration explorer, driven programmatically: selectors set, the run button's handler called."""

from __future__ import annotations

import pytest
from pyscf import fci, gto, scf

import groundkit as gk

pytestmark = pytest.mark.filterwarnings("ignore::groundkit.DegenerateBoundaryWarning")


def click(explorer):
    explorer.run_button.click()  # calls the registered on_click handler


def test_table_gains_a_row_per_run(lih_pipeline):
    explorer = gk.explore(lih_pipeline)
    assert explorer.rows == [] and "No runs yet" in explorer.table_area.value
    click(explorer)
    assert len(explorer.rows) == 1
    explorer.mapping.value = "parity"
    explorer.taper.value = True
    click(explorer)
    explorer.trial_state.value = dict(explorer.trial_state.options)["pair doubles (pUCCD)"]
    explorer.minimiser.value = dict(explorer.minimiser.options)["COBYLA"]
    click(explorer)
    assert [row["run"] for row in explorer.rows] == [1, 2, 3]
    assert explorer.rows[1]["mapping"] == "parity (tapered)"
    assert explorer.rows[1]["qubits"] < explorer.rows[0]["qubits"]
    assert explorer.rows[2]["trial_state"] == "pair doubles (pUCCD)" and explorer.rows[2]["minimiser"] == "COBYLA"
    assert explorer.table_area.value.count("<tr>") == 4  # header and three runs
    assert list(explorer.table["run"]) == [1, 2, 3]
    latest = explorer.view_area.children[0]
    assert latest.energy.energies == list(explorer.results[-1].history.energies)
    for row, result in zip(explorer.rows, explorer.results):
        assert row["energy"] == result.energy and row["error_mha"] == pytest.approx(1000 * result.error)


def test_sampled_estimator_uses_the_shots_and_seed(h2_pipeline):
    explorer = gk.explore(h2_pipeline)
    explorer.estimator.value = "sampled"
    explorer.shots.value = 3000
    explorer.seed.value = 11
    explorer.minimiser.value = dict(explorer.minimiser.options)["SPSA"]
    assert explorer.configured().components["estimator"] == gk.SampledEstimator(shots=3000, seed=11)


def test_too_large_active_space_shows_the_message_and_stays_usable(lih_pipeline):
    explorer = gk.explore(lih_pipeline)
    explorer.orbitals.value = 30
    click(explorer)
    assert explorer.rows == []
    with pytest.raises(gk.ActiveSpaceError) as caught:
        lih_pipeline.active_space(electrons=2, orbitals=30).problem()
    message = explorer.message.value
    assert "ActiveSpaceError" in message and "30 orbitals" in message
    assert str(caught.value).split(";")[0].replace("<", "&lt;") in message
    assert not explorer.run_button.disabled
    explorer.orbitals.value = 3
    click(explorer)
    assert len(explorer.rows) == 1 and "Done" in explorer.message.value


def test_bad_shot_count_shows_the_component_error(h2_pipeline):
    explorer = gk.explore(h2_pipeline)
    explorer.estimator.value = "sampled"
    explorer.shots.value = -5
    click(explorer)
    assert explorer.rows == [] and "ComponentError" in explorer.message.value


def test_own_components_are_offered(h2_pipeline):
    own = gk.UpCCGSD(k=3)
    explorer = gk.explore(h2_pipeline.trial_state(own).minimiser(gk.Adam(step=0.05)))
    assert explorer.trial_state.value == own
    assert explorer.minimiser.value == gk.Adam(step=0.05)


def test_explorer_needs_a_molecule():
    with pytest.raises(gk.ComponentError, match="molecule"):
        gk.explore(gk.Pipeline())


def test_device_selector_adds_the_routed_columns(h2_pipeline):
    explorer = gk.explore(h2_pipeline)
    labels = dict(explorer.device.options)
    assert explorer.device.value == "logical" and "4 × 4 grid (CZ)" in labels
    click(explorer)
    explorer.device.value = labels["line of 16 (CNOT)"]
    click(explorer)
    logical, routed = explorer.rows
    assert logical["device"] == "logical" and logical["swaps"] is None
    result = explorer.results[1]
    assert routed["device"] == "line-16" and routed["swaps"] == result.resources.swaps
    assert routed["logical_two_qubit_gates"] == logical["two_qubit_gates"]  # same logical circuit
    assert routed["device_seconds"] == result.resources.device_seconds > 0
    assert "SWAPs" in explorer.table_area.value and "line-16" in explorer.table_area.value
    own = gk.explore(h2_pipeline.device(gk.DeviceProfile(name="mine", connectivity="ring", size=5)))
    assert own.device.value.name == "mine"


def test_noise_threshold_column_is_opt_in_and_matches_its_definition(h2_pipeline):
    from groundkit.device import ErrorFigures
    from groundkit.estimators import NoisyEstimator

    explorer = gk.explore(h2_pipeline)
    click(explorer)
    assert "threshold_two_qubit" not in explorer.rows[0]  # off by default: a click stays a plain run
    explorer.tolerance.value = True
    explorer.tolerance_mitigation.value = ("readout",)
    click(explorer)
    row = explorer.rows[1]
    assert row["threshold_mitigation"] == "readout" and row["threshold_two_qubit"] > 0
    assert f"{row['threshold_two_qubit']:.2e} (readout)" in explorer.table_area.value
    # the definition, checked outside the search: at the threshold rate the readout-mitigated energy at the run's
    # parameters is within chemical accuracy (1.6 mHa, common practice, no single source) of the FCI reference
    # (PySCF), and at the failing rate above it is not
    base = ErrorFigures()
    factor = row["threshold_two_qubit"] / base.two_qubit
    pipeline = explorer.configured()
    theta = explorer.results[1].parameters
    mf = scf.RHF(gto.M(atom="H 0 0 0; H 0 0 0.7414", basis="sto-3g", verbose=0)).run(conv_tol=1e-12)
    reference = fci.FCI(mf).kernel()[0]  # PySCF FCI of the same H2 (reference library)

    def error(f):
        estimator = NoisyEstimator(errors=base.scaled(f), mitigation=("readout",), seed=7).bind(pipeline)
        return abs(estimator.estimate(theta)[0] - reference)

    assert error(factor) <= 1.6e-3 < error(factor * 1.5)
