"""Minimisers on analytic functions whose minima are known in closed form, plus records, stops and bad options."""

from __future__ import annotations

import dataclasses
import json

import numpy as np
import pytest

from groundkit.errors import ComponentError, ParameterError
from groundkit.minimisers import (
    BFGS,
    BUILT_IN,
    COBYLA,
    LBFGSB,
    MINIMISER_NAMES,
    SPSA,
    Adam,
    Ending,
    FixedStepDescent,
    IterationRecord,
    Minimiser,
    MinimiserOutcome,
    NelderMead,
    minimiser_from_name,
    minimiser_options,
)

# --- analytic test functions -----------------------------------------------------------------------------------

HESSIAN = np.array([[2.0, 0.3, 0.0], [0.3, 1.0, 0.2], [0.0, 0.2, 0.5]])  # symmetric positive definite
MINIMUM = np.array([0.4, -0.3, 0.7])
E_MIN = -1.25


def quadratic(x: np.ndarray) -> float:
    """E_MIN + (x - MINIMUM)^T H (x - MINIMUM) / 2: minimum E_MIN at MINIMUM (analytic)."""
    d = x - MINIMUM
    return float(E_MIN + 0.5 * d @ HESSIAN @ d)


def quadratic_and_gradient(x: np.ndarray) -> tuple[float, np.ndarray]:
    return quadratic(x), HESSIAN @ (x - MINIMUM)


WEIGHTS = np.array([0.8, 0.5, 0.3, 0.6])
PHASES = np.array([0.6, -0.4, 1.0, 0.2])


def rotations(theta: np.ndarray) -> float:
    """-0.5 - sum_i w_i cos(theta_i - phi_i), like a product of independent rotations: minimum -0.5 - sum w at phi
    (analytic)."""
    return float(-0.5 - WEIGHTS @ np.cos(theta - PHASES))


def rotations_and_gradient(theta: np.ndarray) -> tuple[float, np.ndarray]:
    return rotations(theta), WEIGHTS * np.sin(theta - PHASES)


ROTATIONS_MIN = -0.5 - WEIGHTS.sum()


def rosenbrock(x: np.ndarray) -> float:
    """Rosenbrock (Comput. J. 3, 175 (1960)): minimum 0 at (1, 1) (analytic)."""
    return float((1.0 - x[0]) ** 2 + 100.0 * (x[1] - x[0] ** 2) ** 2)


def rosenbrock_and_gradient(x: np.ndarray) -> tuple[float, np.ndarray]:
    g = np.array([-2.0 * (1.0 - x[0]) - 400.0 * x[0] * (x[1] - x[0] ** 2), 200.0 * (x[1] - x[0] ** 2)])
    return rosenbrock(x), g


# Per method: settings that suit it, and how close (Hartree) it must come to an analytic minimum.
CASES = [
    (FixedStepDescent(step=0.5), 1e-9),
    (Adam(step=0.05), 1e-9),
    (BFGS(), 1e-10),
    (LBFGSB(), 1e-10),
    (COBYLA(), 1e-9),
    (NelderMead(), 1e-7),
    (SPSA(seed=11, a=1.0, max_iterations=800), 1e-4),  # a gain suited to curvatures near 1
]
IDS = [type(m).__name__ for m, _ in CASES]


def gentle(minimiser: Minimiser) -> Minimiser:
    """Fixed-gain methods with gains small enough for Rosenbrock's curvature (about 1000 near the start)."""
    if isinstance(minimiser, FixedStepDescent):
        return dataclasses.replace(minimiser, step=5e-4)
    if isinstance(minimiser, SPSA):
        return dataclasses.replace(minimiser, a=0.01)
    return minimiser


def run(minimiser: Minimiser, energy, gradient, x0, **kwargs) -> MinimiserOutcome:
    return minimiser.minimise(energy, np.asarray(x0, dtype=float), energy_and_gradient=gradient, **kwargs)


# --- reaching known minima -------------------------------------------------------------------------------------


@pytest.mark.parametrize(("minimiser", "tol"), CASES, ids=IDS)
def test_reaches_quadratic_minimum(minimiser, tol):
    out = run(minimiser, quadratic, quadratic_and_gradient, np.zeros(3))
    assert out.converged, out.stop_reason
    assert abs(out.energy - E_MIN) < tol  # analytic
    assert out.energy == pytest.approx(quadratic(out.parameters), abs=1e-12)


@pytest.mark.parametrize(("minimiser", "tol"), CASES, ids=IDS)
def test_reaches_rotation_minimum(minimiser, tol):
    out = run(minimiser, rotations, rotations_and_gradient, np.zeros(4))
    assert out.converged, out.stop_reason
    assert abs(out.energy - ROTATIONS_MIN) < tol  # analytic


@pytest.mark.parametrize("minimiser", [BFGS(), LBFGSB(), NelderMead()], ids=str)  # COBYLA crawls along the valley
def test_rosenbrock(minimiser):
    out = run(minimiser, rosenbrock, rosenbrock_and_gradient, [-1.2, 1.0])
    assert out.converged, out.stop_reason
    np.testing.assert_allclose(out.parameters, [1.0, 1.0], atol=2e-3)  # analytic minimum
    assert out.energy < 1e-6


def test_finite_difference_fallback_matches_gradient_run():
    out = BFGS(difference_step=1e-5).minimise(quadratic, np.zeros(3))
    assert out.converged
    assert abs(out.energy - E_MIN) < 1e-9  # analytic
    assert out.evaluations > 7 * len(out.iterations)  # 2n + 1 energies per gradient


def test_lbfgsb_bounds_stop_on_the_box():
    # minimum of the quadratic lies at 0.7 in the last coordinate; the box [-0.5, 0.5] holds it at 0.5
    out = LBFGSB(bounds=(-0.5, 0.5)).minimise(quadratic, np.zeros(3), energy_and_gradient=quadratic_and_gradient)
    assert out.converged, out.stop_reason
    assert out.parameters[2] == pytest.approx(0.5)
    assert np.all(np.abs(out.parameters) <= 0.5)
    with pytest.raises(ParameterError, match="outside bounds"):
        LBFGSB(bounds=(-0.5, 0.5)).minimise(quadratic, np.ones(3), energy_and_gradient=quadratic_and_gradient)


# --- records and callbacks -------------------------------------------------------------------------------------


@pytest.mark.parametrize("minimiser", [m for m, _ in CASES], ids=IDS)
def test_callback_once_per_iteration_with_true_energies(minimiser):
    seen: list[IterationRecord] = []
    out = run(minimiser, rotations, rotations_and_gradient, np.zeros(4), callback=seen.append)
    assert tuple(seen) == out.iterations
    assert [r.iteration for r in seen] == list(range(1, len(seen) + 1))
    counts = [r.evaluations for r in seen]
    assert counts == sorted(counts) and counts[-1] <= out.evaluations
    for record in seen:
        assert record.energy == rotations(record.parameters)  # the energy belongs to the recorded point
        assert record.wall_time >= 0.0
        if minimiser.uses_gradient:
            _, g = rotations_and_gradient(record.parameters)
            assert record.gradient_norm == pytest.approx(np.linalg.norm(g), rel=1e-12, abs=1e-15)
        else:
            assert record.gradient_norm is None
    np.testing.assert_array_equal(out.energies, [r.energy for r in seen])


def test_records_are_read_only_copies():
    def meddling(x):
        value = quadratic(x)
        x[:] = 99.0  # the minimiser hands out copies
        return value

    out = NelderMead(max_iterations=20).minimise(meddling, np.zeros(3))
    assert np.all(np.abs(out.parameters) < 5)
    with pytest.raises(ValueError):
        out.iterations[0].parameters[0] = 1.0
    json.dumps(out.to_dict())


@pytest.mark.parametrize("minimiser", [m for m, _ in CASES], ids=IDS)
def test_max_iterations_respected(minimiser):
    capped = dataclasses.replace(gentle(minimiser), max_iterations=3)
    out = run(capped, rosenbrock, rosenbrock_and_gradient, [-1.2, 1.0])
    assert len(out.iterations) == 3
    assert not out.converged
    assert out.stop_reason.startswith("max_iterations=3 reached")


def test_stop_reasons_name_the_test():
    gradient = run(BFGS(), quadratic, quadratic_and_gradient, np.zeros(3)).stop_reason
    assert gradient.startswith("gradient norm") and "below tolerance 1e-05" in gradient
    assert "trust-region radius" in run(COBYLA(), quadratic, None, np.zeros(3)).stop_reason
    assert "simplex energies" in run(NelderMead(), quadratic, None, np.zeros(3)).stop_reason
    assert "mean energy of the last 20" in run(SPSA(seed=1, a=1.0), quadratic, None, np.zeros(3)).stop_reason


def test_start_at_the_minimum_converges_without_iterations():
    out = run(FixedStepDescent(), quadratic, quadratic_and_gradient, MINIMUM)
    assert out.converged and out.iterations == () and out.evaluations == 1
    assert "at the starting point" in out.stop_reason


def test_no_parameters():
    out = run(BFGS(), lambda x: -1.0, lambda x: (-1.0, np.zeros(0)), np.zeros(0))
    assert out.converged and out.energy == -1.0 and out.iterations == ()


# --- interruptions and early stops -----------------------------------------------------------------------------


@pytest.mark.parametrize("minimiser", [m for m, _ in CASES], ids=IDS)
def test_interrupt_from_callback(minimiser):
    def impatient(record: IterationRecord) -> None:
        if record.iteration == 3:
            raise KeyboardInterrupt

    out = run(gentle(minimiser), rosenbrock, rosenbrock_and_gradient, [-1.2, 1.0], callback=impatient)
    assert not out.converged
    assert "interrupted" in out.stop_reason
    assert [r.iteration for r in out.iterations] == [1, 2, 3]
    assert out.energy == rosenbrock(out.parameters)
    if not isinstance(minimiser, SPSA):
        assert out.energy <= min(r.energy for r in out.iterations)  # the lowest energy seen


@pytest.mark.parametrize("minimiser", [m for m, _ in CASES], ids=IDS)
def test_interrupt_from_energy(minimiser):
    calls = {"n": 0, "values": []}

    def energy(x):
        calls["n"] += 1
        if calls["n"] == 25:
            raise KeyboardInterrupt
        value = rosenbrock(x)
        calls["values"].append(value)
        return value

    def energy_and_gradient(x):
        value = energy(x)
        return value, rosenbrock_and_gradient(x)[1]

    out = run(gentle(minimiser), energy, energy_and_gradient, [-1.2, 1.0])
    assert not out.converged and "interrupted" in out.stop_reason
    assert out.evaluations == 24  # every completed evaluation counted, the interrupted one not
    assert len(out.iterations) >= 1
    assert out.iterations[-1].evaluations <= 24
    if not isinstance(minimiser, SPSA):
        assert out.energy == min(calls["values"])
    else:
        assert out.energy == out.iterations[-1].energy


def test_interrupt_before_any_energy():
    def energy(x):
        raise KeyboardInterrupt

    out = COBYLA().minimise(energy, np.zeros(2))
    assert not out.converged and out.iterations == () and np.isnan(out.energy)
    np.testing.assert_array_equal(out.parameters, np.zeros(2))


def test_callback_stop_iteration_ends_the_search():
    def enough(record):
        if record.iteration == 2:
            raise StopIteration

    out = run(BFGS(), rosenbrock, rosenbrock_and_gradient, [-1.2, 1.0], callback=enough)
    assert not out.converged and out.stop_reason == "stopped by the callback at iteration 2"
    assert len(out.iterations) == 2


def test_non_finite_energy_stops_not_converged():
    def energy(x):
        return float("nan") if x[0] > 0.2 else quadratic(x)

    out = FixedStepDescent(step=0.5).minimise(energy, np.zeros(3), energy_and_gradient=lambda x: (
        energy(x), quadratic_and_gradient(x)[1]))
    assert not out.converged and "not finite" in out.stop_reason
    assert np.isfinite(out.energy)


# --- SPSA ------------------------------------------------------------------------------------------------------


def test_spsa_same_seed_same_trajectory_other_seed_differs():
    one = SPSA(seed=5, max_iterations=40).minimise(rotations, np.zeros(4))
    two = SPSA(seed=5, max_iterations=40).minimise(rotations, np.zeros(4))
    other = SPSA(seed=6, max_iterations=40).minimise(rotations, np.zeros(4))
    assert [r.energy for r in one.iterations] == [r.energy for r in two.iterations]
    np.testing.assert_array_equal(one.parameters, two.parameters)
    assert not np.array_equal(one.parameters, other.parameters)


def test_spsa_gains_follow_spall():
    spsa = SPSA(a=0.2, c=0.1, A=10.0)
    a0, c0 = spsa.gains(0)
    a5, c5 = spsa.gains(5)
    # gain sequences a_k, c_k of J. C. Spall, IEEE Transactions on Aerospace and Electronic Systems 34(3), 817-823
    # (1998) (from memory)
    assert a0 == pytest.approx(0.2 / 11.0**0.602) and c0 == pytest.approx(0.1)  # Spall (1998), IEEE TAES 34, 817
    assert a5 == pytest.approx(0.2 / 16.0**0.602) and c5 == pytest.approx(0.1 / 6.0**0.101)
    assert SPSA(max_iterations=300).stability == 30.0


def test_spsa_on_a_noisy_quadratic_gets_close():
    noise = np.random.default_rng(2024)
    sigma = 1e-3  # Hartree, like a sampled energy

    def noisy(x):
        return quadratic(x) + sigma * noise.standard_normal()

    out = SPSA(seed=3, a=0.3, max_iterations=600, tolerance=1e-7).minimise(noisy, np.zeros(3))
    assert quadratic(out.parameters) - E_MIN < 2e-3  # analytic minimum, noise-free energy at the final point
    assert np.linalg.norm(out.parameters - MINIMUM) < 0.1


# --- construction, names, equality -----------------------------------------------------------------------------

BAD_OPTIONS = [
    (FixedStepDescent, {"step": -0.1}, "step=-0.1"),
    (FixedStepDescent, {"step": 0}, "step=0"),
    (FixedStepDescent, {"max_iterations": 0}, "max_iterations=0"),
    (BFGS, {"max_iterations": -5}, "max_iterations=-5"),
    (BFGS, {"max_iterations": 2.5}, "max_iterations=2.5"),
    (BFGS, {"tolerance": 0.0}, "tolerance=0.0"),
    (COBYLA, {"tolerance": -1e-6}, "tolerance=-1e-06"),
    (BFGS, {"difference_step": 0.0}, "difference_step=0.0"),
    (Adam, {"beta1": 1.0}, "beta1=1.0"),
    (Adam, {"beta2": -0.1}, "beta2=-0.1"),
    (Adam, {"epsilon": 0}, "epsilon=0"),
    (Adam, {"step": float("nan")}, "step=nan"),
    (LBFGSB, {"memory": 0}, "memory=0"),
    (LBFGSB, {"energy_tolerance": 0}, "energy_tolerance=0"),
    (LBFGSB, {"bounds": (1.0, -1.0)}, "bounds=(1.0, -1.0)"),
    (COBYLA, {"initial_step": 0}, "initial_step=0"),
    (NelderMead, {"parameter_tolerance": -1}, "parameter_tolerance=-1"),
    (NelderMead, {"adaptive": "yes"}, "adaptive='yes'"),
    (SPSA, {"a": 0}, "a=0"),
    (SPSA, {"c": -0.1}, "c=-0.1"),
    (SPSA, {"alpha": 1.5}, "alpha=1.5"),
    (SPSA, {"gamma": 0}, "gamma=0"),
    (SPSA, {"A": -1}, "A=-1"),
    (SPSA, {"window": 0}, "window=0"),
    (SPSA, {"seed": -3}, "seed=-3"),
    (SPSA, {"seed": 1.5}, "seed=1.5"),
]


@pytest.mark.parametrize(("cls", "options", "shown"), BAD_OPTIONS, ids=[s for _, _, s in BAD_OPTIONS])
def test_bad_options_refused_naming_the_value(cls, options, shown):
    with pytest.raises(ComponentError) as caught:
        cls(**options)
    assert shown in str(caught.value)
    assert "must" in str(caught.value)  # and what would be accepted


def test_gradient_method_without_gradient_is_refused():
    with pytest.raises(ComponentError, match="needs energy_and_gradient"):
        Adam().minimise(quadratic, np.zeros(3))


@pytest.mark.parametrize("x0", [np.zeros((2, 2)), [0.0, np.nan], ["a", "b"]])
def test_bad_start_vector(x0):
    with pytest.raises(ParameterError):
        COBYLA().minimise(quadratic, x0)


def test_names():
    assert MINIMISER_NAMES == ("gradient-descent", "adam", "bfgs", "l-bfgs-b", "cobyla", "nelder-mead", "spsa")
    for cls in BUILT_IN:
        assert type(minimiser_from_name(cls.name)) is cls
    assert minimiser_from_name("L-BFGS-B") == LBFGSB()
    assert minimiser_from_name("nelder_mead", initial_step=0.2) == NelderMead(initial_step=0.2)
    assert minimiser_from_name("FixedStepDescent", step=0.3) == FixedStepDescent(step=0.3)
    with pytest.raises(ComponentError, match="accepted names: gradient-descent, adam, bfgs, l-bfgs-b, cobyla"):
        minimiser_from_name("newton")
    with pytest.raises(ComponentError, match="unknown minimiser 3"):
        minimiser_from_name(3)
    with pytest.raises(ComponentError, match="has no option .step.*accepted options"):
        minimiser_from_name("bfgs", step=0.1)
    with pytest.raises(ComponentError, match="step=-1"):
        minimiser_from_name("adam", step=-1)


def test_value_equality_repr_and_immutability():
    assert BFGS() == BFGS() and hash(BFGS()) == hash(BFGS())
    assert SPSA(seed=1) != SPSA(seed=2) and BFGS() != LBFGSB()
    assert repr(SPSA(seed=3)) == "SPSA(seed=3)"
    assert repr(FixedStepDescent(step=0.4, max_iterations=50)) == "FixedStepDescent(max_iterations=50, step=0.4)"
    assert eval(repr(Adam(beta1=0.8))) == Adam(beta1=0.8)
    with pytest.raises(dataclasses.FrozenInstanceError):
        BFGS().tolerance = 1.0
    with pytest.raises(ComponentError, match="by keyword"):
        FixedStepDescent(0.1)  # options are keyword-only
    with pytest.raises(TypeError):
        Minimiser()  # abstract


def test_subclass_uses_the_shared_machinery():
    @minimiser_options
    class CoordinateHalving(Minimiser):
        """Try +-step along each axis, halve the step when nothing improves."""

        name = "coordinate-halving"
        step: float = 0.5
        max_iterations: int = 200
        tolerance: float = 1e-6

        def search(self, session, x0):
            x, e, step = x0.copy(), session.energy(x0), self.step
            for _ in range(self.max_iterations):
                for i in range(x.size):
                    for sign in (1.0, -1.0):
                        trial = x.copy()
                        trial[i] += sign * step
                        if (value := session.energy(trial)) < e:
                            x, e = trial, value
                            break
                    else:
                        continue
                    break
                else:
                    step /= 2
                session.record(x, e)
                if step < self.tolerance:
                    return Ending(x, e, True, f"step {step:.2g} below tolerance {self.tolerance:g}")
            return Ending(x, e, False, f"max_iterations={self.max_iterations} reached")

    out = CoordinateHalving().minimise(quadratic, np.zeros(3))
    assert repr(CoordinateHalving(step=0.1)) == "CoordinateHalving(step=0.1)"
    assert out.converged and abs(out.energy - E_MIN) < 1e-6  # analytic

    def stop_early(record):
        if record.iteration == 4:
            raise KeyboardInterrupt

    partial = CoordinateHalving().minimise(quadratic, np.zeros(3), callback=stop_early)
    assert not partial.converged and len(partial.iterations) == 4
