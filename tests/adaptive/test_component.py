"""Adaptive as a component: options checked at construction, value equality, names, no objective before growth."""

from __future__ import annotations

import math

import pytest

import groundkit as gk
from groundkit.adaptive import Adaptive, GeneralisedPool, SinglesDoublesPool


@pytest.mark.parametrize("value", [0, 0.0, -1e-3, math.nan, math.inf, True, "1e-3", None])
def test_non_positive_or_non_numeric_threshold_is_refused(value):
    with pytest.raises(gk.ComponentError, match=rf"gradient_threshold={value!r}.*> 0"):
        Adaptive(gradient_threshold=value)


@pytest.mark.parametrize("value", [0, -1e-9, math.nan])
def test_non_positive_energy_tolerance_is_refused(value):
    with pytest.raises(gk.ComponentError, match=rf"energy_tolerance={value!r}"):
        Adaptive(energy_tolerance=value)


@pytest.mark.parametrize("value", [0, -2, 1.5, True])
def test_bad_operator_cap_is_refused(value):
    with pytest.raises(gk.ComponentError, match=rf"max_operators={value!r}"):
        Adaptive(max_operators=value)


def test_other_bad_options():
    assert Adaptive(minimiser="bfgs").minimiser == gk.BFGS()  # a registered name builds the minimiser
    with pytest.raises(gk.ComponentError, match="minimiser='newton'.*accepted names 'gradient-descent'"):
        Adaptive(minimiser="newton")
    with pytest.raises(gk.ComponentError, match="minimiser=3"):
        Adaptive(minimiser=3)
    with pytest.raises(gk.ComponentError, match="repeats=1"):
        Adaptive(repeats=1)
    with pytest.raises(gk.ExcitationError, match="particle number"):
        Adaptive(start_from=[((4, 5), (0,))])
    with pytest.raises(gk.ComponentError, match="max_operators=1.*2 operators of start_from"):
        Adaptive(start_from=[((4,), (0,)), ((5,), (1,))], max_operators=1)


def test_keyword_only_value_equality_and_repr():
    with pytest.raises(gk.ComponentError, match="by keyword"):
        Adaptive(SinglesDoublesPool())  # type: ignore[misc]
    assert Adaptive() == Adaptive(pool="singles-doubles") and hash(Adaptive()) == hash(Adaptive())
    assert Adaptive() != Adaptive(gradient_threshold=1e-4)
    assert repr(Adaptive()) == "Adaptive()"
    shown = repr(Adaptive(pool=GeneralisedPool(), max_operators=5, minimiser=gk.BFGS(tolerance=1e-7),
                          start_from=[((4,), (0,))]))
    assert shown == ("Adaptive(pool=GeneralisedPool(), max_operators=5, minimiser=BFGS(tolerance=1e-07), "
                     "start_from=[((4,), (0,))])")


def test_shorthand_name(h4_stretched):
    assert h4_stretched.trial_state("adaptive", max_operators=3).components["trial_state"] == Adaptive(
        max_operators=3)


def test_objective_before_growth_explains_run(h4_stretched):
    with pytest.raises(gk.ComponentError, match=r"no fixed operator sequence.*Pipeline.run\(\).*grown_trial_state"):
        h4_stretched.trial_state(Adaptive()).objective()
