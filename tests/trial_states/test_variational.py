"""Property: for any parameters, every built-in trial state's energy lies above the exact reference."""

import math

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from groundkit.objective import Objective
from groundkit.trial_states import UCCSD, ExcitationList, PairDoubles, ReferenceDeterminant, UpCCGSD

MOLECULES = ["h2", "lih", "h4", "h2o_cas44", "nh", "oh"]
TRIAL_STATES = [
    ReferenceDeterminant(),
    UCCSD(),
    UCCSD(spin_adapted=True),
    PairDoubles(),
    UpCCGSD(k=1),
    UpCCGSD(k=2),
    ExcitationList([((2,), (0,)), ((3, 2), (1, 0)), ((3,), (1,)), ((2,), (0,))]),
]
CASES = [
    (m, t) for m in MOLECULES for t in TRIAL_STATES
    if not (m in ("nh", "oh") and t == UCCSD(spin_adapted=True))
]


@pytest.mark.parametrize("name, trial", CASES, ids=[f"{m}-{t!r}" for m, t in CASES])
@settings(max_examples=20, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(data=st.data())
def test_energy_is_above_the_exact_reference(get_problem, name, trial, data):
    p = get_problem(name)
    objective = Objective(p, trial)
    theta = np.array(
        data.draw(
            st.lists(
                st.floats(-math.pi, math.pi, allow_nan=False),
                min_size=objective.n_parameters,
                max_size=objective.n_parameters,
            )
        )
    )
    state = objective.state(theta)
    assert abs(np.linalg.norm(state) - 1.0) < 1e-12
    assert objective.energy(theta) >= p.reference.energy - 1e-10  # PySCF (reference library) CASCI ground energy
