"""Cost estimates and size limits (groundkit.sizing): figures against PySCF and counting, refusals before any SCF."""

from __future__ import annotations

import itertools
import math
import re

import numpy as np
import pytest

import groundkit as gk
from groundkit import chemistry, sizing
from groundkit.objective import Objective

from .conftest import diatomic, water


def cubic_cluster(n: int, symbol: str, spacing: float) -> gk.MoleculeSpec:
    k = math.ceil(n ** (1 / 3))
    grid = [(i, j, m) for i in range(k) for j in range(k) for m in range(k)][:n]
    return gk.MoleculeSpec(symbols=(symbol,) * n, coordinates=tuple(tuple(spacing * x for x in p) for p in grid))


def acetylene() -> gk.MoleculeSpec:  # NIST CCCBDB experimental r(CC) 1.203 Å, r(CH) 1.063 Å (from memory)
    return gk.MoleculeSpec(symbols=("C", "C", "H", "H"), basis="cc-pvdz",
                           coordinates=((0, 0, 0.6015), (0, 0, -0.6015), (0, 0, 1.6645), (0, 0, -1.6645)))


@pytest.fixture
def no_scf(monkeypatch):
    """Any SCF or exact solve fails the test: refusals must come before them."""
    def forbidden(*args, **kwargs):
        raise AssertionError("an SCF or exact solve ran before the refusal")

    monkeypatch.setattr(chemistry, "solve_scf", forbidden)
    monkeypatch.setattr(chemistry, "lowest_states", forbidden)


# figures against outside counts ----------------------------------------------------------------------------------
@pytest.mark.parametrize("molecule", [water(), water("cc-pvdz"), acetylene(), diatomic("Fe", "O", 1.6, basis="6-31g*",
                                                                                         multiplicity=3)])
def test_atomic_orbital_count_is_pyscfs(molecule):
    from pyscf import gto

    mol = gto.M(atom=[(s, c) for s, c in zip(molecule.symbols, molecule.coordinates)], basis=molecule.basis,
                spin=molecule.multiplicity - 1, verbose=0)
    n_ao, weight = sizing.basis_sizes(molecule)
    assert n_ao == mol.nao_nr()  # PySCF (reference library)
    assert weight == sum(mol.bas_nprim(i) * (2 * mol.bas_angular(i) + 1) for i in range(mol.nbas))  # PySCF
    e = gk.cost_estimate(gk.Pipeline(molecule))
    assert e.n_ao == n_ao and e.eri_bytes == 8 * n_ao**4 / 8  # n_ao^4/8 doubles (8-fold symmetry, common practice)


def test_window_determinants_and_qubits_match_the_built_problem_and_pyscf(lih):
    from pyscf.fci import cistring

    for space in (gk.ActiveSpace(), gk.ActiveSpace(electrons=2, orbitals=3), gk.ActiveSpace(frozen_core=True),
                  gk.ActiveSpace(indices=[1, 2, 5])):
        pipeline = gk.Pipeline(lih).active_space(space)
        e = gk.cost_estimate(pipeline)
        problem = pipeline.problem()
        assert (e.window.n_orbitals, e.window.n_alpha, e.window.n_beta, e.window.n_core) == (
            problem.n_orbitals, problem.n_alpha, problem.n_beta, len(problem.active_orbitals.core))  # internal
        strings = cistring.num_strings(problem.n_orbitals, problem.n_alpha) * cistring.num_strings(
            problem.n_orbitals, problem.n_beta)
        assert e.n_determinants == strings  # PySCF (reference library) string counts
        assert e.n_qubits == 2 * problem.n_orbitals


def test_open_shell_window_is_predicted():
    oh = diatomic("O", "H", 0.97, multiplicity=2)
    for space in (gk.ActiveSpace(electrons=3, orbitals=3), gk.ActiveSpace(frozen_core=True)):
        e = gk.cost_estimate(gk.Pipeline(oh).active_space(space))
        problem = gk.Pipeline(oh).active_space(space).problem()
        assert (e.window.n_orbitals, e.window.n_alpha, e.window.n_beta) == (
            problem.n_orbitals, problem.n_alpha, problem.n_beta)  # internal consistency with the resolved space


def test_rotated_pairs_count_by_enumerating_every_string():
    n, na, nb = 6, 2, 2
    trial = gk.UCCSD()
    plan = trial.plan(sizing._Shape(n, na, nb, 1))
    alpha = [s for s in itertools.product((0, 1), repeat=n) if sum(s) == na]
    beta = [s for s in itertools.product((0, 1), repeat=n) if sum(s) == nb]

    def acts(string, ops):  # annihilated orbitals occupied, created ones empty (touched once each)
        return all(string[p] == (0 if creator else 1) for p, creator in ops)

    from groundkit.sector.excitation import split_by_spin

    brute = 0
    for excitation in plan.excitations:
        _, a_ops, b_ops = split_by_spin(excitation)
        brute += sum(acts(sa, a_ops) for sa in alpha) * sum(acts(sb, b_ops) for sb in beta)  # counting by hand
    assert sizing.rotated_pairs(plan.excitations, n, na, nb) == brute


def test_parameters_and_pairs_agree_with_the_engine(lih):
    problem = gk.Pipeline(lih).problem()
    objective = Objective(problem, gk.UCCSD())
    e = gk.cost_estimate(gk.Pipeline(lih))
    assert e.n_parameters == objective.n_parameters  # internal consistency
    n, na, nb = problem.n_orbitals, problem.n_alpha, problem.n_beta
    o, v = na, n - na
    closed_form = 2 * o * v + 2 * math.comb(o, 2) * math.comb(v, 2) + o * o * v * v  # UCCSD count, from memory
    assert e.n_parameters == closed_form
    assert sizing.rotated_pairs(objective.plan.excitations, n, na, nb) == sum(
        s.n_pairs for s in objective.steps.steps)  # internal consistency with the engine's own tables


def test_available_memory_reads_the_machine():
    with open("/proc/meminfo") as fh:
        line = next(x for x in fh if x.startswith("MemAvailable:"))
    reported = 1024.0 * float(line.split()[1])  # the kernel's own figure (common practice, no single source)
    assert sizing.available_memory() == pytest.approx(reported, rel=0.2)
    assert sizing.limits.memory_limit() == pytest.approx(sizing.limits.memory_fraction * reported, rel=0.2)


# refusals before any SCF -----------------------------------------------------------------------------------------
def test_200_atom_hydrogen_cluster_is_refused_before_scf(no_scf):
    h200 = cubic_cluster(200, "H", 0.9)
    for call in (gk.Pipeline(h200).run, gk.Pipeline(h200).objective):
        with pytest.raises(gk.SizeLimitError) as info:
            call()
        message = str(info.value)
        assert "refused before any heavy work" in message and "200 atomic orbitals" in message
        assert "determinants" in message and "integrals" in message
        suggested = re.search(r"ActiveSpace\(electrons=(\d+), orbitals=(\d+)\)", message)
        assert suggested and gk.cost_estimate(gk.Pipeline(h200).active_space(
            electrons=int(suggested[1]), orbitals=int(suggested[2]))).fits, message
    # a machine with 8 GiB to spare cannot hold the 200^4 active-space tensor (11.9 GiB alone): problem() refuses
    with gk.limits.changed(memory_bytes=8 * 2**30):
        with pytest.raises(gk.SizeLimitError, match=r"active-space integrals \(200e, 200o\) needs 17.9 GiB"):
            gk.Pipeline(h200).problem()
    assert ("SCF", h200) not in gk.workspace()


def test_200_atom_carbon_cluster_problem_is_refused_before_scf(no_scf):
    c200 = cubic_cluster(200, "C", 1.4)
    with pytest.raises(gk.SizeLimitError, match=r"1000 atomic orbitals") as info:
        gk.Pipeline(c200).problem()
    assert "limits.scf_seconds" in str(info.value) and "choose a smaller basis set or fewer atoms" in str(info.value)


def test_acetylene_6e_30o_is_refused_with_its_figures(no_scf):
    pipeline = gk.Pipeline(acetylene()).active_space(electrons=6, orbitals=30)
    with pytest.raises(gk.SizeLimitError) as info:
        pipeline.run()
    message = str(info.value)
    assert f"{math.comb(30, 3) ** 2:,}" == "16,483,600" and "16,483,600" in message  # C(30,3)^2, by counting
    assert "qubits: 60" in message and "parameters: 8,829" in message  # the figures
    assert "one energy+gradient would take" in message
    suggested = re.search(r"ActiveSpace\(electrons=(\d+), orbitals=(\d+)\)", message)
    assert suggested, message
    smaller = pipeline.active_space(electrons=int(suggested[1]), orbitals=int(suggested[2]))
    assert gk.cost_estimate(smaller).fits and int(suggested[2]) < 30


def test_estimate_runs_nothing_and_reads_well(no_scf):
    e = gk.cost_estimate(gk.Pipeline(acetylene()).active_space(electrons=6, orbitals=30))
    assert not e.fits and e.n_determinants == 16_483_600 and e.n_qubits == 60 and e.n_parameters == 8829
    text = repr(e)
    for part in ("38 atomic orbitals", "determinants: 16,483,600", "8 CI vectors", "qubits: 60", "REFUSED"):
        assert part in text
    with pytest.raises(gk.ComponentError, match="takes a Pipeline"):
        gk.cost_estimate("water")
    with pytest.raises(gk.ComponentError, match="needs a pipeline with a molecule"):
        gk.cost_estimate(gk.Pipeline())


def test_exact_reference_is_checked_before_pyscf(monkeypatch, h2o):
    problem = gk.Pipeline(h2o).problem()
    problem._states = []
    monkeypatch.setattr(chemistry, "lowest_states", lambda *a, **k: pytest.fail("the exact solve ran"))
    with gk.limits.changed(reference_seconds=1e-9):
        with pytest.raises(gk.SizeLimitError, match=r"exact reference in \(10e, 7o\) refused: .*reference_seconds"):
            problem.lowest_states(1)


def test_qubit_statevectors_are_refused_before_scf(no_scf):
    pipeline = gk.Pipeline(acetylene()).active_space(electrons=6, orbitals=12).trial_state(gk.HardwareEfficient())
    with pytest.raises(gk.SizeLimitError, match="a statevector on 24 qubits .* above the limit of 22 qubits"):
        pipeline.objective()
    sampled = gk.Pipeline(acetylene()).active_space(electrons=6, orbitals=12).estimator(gk.SampledEstimator())
    with pytest.raises(gk.SizeLimitError, match="24 qubits"):
        sampled.run()


def test_small_requests_run_as_before(h2_bohr, h2o):
    result = gk.Pipeline(h2_bohr).run()
    assert result.converged and result.energy == pytest.approx(-1.1373, abs=1e-4)  # Szabo and Ostlund, full CI
    e = gk.cost_estimate(gk.Pipeline(h2o))
    assert e.fits and e.evaluation_seconds < 1 and e.scf_seconds < 1


def test_limits_are_checked_settable_and_restored():
    before = sizing.limits.evaluation_seconds
    with pytest.raises(gk.ComponentError, match="no setting 'evaluation_second'"):
        gk.limits.evaluation_second = 5
    for bad in (-1, 0, float("nan"), "60", True):
        with pytest.raises(gk.ComponentError, match="evaluation_seconds"):
            gk.limits.evaluation_seconds = bad
    with pytest.raises(gk.ComponentError, match="memory_fraction"):
        gk.limits.memory_fraction = 1.5
    with gk.limits.changed(evaluation_seconds=None, memory_bytes=1e9):
        assert gk.limits.evaluation_seconds is None and gk.limits.memory_limit() == 1e9
    assert gk.limits.evaluation_seconds == before and gk.limits.memory_bytes is None


def test_scan_and_grid_are_capped_before_any_scf(no_scf):
    pipeline = gk.Pipeline().trial_state(gk.UCCSD())

    def geometry(r: float) -> gk.MoleculeSpec:
        return diatomic("Li", "H", r)

    with gk.limits.changed(study_seconds=1e-3):
        with pytest.raises(gk.SizeLimitError, match=r"this scan refused before any heavy work: 3 points"):
            pipeline.scan(geometry, [1.4, 1.6, 1.8])
        with pytest.raises(gk.SizeLimitError, match=r"this comparison grid refused .* 2 points"):
            gk.compare(gk.Pipeline(geometry(1.6)), mappings=["jordan-wigner", "parity"])


# options through the pipeline and component names, seeds ---------------------------------------------------------
@pytest.mark.parametrize("build, bad, accepted", [
    (lambda: gk.Pipeline().active_space(elektrons=2), "'elektrons'", "electrons, orbitals"),
    (lambda: gk.Pipeline().estimator("sampled", shotz=10), "'shotz'", "shots"),
    (lambda: gk.Pipeline().mapping("parity", tapering=True), "'tapering'", "taper"),
    (lambda: gk.Pipeline().trial_state("uccsd", k=2), "'k'", "spin_adapted, init"),
    (lambda: gk.Pipeline().minimiser("spsa", seeds=1), "'seeds'", "seed"),
])
def test_unknown_option_names_are_named_with_the_accepted_ones(build, bad, accepted):
    with pytest.raises(gk.GroundkitError, match=f"has no option.*{bad}.*accepted options: .*{accepted}"):
        build()


@pytest.mark.parametrize("build", [lambda s: gk.SampledEstimator(seed=s), lambda s: gk.NoisyEstimator(seed=s),
                                   lambda s: gk.SPSA(seed=s), lambda s: gk.HardwareEfficient(seed=s)])
@pytest.mark.parametrize("seed", [-1, -(2**70), True, 1.5, "7"])
def test_bad_seeds_are_refused(build, seed):
    with pytest.raises(gk.ComponentError, match=r"seed=.*seed must be"):
        build(seed)


def test_numpy_integer_seed_is_accepted():
    assert gk.SampledEstimator(seed=np.int64(3)).seed == 3 and gk.NoisyEstimator(seed=np.uint8(3)).seed == 3
