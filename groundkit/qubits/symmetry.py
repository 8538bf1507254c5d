"""Trial states inside a tapered symmetry sector: keep only the excitations that conserve the symmetries."""

from __future__ import annotations

from typing import Any


def sector_plan(trial_state: Any, encoding: Any) -> Any:
    """The fermionic trial state's plan on ``encoding.problem``, restricted to symmetry-conserving excitations
    when the encoding is tapered (unchanged otherwise).

    Tapering fixes the eigenvalues of the Hamiltonian's Z2 symmetries (electron-number parities and, for
    symmetric molecules, point-group symmetries); an excitation between orbitals of different symmetry would leave
    that sector, so it is dropped, and the parameter count can be lower than on the untapered register.
    """
    plan = trial_state.plan(encoding.problem)
    if encoding.taper is None:
        return plan
    return plan.restricted([encoding.conserves_symmetry(e) for e in plan.excitations])
