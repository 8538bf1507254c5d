"""Every kind of trial state through every route: run, scan (warm-started), compare, circuit, shot budget and a
TOML batch file, on H2/STO-3G.

The references are computed here, outside groundkit: PySCF's RHF and FCI energies at each bond length (reference
library), and the qubit Hamiltonian that OpenFermion assembles from PySCF's integrals under Jordan-Wigner
(reference library). For two electrons one double excitation reaches full CI, so every kind below can and must end
at PySCF's FCI energy. H2's Hamiltonian has no term with an odd count of either orbital's index (the orbitals
have opposite parity under inversion), so it is the same whatever signs the two SCF runs give the orbitals: the
test's Hamiltonian and groundkit's agree term by term.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass

import cirq
import numpy as np
import pandas as pd
import pytest
import sympy
from openfermion import InteractionOperator, QubitOperator, get_sparse_operator, jordan_wigner

import groundkit as gk
from groundkit.adaptive import OperatorPool, grown_trial_state
from groundkit.cli import main as cli_main
from groundkit.qubit_states import QubitTrialState
from groundkit.studies.batch import run_study
from groundkit.studies.toml_file import read_study

from ..sector.engine_problems import build_problem

R0 = 0.7414  # H2 r_e, NIST CCCBDB experimental (from memory)
SCAN = (0.70, 0.80)
ENERGY_TOLERANCE = 1e-6  # Ha: BFGS stops at a gradient norm of 1e-5 Ha/rad, far closer than this


def h2(r: float) -> gk.MoleculeSpec:
    return gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, r)), basis="sto-3g")


# user subclasses of each base class ------------------------------------------------------------------------------
@dataclass(frozen=True)
class OneDouble(gk.TrialState):
    """A user's fermionic trial state: the single pair double 0a0b -> 1a1b."""

    def excitations(self, problem):
        return [((2, 3), (1, 0))]


@dataclass(frozen=True)
class SwapPair(QubitTrialState):
    """A user's qubit trial state: cos t |1100> + sin t |0011> built from Ry and CNOTs."""

    def parametrised_circuit(self, encoding):
        q = cirq.LineQubit.range(encoding.n_qubits)
        t = sympy.Symbol("t")
        return cirq.Circuit([cirq.X(q[0]), cirq.X(q[1]), cirq.ry(2 * t)(q[2]), cirq.CNOT(q[2], q[3]),
                             cirq.CNOT(q[2], q[0]), cirq.CNOT(q[2], q[1])])


@dataclass(frozen=True)
class PairDoublesOnly(OperatorPool):
    """A user's operator pool for the adaptive trial state: only the reference's doubles."""

    def candidates(self, problem, reference):
        return [((2, 3), (1, 0))]


def _circuit() -> cirq.Circuit:
    """A user's Cirq circuit: a|0011> + b|1100> with a relative phase, two symbols."""
    q = cirq.LineQubit.range(4)
    a, b = sympy.symbols("a b")
    return cirq.Circuit([cirq.X(q[2]), cirq.X(q[3]), cirq.ry(a)(q[0]), cirq.rz(b)(q[0]), cirq.CNOT(q[0], q[1]),
                         cirq.CNOT(q[0], q[2]), cirq.CNOT(q[0], q[3])])


KINDS = {
    "uccsd": gk.UCCSD(),
    "pair-doubles": gk.PairDoubles(),
    "k-upccgsd": gk.UpCCGSD(k=1),
    "excitation-list": gk.ExcitationList([((2, 3), (1, 0)), ((2,), (0,))]),
    "hardware-efficient": gk.HardwareEfficient(layers=1),
    "circuit": gk.CircuitTrialState(_circuit()),
    "pauli-rotations": gk.PauliRotations(["Y0 X1 X2 X3"]),
    "adaptive": gk.Adaptive(),
    "adaptive-qubit-pool": gk.Adaptive(pool="qubit"),
    "user-trial-state": OneDouble(),
    "user-qubit-trial-state": SwapPair(),
    "user-operator-pool": gk.Adaptive(pool=PairDoublesOnly()),
}

# the [components] line of a TOML study for every kind a study file can name
TOML_NAMES = {
    "uccsd": '"uccsd"',
    "pair-doubles": '"puccd"',
    "k-upccgsd": '{name = "upccgsd", k = 1}',
    "excitation-list": '{name = "excitation-list", excitations = [[[2, 3], [1, 0]], [[2], [0]]]}',
    "hardware-efficient": '{name = "hardware-efficient", layers = 1}',
    "pauli-rotations": '{name = "pauli-rotations", strings = ["Y0 X1 X2 X3"]}',
    "adaptive": '"adaptive"',
    "adaptive-qubit-pool": '{name = "adaptive", pool = "qubit"}',
}


@dataclass(frozen=True)
class Outside:
    hf: float
    fci: float
    hamiltonian: object  # openfermion.QubitOperator, Jordan-Wigner


@pytest.fixture(scope="module")
def outside() -> dict[float, Outside]:
    """PySCF RHF and FCI energies and the OpenFermion qubit Hamiltonian at every bond length used."""
    out = {}
    for r in (R0, *SCAN):
        p = build_problem(f"H 0 0 0; H 0 0 {r}")  # PySCF (reference library)
        n = p.n_orbitals
        one, two = np.zeros((2 * n, 2 * n)), np.zeros((2 * n,) * 4)
        for s in (0, 1):
            one[s::2, s::2] = p.h1
            for t in (0, 1):
                two[s::2, t::2, t::2, s::2] = 0.5 * p.h2.transpose(0, 2, 3, 1)
        assert p.hf_energy - p.reference.energy > 0.018  # correlation energy, PySCF RHF and FCI
        out[r] = Outside(hf=p.hf_energy, fci=p.reference.energy,
                         hamiltonian=jordan_wigner(InteractionOperator(p.core_energy, one, two)))  # OpenFermion
    return out


def pipeline(kind: str) -> gk.Pipeline:
    return gk.Pipeline(h2(R0)).trial_state(KINDS[kind])


_RUNS: dict[str, gk.RunResult] = {}


def run_of(kind: str) -> gk.RunResult:
    if kind not in _RUNS:
        _RUNS[kind] = pipeline(kind).run()
    return _RUNS[kind]


def assert_at_full_ci(energy: float, ref: Outside) -> None:
    """At PySCF's FCI energy; the correlation energy (over 18 mHa at these bond lengths, checked in ``outside``) is
    thousands of times the tolerance, so a state that stays at Hartree-Fock fails."""
    assert energy >= ref.fci - 1e-9  # variational: never below PySCF's FCI (reference library)
    assert energy - ref.fci < ENERGY_TOLERANCE  # two electrons: one double reaches FCI (PySCF, reference library)


def fixed_pipeline(kind: str, result: gk.RunResult) -> gk.Pipeline:
    """The pipeline whose trial state has fixed parameters: an adaptive run's grown sequence, else the kind's own."""
    if isinstance(KINDS[kind], gk.Adaptive):
        with pytest.raises(gk.ComponentError, match="grown_trial_state"):  # no sequence before it grows
            pipeline(kind).circuit()
        return pipeline(kind).trial_state(grown_trial_state(result))
    return pipeline(kind)


def circuit_state(kind: str, result: gk.RunResult) -> np.ndarray:
    circuit = fixed_pipeline(kind, result).circuit(result.parameters).circuit
    assert sorted(circuit.all_qubits()) == cirq.LineQubit.range(4)
    return cirq.Simulator(dtype=np.complex128).simulate(circuit, qubit_order=cirq.LineQubit.range(4)) \
        .final_state_vector  # Cirq (reference library)


@pytest.mark.parametrize("kind", KINDS)
def test_run_reaches_full_ci(kind, outside):
    result = run_of(kind)
    assert result.converged, result.stop_reason
    assert_at_full_ci(result.energy, outside[R0])
    assert result.verdict == "within" and result.within_chemical_accuracy


@pytest.mark.parametrize("kind", KINDS)
def test_the_circuit_prepares_the_state_of_the_run(kind, outside):
    result = run_of(kind)
    psi = circuit_state(kind, result)
    h = get_sparse_operator(outside[R0].hamiltonian, n_qubits=4)
    energy = float(np.vdot(psi, h @ psi).real)  # OpenFermion's Hamiltonian in Cirq's state
    assert energy == pytest.approx(result.energy, abs=1e-8)


@pytest.mark.parametrize("kind", KINDS)
def test_shot_budget_follows_the_term_variances(kind, outside):
    # one term per group, shots in proportion to each term's standard deviation: N = (sum_k |c_k| sigma_k)^2 / eps^2
    # (Wecker, Hastings, Troyer, Phys. Rev. A 92, 042303 (2015); Rubin, Babbush, McClean, New J. Phys. 20,
    # 053020 (2018))
    result = run_of(kind)
    psi = circuit_state(kind, result)
    total = 0.0
    for term, c in outside[R0].hamiltonian.terms.items():
        if term:
            p = get_sparse_operator(QubitOperator(term), n_qubits=4)
            mean = float(np.vdot(psi, p @ psi).real)
            total += abs(c.real) * math.sqrt(max(0.0, 1.0 - mean * mean))
    expected = total ** 2 / 1.6e-3 ** 2
    budget = fixed_pipeline(kind, result).shot_budget(precision=1.6e-3, parameters=result.parameters, grouping="none")
    assert budget == pytest.approx(expected, rel=1e-6, abs=1.0)


@pytest.mark.parametrize("kind", KINDS)
def test_a_warm_started_scan_gives_full_ci_at_each_point(kind, outside):
    scan = gk.Pipeline().trial_state(KINDS[kind]).scan(h2, list(SCAN), warm_start=True)
    assert scan.failures == {}
    first, second = scan.points
    assert first.start == "cold" and second.start.startswith("warm"), second.start
    for point in scan.points:
        assert_at_full_ci(point.result.energy, outside[point.value])


@pytest.mark.parametrize("kind", KINDS)
def test_compare_gives_a_row_at_full_ci(kind, outside):
    table = gk.compare(gk.Pipeline(h2(R0)), trial_states=[KINDS[kind]])
    assert len(table) == 1
    row = table.iloc[0]
    assert row["failure"] is None
    assert_at_full_ci(row["energy"], outside[R0])
    assert row["verdict"] == "within" and bool(row["within_chemical_accuracy"])


def _study_file(tmp_path, trial_state: str) -> str:
    path = tmp_path / "study.toml"
    path.write_text(f"""title = "H2 stretch"
[molecule]
symbols = ["H", "H"]
coordinates = [[0, 0, 0], [0, 0, {R0}]]
basis = "sto-3g"
[components]
trial_state = {trial_state}
[scan]
bond = [0, 1]
values = [{SCAN[0]}, {SCAN[1]}]
[output]
directory = "out"
""", encoding="utf-8")
    return str(path)


@pytest.mark.parametrize("kind", KINDS)
def test_a_toml_batch_scan_gives_full_ci_at_each_point(kind, outside, tmp_path):
    if kind in TOML_NAMES:  # the whole route: the file names the trial state, the command line runs it
        path = _study_file(tmp_path, TOML_NAMES[kind])
        assert read_study(path).pipeline.components["trial_state"] == KINDS[kind]
        assert cli_main(["run", path, "--quiet"]) == 0
    else:  # a Python object no file can name: the file's study with the trial state put in, run as a batch
        study = read_study(_study_file(tmp_path, '"uccsd"'))
        study = dataclasses.replace(study, pipeline=study.pipeline.trial_state(KINDS[kind]))
        _, failed = run_study(study, progress=False)
        assert failed == 0
    table = pd.read_csv(tmp_path / "out" / "summary.csv")
    assert table["failure"].isna().all()
    assert list(table["start"])[0] == "cold" and list(table["start"])[1].startswith("warm")
    for value, energy in zip(table["value"], table["energy"]):
        assert_at_full_ci(float(energy), outside[float(value)])
