import warnings

import numpy as np
import pytest
from pyscf import gto, mp, scf

import groundkit as gk
from groundkit import chemistry

from .conftest import diatomic, water


def _resolve(spec, space):
    return space.resolve(spec, chemistry.solve_scf(spec))


def test_window_around_fermi_level(h2o):
    r = _resolve(h2o, gk.ActiveSpace(electrons=4, orbitals=4))
    assert (r.core, r.active, r.external) == ((0, 1, 2), (3, 4, 5, 6), ())
    assert (r.n_alpha, r.n_beta, r.n_spin_orbitals) == (2, 2, 8)


def test_full_space_by_default(h2o):
    r = _resolve(h2o, gk.ActiveSpace())
    assert r.core == () and r.active == tuple(range(7)) and r.n_electrons == 10


def test_explicit_indices_make_the_rest_core(h2o):
    r = _resolve(h2o, gk.ActiveSpace(indices=[4, 2, 5]))
    assert r.active == (2, 4, 5) and r.core == (0, 1, 3) and r.external == (6,)
    assert r.n_electrons == 4


@pytest.mark.parametrize("symbols, n_core", [(("O", "H", "H"), 1), (("H", "Cl"), 5), (("H", "H"), 0)])
def test_frozen_core_by_element_rows(symbols, n_core):
    coords = [(0, 0, 0), (0, 0, 1.3), (0, 1.3, 0)][: len(symbols)]
    spec = gk.MoleculeSpec(symbols=symbols, coordinates=coords)
    r = _resolve(spec, gk.ActiveSpace(frozen_core=True))
    assert len(r.core) == n_core  # 1s for Li–Ne, 1s2s2p for Na–Ar (common practice, no single source)


def test_auto_selection_follows_mp2_natural_occupations():
    stretched = diatomic("N", "N", 1.6)  # a stretched bond has strongly fractional occupations
    space = gk.ActiveSpace.auto()
    r = _resolve(stretched, space)
    mol = gto.M(atom=[("N", (0, 0, 0)), ("N", (0, 0, 1.6))], basis="sto-3g", verbose=0)
    mf = scf.RHF(mol).run(conv_tol=1e-10)
    pt = mp.MP2(mf, frozen=2).run()
    occ = np.linalg.eigvalsh(pt.make_rdm1())  # PySCF MP2 natural-orbital occupations (reference library)
    inside = int(np.count_nonzero((occ > 0.02) & (occ < 1.98)))  # window 0.02..1.98 (common practice)
    assert r.n_orbitals == inside
    active_rows = [row for row in r.selection_table if row["role"] == "active"]
    assert all(0.02 < row["mp2_occupation"] < 1.98 for row in active_rows)
    assert len(r.explain().splitlines()) == 2 + len(r.selection_table)  # kind line, header, rows
    assert sum(row["role"] == "active" for row in r.selection_table) == r.n_orbitals


def test_auto_keeps_at_least_homo_and_lumo(h2o):
    r = _resolve(h2o, gk.ActiveSpace.auto())
    assert r.n_orbitals >= 2 and r.n_electrons >= 2


def test_degenerate_cut_warns():
    n2 = diatomic("N", "N", 1.0977)  # NIST CCCBDB experimental r_e (from memory)
    solution = chemistry.solve_scf(n2)
    e = solution.mo_energy
    pairs = [i for i in range(len(e) - 1) if abs(e[i + 1] - e[i]) < 1e-6]
    assert pairs, "N2 has degenerate pi orbitals"  # textbook MO diagram of N2
    first = pairs[0]
    with pytest.warns(gk.DegenerateBoundaryWarning, match="degenerate"):
        gk.ActiveSpace(indices=[first]).resolve(n2, solution)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        gk.ActiveSpace(indices=[first, first + 1]).resolve(n2, solution)


# bad input ------------------------------------------------------------------------------------------------------
def test_more_electrons_than_exist(h2o):
    with pytest.raises(gk.ActiveSpaceError, match="asks for 12 electrons"):
        _resolve(h2o, gk.ActiveSpace(electrons=12, orbitals=7))


def test_more_orbitals_than_exist(h2o):
    with pytest.raises(gk.ActiveSpaceError, match="asks for 9 orbitals"):
        _resolve(h2o, gk.ActiveSpace(electrons=4, orbitals=9))


def test_electron_count_inconsistent_with_multiplicity():
    triplet_o2 = diatomic("O", "O", 1.2075, multiplicity=3)
    with pytest.raises(gk.ActiveSpaceError, match="inconsistent with multiplicity 3"):
        _resolve(triplet_o2, gk.ActiveSpace(electrons=5, orbitals=6))
    with pytest.raises(gk.ActiveSpaceError, match="inconsistent with multiplicity"):
        _resolve(water(), gk.ActiveSpace(electrons=3, orbitals=4))


def test_index_out_of_range_and_unpaired_left_out(h2o):
    with pytest.raises(gk.ActiveSpaceError, match="out of range"):
        _resolve(h2o, gk.ActiveSpace(indices=[3, 40]))
    oh = diatomic("O", "H", 0.9697, multiplicity=2)
    with pytest.raises(gk.ActiveSpaceError, match="singly occupied"):
        _resolve(oh, gk.ActiveSpace(indices=[1, 2]))


@pytest.mark.parametrize("options", [dict(electrons=-2, orbitals=2), dict(electrons=2, orbitals=0),
                                     dict(electrons=2), dict(indices=[1, 1]), dict(indices=[]),
                                     dict(occupation_window=(1.5, 0.5), selection="mp2-occupation")])
def test_bad_options_are_refused_at_construction(options):
    with pytest.raises(gk.ActiveSpaceError):
        gk.ActiveSpace(**options)
