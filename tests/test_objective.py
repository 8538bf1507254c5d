import math

import numpy as np
import pytest
import scipy.optimize

import groundkit.objective as objective_module
from groundkit.errors import ComponentError, ParameterError, SizeLimitError
from groundkit.objective import Objective
from groundkit.sector.space import Sector
from groundkit.trial_states import UCCSD, ExcitationList, ReferenceDeterminant, UpCCGSD
from tests.outside_references import pyscf_exact, water
from tests.sector.engine_problems import problem


@pytest.fixture(scope="module")
def lih_uccsd():
    return Objective(problem("lih"), UCCSD())


def test_sizes_and_labels(lih_uccsd):
    assert lih_uccsd.n_parameters == 92 == len(lih_uccsd.parameter_labels)
    assert lih_uccsd.parameter_labels[0] == "0a,1a->2a,3a"
    assert "92 parameters" in repr(lih_uccsd) and "225 determinants" in repr(lih_uccsd)


def test_initial_parameters_are_a_fresh_copy(lih_uccsd):
    start = lih_uccsd.initial_parameters()
    start[:] = 1.0
    assert np.all(lih_uccsd.initial_parameters() == 0.0)


def test_reference_energy_and_state(lih_uccsd):
    p = problem("lih")
    zero = np.zeros(lih_uccsd.n_parameters)
    assert abs(lih_uccsd.energy(zero) - p.hf_energy) < 1e-10  # PySCF (reference library) RHF e_tot
    energy, gradient = lih_uccsd.energy_and_gradient(zero)
    assert abs(energy - p.hf_energy) < 1e-10
    assert np.abs(gradient).max() > 1e-3
    assert lih_uccsd.state(zero)[0, 0] == 1.0


def test_energy_and_gradient_agree_with_energy(lih_uccsd):
    theta = np.random.default_rng(4).uniform(-0.5, 0.5, lih_uccsd.n_parameters)
    energy, gradient = lih_uccsd.energy_and_gradient(theta)
    assert abs(energy - lih_uccsd.energy(theta)) < 1e-12
    h = 1e-5
    for k in range(0, lih_uccsd.n_parameters, 9):
        step = np.zeros_like(theta)
        step[k] = h
        numeric = (lih_uccsd.energy(theta + step) - lih_uccsd.energy(theta - step)) / (2 * h)
        assert abs(numeric - gradient[k]) < 1e-6


def test_shared_parameters_sum_their_derivatives():
    p = problem("h4")
    shared, free = Objective(p, UCCSD(spin_adapted=True)), Objective(p, UCCSD())
    theta = np.random.default_rng(8).uniform(-0.4, 0.4, shared.n_parameters)
    angles = shared.plan.angles(theta)
    assert abs(shared.energy(theta) - free.energy(angles)) < 1e-12
    _, g_shared = shared.energy_and_gradient(theta)
    _, g_free = free.energy_and_gradient(angles)
    np.testing.assert_allclose(shared.plan.parameter_gradient(g_free), g_shared, atol=1e-12)


@pytest.mark.parametrize(
    "theta, words",
    [
        (np.zeros(91), r"shape \(91,\); expected 92 values"),
        (np.zeros((2, 46)), r"shape \(2, 46\); expected 92 values"),
        (np.r_[np.zeros(91), np.nan], "parameter 91 is nan; expected 92 finite values"),
        (np.r_[np.inf, np.zeros(91)], "parameter 0 is inf; expected 92 finite values"),
        (["a"] * 92, "not numbers; expected 92 finite values"),
        (None, "expected 92"),
    ],
)
def test_bad_parameters(lih_uccsd, theta, words):
    for call in (lih_uccsd.energy, lih_uccsd.energy_and_gradient, lih_uccsd.state, lih_uccsd.amplitudes):
        with pytest.raises(ParameterError, match=words):
            call(theta)


def test_amplitudes_are_labelled_sorted_and_interleaved():
    p = problem("nh")
    objective = Objective(p, UCCSD())
    theta = np.random.default_rng(1).uniform(-0.3, 0.3, objective.n_parameters)
    amplitudes = objective.amplitudes(theta, threshold=0.0)
    assert len(amplitudes) == 120
    weights = [abs(v) for v in amplitudes.values()]
    assert weights == sorted(weights, reverse=True)
    assert abs(sum(w * w for w in weights) - 1.0) < 1e-12
    sector = Sector(p.n_orbitals, p.n_alpha, p.n_beta)
    signed = objective.state(theta) * sector.interleaved_signs()
    ia, ib = sector.index(0b011111, 0b000111)
    assert amplitudes["222aa0"] == pytest.approx(signed[ia, ib], abs=1e-15)
    assert amplitudes["222aa0"] == pytest.approx(objective.amplitudes(theta)["222aa0"])
    hf = Objective(p, ReferenceDeterminant()).amplitudes([])
    assert list(hf) == ["222aa0"] and abs(hf["222aa0"]) == 1.0


def test_spin_square_of_the_trial_state():
    objective = Objective(problem("oh"), UpCCGSD(k=1))
    assert abs(objective.spin_square(np.zeros(objective.n_parameters)) - 0.75) < 1e-12  # S(S+1) for a doublet
    # equal alpha and beta singles and pair moves commute with S^2; unequal alpha and beta singles do not
    assert abs(objective.spin_square(np.full(objective.n_parameters, 0.3)) - 0.75) < 1e-12
    theta = np.random.default_rng(0).uniform(-0.5, 0.5, objective.n_parameters)
    assert objective.spin_square(theta) > 0.75 + 1e-6


def test_tables_are_built_once(monkeypatch):
    calls = []
    original = objective_module.excitation_tables

    def counting(*args, **kwargs):
        calls.append(1)
        return original(*args, **kwargs)

    monkeypatch.setattr(objective_module, "excitation_tables", counting)
    objective = Objective(problem("h4"), UCCSD())
    theta = np.full(objective.n_parameters, 0.1)
    for _ in range(3):
        objective.energy(theta)
        objective.energy_and_gradient(theta)
    assert len(calls) == 1


def test_not_a_fermionic_trial_state():
    with pytest.raises(ComponentError, match="not a fermionic TrialState"):
        Objective(problem("h2"), "UCCSD")


def test_size_limit():
    with pytest.raises(SizeLimitError, match="225 determinants"):
        Objective(problem("lih"), UCCSD(), max_determinants=100)


def test_excitation_list_energy_matches_the_same_uccsd_parameters():
    p = problem("h2")
    uccsd = Objective(p, UCCSD())
    custom = Objective(p, ExcitationList(list(uccsd.plan.excitations)))
    theta = np.array([0.3, -0.2, 0.1])
    assert abs(uccsd.energy(theta) - custom.energy(theta)) < 1e-14
    # One double on H2/STO-3G spans the two singlet determinants: the minimum is full CI.
    double = Objective(p, ExcitationList([((2, 3), (1, 0))]))
    result = scipy.optimize.minimize_scalar(lambda t: double.energy([t]), bounds=(-math.pi / 2, math.pi / 2),
                                            method="bounded", options={"xatol": 1e-10})
    assert abs(result.fun - (-1.137270174660903)) < 1e-8  # PySCF (reference library) FCI at r = 0.7414 A


def test_groundkit_problem_drives_the_engine(h2o):
    import groundkit as gk

    outside = pyscf_exact(water())  # PySCF RHF and full CI of the test's own water molecule (reference library)
    p = gk.build_problem(h2o)
    objective = Objective(p, UCCSD(init="mp2"))
    hf_energy = Objective(p, ReferenceDeterminant()).energy([])
    assert abs(hf_energy - outside.hf) < 1e-9  # PySCF (reference library) RHF e_tot
    assert abs(hf_energy - p.scf_energy) < 1e-9  # internal consistency
    result = scipy.optimize.minimize(objective.energy_and_gradient, objective.initial_parameters(), jac=True,
                                     method="BFGS")
    assert result.success
    assert 0 <= result.fun - outside.exact < 1.6e-3  # PySCF FCI; chemical accuracy: common practice, no single source
    assert outside.exact - outside.hf < -0.04  # PySCF: 50 mHa of correlation, far above the tolerance
