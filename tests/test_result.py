"""RunResult: derived quantities, summary, JSON persistence and its failure modes."""

import json
import os

import numpy as np
import pytest

import groundkit as gk
from groundkit.persistence import SCHEMA, VERSION
from tests.outside_references import diatomic, pyscf_exact

BOHR = 0.529177210903  # angstrom (CODATA 2018, from memory)


@pytest.fixture(scope="module")
def result(h2_bohr):
    return h2_bohr.pipeline().run()


def test_result_carries_its_reference(result, h2_bohr):
    problem = h2_bohr.pipeline().problem()
    assert result.reference.energy == problem.reference.energy  # internal consistency: the problem's reference
    exact = pyscf_exact(diatomic("H", "H", 1.4 * BOHR)).exact  # PySCF FCI at 1.4 bohr (reference library)
    assert result.reference.energy == pytest.approx(exact, abs=1e-9)
    assert result.reference.energy == pytest.approx(-1.1373, abs=1e-4)  # Szabo & Ostlund, full CI (from memory)
    assert result.error == pytest.approx(result.energy - exact, abs=1e-9)  # against PySCF FCI
    assert result.within_chemical_accuracy  # 1.6 mHa, common practice, no single source
    assert result.baselines["hf"] == pytest.approx(-1.1167, abs=1e-4)  # Szabo & Ostlund (from memory)
    assert result.fidelity == pytest.approx(1.0, abs=1e-8)  # UCCSD is exact for two electrons (textbook)
    assert result.spin_square == pytest.approx(0.0, abs=1e-10)
    assert result.particle_number == pytest.approx(2.0)
    assert list(result.amplitudes)[0] == "20"
    assert result.resources.qubits == 4 and result.resources.parameters == len(result.parameters)
    versions = result.provenance["versions"]
    assert {"groundkit", "numpy", "scipy", "pyscf", "openfermion", "cirq-core", "python"} <= set(versions)
    assert "UCCSD" in result.provenance["configuration"]["trial_state"]


def test_summary_is_a_plain_table(result):
    text = result.summary()
    assert "exact reference" in text and "mHa" in text and "ccsd" in text and "converged" in text


def test_save_load_round_trip(result, tmp_path):
    path = tmp_path / "h2.json"
    result.save(path)
    loaded = gk.load_result(path)
    assert loaded == result
    assert loaded.energy == result.energy
    assert loaded.history.energies == result.history.energies
    assert loaded.amplitudes == result.amplitudes
    assert loaded.reference.amplitudes == result.reference.amplitudes
    assert np.array_equal(loaded.parameters, result.parameters)
    assert [p.name for p in tmp_path.iterdir()] == ["h2.json"]  # no temporary files left behind


def test_truncated_file_is_refused(result, tmp_path):
    path = tmp_path / "cut.json"
    result.save(path)
    text = path.read_text()
    path.write_text(text[: len(text) // 2])
    with pytest.raises(gk.ResultFileError, match="truncated"):
        gk.load_result(path)


def test_other_schema_or_version_is_refused(result, tmp_path):
    data = result.to_dict()
    for change, message in (({"schema": "someone.else"}, "schema"), ({"version": VERSION + 1}, "version")):
        path = tmp_path / "other.json"
        path.write_text(json.dumps({**data, **change}))
        with pytest.raises(gk.ResultFileError, match=message):
            gk.load_result(path)


@pytest.mark.parametrize("content", ['[1, 2, 3]', '{"a": 1}', f'{{"schema": "{SCHEMA}", "version": {VERSION}}}',
                                     "\x00\x01binary"])
def test_foreign_content_is_refused(tmp_path, content):
    path = tmp_path / "foreign.json"
    path.write_text(content)
    with pytest.raises(gk.ResultFileError):
        gk.load_result(path)


def test_write_is_atomic(result, tmp_path, monkeypatch):
    path = tmp_path / "keep.json"
    result.save(path)
    before = path.read_text()

    def crash(*args, **kwargs):
        raise OSError("disk vanished")

    monkeypatch.setattr(os, "replace", crash)
    with pytest.raises(OSError):
        result.save(path)
    assert path.read_text() == before  # the old file is intact under the final name
    assert [p.name for p in tmp_path.iterdir()] == ["keep.json"]


def test_trial_amplitudes_share_the_reference_phase():
    nh2 = gk.MoleculeSpec.from_xyz("N 0 0 0\nH 0.8018 0 0.6370\nH -0.8018 0 0.6370", multiplicity=2)
    result = nh2.pipeline().active_space(frozen_core=True).run()
    overlap = sum(a * result.reference.amplitudes.get(label, 0.0) for label, a in result.amplitudes.items())
    assert overlap == pytest.approx(np.sqrt(result.fidelity), abs=1e-6)
    leading = next(iter(result.reference.amplitudes))
    assert result.amplitudes[leading] > 0
