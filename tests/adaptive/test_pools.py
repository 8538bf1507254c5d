"""Operator pools: contents, order, and every bad-input row (empty pool, operators breaking N or Sz)."""

from __future__ import annotations

from dataclasses import dataclass
from math import comb

import pytest

import groundkit as gk
from groundkit.adaptive import (
    Adaptive,
    ExcitationPool,
    GeneralisedPool,
    OperatorPool,
    SinglesDoublesPool,
    as_pool,
    generalised_doubles,
)
from groundkit.sector.space import lowest_strings


def test_singles_doubles_pool_is_uccsd_in_its_order(get_problem):
    problem = get_problem("h4")
    pool = SinglesDoublesPool().checked_candidates(problem, lowest_strings(2, 2))
    assert list(pool) == list(gk.UCCSD().plan(problem).excitations)
    assert len(pool) == 26  # 8 singles + 1 + 1 + 16 doubles for 4 electrons in 4 orbitals (by counting)


def test_generalised_pool_counts_and_symmetries(get_problem):
    problem = get_problem("h4")
    pool = GeneralisedPool().checked_candidates(problem, lowest_strings(2, 2))
    n = 4
    doubles = generalised_doubles(n)
    # same-spin pairs: C(4,2) per spin, choose 2 distinct disjoint ones; alpha-beta pairs: 16, disjoint partners
    same_spin = 2 * sum(1 for a in range(6) for b in range(a + 1, 6)
                        if not set(_pairs(n)[a]) & set(_pairs(n)[b]))
    mixed = sum(1 for i in range(16) for j in range(i + 1, 16)
                if not set(_mixed(n)[i]) & set(_mixed(n)[j]))
    assert len(doubles) == same_spin + mixed
    assert len(pool) == 2 * comb(n, 2) + len(doubles)
    for e in doubles:
        assert sum(p % 2 for p in e.creators) == sum(q % 2 for q in e.annihilators)  # Sz conserved
        assert not set(e.creators) & set(e.annihilators)
    assert len(set(doubles)) == len(doubles)


def _pairs(n: int) -> list[tuple[int, int]]:
    alpha = [2 * i for i in range(n)]
    return [(a, b) for k, a in enumerate(alpha) for b in alpha[k + 1:]]


def _mixed(n: int) -> list[tuple[int, int]]:
    return [(2 * i, 2 * j + 1) for i in range(n) for j in range(n)]


def test_pool_names():
    assert as_pool("singles-doubles") == SinglesDoublesPool()
    assert as_pool("Generalized") == GeneralisedPool()
    assert Adaptive(pool="generalised").pool == GeneralisedPool()
    with pytest.raises(gk.ComponentError, match="'qubit-ish'.*accepted names"):
        Adaptive(pool="qubit-ish")


def test_empty_pool_is_refused():
    with pytest.raises(gk.ComponentError, match=r"ExcitationPool\(\[\]\) is empty"):
        ExcitationPool([])


def test_pool_empty_for_the_problem_is_refused():
    # H2 in a one-orbital active space: two electrons, no empty orbital, so no excitation from the reference
    h2 = gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.7414)), basis="sto-3g")
    pipeline = gk.Pipeline(h2).active_space(electrons=2, orbitals=1).trial_state(Adaptive())
    with pytest.raises(gk.ComponentError, match="has no operators for this problem"):
        pipeline.run()


def test_operator_breaking_particle_number_is_refused():
    with pytest.raises(gk.ExcitationError, match=r"\(\(4, 5\), \(0,\)\).*particle number"):
        ExcitationPool([((2,), (0,)), ((4, 5), (0,))])


def test_operator_breaking_sz_is_refused():
    with pytest.raises(gk.ExcitationError, match=r"\(\(3,\), \(0,\)\).*Sz"):
        ExcitationPool([((3,), (0,))])


@dataclass(frozen=True)
class _SpinFlipPool(OperatorPool):
    """A user pool that (wrongly) offers an alpha-to-beta move."""

    def candidates(self, problem, reference):
        return [((4,), (0,)), ((5,), (0,))]


def test_user_pool_breaking_sz_is_refused_at_run(h4_stretched):
    with pytest.raises(gk.ExcitationError, match=r"_SpinFlipPool.*\(\(5,\), \(0,\)\).*Sz"):
        h4_stretched.trial_state(Adaptive(pool=_SpinFlipPool())).run()


def test_pool_operator_out_of_range_is_refused(h4_stretched):
    with pytest.raises(gk.ExcitationError, match="spin orbital 12 is out of range"):
        h4_stretched.trial_state(Adaptive(pool=ExcitationPool([((12,), (0,))]))).run()


def test_repeated_pool_operator_is_refused(h4_stretched):
    with pytest.raises(gk.ComponentError, match="more than once"):
        h4_stretched.trial_state(Adaptive(pool=ExcitationPool([((4,), (0,)), ((4,), (0,))]))).run()
