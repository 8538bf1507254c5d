"""The registry: a user's trial state, minimiser, mapping and estimator, each registered by name and used from a
pipeline shorthand, a TOML study file, gk.compare and the explorer; and the registration errors."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np
import openfermion as of
import pytest

import groundkit as gk
from groundkit.constraints import Integer, Interval, Positive, Seed
from groundkit.minimisers import Ending, minimiser_options
from groundkit.studies.toml_file import read_study
from tests import outside_references as outside

H2 = outside.diatomic("H", "H", 0.7414)  # NIST CCCBDB experimental r_e (from memory)
pytestmark = pytest.mark.filterwarnings("ignore::groundkit.DegenerateBoundaryWarning")  # LiH (2e, 3o)


# the user's components ------------------------------------------------------------------------------------------
@dataclass(frozen=True, kw_only=True)
class LowestPairs(gk.TrialState):
    """Pair moves from every doubly occupied orbital into the lowest ``virtuals`` empty orbitals."""

    virtuals: int = 1
    constraints = {"virtuals": Integer(1)}

    def excitations(self, problem: Any) -> list:
        occupied = range(problem.n_beta)
        empty = range(problem.n_alpha, min(problem.n_orbitals, problem.n_alpha + self.virtuals))
        return [((2 * a, 2 * a + 1), (2 * i + 1, 2 * i)) for i in occupied for a in empty]


@minimiser_options
class CoordinateSweep(gk.Minimiser):
    """Try +-step along each parameter in turn; halve the step when no move lowers the energy."""

    uses_gradient = False
    step: float = 0.5
    max_iterations: int = 300
    tolerance: float = 1e-9  # radians: stop when the step falls below it
    constraints = {"step": Positive(unit="radians")}

    def search(self, session: Any, x0: np.ndarray) -> Ending:
        x, energy, step = x0.copy(), session.energy(x0), self.step
        for _ in range(self.max_iterations):
            moved = False
            for k in range(x.size):
                for sign in (1.0, -1.0):
                    trial = x.copy()
                    trial[k] += sign * step
                    value = session.energy(trial)
                    if value < energy:
                        x, energy, moved = trial, value, True
                        break
            session.record(x, energy)
            if not moved:
                step /= 2
                if step < self.tolerance:
                    return Ending(x, energy, True, f"step below tolerance {self.tolerance:g} rad")
        return Ending(x, energy, False, f"max_iterations={self.max_iterations} reached")


def fenwick_matrix(n_modes: int) -> np.ndarray:
    """Bravyi–Kitaev as a Fenwick tree: qubit j holds the parity of modes j + 1 - lowbit(j + 1) ... j
    (Havlicek, Troyer, Whitfield, Phys. Rev. A 95, 032332 (2017), from memory)."""
    matrix = np.zeros((n_modes, n_modes), dtype=np.uint8)
    for j in range(n_modes):
        matrix[j, j + 1 - ((j + 1) & -(j + 1)):j + 1] = 1
    return matrix


@dataclass(frozen=True, repr=False)
class FenwickMapping(gk.LinearMapping):
    """A user's mapping given only by its binary matrix."""

    def basis_matrix(self, n_modes: int) -> np.ndarray:
        return fenwick_matrix(n_modes)


class _Noisy(gk.Measurement):
    exact = False
    provides_gradient = False

    def __init__(self, options: GaussianNoise, objective: Any) -> None:
        self.objective, self.sigma = objective, options.sigma
        self.rng = np.random.default_rng(options.seed)

    def estimate(self, theta: np.ndarray) -> tuple[float, float]:
        return float(self.objective.energy(theta)) + self.sigma * float(self.rng.standard_normal()), self.sigma


@dataclass(frozen=True)
class GaussianNoise(gk.Estimator):
    """Exact energies plus seeded Gaussian noise of standard deviation ``sigma`` (Ha)."""

    sigma: float = 1e-4
    seed: int | None = None
    exact = False
    constraints = {"sigma": Interval(float, 0.0, None, unit="Hartree"), "seed": Seed()}

    def measure(self, objective: Any, encoding: Any = None) -> _Noisy:
        return _Noisy(self, objective)


USER = [("trial_state", "test-lowest-pairs", LowestPairs, "lowest pair moves"),
        ("minimiser", "test-sweep", CoordinateSweep, "coordinate sweep"),
        ("mapping", "test-fenwick", FenwickMapping, "Fenwick tree"),
        ("estimator", "test-noise", GaussianNoise, "Gaussian noise")]


@pytest.fixture(scope="module", autouse=True)
def registered():
    for role, name, cls, label in USER:
        gk.register(role, name, label=label)(cls)
    yield
    for role, name, _, _ in USER:
        gk.unregister(role, name)


@pytest.fixture(scope="module")
def h2() -> gk.Pipeline:
    return gk.Pipeline(gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.7414))))


# shorthands -----------------------------------------------------------------------------------------------------
def test_user_components_by_name_in_a_pipeline(h2):
    p = h2.trial_state("test-lowest-pairs").minimiser("test-sweep", step=0.25).mapping("test-fenwick")
    assert p.components["trial_state"] == LowestPairs()
    assert p.components["minimiser"] == CoordinateSweep(step=0.25)
    assert p.components["mapping"] == FenwickMapping() and p.components["mapping"].name == "test-fenwick"
    assert gk.QubitMapping("test-fenwick", taper=True) == FenwickMapping(taper=True)
    result = p.run()
    assert result.converged
    assert result.energy == pytest.approx(outside.pyscf_exact(H2).exact, abs=1e-9)  # PySCF FCI (reference library)
    noisy = h2.trial_state("test-lowest-pairs").estimator("test-noise", sigma=1e-4, seed=5).minimiser("cobyla").run()
    assert noisy.standard_error == 1e-4
    assert abs(noisy.energy - noisy.exact_energy) < 5e-4  # one fresh estimate: within five standard deviations


def test_user_options_are_checked_by_the_same_mechanism(h2):
    with pytest.raises(gk.ComponentError, match=r"CoordinateSweep\(step=-1\): step must be a finite number > 0 "
                                                r"\(radians\)"):
        h2.minimiser("test-sweep", step=-1)
    with pytest.raises(gk.ComponentError, match=r"LowestPairs has no option 'virtual' \(did you mean 'virtuals'\?\)"
                                                r"; accepted options: virtuals"):
        LowestPairs(virtual=2)
    with pytest.raises(gk.ComponentError, match="has no option 'sigmma'.*accepted options: sigma, seed"):
        h2.estimator("test-noise", sigmma=1.0)
    with pytest.raises(gk.ComponentError, match=r"GaussianNoise\(seed=-3\): seed must be None or an integer >= 0"):
        GaussianNoise(seed=-3)


def test_a_binary_matrix_mapping_equal_to_bravyi_kitaev_gives_openfermions_hamiltonian(h2):
    assert np.array_equal(fenwick_matrix(12), of.bravyi_kitaev_code(12).encoder.toarray())  # OpenFermion
    hamiltonian = h2.mapping("test-fenwick").qubit_hamiltonian()
    expected = of.bravyi_kitaev(of.get_fermion_operator(outside.openfermion_interaction(H2)), n_qubits=4)
    expected.compress(1e-12)
    assert set(hamiltonian.terms) == set(expected.terms)
    for term, coefficient in expected.terms.items():  # OpenFermion's bravyi_kitaev on PySCF integrals
        assert hamiltonian.terms[term] == pytest.approx(coefficient.real, abs=1e-10)


def test_a_binary_matrix_mapping_tapers_and_compiles(lih_small):
    fenwick = lih_small.mapping("test-fenwick", taper=True)
    builtin = lih_small.mapping("bravyi-kitaev", taper=True)
    n = fenwick.encoding().n_qubits
    assert n == builtin.encoding().n_qubits < 6  # internal consistency: the same symmetries are found
    lowest = np.linalg.eigvalsh(of.get_sparse_operator(fenwick.qubit_hamiltonian(), n_qubits=n).toarray())[0]
    exact = outside.pyscf_exact(outside.diatomic("Li", "H", 1.5949), active=(2, 3)).exact
    assert lowest == pytest.approx(exact, abs=1e-9)  # PySCF CASCI(2,3) (reference library)
    theta = np.linspace(0.05, 0.3, fenwick.objective().n_parameters)
    from cirq import Simulator

    state = Simulator(dtype=np.complex128).simulate(fenwick.circuit(theta).circuit).final_state_vector
    energy = float(np.real(np.vdot(state, of.get_sparse_operator(fenwick.qubit_hamiltonian(), n) @ state)))
    assert energy == pytest.approx(fenwick.objective().energy(theta), abs=1e-9)  # Cirq vs the engine: two routes


@pytest.fixture(scope="module")
def lih_small() -> gk.Pipeline:
    lih = gk.MoleculeSpec(symbols=("Li", "H"), coordinates=((0, 0, 0), (0, 0, 1.5949)))  # NIST CCCBDB r_e
    return gk.Pipeline(lih).active_space(electrons=2, orbitals=3)


# TOML, compare, explorer --------------------------------------------------------------------------------------
def test_user_components_from_a_study_file(tmp_path):
    path = tmp_path / "mine.toml"
    path.write_text(
        '[molecule]\nsymbols = ["H", "H"]\ncoordinates = [[0, 0, 0], [0, 0, 0.7414]]\n'
        '[components]\ntrial_state = {name = "test-lowest-pairs", virtuals = 2}\nmapping = "test-fenwick"\n'
        'minimiser = {name = "test-sweep", step = 0.25}\nestimator = {name = "test-noise", sigma = 0.001, seed = 2}\n',
        encoding="utf-8")
    chosen = read_study(path).pipeline.components
    assert chosen["trial_state"] == LowestPairs(virtuals=2) and chosen["mapping"] == FenwickMapping()
    assert chosen["minimiser"] == CoordinateSweep(step=0.25)
    assert chosen["estimator"] == GaussianNoise(sigma=1e-3, seed=2)
    path.write_text(path.read_text().replace("step = 0.25", "stepp = 0.25"), encoding="utf-8")
    with pytest.raises(gk.StudyFileError, match=r"components.minimiser \(line 7\).*no option 'stepp'.*'step'"):
        read_study(path)


def test_user_components_in_a_comparison(h2):
    table = gk.compare(h2, trial_states=["test-lowest-pairs", "uccsd"], minimisers=["test-sweep", "bfgs"],
                       mappings=["test-fenwick"])
    assert len(table) == 4 and table["failure"].isna().all() and table["converged"].all()
    exact = outside.pyscf_exact(H2).exact
    assert np.allclose(table["energy"], exact, atol=1e-8)  # PySCF FCI (reference library)
    assert set(table["minimiser"]) == {"CoordinateSweep()", "BFGS()"}


def test_user_components_in_the_explorer(h2):
    explorer = gk.explore(h2)
    assert dict(explorer.mapping.options)["Fenwick tree"] == "test-fenwick"
    assert dict(explorer.estimator.options)["Gaussian noise"] == "test-noise"
    explorer.mapping.value = "test-fenwick"
    explorer.trial_state.value = dict(explorer.trial_state.options)["lowest pair moves"]
    explorer.minimiser.value = dict(explorer.minimiser.options)["coordinate sweep"]
    explorer.run_button.click()
    assert len(explorer.rows) == 1, explorer.message.value
    row = explorer.rows[0]
    assert row["trial_state"] == "lowest pair moves" and row["minimiser"] == "coordinate sweep"
    assert row["mapping"] == "test-fenwick"
    assert row["energy"] == pytest.approx(outside.pyscf_exact(H2).exact, abs=1e-9)  # PySCF FCI (reference library)
    explorer.estimator.value = "test-noise"
    explorer.seed.value = 4
    assert explorer.configured().components["estimator"] == GaussianNoise(seed=4)  # seed applies; shots does not


def test_a_saved_result_of_user_components_rebuilds_its_pipeline(h2, tmp_path):
    result = h2.trial_state("test-lowest-pairs").mapping("test-fenwick", taper=True).minimiser("test-sweep").run()
    result.save(tmp_path / "mine.json")
    rebuilt = gk.load_result(tmp_path / "mine.json").pipeline()
    assert rebuilt.resolved_components() == h2.trial_state("test-lowest-pairs").mapping(
        "test-fenwick", taper=True).minimiser("test-sweep").resolved_components()
    assert abs(rebuilt.run().energy - result.energy) < 1e-10


# registration ---------------------------------------------------------------------------------------------------
def test_lookups_ignore_case_and_separators_and_suggest():
    assert gk.registry.lookup("trial_state", "Test_Lowest Pairs") is LowestPairs
    assert gk.registry.lookup("trial_state", "LowestPairs") is LowestPairs  # the class name is a name too
    with pytest.raises(gk.ComponentError, match=r"unknown trial state 'test-lowest-pair' \(did you mean "
                                                r"'test-lowest-pairs'\?\); accepted names: .*uccsd"):
        gk.Pipeline().trial_state("test-lowest-pair")
    assert "test-lowest-pairs" in gk.registry.names("trial_state")


def test_registration_errors():
    @dataclass(frozen=True)
    class Other(gk.TrialState):
        def excitations(self, problem):
            return []

    with pytest.raises(gk.ComponentError, match="name 'uccsd' is taken by groundkit.trial_states.uccsd.UCCSD"):
        gk.register("trial_state", "uccsd")(Other)
    with pytest.raises(gk.ComponentError, match="name 'hf' is taken"):  # aliases are names too
        gk.register("trial_state", "mine", aliases=("hf",))(Other)
    with pytest.raises(gk.ComponentError, match="not a minimiser class.*it is a trial state: register it under "
                                                "'trial_state'"):
        gk.register("minimiser", "other")(Other)
    with pytest.raises(gk.ComponentError, match="not a component class"):
        gk.register("trial_state", "plain")(type("Plain", (), {}))
    with pytest.raises(gk.ComponentError, match="unknown role 'trialstate'; accepted roles: active_space, mapping"):
        gk.register("trialstate", "other")
    with pytest.raises(gk.ComponentError, match="already registered as trial_state 'test-lowest-pairs'"):
        gk.register("trial_state", "second-name")(LowestPairs)
    assert gk.registry.entry_of(Other) is None


def test_running_a_registration_again_replaces_the_class():
    """A notebook cell that defines and registers a class, run twice, registers the new definition."""
    made = []
    for _ in range(2):
        @gk.register("trial_state", "test-redefined")
        @dataclass(frozen=True)
        class Redefined(gk.TrialState):
            def excitations(self, problem):
                return []

        made.append(Redefined)
    try:
        assert gk.registry.lookup("trial_state", "test-redefined") is made[1]
    finally:
        gk.unregister("trial_state", "test-redefined")


def test_an_unregistered_component_runs_but_cannot_be_rebuilt(h2, tmp_path):
    @dataclass(frozen=True)
    class Unnamed(LowestPairs):
        pass

    result = h2.trial_state(Unnamed()).run()
    assert result.provenance["components"]["trial_state"] is None
    assert "Unnamed is not registered" in result.provenance["component_notes"]["trial_state"]
    result.save(tmp_path / "unnamed.json")
    with pytest.raises(gk.ResultFileError, match="trial state was not recorded.*Unnamed is not registered"):
        gk.load_result(tmp_path / "unnamed.json").pipeline()


def test_two_classes_of_one_class_name_from_different_places_can_both_register():
    @dataclass(frozen=True, kw_only=True)
    class LowestPairs(gk.TrialState):  # the same class name as the module's registered LowestPairs
        def excitations(self, problem):
            return []

    gk.register("trial_state", "test-other-pairs")(LowestPairs)
    try:
        assert gk.registry.lookup("trial_state", "test-other-pairs") is LowestPairs
        assert gk.registry.lookup("trial_state", "LowestPairs") is globals()["LowestPairs"]  # the first keeps it
    finally:
        gk.unregister("trial_state", "test-other-pairs")
    assert gk.registry.lookup("trial_state", "LowestPairs") is globals()["LowestPairs"]
