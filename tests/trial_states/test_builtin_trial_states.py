import numpy as np
import pytest

from groundkit.errors import ComponentError, ExcitationError
from groundkit.sector.excitation import Excitation
from groundkit.trial_states import UCCSD, ExcitationList, PairDoubles, ReferenceDeterminant, TrialState, UpCCGSD


def uccsd_count(o_a, v_a, o_b, v_b):
    """Singles plus alpha-alpha, beta-beta and alpha-beta doubles, counted by hand."""
    pairs = lambda n: n * (n - 1) // 2  # noqa: E731
    return o_a * v_a + o_b * v_b + pairs(o_a) * pairs(v_a) + pairs(o_b) * pairs(v_b) + o_a * v_a * o_b * v_b


@pytest.mark.parametrize(
    "name, counts", [("h2", (1, 1, 1, 1)), ("lih", (2, 4, 2, 4)), ("h2o", (5, 2, 5, 2)), ("nh", (5, 1, 3, 3))]
)
def test_uccsd_has_every_sz_conserving_single_and_double(get_problem, name, counts):
    p = get_problem(name)
    plan = UCCSD().plan(p)
    assert plan.n_parameters == len(plan.excitations) == uccsd_count(*counts)
    ranks = [e.rank for e in plan.excitations]
    assert ranks == sorted(ranks, reverse=True)  # doubles first, then singles
    assert len(set(plan.excitations)) == len(plan.excitations)
    hf_alpha, hf_beta = plan.reference
    for e in plan.excitations:
        for q in e.annihilators:
            assert (hf_alpha if q % 2 == 0 else hf_beta) >> (q // 2) & 1
        for a in e.creators:
            assert not (hf_alpha if a % 2 == 0 else hf_beta) >> (a // 2) & 1


def test_uccsd_order_for_h2(get_problem):
    plan = UCCSD().plan(get_problem("h2"))
    assert plan.excitations == (
        Excitation((2, 3), (1, 0)),
        Excitation((2,), (0,)),
        Excitation((3,), (1,)),
    )
    assert plan.labels == ("0a,0b->1a,1b", "0a->1a", "0b->1b")


def test_spin_adapted_uccsd_shares_partners(get_problem):
    p = get_problem("h2o")
    plan = UCCSD(spin_adapted=True).plan(p)
    assert plan.n_parameters == 75  # 10 singles + 10 same-spin + 10 self-partnered + 45 mixed pairs, by hand
    for k, e in enumerate(plan.excitations):
        flipped = e.spin_flipped()
        partner = [m for m, f in enumerate(plan.excitations) if set(f.creators) == set(flipped.creators)
                   and set(f.annihilators) == set(flipped.annihilators)]
        assert len(partner) == 1
        assert plan.parameter_index[partner[0]] == plan.parameter_index[k]


def test_spin_adapted_needs_a_closed_shell(get_problem):
    with pytest.raises(ComponentError, match="closed-shell.*5 alpha and 3 beta"):
        UCCSD(spin_adapted=True).plan(get_problem("nh"))


@pytest.mark.parametrize("name, n_pairs", [("h2o", 10), ("lih", 8), ("nh", 3), ("oh", 4)])
def test_puccd_moves_pairs_only(get_problem, name, n_pairs):
    plan = PairDoubles().plan(get_problem(name))
    assert plan.n_parameters == n_pairs
    for e in plan.excitations:
        assert e.creators[0] // 2 == e.creators[1] // 2 and e.annihilators[0] // 2 == e.annihilators[1] // 2


@pytest.mark.parametrize("k", [1, 2, 3])
def test_upccgsd_layers(get_problem, k):
    n = get_problem("h2o").n_orbitals
    pairs = n * (n - 1) // 2
    closed = UpCCGSD(k=k).plan(get_problem("h2o"))
    assert len(closed.excitations) == 3 * pairs * k
    assert closed.n_parameters == 2 * pairs * k  # singles shared between spins for closed shells
    m = get_problem("nh").n_orbitals
    open_shell = UpCCGSD(k=k).plan(get_problem("nh"))
    assert open_shell.n_parameters == 3 * (m * (m - 1) // 2) * k


def test_hartree_fock_has_no_parameters(get_problem):
    plan = ReferenceDeterminant().plan(get_problem("lih"))
    assert plan.n_parameters == 0 and plan.excitations == ()
    assert plan.reference == (0b11, 0b11)


def test_repr_and_value_equality():
    assert repr(UCCSD()) == "UCCSD(spin_adapted=False, init='zeros')"
    assert repr(UpCCGSD(k=2)) == "UpCCGSD(k=2)"
    assert repr(PairDoubles()) == "PairDoubles()" and repr(ReferenceDeterminant()) == "ReferenceDeterminant()"
    assert repr(ExcitationList([((2,), (0,)), ((4, 5), (1, 0))])) == "ExcitationList([((2,), (0,)), ((4, 5), (1, 0))])"
    assert UCCSD(init="mp2") == UCCSD(init="mp2") != UCCSD()
    assert UpCCGSD(k=2) == UpCCGSD(k=2) != UpCCGSD(k=1)
    assert ExcitationList([((2,), (0,))]) == ExcitationList([[[2], [0]]])
    assert len({UCCSD(), UCCSD(), PairDoubles(), ReferenceDeterminant(), ExcitationList([((2,), (0,))])}) == 4
    assert PairDoubles() != ReferenceDeterminant()


@pytest.mark.parametrize(
    "make, words",
    [
        (lambda: UCCSD(init="random"), "init='random'.*'zeros', 'mp2'"),
        (lambda: UCCSD(spin_adapted="yes"), "spin_adapted='yes'"),
        (lambda: UpCCGSD(k=0), "k=0.*from 1"),
        (lambda: UpCCGSD(k=2.5), "k=2.5"),
        (lambda: UpCCGSD(k=True), "k=True"),
    ],
)
def test_options_out_of_range(make, words):
    with pytest.raises(ComponentError, match=words):
        make()


def test_options_are_keyword_only():
    with pytest.raises(ComponentError, match="by keyword"):
        UCCSD(True)
    with pytest.raises(ComponentError, match="by keyword"):
        UpCCGSD(2)


@pytest.mark.parametrize(
    "excitations, words",
    [
        ([((4, 5), (0,))], "particle number"),
        ([((3,), (0,))], "Sz"),
        ([((4, 4), (1, 0))], "repeats"),
        ("((2,), (0,))", "give a list"),
    ],
)
def test_excitation_list_refuses_bad_excitations(excitations, words):
    with pytest.raises(ExcitationError, match=words):
        ExcitationList(excitations)


def test_excitation_list_range_is_checked_against_the_problem(get_problem):
    trial = ExcitationList([((2,), (0,)), ((12,), (0,))])
    with pytest.raises(ExcitationError, match="spin orbital 12 is out of range.*4 spin orbitals"):
        trial.plan(get_problem("h2"))


def test_trial_state_is_abstract():
    with pytest.raises(TypeError):
        TrialState()


def test_mp2_start_is_below_hartree_fock(get_problem):
    from groundkit.objective import Objective

    for name in ["lih", "h2o", "h4", "nh", "oh"]:
        p = get_problem(name)
        for trial in [UCCSD(init="mp2")] + ([UCCSD(init="mp2", spin_adapted=True)] if p.n_alpha == p.n_beta else []):
            objective = Objective(p, trial)
            start = objective.initial_parameters()
            assert np.count_nonzero(start) > 0
            assert objective.energy(start) < p.hf_energy - 1e-4  # PySCF (reference library) RHF/ROHF e_tot


def test_closed_shell_upccgsd_stays_a_singlet(get_problem):
    from groundkit.objective import Objective

    objective = Objective(get_problem("h2o"), UpCCGSD(k=2))
    theta = np.random.default_rng(6).uniform(-1.0, 1.0, objective.n_parameters)
    assert abs(objective.spin_square(theta)) < 1e-10  # pair moves and spin-summed singles commute with S^2
