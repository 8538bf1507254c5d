"""Property-based hostile input: whatever a user passes, only GroundkitErrors escape the public API.

Each test draws malformed input from a strategy below and calls one entry point through :func:`only_groundkit_errors`:
a GroundkitError (our refusal, naming the value) passes, any other exception fails the example. To cover a new entry
point, add a strategy of its inputs and a test calling it; result and scan files get theirs the same way (write the
drawn bytes to ``tmp_path`` and load them). Examples stop at construction, at a refusal, or run a tiny molecule.
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import groundkit as gk

EXAMPLES = settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])


def only_groundkit_errors(call, *args, **kwargs):
    """``call(*args, **kwargs)``; returns its value, or None when groundkit refused with a GroundkitError."""
    try:
        return call(*args, **kwargs)
    except gk.GroundkitError as err:
        assert str(err), "a refusal must say what was wrong"
        return None


# strategies --------------------------------------------------------------------------------------------------------
hostile_numbers = st.one_of(
    st.integers(min_value=-(10**40), max_value=10**40),
    st.floats(allow_nan=True, allow_infinity=True),
    st.sampled_from([0, 1, -1, 2, 3, 1e308, -1e308, 5e-324, 2**63, -(2**63) - 1, 10**400]),
    st.sampled_from([np.int64(2), np.float64("nan"), np.uint8(1), np.bool_(True)]),
)
hostile_values = st.one_of(
    hostile_numbers, st.none(), st.booleans(), st.text(max_size=8), st.binary(max_size=8),
    st.lists(st.integers(-3, 3), max_size=3), st.tuples(hostile_numbers, hostile_numbers),
    st.just(object()), st.just(float), st.dictionaries(st.text(max_size=2), st.integers(), max_size=2),
)
element_like = st.one_of(
    st.sampled_from(["H", "He", "Li", "C", "N", "O", "h", "HE", "d", "t", "Xx", "", " ", "Uuo", "Rn", "Og"]),
    st.text(max_size=3), st.integers(-2, 120), st.none(),
)
coordinate = st.one_of(st.floats(min_value=-3, max_value=3), st.floats(allow_nan=True, allow_infinity=True),
                       st.sampled_from([1e6, 1e300, -1e300, 10**400]), st.text(max_size=3), st.none())
row = st.one_of(st.tuples(coordinate, coordinate, coordinate), st.lists(coordinate, max_size=4), coordinate)
basis_names = st.one_of(st.sampled_from(["sto-3g", "STO-3G", "cc-pvdz", "6-31g", "", "   ", "not-a-basis",
                                         "../../etc/passwd", "sto-3g\x00"]), st.text(max_size=10), hostile_values)
charges = st.one_of(st.integers(-6, 6), hostile_values)
multiplicities = st.one_of(st.integers(-2, 6), hostile_values)
units = st.one_of(st.sampled_from(["angstrom", "bohr", "Bohr", "ANGSTROM", "nm", ""]), hostile_values)


@st.composite
def molecule_arguments(draw):
    n = draw(st.integers(0, 4))
    symbols = draw(st.one_of(st.lists(element_like, min_size=n, max_size=n), st.text(max_size=10), hostile_values))
    coordinates = draw(st.one_of(st.lists(row, min_size=n, max_size=n), st.lists(row, max_size=5), hostile_values))
    return dict(symbols=symbols, coordinates=coordinates, charge=draw(charges), multiplicity=draw(multiplicities),
                basis=draw(basis_names), unit=draw(units))


xyz_line = st.one_of(
    st.builds(lambda s, x, y, z: f"{s} {x} {y} {z}", element_like, coordinate, coordinate, coordinate),
    st.text(max_size=30), st.sampled_from(["", "2", "99999999999999999999999999999999999999", "²", "-1", "nan"]),
)
xyz_text = st.lists(xyz_line, max_size=6).map("\n".join)
xyz_bytes = st.one_of(st.binary(max_size=64), xyz_text.map(lambda t: t.encode("utf-8", "surrogatepass")),
                      st.just(bytes(range(256))), st.just(b"\xff\xfe" + "H 0 0 0".encode("utf-16-le")))


def component_options(cls) -> st.SearchStrategy[dict]:
    """Options of a component: its own names (and a few unknown ones) with hostile values."""
    names = [f.name for f in dataclasses.fields(cls) if f.init]
    keys = st.sampled_from(names + ["shotz", "tapering", "elektrons", "seeds", ""])
    return st.dictionaries(keys, hostile_values, max_size=3)


COMPONENTS = {
    "active_space": [gk.ActiveSpace],
    "mapping": [gk.QubitMapping],
    "trial_state": [gk.UCCSD, gk.PairDoubles, gk.UpCCGSD, gk.HardwareEfficient],
    "estimator": [gk.SampledEstimator, gk.NoisyEstimator],
    "minimiser": [gk.BFGS, gk.LBFGSB, gk.COBYLA, gk.NelderMead, gk.SPSA, gk.Adam, gk.FixedStepDescent],
}
NAMES = {gk.QubitMapping: "parity", gk.UCCSD: "uccsd", gk.PairDoubles: "puccd", gk.UpCCGSD: "upccgsd",
         gk.HardwareEfficient: "hardware-efficient", gk.SampledEstimator: "sampled", gk.NoisyEstimator: "noisy",
         gk.BFGS: "bfgs", gk.LBFGSB: "l-bfgs-b", gk.COBYLA: "cobyla", gk.NelderMead: "nelder-mead", gk.SPSA: "spsa",
         gk.Adam: "adam", gk.FixedStepDescent: "gradient-descent"}
component_requests = st.sampled_from([(role, cls) for role, classes in COMPONENTS.items() for cls in classes])


# molecules -----------------------------------------------------------------------------------------------------------
@EXAMPLES
@given(molecule_arguments())
def test_malformed_molecules_get_groundkit_errors(arguments):
    molecule = only_groundkit_errors(gk.MoleculeSpec, **arguments)
    if molecule is None:
        return
    assert all(math.isfinite(x) for r in molecule.coordinates for x in r)
    assert molecule.n_electrons > 0 and molecule.multiplicity >= 1
    estimate = only_groundkit_errors(gk.cost_estimate, gk.Pipeline(molecule))  # no SCF: figures only
    if estimate is not None:
        assert estimate.n_ao >= 1 and repr(estimate)


@settings(max_examples=25, deadline=None)
@given(st.lists(st.sampled_from(["H", "He"]), min_size=1, max_size=2), st.floats(0.3, 6.0), st.integers(-2, 2),
       st.integers(1, 4))
def test_tiny_molecules_run_to_a_problem_or_a_groundkit_error(symbols, distance, charge, multiplicity):
    coordinates = [(0.0, 0.0, k * distance) for k in range(len(symbols))]
    molecule = only_groundkit_errors(gk.MoleculeSpec, symbols=symbols, coordinates=coordinates, charge=charge,
                                     multiplicity=multiplicity)
    if molecule is not None:  # passes every check: PySCF must then work on it
        problem = only_groundkit_errors(gk.Pipeline(molecule).problem)
        if problem is not None:
            assert problem.n_alpha <= problem.n_orbitals and math.isfinite(problem.scf_energy)


@EXAMPLES
@given(xyz_text)
def test_malformed_xyz_text_gets_groundkit_errors(text):
    only_groundkit_errors(gk.MoleculeSpec.from_xyz, text)


@EXAMPLES
@given(xyz_bytes)
def test_xyz_bytes_and_files_get_groundkit_errors(tmp_path, data):
    only_groundkit_errors(gk.MoleculeSpec.from_xyz, data)
    path = tmp_path / "drawn.xyz"
    path.write_bytes(data)
    only_groundkit_errors(gk.MoleculeSpec.from_xyz, path)
    only_groundkit_errors(gk.MoleculeSpec.from_xyz, str(path))


# component options -------------------------------------------------------------------------------------------------
@EXAMPLES
@given(st.data())
def test_hostile_component_options_get_groundkit_errors(data):
    role, cls = data.draw(component_requests)
    options = data.draw(component_options(cls))
    known = {k: v for k, v in options.items() if k in {f.name for f in dataclasses.fields(cls) if f.init}}
    only_groundkit_errors(cls, **known)  # the constructor with its own option names
    chain = getattr(gk.Pipeline(), role)
    if role == "active_space":
        only_groundkit_errors(chain, **options)
    else:
        only_groundkit_errors(chain, NAMES[cls], **options)  # names with any options, unknown ones included


@EXAMPLES
@given(hostile_values, hostile_values)
def test_hostile_component_names_and_limits_get_groundkit_errors(value, setting):
    for role in ("mapping", "trial_state", "estimator", "minimiser", "active_space", "molecule"):
        only_groundkit_errors(getattr(gk.Pipeline(), role), value)
    for name in ("evaluation_seconds", "memory_fraction", "memory_bytes"):
        with gk.limits.changed():
            only_groundkit_errors(setattr, gk.limits, name, setting)


def test_an_integer_beyond_the_float_range_is_refused_as_a_probability():
    # an int of 10**400 has no float (OverflowError in float()); drawn once by hypothesis above, pinned here
    with pytest.raises(gk.errors.ComponentError, match="one_qubit must be"):
        gk.NoisyEstimator(one_qubit=10**400)
