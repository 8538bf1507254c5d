"""Property-based tests of the file readers (hypothesis): damaged files are refused with ResultFileError and
nothing else; every file that loads saves again and reloads equal.

Each example starts from a real saved file (H2/STO-3G UCCSD result, an H2 scan of three points, one of that scan's
checkpoint point files) and damages it: deleted fields, values swapped for other JSON types, NaN and Infinity,
numbers no float can hold, deep nesting, repeated keys, truncation, flipped and random bytes. Examples are
derandomized (fixed seed), so every run tries the same files.
"""

from __future__ import annotations

import json

import pytest
from hypothesis import HealthCheck, event, given, settings
from hypothesis import strategies as st

import groundkit as gk
from tests.saved_files import delete_at, reload_equal, resolve, result_text, scan_texts, set_at

SETTINGS = dict(deadline=None, derandomize=True, suppress_health_check=[HealthCheck.function_scoped_fixture,
                                                                        HealthCheck.too_slow])
MARK = "@@hostile@@"

SCALARS = (st.none() | st.booleans() | st.integers(-10**6, 10**6) | st.text(max_size=8)
           | st.floats(allow_nan=True, allow_infinity=True))
JSON_VALUES = st.recursive(SCALARS, lambda inner: st.lists(inner, max_size=3)
                           | st.dictionaries(st.text(max_size=6), inner, max_size=3), max_leaves=6)
TOKENS = st.sampled_from([
    "NaN", "Infinity", "-Infinity", "1e400", "-1e999", "9" * 299, "9" * 301, "7" * 5000, "-" + "3" * 100_000,
    "[" * 63 + "]" * 63, "[" * 70 + "]" * 70, "{\"a\":" * 3000 + "1" + "}" * 3000, "[" * 100_000 + "]" * 100_000,
    '{"a": 1, "a": 2}', '"\\ud800"', "1.0", "0", "-0.0", "true", "[]", "{}",
])


def paths_of(data) -> list[tuple]:
    """Every path below the root of a JSON value, in document order (iterative)."""
    out, stack = [], [(data, ())]
    while stack:
        value, path = stack.pop()
        if path:
            out.append(path)
        children = value.items() if isinstance(value, dict) else enumerate(value) if isinstance(value, list) else ()
        stack.extend((v, (*path, k)) for k, v in reversed(list(children)))
    return out


def _same_kind(value) -> st.SearchStrategy:
    """Another value of the JSON kind of ``value`` (containers are kept)."""
    if isinstance(value, bool):
        return st.booleans()
    if isinstance(value, int):
        return st.integers(0, 10**6)
    if isinstance(value, float):
        return st.floats(-1e3, 1e3) | st.floats(0, 1)
    if isinstance(value, str):
        return st.text(max_size=12)
    return st.just(value)


@st.composite
def damaged(draw, text: str) -> bytes:
    """Bytes of ``text`` (a saved file) after one to three structural changes and perhaps some byte damage."""
    data = json.loads(text)
    tokens = []
    for _ in range(draw(st.integers(1, 3))):
        paths = paths_of(data)
        if not paths:
            break
        path = draw(st.sampled_from(paths))
        how = draw(st.sampled_from(["delete", "swap", "token", "nan", "same_kind", "same_kind"]))
        if how == "same_kind":  # often still a valid file, with other content
            container, key = resolve(data, path)
            set_at(data, path, draw(_same_kind(container[key])))
        elif how == "delete":
            delete_at(data, path)
        elif how == "swap":
            set_at(data, path, draw(JSON_VALUES))
        elif how == "nan":
            set_at(data, path, draw(st.sampled_from([float("nan"), float("inf"), -float("inf")])))
        else:
            tokens.append(draw(TOKENS))
            set_at(data, path, f"{MARK}{len(tokens) - 1}")
    out = json.dumps(data, indent=draw(st.sampled_from([None, 1])), allow_nan=True)
    for k, token in enumerate(tokens):
        out = out.replace(f'"{MARK}{k}"', token)
    raw = out.encode("utf-8")
    damage = draw(st.sampled_from(["none", "none", "none", "none", "truncate", "flip", "insert", "random"]))
    if damage == "truncate":
        raw = raw[: draw(st.integers(0, max(len(raw) - 1, 0)))]
    elif damage == "flip" and raw:
        at = draw(st.integers(0, len(raw) - 1))
        raw = raw[:at] + bytes([draw(st.integers(0, 255))]) + raw[at + 1:]
    elif damage == "insert":
        at = draw(st.integers(0, len(raw)))
        raw = raw[:at] + draw(st.binary(min_size=1, max_size=8)) + raw[at:]
    elif damage == "random":
        raw = draw(st.binary(max_size=200))
    return raw


def loads_or_refuses(kind: str, raw: bytes, folder) -> bool:
    """True when the file loaded (and then it must re-save and reload equal); False when it was refused with a
    ResultFileError. Any other exception fails the test."""
    path = folder / ("point-00001.json" if kind == "point" else f"hostile-{kind}.json")
    path.write_bytes(raw)
    try:
        equal = reload_equal(kind, path, folder)
    except gk.ResultFileError as err:
        assert str(err).startswith(str(path)), err  # the message names the file
        event(f"refused: {type(err).__name__}")
        return False
    assert equal, f"{kind} file loaded but did not reload equal after saving"
    event("loaded and round-tripped")
    return True


@pytest.mark.slow  # 300 files: about 6 s
@settings(max_examples=300, **SETTINGS)
@given(data=st.data())
def test_damaged_result_files_load_equal_or_are_refused(tmp_path, data):
    loads_or_refuses("result", data.draw(damaged(result_text())), tmp_path)


@pytest.mark.slow  # every loaded scan point builds its molecule (PySCF basis look-ups): about 10 s
@settings(max_examples=150, **SETTINGS)
@given(data=st.data())
def test_damaged_scan_files_load_equal_or_are_refused(tmp_path, data):
    loads_or_refuses("scan", data.draw(damaged(scan_texts()[0])), tmp_path)


@settings(max_examples=100, **SETTINGS)
@given(data=st.data())
def test_damaged_checkpoint_point_files_load_equal_or_are_refused(tmp_path, data):
    loads_or_refuses("point", data.draw(damaged(scan_texts()[1]["point-00001.json"])), tmp_path)


# valid files generated from the saved one: they must all load, keep their values and round-trip ---------------------
FINITE = st.floats(allow_nan=False, allow_infinity=False)
PLAIN = st.recursive(st.none() | st.booleans() | st.integers(-10**100, 10**100) | FINITE | st.text(max_size=8),
                     lambda inner: st.lists(inner, max_size=3) | st.dictionaries(st.text(max_size=6), inner,
                                                                                 max_size=3), max_leaves=8)


@st.composite
def valid_results(draw) -> dict:
    data = json.loads(result_text())
    n = len(data["parameters"])
    data["energy"] = draw(FINITE)
    data["parameters"] = draw(st.lists(FINITE, min_size=n, max_size=n))
    data["parameter_labels"] = draw(st.lists(st.text(max_size=12), min_size=n, max_size=n))
    iterations = draw(st.integers(0, 4))
    data["history"] = {
        "energies": draw(st.lists(FINITE, min_size=iterations, max_size=iterations)),
        "gradient_norms": draw(st.lists(st.none() | st.floats(0, 1e300), min_size=iterations, max_size=iterations)),
        "wall_times": draw(st.lists(st.floats(0, 1e6), min_size=iterations, max_size=iterations)),
        "evaluations": [draw(st.integers(0, 10**12) | st.integers(0, 10**6).map(float)) for _ in range(iterations)],
    }
    data["fidelity"] = draw(st.floats(0, 1))
    data["standard_error"] = draw(st.floats(0, 1e3))
    data["reference"]["multiplicity"] = draw(st.integers(1, 99))
    data["reference"]["method"] = draw(st.text(max_size=20))
    data["amplitudes"] = draw(st.dictionaries(st.text(max_size=6), st.floats(-1, 1), max_size=4))
    data["baselines"] = draw(st.dictionaries(st.text(max_size=6), st.none() | FINITE, max_size=4))
    data["resources"]["pauli_terms"] = draw(st.none() | st.integers(0, 10**30))
    data["stop_reason"] = draw(st.text(max_size=30))
    data["provenance"].update(draw(st.dictionaries(st.text(max_size=8), PLAIN, max_size=3)))
    data["provenance"]["components"] = draw(st.dictionaries(st.text(max_size=8), st.dictionaries(
        st.text(max_size=6), PLAIN, max_size=3), max_size=3))
    for key in ("growth", "suspect_baselines", "baseline_notes", "exact_energy"):
        if draw(st.booleans()):
            del data[key]
    return data


@pytest.mark.slow  # 200 files: about 6 s
@settings(max_examples=200, **SETTINGS)
@given(data=valid_results())
def test_generated_valid_result_files_load_keep_their_values_and_round_trip(tmp_path, data):
    path = tmp_path / "valid.json"
    path.write_text(json.dumps(data, allow_nan=False), encoding="utf-8")
    loaded = gk.load_result(path)
    assert loaded.energy == data["energy"] and list(loaded.parameters) == data["parameters"]
    assert loaded.history.evaluations == tuple(int(x) for x in data["history"]["evaluations"])
    assert loaded.provenance["components"] == data["provenance"]["components"]
    assert reload_equal("result", path, tmp_path)
