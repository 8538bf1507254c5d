"""Saved results and scans rebuild the pipeline that made them; re-running it reproduces the energy."""

from __future__ import annotations

import json

import cirq
import pytest
import sympy

import groundkit as gk
from tests import outside_references as outside

pytestmark = pytest.mark.filterwarnings("ignore::groundkit.DegenerateBoundaryWarning")  # LiH (2e, 3o)


def h2(r: float = 0.7414) -> gk.MoleculeSpec:
    return gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, r)), name="hydrogen")


def lih() -> gk.MoleculeSpec:
    return gk.MoleculeSpec(symbols=("Li", "H"), coordinates=((0, 0, 0), (0, 0, 1.5949)))  # NIST CCCBDB r_e


def _circuit_state() -> gk.CircuitTrialState:
    t = sympy.Symbol("t")
    q = cirq.LineQubit.range(4)
    circuit = cirq.Circuit([cirq.X(q[0]), cirq.X(q[1]), cirq.ry(t).on(q[2]), cirq.CNOT(q[2], q[3]),
                            cirq.CNOT(q[0], q[2]), cirq.CNOT(q[1], q[3])])
    return gk.CircuitTrialState(circuit, initial=[0.1])


PIPELINES = {
    "tapered parity, UCCSD, BFGS": lambda: gk.Pipeline(lih()).active_space(electrons=2, orbitals=3).mapping(
        "parity", taper=True),
    "MP2 start, spin-adapted, L-BFGS-B": lambda: gk.Pipeline(lih()).active_space(electrons=2, orbitals=3)
    .trial_state(gk.UCCSD(spin_adapted=True, init="mp2")).minimiser(gk.LBFGSB(bounds=(-3.0, 3.0))),
    "hardware-efficient, COBYLA": lambda: gk.Pipeline(h2()).trial_state(gk.HardwareEfficient(layers=1, seed=3))
    .minimiser(gk.COBYLA(max_iterations=200)),
    "a Cirq circuit": lambda: gk.Pipeline(h2()).trial_state(_circuit_state()),
    "adaptive with a qubit pool": lambda: gk.Pipeline(lih()).active_space(electrons=2, orbitals=3).trial_state(
        gk.Adaptive(pool="qubit", minimiser="bfgs")),
    "seeded sampling and SPSA": lambda: gk.Pipeline(h2()).estimator(gk.SampledEstimator(shots=2000, seed=5))
    .minimiser(gk.SPSA(seed=3, max_iterations=20)),
}


@pytest.mark.parametrize("name", list(PIPELINES))
def test_a_saved_result_rebuilds_its_pipeline_and_reruns_to_the_same_energy(name, tmp_path):
    pipeline = PIPELINES[name]()
    result = pipeline.run()
    path = tmp_path / "result.json"
    result.save(path)
    rebuilt = gk.load_result(path).pipeline()
    assert rebuilt.resolved_components() == pipeline.resolved_components()
    assert rebuilt.components["molecule"].name == pipeline.components["molecule"].name
    again = rebuilt.run()
    assert abs(again.energy - result.energy) < 1e-10  # internal consistency: the same run, rebuilt from the file
    assert again.parameters.tolist() == pytest.approx(result.parameters.tolist(), abs=1e-10)


def test_the_rebuilt_run_is_still_right():
    """The rebuilt pipeline reaches PySCF's exact energy, so the record did not quietly change the problem."""
    result = PIPELINES["tapered parity, UCCSD, BFGS"]().run()
    again = result.pipeline().run()
    exact = outside.pyscf_exact(outside.diatomic("Li", "H", 1.5949), active=(2, 3)).exact
    assert again.converged and again.energy == pytest.approx(exact, abs=1e-8)  # PySCF CASCI (reference library)


def test_the_provenance_holds_records_beside_the_readable_strings():
    result = gk.Pipeline(h2(0.8)).mapping("bk").run()
    provenance = result.provenance
    assert provenance["configuration"]["mapping"] == "QubitMapping('bravyi-kitaev')"  # readable, unchanged
    assert provenance["components"]["mapping"] == {"role": "mapping", "name": "bravyi-kitaev",
                                                   "options": {"taper": False}}
    assert provenance["molecule"]["coordinates"] == [[0, 0, 0], [0, 0, 0.8]]  # full precision, not XYZ text
    assert set(provenance["components"]) == {"active_space", "mapping", "trial_state", "estimator", "minimiser"}
    json.dumps(provenance, allow_nan=False)


def test_a_file_written_before_component_records_loads_but_cannot_rebuild(tmp_path):
    result = gk.Pipeline(h2()).run()
    path = tmp_path / "old.json"
    result.save(path)
    data = json.loads(path.read_text())
    for key in ("components", "molecule"):
        del data["provenance"][key]  # what the release before records wrote
    path.write_text(json.dumps(data))
    loaded = gk.load_result(path)
    assert loaded.energy == result.energy
    with pytest.raises(gk.ResultFileError, match="predates component records"):
        loaded.pipeline()


def test_a_tampered_record_is_refused_with_the_file_error(tmp_path):
    path = tmp_path / "bad.json"
    gk.Pipeline(h2()).run().save(path)
    data = json.loads(path.read_text())
    data["provenance"]["components"]["minimiser"]["options"]["tolerance"] = -1
    path.write_text(json.dumps(data))
    with pytest.raises(gk.ResultFileError, match=r"recorded minimiser cannot be rebuilt: BFGS\(tolerance=-1\)"):
        gk.load_result(path).pipeline()


@pytest.mark.parametrize("warm_start", [True, False])
def test_a_saved_scan_rebuilds_its_pipeline_and_reruns_to_the_same_energies(tmp_path, warm_start):
    pipeline = gk.Pipeline().mapping("parity").minimiser(gk.BFGS(tolerance=1e-7))
    scan = pipeline.scan(h2, [0.6, 0.75, 0.9, 1.2], warm_start=warm_start, checkpoint=str(tmp_path / "ckpt"))
    scan.save(tmp_path / "scan.json")
    loaded = gk.load_scan(tmp_path / "scan.json")
    assert loaded.pipeline().resolved_components() == pipeline.resolved_components()
    assert loaded.pipeline().components["molecule"] is None
    geometry = loaded.geometry()
    assert [geometry(v) for v in loaded.values] == [h2(v) for v in (0.6, 0.75, 0.9, 1.2)]
    again = loaded.rerun()
    assert again.warm_start == scan.warm_start
    for old, new in zip(scan.points, again.points):
        assert abs(old.result.energy - new.result.energy) < 1e-10 and old.start == new.start
    resumed = loaded.rerun(checkpoint=str(tmp_path / "ckpt"))  # the records give the same checkpoint fingerprint
    assert [p.result.energy for p in resumed.points] == [p.result.energy for p in scan.points]


def test_a_scan_geometry_refuses_a_value_it_does_not_hold(tmp_path):
    scan = gk.Pipeline().scan(h2, [0.7, 0.8])
    with pytest.raises(gk.ScanInputError, match="no molecule for value 0.75; its values: 0.7, 0.8"):
        scan.geometry()(0.75)
