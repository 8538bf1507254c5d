import numpy as np
import pytest
from pyscf.fci import cistring

from groundkit.sector.excitation import Excitation
from groundkit.sector.strings import make_strings
from groundkit.sector.tables import determinant_image, excitation_table, spin_part, string_action


@pytest.mark.parametrize("n_orbitals, n_electrons", [(4, 2), (6, 3), (7, 5)])
def test_single_excitations_match_pyscf_link_table(n_orbitals, n_electrons):
    strings = make_strings(n_orbitals, n_electrons)
    link = cistring.gen_linkstr_index(range(n_orbitals), n_electrons)  # PySCF (reference library): E_ai targets/signs
    for source, rows in enumerate(link):
        for a, i, target, sign in rows:
            if a == i:
                continue
            part = spin_part(strings, [(int(a), True), (int(i), False)])
            where = np.flatnonzero(part.source == source)
            assert where.size == 1
            assert part.target[where[0]] == target
            assert part.sign[where[0]] == sign


def test_string_action_annihilates_and_signs():
    strings = np.array([0b0011, 0b0101, 0b0110])
    new, sign = string_action(strings, [(3, True), (0, False)])
    # 0b0011: remove 0 (one electron above: -1), add 3 (none above: +1)
    assert new.tolist() == [0b1010, 0b1100, -1]
    assert sign[:2].tolist() == [-1.0, -1.0]


def test_determinant_image_of_a_double():
    alpha, beta = make_strings(4, 2), make_strings(4, 2)
    table = excitation_table(Excitation((4, 5), (1, 0)), alpha, beta)
    ja, jb, sign = determinant_image(table, 0, 0)
    assert alpha[ja] == 0b0110 and beta[jb] == 0b0110
    assert abs(sign) == 1.0
    assert determinant_image(table, 0, int(np.searchsorted(beta, 0b0110))) is None


def test_parts_are_shared_and_sign_folded_into_a_copy():
    alpha, beta = make_strings(4, 2), make_strings(4, 2)
    cache = {}
    plus = excitation_table(Excitation((4, 7), (3, 0)), alpha, beta, cache)
    minus = excitation_table(Excitation((7, 4), (3, 0)), alpha, beta, cache)
    np.testing.assert_array_equal(plus.weight(), -minus.weight())
    assert len(cache) == 2


def test_tables_refuse_excitations_that_leave_the_sector():
    from groundkit.errors import ExcitationError

    alpha, beta = make_strings(4, 2), make_strings(4, 2)
    with pytest.raises(ExcitationError, match="Sz"):
        excitation_table(Excitation((3, 1), (2, 0)), alpha, beta)
    with pytest.raises(ExcitationError, match="out of the strings"):
        excitation_table(Excitation((8,), (0,)), alpha, beta)
