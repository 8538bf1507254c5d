"""Scan files and checkpoint files: every refusal names the file, the field and what is accepted; files that load
save again and reload equal. Each case mutates a real saved H2/STO-3G scan (0.7, 0.8, 0.9 Å) or its checkpoint."""

from __future__ import annotations

import json
import re

import jsonschema
import pytest
from pyscf import fci, gto, scf

import groundkit as gk
from groundkit import file_schemas
from groundkit.errors import CheckpointWarning
from groundkit.studies import CheckpointError
from groundkit.studies.checkpoint import content_checksum
from tests.saved_files import SCAN_VALUES, delete_at, h2, reload_equal, scan_texts, set_at, write

NAN = float("nan")


@pytest.fixture(scope="module")
def saved() -> dict:
    return json.loads(scan_texts()[0])


def fresh(saved: dict) -> dict:
    return json.loads(json.dumps(saved))


def refused(path, field: str, word: str, loader=gk.load_scan) -> gk.ResultFileError:
    with pytest.raises(gk.ResultFileError) as info:
        loader(path)
    message = str(info.value)
    assert message.startswith(f"{path}: {field} ") and "; expected " in message and word in message, message
    return info.value


def test_the_saved_scan_is_real_and_round_trips(saved, tmp_path):
    for point, r in zip(saved["points"], SCAN_VALUES):
        mol = gto.M(atom=f"H 0 0 0; H 0 0 {r}", basis="sto-3g", verbose=0)
        exact = fci.FCI(scf.RHF(mol).run(conv_tol=1e-12)).kernel()[0]
        assert point["result"]["energy"] == pytest.approx(exact, abs=1e-6)  # PySCF FCI (reference library)
        assert point["result"]["converged"] is True
    assert reload_equal("scan", write(tmp_path / "scan.json", saved), tmp_path)
    for document in (file_schemas.SCAN, file_schemas.MANIFEST, file_schemas.POINT_FILE):
        jsonschema.Draft202012Validator.check_schema(document)  # the JSON Schema meta-schema (jsonschema library)
    jsonschema.validate(saved, file_schemas.SCAN, cls=jsonschema.Draft202012Validator)


def _swap(points: list, i: int, j: int) -> None:
    points[i], points[j] = points[j], points[i]


CASES = {
    "index_repeated": (lambda d: set_at(d, ("points", 1, "index"), 0), "points[1].index", "each index once"),
    "indices_reversed": (lambda d: (d["points"].reverse(), d)[1], "points[0].index", "scan order"),
    "indices_swapped": (lambda d: (_swap(d["points"], 1, 2), d)[1], "points[1].index", "scan order"),
    "index_negative": (lambda d: set_at(d, ("points", 0, "index"), -1), "points[0].index", "≥ 0"),
    "index_fractional": (lambda d: set_at(d, ("points", 0, "index"), 0.5), "points[0].index", "whole number"),
    "value_nan": (lambda d: set_at(d, ("points", 2, "value"), NAN), "points[2].value", "finite"),
    "value_string": (lambda d: set_at(d, ("points", 2, "value"), "0.9"), "points[2].value", "finite number"),
    "point_field_missing": (lambda d: delete_at(d, ("points", 0, "start")), "points[0].start", "is missing"),
    "point_without_result_or_failure": (lambda d: set_at(d, ("points", 2, "result"), None), "points[2].failure",
                                        "says why"),
    "result_without_molecule": (lambda d: set_at(d, ("points", 2, "molecule"), None), "points[2].molecule",
                                "a point with a result has one"),
    "result_energy_nan": (lambda d: set_at(d, ("points", 1, "result", "energy"), NAN), "points[1].result.energy",
                          "finite"),
    "result_parameters_too_many": (lambda d: (d["points"][1]["result"]["parameters"].append(0.0), d)[1],
                                   "points[1].result.parameters", "parameter_labels"),
    "result_fidelity_seven": (lambda d: set_at(d, ("points", 1, "result", "fidelity"), 7),
                              "points[1].result.fidelity", "from 0 to 1"),
    "symbol_unknown": (lambda d: set_at(d, ("points", 1, "molecule", "symbols"), ["H", "Xx"]),
                       "points[1].molecule.symbols", "ElementError"),
    "symbol_not_a_string": (lambda d: set_at(d, ("points", 1, "molecule", "symbols", 1), 1),
                            "points[1].molecule.symbols[1]", "a string"),
    "coordinates_two_values": (lambda d: set_at(d, ("points", 1, "molecule", "coordinates", 1), [0, 0]),
                               "points[1].molecule.coordinates[1]", "three finite numbers"),
    "coordinates_nan": (lambda d: set_at(d, ("points", 1, "molecule", "coordinates", 1, 2), NAN),
                        "points[1].molecule.coordinates[1][2]", "finite"),
    "coordinates_string": (lambda d: set_at(d, ("points", 1, "molecule", "coordinates", 1, 2), "x"),
                           "points[1].molecule.coordinates[1][2]", "finite number"),
    "coordinates_one_row": (lambda d: set_at(d, ("points", 1, "molecule", "coordinates"), [[0, 0, 0]]),
                            "points[1].molecule.coordinates", "GeometryError"),
    "atoms_too_close": (lambda d: set_at(d, ("points", 1, "molecule", "coordinates", 1), [0, 0, 0.01]),
                        "points[1].molecule.coordinates", "at least 0.1 Å apart"),
    "molecule_multiplicity_even": (lambda d: set_at(d, ("points", 1, "molecule", "multiplicity"), 2),
                                   "points[1].molecule.multiplicity", "MultiplicityError"),
    "molecule_multiplicity_zero": (lambda d: set_at(d, ("points", 1, "molecule", "multiplicity"), 0),
                                   "points[1].molecule.multiplicity", "2S+1 ≥ 1"),
    "molecule_charge_fractional": (lambda d: set_at(d, ("points", 1, "molecule", "charge"), 0.5),
                                   "points[1].molecule.charge", "whole number"),
    "molecule_basis_unknown": (lambda d: set_at(d, ("points", 1, "molecule", "basis"), "no-such-basis"),
                               "points[1].molecule.basis", "BasisError"),
    "molecule_unit_unknown": (lambda d: set_at(d, ("points", 1, "molecule", "unit"), "furlong"),
                              "points[1].molecule.unit", "\"angstrom\" or \"bohr\""),
    "molecule_key_unknown": (lambda d: set_at(d, ("points", 1, "molecule", "spin"), 0), "points[1].molecule.spin",
                             "only the keys"),
    "molecule_key_missing": (lambda d: delete_at(d, ("points", 1, "molecule", "basis")), "points[1].molecule.basis",
                             "is missing"),
    "handover_index_out_of_range": (lambda d: set_at(d, ("points", 2, "handover", "parameter_index", 0), 99),
                                    "points[2].handover.parameter_index[0]", "below 3"),
    "handover_orbitals_ragged": (lambda d: (d["points"][2]["handover"]["orbitals"][1].append(1.0), d)[1],
                                 "points[2].handover.orbitals[1]", "rectangular"),
    "handover_scale_missing": (lambda d: delete_at(d, ("points", 2, "handover", "scale")),
                               "points[2].handover.scale", "is missing"),
    "handover_kind_unknown": (lambda d: set_at(d, ("points", 2, "handover", "kind"), "telepathy"),
                              "points[2].handover.kind", "orbital-matching"),
    "handover_spin_orbital_outside": (lambda d: set_at(d, ("points", 2, "handover", "excitations", 0, 0, 0), 40),
                                      "points[2].handover.excitations[0][0][0]", "spin-orbital index below"),
    "configuration_not_strings": (lambda d: set_at(d, ("configuration", "trial_state"), 3),
                                  "configuration.trial_state", "a string"),
    "warm_start_missing": (lambda d: delete_at(d, ("warm_start",)), "warm_start", "is missing"),
    "version_string": (lambda d: set_at(d, ("version",), "1"), "version", "whole number 1"),
    "points_not_a_list": (lambda d: set_at(d, ("points",), {"0": None}), "points", "a list of scan points"),
}


@pytest.mark.parametrize("case", sorted(CASES))
def test_each_bad_scan_field_is_refused_with_its_path(saved, tmp_path, case):
    mutate, field, word = CASES[case]
    error = refused(write(tmp_path / f"{case}.json", mutate(fresh(saved))), field, word)
    assert error.path == field


def test_a_huge_value_and_deep_nesting_in_a_scan_are_refused(saved, tmp_path):
    data = set_at(fresh(saved), ("points", 1, "value"), "@@")
    path = tmp_path / "huge.json"
    path.write_text(json.dumps(data).replace('"@@"', "1e400"))
    refused(path, "points[1].value", "±1.8e308")
    path.write_text(json.dumps(data).replace('"@@"', "[" * 100_000 + "]" * 100_000))
    with pytest.raises(gk.ResultFileError, match="nested deeper than the JSON parser allows"):
        gk.load_scan(path)


def test_a_failed_point_and_an_earlier_scan_file_round_trip(saved, tmp_path):
    data = fresh(saved)
    data["points"][0].update(result=None, molecule=None, handover=None, failure="geometry(0.7) raised ValueError: x")
    for point in data["points"][1:]:
        for key in ("growth", "suspect_baselines", "baseline_notes", "exact_energy"):
            del point["result"][key]  # as written before these fields existed
        del point["handover"]["kind"]  # handovers written before kinds were recorded
    loaded = gk.load_scan(write(tmp_path / "old.json", data))
    assert not loaded.points[0].ok and loaded.points[1].result.suspect_baselines == {}
    assert reload_equal("scan", tmp_path / "old.json", tmp_path)


# checkpoint point files and manifests -------------------------------------------------------------------------
@pytest.fixture()
def checkpoint(tmp_path):
    folder = tmp_path / "checkpoint"
    folder.mkdir()
    for name, text in scan_texts()[1].items():
        (folder / name).write_text(text)
    return folder


def edit(path, change) -> None:
    """Apply ``change``; a point file's checksum is recomputed, so that the checks behind it are reached."""
    data = json.loads(path.read_text())
    change(data)
    if "checksum" in data and isinstance(data.get("point"), dict) and isinstance(data.get("fingerprint"), str):
        try:
            data["checksum"] = content_checksum(data["fingerprint"], data["point"])
        except ValueError:  # NaN: no checksum can be made, the NaN check comes first anyway
            pass
    write(path, data)


def resume(folder) -> gk.ScanResult:
    return gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, list(SCAN_VALUES), checkpoint=str(folder))


def test_an_untouched_checkpoint_resumes_and_its_files_round_trip(checkpoint, saved, tmp_path):
    resumed = resume(checkpoint)
    assert [p.result.energy for p in resumed.points] == [p["result"]["energy"] for p in saved["points"]]
    for k in range(len(SCAN_VALUES)):
        assert reload_equal("point", checkpoint / f"point-{k:05d}.json", tmp_path)


POINT_CASES = {  # what the CheckpointWarning says about the bad point file (it is set aside and recomputed)
    "value_changed": (lambda d: set_at(d, ("point", "value"), 0.75), r"its value is 0\.75; the manifest has"),
    "index_not_the_file_name": (lambda d: set_at(d, ("point", "index"), 2), "does not match its file name"),
    "geometry_changed": (lambda d: set_at(d, ("point", "molecule", "coordinates", 1, 2), 0.81),
                         "its molecule differs from the manifest's"),
    "nan_parameters": (lambda d: set_at(d, ("point", "result", "parameters", 0), NAN),
                       r"holds NaN or infinity.*point\.result\.parameters\[0\]"),
    "energy_string": (lambda d: set_at(d, ("point", "result", "energy"), "low"), r'result\.energy is "low".*finite'),
    "fingerprint_not_hex": (lambda d: set_at(d, ("fingerprint",), 5), "written by another scan configuration"),
    "point_missing": (lambda d: delete_at(d, ("point",)), "checksum does not match"),
    "version_fractional": (lambda d: set_at(d, ("version",), 1.5), "not a groundkit scan point"),
}


@pytest.mark.parametrize("case", sorted(POINT_CASES))
def test_each_bad_point_file_is_set_aside_and_recomputed_on_resume(checkpoint, saved, case):
    mutate, said = POINT_CASES[case]
    path = checkpoint / "point-00001.json"
    edit(path, mutate)
    with pytest.warns(CheckpointWarning, match=rf"{re.escape(str(path))}: .*{said}"):
        resumed = resume(checkpoint)
    assert (checkpoint / "set-aside" / "point-00001.1.json").exists()  # kept as it was, not deleted
    # internal consistency: the recomputed point equals the one first written
    assert [p.result.energy for p in resumed.points] == pytest.approx(
        [p["result"]["energy"] for p in saved["points"]], abs=1e-10)


def test_a_point_of_another_configuration_is_still_called_so(checkpoint):
    edit(checkpoint / "point-00001.json", lambda d: set_at(d, ("fingerprint",), "0" * 64))
    with pytest.warns(CheckpointWarning, match="written by another scan configuration"):
        resume(checkpoint)


MANIFEST_CASES = {
    "version_fractional": (lambda d: set_at(d, ("version",), 1.5), "version", "whole number 1 or 2"),
    "schema_other": (lambda d: set_at(d, ("schema",), "x"), "schema", "groundkit.scan-checkpoint"),
    "points_not_a_list": (lambda d: set_at(d, ("description", "points"), 3), "description.points", "pairs"),
    "fingerprint_missing": (lambda d: delete_at(d, ("fingerprint",)), "fingerprint", "is missing"),
    "value_nan": (lambda d: set_at(d, ("description", "points", 0, 0), NAN), "description.points[0][0]", "finite"),
}


@pytest.mark.parametrize("case", sorted(MANIFEST_CASES))
def test_each_bad_manifest_is_refused(checkpoint, case):
    mutate, field, word = MANIFEST_CASES[case]
    path = checkpoint / "manifest.json"
    edit(path, mutate)
    with pytest.raises(CheckpointError) as info:
        resume(checkpoint)
    message = str(info.value)
    assert message.startswith(f"{path}: {field} ") and word in message, message
