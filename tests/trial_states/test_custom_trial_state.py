"""The worked custom trial state of docs/trial_states.md, read from the document and run."""

import re
from pathlib import Path

import pytest
import scipy.optimize

from groundkit.errors import ComponentError
from groundkit.objective import Objective
from groundkit.trial_states import ExcitationList

DOC = Path(__file__).parents[2] / "docs" / "trial_states.md"


@pytest.fixture(scope="module")
def frontier_pairs():
    text = DOC.read_text()
    section = text[text.index("### Worked example"):]
    code = re.search(r"```python\n(.*?)```", section, re.S).group(1)
    namespace: dict = {}
    exec(compile(code, str(DOC), "exec"), namespace)
    return namespace["FrontierPairs"]


def test_declares_its_window(frontier_pairs, get_problem):
    plan = frontier_pairs(width=2).plan(get_problem("h2o"))
    assert plan.n_parameters == 8 and len(plan.excitations) == 12
    assert plan.labels[0] == "3a,3b->5a,5b"
    assert repr(frontier_pairs(width=1, start=0.1)) == "FrontierPairs(width=1, start=0.1)"
    assert frontier_pairs(width=2) == frontier_pairs(width=2) != frontier_pairs(width=3)


def test_bad_width(frontier_pairs):
    with pytest.raises(ComponentError, match="width=0"):
        frontier_pairs(width=0)


def test_minimises_between_hartree_fock_and_the_reference(frontier_pairs, get_problem):
    p = get_problem("h2o")
    objective = Objective(p, frontier_pairs(width=2, start=0.05))
    start = objective.initial_parameters()
    assert start.tolist() == [0.05] * 4 + [0.0] * 4
    result = scipy.optimize.minimize(objective.energy_and_gradient, start, jac=True, method="BFGS")
    assert p.reference.energy < result.fun < p.hf_energy - 1e-3  # PySCF (reference library) CASCI and RHF
    same = Objective(p, ExcitationList(list(objective.plan.excitations)))
    assert abs(same.energy(objective.plan.angles(result.x)) - result.fun) < 1e-12
    largest = next(iter(objective.amplitudes(result.x)))
    assert largest == "2222200"
