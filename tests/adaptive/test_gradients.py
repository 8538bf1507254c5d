"""Pool gradients: 2<H psi|G_k psi> for all candidates at once equals central differences of the energy."""

from __future__ import annotations

import numpy as np
import pytest

from groundkit.adaptive import DeterminantPoolEngine, GeneralisedPool, SinglesDoublesPool
from groundkit.objective import Objective
from groundkit.sector.space import lowest_strings
from groundkit.trial_states import ExcitationList

STEP = 1e-5  # radians


def central_differences(problem, sequence, parameters, operator) -> float:
    """dE/dtheta of ``operator`` appended to ``sequence`` at theta = 0, by central differences."""
    objective = Objective(problem, ExcitationList(list(sequence) + [operator]))
    plus, minus = np.append(parameters, STEP), np.append(parameters, -STEP)
    return (objective.energy(plus) - objective.energy(minus)) / (2 * STEP)


@pytest.mark.parametrize("name, pool", [("h4", SinglesDoublesPool()), ("h4", GeneralisedPool()),
                                        ("lih", SinglesDoublesPool()), ("nh", SinglesDoublesPool())])
def test_pool_gradients_match_central_differences(get_problem, name, pool):
    problem = get_problem(name)  # PySCF integrals (tests/sector/engine_problems.py)
    reference = lowest_strings(problem.n_alpha, problem.n_beta)
    engine = DeterminantPoolEngine(problem, pool.checked_candidates(problem, reference), reference)
    rng = np.random.default_rng(11)
    sequence = [engine.operators[k] for k in rng.choice(len(engine), size=3, replace=False)]
    parameters = rng.uniform(-0.4, 0.4, size=3)
    objective = Objective(problem, engine.trial_state(sequence))
    gradients = engine.gradients(objective, parameters)
    picks = rng.choice(len(engine), size=min(8, len(engine)), replace=False)
    for k in picks:
        expected = central_differences(problem, sequence, parameters, engine.operators[k])
        assert gradients[k] == pytest.approx(expected, abs=1e-8)
    assert np.linalg.norm(gradients) > 1e-3  # the check is not trivially zero


def test_pool_gradients_at_the_reference_are_twice_the_couplings(get_problem):
    problem = get_problem("h2")
    reference = lowest_strings(1, 1)
    engine = DeterminantPoolEngine(problem, SinglesDoublesPool().checked_candidates(problem, reference), reference)
    objective = Objective(problem, engine.trial_state([]))
    gradients = engine.gradients(objective, np.zeros(0))
    double = engine.operators.index(((2, 3), (1, 0)))
    # d/dtheta E at 0 = 2 <D|H|HF> (up to the sign of tau on HF), and <D|H|HF> = K_12 = (12|12) for minimal-basis H2
    # (Szabo and Ostlund, Modern Quantum Chemistry, ch. 4, the two-determinant CI matrix); integrals from PySCF
    assert abs(gradients[double]) == pytest.approx(2 * abs(problem.h2[0, 1, 0, 1]), rel=1e-10)
    singles = [k for k, e in enumerate(engine.operators) if e.rank == 1]
    assert np.allclose(gradients[singles], 0.0, atol=1e-10)  # Brillouin's theorem for the RHF determinant
