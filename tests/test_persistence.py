"""Result files: every refusal of gk.load_result names the file, the field and what is accepted; every file that
loads saves again and reloads equal. Each case mutates a real saved H2/STO-3G UCCSD result."""

from __future__ import annotations

import json
import pickle

import jsonschema
import pytest
from pyscf import fci, gto, scf

import groundkit as gk
from groundkit import file_schemas
from groundkit.errors import ResultFieldError
from tests.saved_files import delete_at, reload_equal, result_text, set_at, write

NAN, INF = float("nan"), float("inf")


@pytest.fixture(scope="module")
def saved() -> dict:
    return json.loads(result_text())


def fresh(saved: dict) -> dict:
    return json.loads(json.dumps(saved))


def refused(path, field: str, *words: str) -> ResultFieldError:
    """The ResultFieldError of loading ``path``; its message names the file and ``field``."""
    with pytest.raises(gk.ResultFileError) as info:
        gk.load_result(path)
    message = str(info.value)
    assert message.startswith(f"{path}: {field} "), message
    assert "; expected " in message, message
    for word in words:
        assert word in message, message
    return info.value


def test_the_saved_file_is_a_real_result_that_round_trips(saved, tmp_path):
    mol = gto.M(atom="H 0 0 0; H 0 0 0.74", basis="sto-3g", verbose=0)
    exact = fci.FCI(scf.RHF(mol).run(conv_tol=1e-12)).kernel()[0]
    assert saved["reference"]["energy"] == pytest.approx(exact, abs=1e-9)  # PySCF FCI (reference library)
    assert saved["energy"] == pytest.approx(exact, abs=1e-6)  # UCCSD is exact for two electrons (textbook)
    assert saved["converged"] is True
    assert reload_equal("result", write(tmp_path / "h2.json", saved), tmp_path)


def test_schema_documents_are_draft_2020_12_and_describe_the_saved_file(saved):
    for document in file_schemas.DOCUMENTS.values():
        jsonschema.Draft202012Validator.check_schema(document)  # the JSON Schema meta-schema (jsonschema library)
    jsonschema.validate(saved, file_schemas.RUN_RESULT, cls=jsonschema.Draft202012Validator)


# (mutation of the saved dict, field path named in the message, a word of what is accepted)
CASES = {
    "nan_in_history": (lambda d: set_at(d, ("history", "energies", 1), NAN), r"history.energies[1]", "finite"),
    "infinity_in_parameters": (lambda d: set_at(d, ("parameters", 0), -INF), "parameters[0]", "finite"),
    "nan_in_amplitudes": (lambda d: set_at(d, ("amplitudes", "20"), NAN), "amplitudes.20", "finite"),
    "infinity_in_baselines": (lambda d: set_at(d, ("baselines", "hf"), INF), "baselines.hf", "finite"),
    "nan_in_provenance": (lambda d: set_at(d, ("provenance", "versions", "numpy"), NAN), "provenance.versions.numpy",
                          "finite"),
    "parameters_longer_than_labels": (lambda d: (d["parameters"].append(0.1), d)[1], "parameters", "parameter_labels"),
    "labels_longer_than_parameters": (lambda d: (d["parameters"].pop(), d)[1], "parameters", "parameter_labels"),
    "resources_parameters_differ": (lambda d: set_at(d, ("resources", "parameters"), 7), "resources.parameters",
                                    "number of entries of parameters"),
    "history_wall_times_shorter": (lambda d: (d["history"]["wall_times"].pop(), d)[1], "history.wall_times",
                                   "one entry per iteration"),
    "history_evaluations_longer": (lambda d: (d["history"]["evaluations"].append(99), d)[1], "history.evaluations",
                                   "one entry per iteration"),
    "evaluations_fractional": (lambda d: set_at(d, ("history", "evaluations", 0), 1.7), "history.evaluations[0]",
                               "whole number"),
    "evaluations_boolean": (lambda d: set_at(d, ("history", "evaluations", 0), True), "history.evaluations[0]",
                            "not a boolean"),
    "qubits_fractional": (lambda d: set_at(d, ("resources", "qubits"), 2.9), "resources.qubits", "whole number"),
    "qubits_boolean": (lambda d: set_at(d, ("resources", "qubits"), False), "resources.qubits", "not a boolean"),
    "qubits_negative": (lambda d: set_at(d, ("resources", "qubits"), -4), "resources.qubits", "≥ 0"),
    "multiplicity_negative": (lambda d: set_at(d, ("reference", "multiplicity"), -7), "reference.multiplicity",
                              "2S+1 ≥ 1"),
    "multiplicity_zero": (lambda d: set_at(d, ("reference", "multiplicity"), 0), "reference.multiplicity",
                          "2S+1 ≥ 1"),
    "multiplicity_fractional": (lambda d: set_at(d, ("reference", "multiplicity"), 1.5), "reference.multiplicity",
                                "whole number"),
    "fidelity_seven": (lambda d: set_at(d, ("fidelity",), 7), "fidelity", "from 0 to 1"),
    "fidelity_negative": (lambda d: set_at(d, ("fidelity",), -0.1), "fidelity", "from 0 to 1"),
    "spin_square_negative": (lambda d: set_at(d, ("spin_square",), -0.5), "spin_square", "≥ 0"),
    "reference_spin_square_negative": (lambda d: set_at(d, ("reference", "spin_square"), -2.0),
                                       "reference.spin_square", "≥ 0"),
    "standard_error_negative": (lambda d: set_at(d, ("standard_error",), -1e-3), "standard_error", "≥ 0"),
    "particle_number_negative": (lambda d: set_at(d, ("particle_number",), -2.0), "particle_number", "≥ 0"),
    "amplitude_above_one": (lambda d: set_at(d, ("amplitudes", "20"), 1.5), "amplitudes.20", "from −1 to 1"),
    "wall_time_negative": (lambda d: set_at(d, ("history", "wall_times", 0), -1.0), "history.wall_times[0]", "≥ 0"),
    "energy_missing": (lambda d: delete_at(d, ("energy",)), "energy", "is missing"),
    "history_energies_missing": (lambda d: delete_at(d, ("history", "energies")), "history.energies", "is missing"),
    "reference_method_missing": (lambda d: delete_at(d, ("reference", "method")), "reference.method", "is missing"),
    "resources_qubits_missing": (lambda d: delete_at(d, ("resources", "qubits")), "resources.qubits", "is missing"),
    "provenance_missing": (lambda d: delete_at(d, ("provenance",)), "provenance", "is missing"),
    "version_string": (lambda d: set_at(d, ("version",), "1"), "version", "whole number 1"),
    "version_fractional": (lambda d: set_at(d, ("version",), 1.5), "version", "whole number 1"),
    "version_boolean": (lambda d: set_at(d, ("version",), True), "version", "whole number 1"),
    "version_null": (lambda d: set_at(d, ("version",), None), "version", "whole number 1"),
    "version_missing": (lambda d: delete_at(d, ("version",)), "version", "is missing"),
    "version_other": (lambda d: set_at(d, ("version",), 2), "version", "the version this groundkit reads"),
    "schema_other": (lambda d: set_at(d, ("schema",), "someone.else"), "schema", "groundkit.run-result"),
    "provenance_list": (lambda d: set_at(d, ("provenance",), []), "provenance", "versions, time and configuration"),
    "provenance_string": (lambda d: set_at(d, ("provenance",), "today"), "provenance", "an object"),
    "provenance_without_time": (lambda d: delete_at(d, ("provenance", "time")), "provenance.time", "is missing"),
    "provenance_configuration_string": (lambda d: set_at(d, ("provenance", "configuration"), "UCCSD"),
                                        "provenance.configuration", "an object"),
    "provenance_versions_list": (lambda d: set_at(d, ("provenance", "versions"), ["numpy"]), "provenance.versions",
                                 "an object"),
    "converged_number": (lambda d: set_at(d, ("converged",), 1), "converged", "true or false"),
    "labels_not_strings": (lambda d: set_at(d, ("parameter_labels", 0), 3), "parameter_labels[0]", "a string"),
    "energy_string": (lambda d: set_at(d, ("energy",), "-1.13"), "energy", "finite number"),
    "exact_energy_list": (lambda d: set_at(d, ("exact_energy",), [1.0]), "exact_energy", "or null"),
    "gradient_norm_negative": (lambda d: set_at(d, ("history", "gradient_norms", 0), -1.0),
                               "history.gradient_norms[0]", "≥ 0"),
    "suspect_baseline_not_a_string": (lambda d: set_at(d, ("suspect_baselines",), {"ccsd": 1.0}),
                                      "suspect_baselines.ccsd", "a string"),
    "growth_record_incomplete": (lambda d: set_at(d, ("growth",), [{"step": 0}]), "growth[0].operators",
                                 "is missing"),
    "file_is_a_list": (lambda d: [d], "the file", "groundkit.run-result"),
}


@pytest.mark.parametrize("case", sorted(CASES))
def test_each_bad_field_is_refused_with_its_path(saved, tmp_path, case):
    mutate, field, word = CASES[case]
    data = mutate(fresh(saved))
    error = refused(write(tmp_path / f"{case}.json", data), field, word)
    assert error.path == field


# text-level damage that a JSON writer in Python cannot produce directly: (marker replacement, field, word)
TEXT_CASES = {
    "number_above_float_range": ("1e400", "fidelity", "±1.8e308"),
    "number_below_float_range": ("-1e400", "fidelity", "±1.8e308"),
    "integer_of_100000_digits": ("9" * 100_000, "fidelity", "at most 300 digits"),
    "integer_of_400_digits": ("9" * 400, "fidelity", "at most 300 digits"),
}


@pytest.mark.parametrize("case", sorted(TEXT_CASES))
def test_numbers_no_float_can_hold_are_refused(saved, tmp_path, case):
    token, field, word = TEXT_CASES[case]
    text = json.dumps(set_at(fresh(saved), ("fidelity",), "@@")).replace('"@@"', token)
    path = tmp_path / f"{case}.json"
    path.write_text(text)
    refused(path, field, word)


def test_a_count_of_100000_digits_is_refused(saved, tmp_path):
    path = tmp_path / "count.json"
    path.write_text(json.dumps(set_at(fresh(saved), ("resources", "qubits"), "@@")).replace('"@@"', "7" * 100_000))
    refused(path, "resources.qubits", "(100000 digits)")


def test_nesting_of_100000_lists_is_refused_not_a_recursion_error(saved, tmp_path):
    path = tmp_path / "deep.json"
    data = set_at(fresh(saved), ("provenance", "deep"), "@@")
    path.write_text(json.dumps(data).replace('"@@"', "[" * 100_000 + "]" * 100_000))
    with pytest.raises(gk.ResultFileError, match=r"nested deeper than the JSON parser allows; expected at most 64 "
                                                 r"levels") as info:
        gk.load_result(path)
    assert str(info.value).startswith(f"{path}: (line 1, column ")


def test_nesting_deeper_than_the_limit_names_the_field(saved, tmp_path):
    deep: list = []
    for _ in range(70):
        deep = [deep]
    error = refused(write(tmp_path / "deep70.json", set_at(fresh(saved), ("provenance", "deep"), deep)),
                    "provenance.deep[0]×62", "at most 64 levels")
    assert error.path == "provenance.deep[0]×62"


def test_a_key_given_twice_is_refused(saved, tmp_path):
    path = tmp_path / "twice.json"
    path.write_text(json.dumps(fresh(saved)).replace('"fidelity": ', '"energy": -3.0, "fidelity": ', 1))
    refused(path, "energy", "given twice", "each key once")


def test_binary_and_truncated_files_are_refused(tmp_path):
    binary = tmp_path / "binary.json"
    binary.write_bytes(b"\x89PNG\r\n\x1a\n\xff\x00")
    with pytest.raises(gk.ResultFileError, match="not a text file"):
        gk.load_result(binary)
    cut = tmp_path / "cut.json"
    cut.write_text(result_text()[:500])
    with pytest.raises(gk.ResultFileError, match="truncated"):
        gk.load_result(cut)


# files that must still load: what earlier releases wrote, what a later provenance carries
def test_files_of_earlier_releases_load_and_round_trip(saved, tmp_path):
    old = fresh(saved)
    for key in ("growth", "suspect_baselines", "baseline_notes", "exact_energy"):
        del old[key]
    loaded = gk.load_result(write(tmp_path / "old.json", old))
    assert loaded.growth == () and loaded.suspect_baselines == {} and loaded.baseline_notes == {}
    assert loaded.exact_energy is None and loaded.energy == saved["energy"]
    assert reload_equal("result", tmp_path / "old.json", tmp_path)


def test_provenance_with_components_and_other_keys_loads(saved, tmp_path):
    data = fresh(saved)
    data["provenance"]["components"] = {"trial_state": {"kind": "uccsd", "options": {"layers": [1, 2]}},
                                        "estimator": {"kind": "exact"}}
    data["written_by_a_later_release"] = {"note": "ignored"}
    loaded = gk.load_result(write(tmp_path / "later.json", data))
    assert loaded.provenance["components"]["trial_state"]["options"]["layers"] == [1, 2]
    assert reload_equal("result", tmp_path / "later.json", tmp_path)


def test_whole_numbers_written_with_a_decimal_point_load_as_integers(saved, tmp_path):
    data = fresh(saved)
    data["resources"]["qubits"] = 4.0
    data["history"]["evaluations"] = [float(x) for x in data["history"]["evaluations"]]
    loaded = gk.load_result(write(tmp_path / "floats.json", data))
    assert loaded.resources.qubits == 4 and isinstance(loaded.resources.qubits, int)
    assert all(isinstance(x, int) for x in loaded.history.evaluations)
    assert reload_equal("result", tmp_path / "floats.json", tmp_path)


def test_results_built_in_memory_are_validated_alike(saved):
    from groundkit.persistence import result_from_dict

    data = fresh(saved)
    data["history"]["energies"] = tuple(data["history"]["energies"])  # tuples as a caller may give them
    assert result_from_dict(data).history.energies == tuple(saved["history"]["energies"])
    data["fidelity"] = NAN
    with pytest.raises(gk.ResultFileError, match=r"^memory: fidelity is NaN; expected a finite number"):
        result_from_dict(data, source="memory")


def test_the_error_carries_its_parts_and_pickles(saved, tmp_path):
    error = refused(write(tmp_path / "f.json", set_at(fresh(saved), ("fidelity",), 7)), "fidelity", "from 0 to 1")
    assert (error.source, error.path, error.value, error.expected) == (str(tmp_path / "f.json"), "fidelity", "7",
                                                                       "a fidelity from 0 to 1")
    again = pickle.loads(pickle.dumps(error))
    assert str(again) == str(error) and isinstance(again, gk.ResultFileError) and isinstance(again, ValueError)
