"""Pipeline.run end to end: every minimiser, interruption, immutability, shorthand and bad components."""

import pytest

import groundkit as gk

from . import outside_references as outside
from .conftest import diatomic

CHEMICAL_ACCURACY = 1.6e-3  # Hartree; common practice, no single source
# LiH at 1.5949 Å: r_e as listed by NIST CCCBDB (from memory; Huber-Herzberg via the NIST WebBook: 1.5957 Å)
LIH_ATOM = outside.diatomic("Li", "H", 1.5949)
LIH_WINDOW = (2, 4)  # (electrons, orbitals)
STRETCHED_H2 = 1.5  # angstrom, twice the equilibrium bond: 57 mHa of correlation in 6-31G (PySCF FCI)


@pytest.fixture(scope="module")
def lih_small():
    """LiH (2e, 4o): 8 qubits, the pi pair kept whole (1.8 mHa of correlation: too little to test a minimiser)."""
    return diatomic("Li", "H", 1.5949).pipeline().active_space(electrons=2, orbitals=4)  # LIH_ATOM's r_e


@pytest.fixture(scope="module")
def stretched_h2():
    """H2 in 6-31G at 1.5 angstrom: 8 qubits, 15 UCCSD parameters, correlation energy 57 mHa."""
    return diatomic("H", "H", STRETCHED_H2, basis="6-31g").pipeline()


@pytest.mark.parametrize("minimiser", [
    gk.BFGS(), gk.LBFGSB(), gk.COBYLA(initial_step=0.2, tolerance=1e-5, max_iterations=3000),
    gk.NelderMead(max_iterations=4000), gk.FixedStepDescent(step=0.3), gk.Adam(step=0.05, max_iterations=2000),
    gk.SPSA(seed=3, max_iterations=1500),
])
def test_every_minimiser_reaches_the_exact_reference(stretched_h2, minimiser):
    exact = outside.pyscf_exact(outside.diatomic("H", "H", STRETCHED_H2), "6-31g")  # PySCF RHF and FCI
    assert exact.correlation > 0.05  # PySCF: the test needs a correlation energy far above its tolerances
    result = stretched_h2.minimiser(minimiser).run()
    assert result.converged, result.stop_reason  # the method's own convergence test was met, not a budget
    error = result.energy - exact.exact
    assert error < exact.correlation / 10  # PySCF FCI (reference library): at least 90 % of the correlation
    assert error <= CHEMICAL_ACCURACY  # two electrons: UCCSD can reach full CI (textbook); 1.6 mHa common practice
    assert error >= -1e-10  # variational principle against PySCF FCI


def test_bfgs_converges_and_records_history(lih_small):
    result = lih_small.run()
    assert result.converged
    assert len(result.history) == result.iterations > 0
    assert result.history.energies[-1] == pytest.approx(result.energy, abs=1e-10)
    assert all(g is not None for g in result.history.gradient_norms)
    exact = outside.pyscf_exact(LIH_ATOM, active=LIH_WINDOW).exact  # PySCF CASCI (2e, 4o) (reference library)
    assert result.energy == pytest.approx(exact, abs=1e-6)  # UCCSD is exact for two electrons (textbook)
    assert result.error == pytest.approx(result.energy - exact, abs=1e-9)  # the reported error, against PySCF


def test_interrupt_from_callback_returns_partial_result(lih_small):
    seen = []

    def stop_after_two(record):
        seen.append(record.iteration)
        if len(seen) == 2:
            raise KeyboardInterrupt

    result = lih_small.minimiser(gk.FixedStepDescent(step=0.1, max_iterations=500)).run(callback=stop_after_two)
    assert not result.converged
    assert "interrupt" in result.stop_reason.lower()
    assert len(result.history) >= 1
    assert result.energy <= result.history.energies[0] + 1e-12


def test_callback_once_per_iteration(lih_small):
    calls = []
    result = lih_small.minimiser(gk.COBYLA()).run(callback=lambda r: calls.append(r.iteration))
    assert calls == list(range(1, len(calls) + 1))
    assert len(calls) == len(result.history)


def test_chaining_never_mutates(lih_small):
    p = lih_small
    q = p.mapping("parity")
    assert p.components["mapping"] is None and q.components["mapping"] == gk.QubitMapping("parity")
    r = q.trial_state(gk.PairDoubles()).minimiser("cobyla")
    assert q.components["trial_state"] is None and r.components["minimiser"] == gk.COBYLA()
    assert "PairDoubles" in repr(r) and "parity" in repr(r)


def test_swapping_downstream_components_reuses_the_chemistry(lih_small):
    a = lih_small.minimiser(gk.BFGS())
    b = lih_small.minimiser(gk.COBYLA()).mapping("bravyi-kitaev")
    assert a.problem() is b.problem()
    assert a.objective() is b.objective()
    assert lih_small.trial_state(gk.PairDoubles()).problem() is a.problem()


def test_hartree_fock_trial_state_has_nothing_to_minimise(lih_small):
    result = lih_small.trial_state("hartree-fock").run()
    assert result.converged and result.iterations == 0
    assert result.energy == pytest.approx(outside.pyscf_exact(LIH_ATOM, active=LIH_WINDOW).hf, abs=1e-8)  # PySCF RHF
    assert result.energy == pytest.approx(result.baselines["hf"], abs=1e-8)  # internal consistency


def test_unknown_component_names_list_the_accepted_ones(lih_small):
    with pytest.raises(gk.ComponentError, match="jordan-wigner"):
        lih_small.mapping("fancy-wigner")
    with pytest.raises(gk.ComponentError, match="uccsd"):
        lih_small.trial_state("ucc-everything")
    with pytest.raises(gk.ComponentError, match="bfgs"):
        lih_small.minimiser("newton-raphson")
    with pytest.raises(gk.ComponentError, match="exact"):
        lih_small.estimator("psychic")


@pytest.mark.parametrize("make", [lambda: gk.FixedStepDescent(step=-0.1), lambda: gk.BFGS(max_iterations=0),
                                  lambda: gk.Adam(step=0.0), lambda: gk.COBYLA(max_iterations=-3)])
def test_options_out_of_range_are_refused_at_construction(make):
    with pytest.raises(gk.ComponentError):
        make()


def test_initial_parameters_start_the_run_and_are_checked(lih_small):
    converged = lih_small.run()
    again = lih_small.run(initial_parameters=converged.parameters)
    assert again.iterations <= 2 and again.energy == pytest.approx(converged.energy, abs=1e-9)
    with pytest.raises(gk.ParameterError, match="expected"):
        lih_small.run(initial_parameters=[0.0])
