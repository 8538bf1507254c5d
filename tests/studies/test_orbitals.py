import numpy as np
import pytest

import groundkit as gk
from groundkit.studies.orbitals import Handover, OrbitalMatch, active_orbitals, match_orbitals, transfer_parameters
from groundkit.studies.work import map_sequence

from .helpers import h2_631g, pyscf_fci_curve


def _random_orbitals(n: int, seed: int) -> np.ndarray:
    q, _ = np.linalg.qr(np.random.default_rng(seed).normal(size=(n, n)))
    return q


def test_match_finds_permutation_and_signs():
    old = _random_orbitals(5, seed=3)
    new = old[:, [0, 2, 1, 3, 4]] * np.array([1, -1, 1, 1, -1])
    match = match_orbitals(old, new, np.eye(5))  # orthonormal AOs: the cross overlap is the identity
    assert match.old_of_new == (0, 2, 1, 3, 4)
    assert match.signs == (1, -1, 1, 1, -1)
    assert match.quality == pytest.approx(1.0)
    assert not match.is_identity


def test_transfer_relabels_indices_and_multiplies_phases():
    # old: single 0a -> 2a (angle 0.1), double 0a0b -> 2a2b (angle 0.2); new orbital 1 is old orbital 2, sign -1
    handover = Handover(orbitals=np.eye(3), excitations=(((4,), (0,)), ((4, 5), (1, 0))), parameter_index=(0, 1),
                        scale=(1.0, 1.0), parameters=np.array([0.1, 0.2]))
    match = OrbitalMatch(old_of_new=(0, 2, 1), signs=(1, -1, 1), overlaps=(1.0, 1.0, 1.0))
    new_excitations = [((2, 3), (1, 0)), ((2,), (0,)), ((4,), (0,))]
    theta, carried = transfer_parameters(handover, match, new_excitations, (0, 1, 2), (1.0, 1.0, 1.0), 3)
    # the single touches one flipped spin orbital (sign -1); the double touches two (sign +1);
    # the new 0a -> 4a has no counterpart and starts at zero
    np.testing.assert_allclose(theta, [0.2, -0.1, 0.0])
    assert carried == 2


def test_transfer_follows_operator_order_and_sharing():
    handover = Handover(orbitals=np.eye(2), excitations=(((2, 3), (1, 0)),), parameter_index=(0,), scale=(1.0,),
                        parameters=np.array([0.3]))
    identity = OrbitalMatch(old_of_new=(0, 1), signs=(1, 1), overlaps=(1.0, 1.0))
    # the same double written with its creators swapped is minus the operator: the angle changes sign;
    # a scale of 2 halves the parameter
    theta, _ = transfer_parameters(handover, identity, [((3, 2), (1, 0))], (0,), (2.0,), 1)
    np.testing.assert_allclose(theta, [-0.15])


@pytest.fixture(scope="module")
def h2_631g_solution():
    pipeline = gk.Pipeline(h2_631g(0.74)).trial_state(gk.UCCSD())
    result = pipeline.run()
    return pipeline, result


def test_deliberately_sign_flipped_orbitals_are_undone(h2_631g_solution):
    pipeline, result = h2_631g_solution
    objective = pipeline.objective()
    plan = objective.plan
    flipped_orbital = 2
    # the same state described over orbitals whose orbital 2 has the opposite sign: every excitation that
    # touches that orbital an odd number of times changes sign (worked out by hand here)
    odd = np.array([sum(p // 2 == flipped_orbital for p in e.creators + e.annihilators) % 2 for e in plan.excitations])
    theta_flipped = np.where(odd == 1, -result.parameters, result.parameters)
    orbitals = active_orbitals(objective.problem)
    orbitals[:, flipped_orbital] *= -1
    handover = Handover(orbitals=orbitals, excitations=tuple((e.creators, e.annihilators) for e in plan.excitations),
                        parameter_index=plan.parameter_index, scale=plan.scale, parameters=theta_flipped)
    from groundkit.chemistry import cross_overlap

    molecule = pipeline.components["molecule"]
    match = match_orbitals(handover.orbitals, active_orbitals(objective.problem), cross_overlap(molecule, molecule))
    assert match.signs[flipped_orbital] == -1 and sum(s < 0 for s in match.signs) == 1
    theta, carried = transfer_parameters(handover, match, [(e.creators, e.annihilators) for e in plan.excitations],
                                         plan.parameter_index, plan.scale, plan.n_parameters)
    assert carried == plan.n_parameters
    np.testing.assert_allclose(theta, result.parameters, atol=1e-14)
    assert objective.energy(theta) == pytest.approx(result.energy, abs=1e-12)
    # reusing the flipped parameters without matching would start elsewhere
    assert objective.energy(theta_flipped) - result.energy > 1e-6


def test_warm_start_converges_to_the_same_energy_in_fewer_iterations():
    pipeline = gk.Pipeline().trial_state(gk.UCCSD())
    warm = pipeline.scan(h2_631g, [0.74, 0.80])
    cold = pipeline.scan(h2_631g, [0.74, 0.80], warm_start=False)
    w, c = warm.points[1], cold.points[1]
    assert w.start.startswith("warm") and c.start == "cold"
    assert w.result.energy == pytest.approx(c.result.energy, abs=1e-8)
    # two electrons: UCCSD is exact (textbook); PySCF FCI computed here on the test's own molecule
    (exact,) = pyscf_fci_curve(np.array([0.80]), basis="6-31g")
    assert w.result.energy == pytest.approx(exact, abs=1e-8)  # PySCF FCI (reference library)
    assert w.result.converged and c.result.converged
    assert w.result.iterations < c.result.iterations
    assert 0.9 < w.orbital_match <= 1.0 + 1e-9


def test_map_sequence_keeps_order_and_multiplies_phases():
    data = Handover(orbitals=np.eye(3), excitations=(((4,), (0,)), ((5, 4), (1, 0))), parameter_index=(0, 1),
                    scale=(1.0, 1.0), parameters=np.array([0.1, 0.2]))
    match = OrbitalMatch(old_of_new=(0, 2, 1), signs=(1, -1, 1), overlaps=(1.0, 1.0, 1.0))
    sequence, angles = map_sequence(data, match)
    assert sequence == [((2,), (0,)), ((3, 2), (1, 0))]
    np.testing.assert_allclose(angles, [-0.1, 0.2])


def test_an_adaptive_scan_starts_each_point_from_the_grown_sequence():
    from groundkit.adaptive import Adaptive

    pipeline = gk.Pipeline().trial_state(Adaptive())
    warm = pipeline.scan(h2_631g, [0.74, 0.80])
    cold = pipeline.scan(h2_631g, [0.74, 0.80], warm_start=False)
    w, c = warm.points[1], cold.points[1]
    assert w.start.startswith("warm") and "operators carried" in w.start
    assert w.result.energy == pytest.approx(c.result.energy, abs=1e-8)
    assert w.result.iterations < c.result.iterations
