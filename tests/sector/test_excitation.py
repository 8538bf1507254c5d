import pytest

from groundkit.errors import ExcitationError
from groundkit.sector.excitation import Excitation, as_excitation, check_excitation, check_excitations, split_by_spin


def test_plain_pairs_become_excitations():
    e = as_excitation(((4, 5), (1, 0)))
    assert e == Excitation((4, 5), (1, 0))
    assert e.rank == 2
    assert e.operator_term() == ((4, 1), (5, 1), (1, 0), (0, 0))
    assert e.adjoint() == Excitation((0, 1), (5, 4))
    assert e.spin_flipped() == Excitation((5, 4), (0, 1))


def test_single_and_numpy_integers_are_accepted():
    import numpy as np

    assert as_excitation(((np.int64(2),), (0,))) == Excitation((2,), (0,))
    assert as_excitation((2, 0)) == Excitation((2,), (0,))


@pytest.mark.parametrize(
    "bad, words",
    [
        (((4, 5), (0,)), "particle number"),
        (((4,), (0, 1)), "particle number"),
        (((3,), (0,)), "Sz"),
        (((4, 6), (0, 1)), "Sz"),
        (((4, 4), (0, 2)), "repeats"),
        (((4, 1), (1, 0)), "repeats"),
        (((-2,), (0,)), "negative"),
        (((), ()), "empty"),
        (((2.5,), (0,)), "not an integer"),
        ((("a",), (0,)), "not an integer"),
        ((1, 2, 3), "not a pair"),
        (7, "not a pair"),
    ],
)
def test_bad_excitations_raise_with_the_value(bad, words):
    with pytest.raises(ExcitationError, match=words):
        as_excitation(bad)


def test_out_of_range_needs_the_problem_size():
    e = as_excitation(((8,), (0,)))
    check_excitation(e)
    with pytest.raises(ExcitationError, match="spin orbital 8 is out of range.*8 spin orbitals"):
        check_excitation(e, 8)
    with pytest.raises(ExcitationError, match="out of range"):
        check_excitations([((2,), (0,)), ((9, 11), (1, 3))], 10)


def test_error_is_a_value_error():
    with pytest.raises(ValueError):
        as_excitation(((3,), (0,)))


@pytest.mark.parametrize(
    "excitation, sign, alpha, beta",
    [
        (Excitation((2,), (0,)), 1, [(1, True), (0, False)], []),
        (Excitation((3,), (1,)), 1, [], [(1, True), (0, False)]),
        # a+_2a a+_3b a_1b a_0a -> alpha ops (2, 0) must pass two beta ops: even
        (Excitation((4, 7), (3, 0)), 1, [(2, True), (0, False)], [(3, True), (1, False)]),
        # a+_3b a+_4a a_1b a_0a: alpha 4 passes one beta, alpha 0 passes two: odd
        (Excitation((3, 4), (1, 0)), -1, [(2, True), (0, False)], [(1, True), (0, False)]),
    ],
)
def test_split_by_spin(excitation, sign, alpha, beta):
    assert split_by_spin(excitation) == (sign, alpha, beta)
