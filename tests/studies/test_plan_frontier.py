"""Frontier and recommendation on rows made up here, where the answers are known by construction."""

from __future__ import annotations

import itertools

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from groundkit.studies.plan_result import PlanResult, dominates, non_dominated


def row(label, hours, gates, error, meets=True, reason=""):
    return {"configuration": label, "run": 0, "device_hours": hours, "two_qubit_gates": gates,
            "worst_error_mha": error, "shots_per_energy": 1000, "meets": meets, "meets_target": meets,
            "within_limits": True, "reason": reason}


def plan_of(rows):
    return PlanResult(rows=tuple(rows), curves=())


def test_frontier_by_hand():
    rows = [row("a", 1.0, 10, 5.0, False, "misses"), row("b", 2.0, 40, 1.0), row("c", 3.0, 20, 1.0),
            row("d", 4.0, 30, 0.5), row("e", 5.0, 50, 2.0)]
    plan = plan_of(rows)
    assert list(plan.frontier("device_hours")["configuration"]) == ["a", "b", "d"]  # c: b is cheaper, same error
    assert list(plan.frontier("two_qubit_gates")["configuration"]) == ["a", "c", "d"]  # b: c has fewer gates
    both = plan.frontier()
    assert list(both["configuration"]) == ["a", "b", "c", "d"]
    assert list(both["on_device_hours_frontier"]) == [True, True, False, True]


@settings(max_examples=60, deadline=None)
@given(st.lists(st.tuples(st.integers(0, 6), st.integers(0, 6)), min_size=1, max_size=12))
def test_frontier_members_are_non_dominated_and_others_dominated_by_a_member(points):
    flags = non_dominated(points)
    members = [p for p, f in zip(points, flags) if f]
    assert members
    for p, f in zip(points, flags):
        if f:
            assert not any(dominates(q, p) for q in points)
        else:
            assert any(dominates(m, p) for m in members)


def test_rows_without_figures_take_no_part():
    assert non_dominated([(None, 1.0), (2.0, None), (1.0, 1.0)]) == [False, False, True]


def test_recommendation_names_a_cheaper_runner_up_and_why_it_lost():
    rows = [row("eq-cheap", 0.5, 10, 3.0, False, "misses 1.6 mHa at 1 of 3 geometries"), row("ok", 2.0, 30, 0.4),
            row("ok-dear", 6.0, 60, 0.1), row("bad-cheap", 0.1, 5, 40.0, False, "misses 1.6 mHa at 3 of 3")]
    choice = plan_of(rows).recommend()
    assert choice.configuration == "ok"
    assert choice.runner_up == "eq-cheap"  # of the cheaper ones, the one that came closest
    assert "would need only 30 min but lost: misses 1.6 mHa at 1 of 3 geometries" in choice.justification


def test_recommendation_with_no_cheaper_row_names_the_next_on_cost():
    choice = plan_of([row("x", 3.0, 30, 0.4), row("y", 1.5, 40, 1.0)]).recommend()
    assert (choice.configuration, choice.runner_up) == ("y", "x")
    assert "2× as much device time" in choice.justification


def test_recommendation_ties_break_on_gates_then_error():
    rows = [row("p", 1.0, 20, 0.5), row("q", 1.0, 10, 0.9), row("r", 1.0, 10, 0.2)]
    assert plan_of(rows).recommend().configuration == "r"


def test_no_configuration_meets():
    choice = plan_of([row("a", 1.0, 10, 5.0, False, "misses"), row("b", 1.0, 10, 3.0, False, "misses")]).recommend()
    assert choice.configuration is None and choice.runner_up == "b"
    assert "No configuration holds 1.6 mHa" in choice.justification


@pytest.mark.parametrize("order", list(itertools.permutations(range(3))))
def test_recommendation_does_not_depend_on_row_order(order):
    rows = [row("a", 2.0, 10, 0.5), row("b", 1.0, 30, 0.5), row("c", 0.5, 5, 9.0, False, "misses")]
    assert plan_of([rows[k] for k in order]).recommend().configuration == "b"


def test_bad_frontier_cost():
    from groundkit.studies.plan_input import PlanInputError

    with pytest.raises(PlanInputError, match="frontier\\(by='depth'\\)"):
        plan_of([row("a", 1.0, 1, 1.0)]).frontier("depth")


def test_labels_that_read_alike_are_numbered():
    from groundkit.studies.planning import _unique_labels

    rows = [{"configuration": "x"}, {"configuration": "y"}, {"configuration": "x"}, {"configuration": "x"}]
    _unique_labels(rows)
    assert [r["configuration"] for r in rows] == ["x", "y", "x #2", "x #3"]
