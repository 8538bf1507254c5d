"""The objective protocol: both objectives implement it, give exact energies only, and hand warm starts over."""

from __future__ import annotations

import numpy as np
import pytest

import groundkit as gk


def h2(r: float = 0.7414) -> gk.MoleculeSpec:
    return gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, r)))  # r_e: NIST CCCBDB (memory)


def pyscf_hf_energy(r: float = 0.7414) -> float:
    from pyscf import gto, scf

    return float(scf.RHF(gto.M(atom=f"H 0 0 0; H 0 0 {r}", basis="sto-3g", verbose=0)).run(conv_tol=1e-12).e_tot)


TRIAL_STATES = [gk.UCCSD(), gk.HardwareEfficient(layers=1, entangler="cz", jitter=0.0)]


@pytest.mark.parametrize("trial_state", TRIAL_STATES, ids=["fermionic", "qubit"])
def test_a_sampled_pipelines_objective_refuses_to_pass_exact_energies_off_as_estimates(trial_state):
    pipeline = gk.Pipeline(h2()).trial_state(trial_state).estimator(gk.SampledEstimator(shots=2000, seed=5))
    objective = pipeline.objective()
    theta = np.zeros(objective.n_parameters)  # the Hartree-Fock determinant for both states
    with pytest.raises(gk.ComponentError, match=r"pipeline\.measurement\(\)\.estimate\(theta\)"):
        objective.estimate(theta)
    value, stderr = pipeline.measurement().estimate(theta)
    hf = pyscf_hf_energy()  # PySCF (reference library)
    assert objective.energy(theta) == pytest.approx(hf, abs=1e-9)
    assert 1e-4 < stderr < 0.05 and abs(value - hf) < 5 * stderr  # a sample, with its error


def test_an_exact_pipelines_objective_refuses_too():
    objective = gk.Pipeline(h2()).objective()
    with pytest.raises(gk.ComponentError, match="exact energies only"):
        objective.estimate(objective.initial_parameters())


def test_objectives_an_adaptive_run_grows_implement_the_protocol():
    from groundkit.adaptive import grow
    from groundkit.energy_surface import EnergySurface

    assert all(isinstance(gk.Pipeline(h2()).trial_state(t).objective(), EnergySurface) for t in TRIAL_STATES)
    for pool in ("singles-doubles", "qubit"):
        growth = grow(gk.Pipeline(h2()).trial_state(gk.Adaptive(pool=pool)))
        assert isinstance(growth.objective, EnergySurface)


def test_qubit_objectives_reuse_parameters_and_refuse_other_handovers():
    near, far = (gk.Pipeline(h2(r)).trial_state(gk.HardwareEfficient(layers=1)).objective() for r in (0.70, 0.80))
    theta = np.linspace(-0.3, 0.3, near.n_parameters)
    start = far.warm_start(h2(0.70), near.handover(theta))
    assert start.note.startswith("warm") and start.orbital_match is None
    np.testing.assert_array_equal(start.parameters, theta)
    fermionic = gk.Pipeline(h2(0.70)).objective()
    cold = far.warm_start(h2(0.70), fermionic.handover(fermionic.initial_parameters()))
    assert cold.parameters is None and cold.note.startswith("cold (") and "orbital-matching" in cold.note
    narrow = gk.Pipeline(h2(0.80)).trial_state(gk.HardwareEfficient(layers=2)).objective()
    assert narrow.warm_start(h2(0.70), near.handover(theta)).parameters is None  # other parameter count


def test_fermionic_objectives_match_orbitals_and_refuse_parameter_reuse():
    from groundkit.energy_surface import WarmStart

    near, far = (gk.Pipeline(h2(r)) for r in (0.70, 0.80))
    solved = near.run()
    start = far.objective().warm_start(h2(0.70), near.objective().handover(solved.parameters))
    assert isinstance(start, WarmStart) and start.note.startswith("warm (3/3 parameters carried")
    assert 0.9 < start.orbital_match <= 1 + 1e-9
    # the carried start is close to the far point's minimum and much closer than the Hartree-Fock start
    lowest = far.run().energy
    warm, cold = far.objective().energy(start.parameters), far.objective().energy(np.zeros(3))
    assert warm - lowest < 0.1 * (cold - lowest)
    qubit = gk.Pipeline(h2(0.70)).trial_state(gk.HardwareEfficient(layers=1)).objective()
    refused = far.objective().warm_start(h2(0.70), qubit.handover(np.zeros(qubit.n_parameters)))
    assert refused.parameters is None and "parameter-reuse" in refused.note
