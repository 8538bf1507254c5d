import math

import pytest

import groundkit as gk
from groundkit.molecule import BOHR_PER_ANGSTROM


def test_value_object_equality_hash_and_repr():
    a = gk.MoleculeSpec(symbols=("h", "H"), coordinates=((0, 0, 0), (0, 0, 0.74)))
    b = gk.MoleculeSpec(symbols=["H", "H"], coordinates=[[0, 0, 0], [0, 0, 0.74]], name="other name")
    assert a == b and hash(a) == hash(b)  # name is a label, not part of the physics
    assert a.symbols == ("H", "H")
    assert "H2" in repr(a) and "sto-3g" in repr(a)
    with pytest.raises(AttributeError):
        a.charge = 1  # frozen


def test_electron_count_and_multiplicity():
    oh = gk.MoleculeSpec(symbols=("O", "H"), coordinates=((0, 0, 0), (0, 0, 0.97)), multiplicity=2)
    assert oh.n_electrons == 9
    oh_minus = gk.MoleculeSpec(symbols=("O", "H"), coordinates=((0, 0, 0), (0, 0, 0.97)), charge=-1)
    assert oh_minus.n_electrons == 10


def test_from_xyz_with_and_without_header(tmp_path):
    body = "O 0 0 0\nH 0 0.757 0.587\nH 0 -0.757 0.587\n"
    with_header = gk.MoleculeSpec.from_xyz("3\nwater test\n" + body)
    bare = gk.MoleculeSpec.from_xyz(body)
    assert with_header == bare
    assert with_header.name == "water test"
    path = tmp_path / "w.xyz"
    path.write_text("3\nfrom file\n" + body)
    assert gk.MoleculeSpec.from_xyz(path) == bare
    assert gk.MoleculeSpec.from_xyz(str(path)).name == "from file"
    assert gk.MoleculeSpec.from_xyz(bare.to_xyz()) == bare


def test_bohr_and_with_coordinates():
    h2 = gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 1.4)), unit="bohr")
    assert math.isclose(h2.distance(0, 1), 1.4 / BOHR_PER_ANGSTROM)
    moved = h2.with_coordinates([(0, 0, 0), (0, 0, 0.9)], unit="angstrom")
    assert moved.unit == "angstrom" and math.isclose(moved.distance(0, 1), 0.9)
    assert h2.coordinates[1][2] == 1.4  # the original is untouched


def test_pipeline_shortcut():
    mol = gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.74)))
    assert isinstance(mol.pipeline(), gk.Pipeline)


# bad input: each row of the list -----------------------------------------------------------------------
def test_unknown_element_is_named():
    with pytest.raises(gk.ElementError, match="'Xx'"):
        gk.MoleculeSpec(symbols=("Xx", "H"), coordinates=((0, 0, 0), (0, 0, 1)))


@pytest.mark.parametrize("coords", [((0, 0, 0),), ((0, 0, 0), (0, 0)), ((0, 0, 0), (0, 0, float("nan"))),
                                    ((0, 0, 0), (0, float("inf"), 1)), ((0, 0, 0), ("a", 0, 1))])
def test_bad_coordinates(coords):
    with pytest.raises(gk.GeometryError):
        gk.MoleculeSpec(symbols=("H", "H"), coordinates=coords)


def test_atoms_too_close():
    with pytest.raises(gk.GeometryError, match="0.0500 Å apart"):
        gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.05)))


@pytest.mark.parametrize("charge", [2, 3])
def test_charge_leaving_no_or_negative_electrons(charge):
    with pytest.raises(gk.ChargeError, match=f"charge {charge}"):
        gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.74)), charge=charge)


@pytest.mark.parametrize("multiplicity", [0, -1, 2, 4])
def test_multiplicity_below_one_or_wrong_parity(multiplicity):
    with pytest.raises(gk.MultiplicityError, match=f"multiplicity {multiplicity}"):
        gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.74)), multiplicity=multiplicity)


def test_unknown_basis_says_how_to_find_valid_ones():
    with pytest.raises(gk.BasisError, match="pyscf.gto.basis.ALIAS"):
        gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.74)), basis="not-a-basis")


@pytest.mark.parametrize("text, line", [
    ("2\ncomment\nH 0 0 0\nH 0 0\n", 4),
    ("H 0 0 0\nH 0 zero 0.7\n", 2),
    ("2\n\nH 0 0 0\nQq 0 0 0.7\n", 4),
    ("3\ncomment\nH 0 0 0\nH 0 0 0.7\n", 1),
])
def test_malformed_xyz_names_the_line(text, line):
    with pytest.raises(gk.XYZFormatError, match=f"line {line}"):
        gk.MoleculeSpec.from_xyz(text)


def test_errors_are_value_errors():
    assert issubclass(gk.XYZFormatError, ValueError) and issubclass(gk.ActiveSpaceError, ValueError)


# Hill-order formulas, with and without carbon (common practice, no single source; Hill's indexing system) --------
@pytest.mark.parametrize("symbols, multiplicity, formula", [
    (("C", "O"), 1, "CO"),
    (("O", "C", "O"), 1, "CO2"),
    (("C", "N"), 2, "CN"),
    (("C", "C"), 1, "C2"),
    (("F", "C", "F", "F", "F"), 1, "CF4"),
    (("C",), 3, "C"),
    (("H", "C", "H", "H", "H"), 1, "CH4"),  # C, then H
    (("Cl", "H", "C", "H", "H"), 1, "CH3Cl"),  # C, H, then the rest alphabetically
    (("O", "H", "H"), 1, "H2O"),  # no carbon: all alphabetical
    (("N", "H", "H", "H"), 1, "H3N"),
    (("Na", "Cl"), 1, "ClNa"),
])
def test_formula_in_hill_order(symbols, multiplicity, formula):
    coords = tuple((0.0, 0.0, 1.2 * k) for k in range(len(symbols)))
    spec = gk.MoleculeSpec(symbols=symbols, coordinates=coords, multiplicity=multiplicity)
    assert spec.formula == formula  # Hill order (common practice, no single source)
    assert f"MoleculeSpec({formula}, {len(symbols)} atoms" in repr(spec)
    assert spec.to_xyz().splitlines()[1] == formula


@pytest.mark.slow
def test_carbon_without_hydrogen_in_errors_and_a_run():
    """CO and the C atom in STO-3G: the formula reaches error messages, reprs and a finished run's summary."""
    from pyscf import gto, mcscf, scf

    co = gk.MoleculeSpec(symbols=("C", "O"), coordinates=((0, 0, 0), (0, 0, 1.128)))  # NIST CCCBDB r_e (from memory)
    with pytest.raises(gk.ActiveSpaceError, match="CO has 14"):
        co.pipeline().active_space(electrons=16, orbitals=10).problem()
    carbon = gk.MoleculeSpec(symbols=("C",), coordinates=((0, 0, 0),), multiplicity=3)
    pipeline = carbon.pipeline().active_space(electrons=4, orbitals=4).trial_state(gk.UCCSD()).minimiser(gk.BFGS())
    assert repr(pipeline.problem()).startswith("Problem(C, 4e/4o")
    result = pipeline.run()
    assert result.converged and result.summary().startswith("MoleculeSpec(C, 1 atoms")
    mf = scf.ROHF(gto.M(atom="C 0 0 0", basis="sto-3g", spin=2, verbose=0)).run(conv_tol=1e-10)
    e_casci = mcscf.CASCI(mf, 4, (3, 1)).kernel()[0]
    assert result.energy == pytest.approx(e_casci, abs=1e-6)  # PySCF CASCI (reference library); 36 determinants


# bad input refused before PySCF (issue 13) ------------------------------------------------------------------------
H2 = dict(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.74)))


@pytest.mark.parametrize("value", [float("nan"), float("inf"), -float("inf"), None, "1", True, False, 0.5, [0]])
def test_charge_of_the_wrong_kind_names_the_value(value):
    with pytest.raises(gk.ChargeError, match=r"charge .* is not accepted; give an integer"):
        gk.MoleculeSpec(**H2, charge=value)


@pytest.mark.parametrize("value", [float("nan"), float("inf"), None, "1", True, 1.5, (1,)])
def test_multiplicity_of_the_wrong_kind_names_the_value(value):
    with pytest.raises(gk.MultiplicityError, match=r"multiplicity .* is not accepted; give an integer 2S\+1"):
        gk.MoleculeSpec(**H2, multiplicity=value)


def test_whole_numbers_of_other_types_are_accepted():
    import numpy as np

    spec = gk.MoleculeSpec(**H2, charge=np.int64(0), multiplicity=1.0)
    assert spec.charge == 0 and type(spec.charge) is int and spec.multiplicity == 1 and type(spec.multiplicity) is int


def test_helium_triplet_in_sto3g_is_refused_before_pyscf():
    from pyscf import gto, scf

    # PySCF (reference library) itself cannot place two alpha electrons in He/STO-3G's single orbital
    mol = gto.M(atom="He 0 0 0", basis="sto-3g", spin=2, verbose=0)
    with pytest.raises(RuntimeError, match="mo_occ"):
        scf.ROHF(mol).kernel()
    with pytest.raises(gk.MultiplicityError, match=r"2 alpha electrons .* 1 spatial orbital.* at most 1"):
        gk.MoleculeSpec(symbols=("He",), coordinates=((0, 0, 0),), multiplicity=3)
    # in cc-pVDZ (5 orbitals, PySCF's count) the triplet is possible
    assert gk.MoleculeSpec(symbols=("He",), coordinates=((0, 0, 0),), multiplicity=3, basis="cc-pvdz").n_unpaired == 2


def test_more_electrons_than_spin_orbitals_is_refused_with_the_possible_charge():
    from pyscf import gto, scf

    mol = gto.M(atom="H 0 0 0; H 0 0 0.74", basis="sto-3g", charge=-4, spin=0, verbose=0)
    with pytest.raises(RuntimeError, match="mo_occ"):  # PySCF (reference library) fails deep inside
        scf.RHF(mol).kernel()
    with pytest.raises(gk.ChargeError, match=r"charge -4 leaves 6 electrons .* 2 spatial orbitals \(4 spin "
                                             r"orbitals\); the charge must be at least -2"):
        gk.MoleculeSpec(**H2, charge=-4)
    assert gk.MoleculeSpec(**H2, charge=-2).n_electrons == 4  # 4 electrons fill the 4 spin orbitals


def test_open_shell_that_overfills_alpha_orbitals():
    # Li in STO-3G has 5 orbitals; a sextet (5 unpaired of 3 electrons) is impossible by parity, a quartet fits
    assert gk.MoleculeSpec(symbols=("Li",), coordinates=((0, 0, 0),), multiplicity=4).n_unpaired == 3
    # Li- (4 electrons) as a quintet needs 4 alpha electrons: fits 5 orbitals; Li 3- (6 e) septet needs 6 > 5
    with pytest.raises(gk.MultiplicityError, match="at most 5 fit"):
        gk.MoleculeSpec(symbols=("Li",), coordinates=((0, 0, 0),), charge=-3, multiplicity=7)


@pytest.mark.parametrize("far", [1e6, 1e300, 1e308])
def test_absurd_coordinates_are_refused_with_the_value(far):
    with pytest.raises(gk.GeometryError, match=r"within ±1000 Å"):
        gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, far)))


def test_molecule_extent_is_bounded_but_a_dissociation_limit_is_fine():
    fragments = gk.MoleculeSpec(symbols=("H", "H", "H", "H"),
                                coordinates=((0, 0, 0), (0, 0, 0.74), (50, 0, 0), (50, 0, 0.74)))
    assert fragments.distance(0, 2) == pytest.approx(50.0)
    with pytest.raises(gk.GeometryError, match=r"atoms 0 \(H\) and 1 \(H\) are 150 Å apart; .* at most 100 Å"):
        gk.MoleculeSpec(symbols=("H", "H"), coordinates=((-75, 0, 0), (75, 0, 0)))
    with pytest.raises(gk.GeometryError, match="within ±1000 Å"):  # 1e6 bohr is still absurd
        gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 1e6)), unit="bohr")


def test_coordinates_too_large_for_a_float_are_a_geometry_error():
    with pytest.raises(gk.GeometryError, match="not three numbers"):
        gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 10**400)))


def test_xyz_from_a_binary_file_a_directory_or_a_missing_file(tmp_path):
    binary = tmp_path / "image.xyz"
    binary.write_bytes(bytes(range(256)))
    for given in (binary, str(binary)):
        with pytest.raises(gk.XYZFormatError, match=r"is not UTF-8 text \(byte 0x80 at offset 128\)"):
            gk.MoleculeSpec.from_xyz(given)
    nul = tmp_path / "nul.xyz"
    nul.write_bytes(b"H 0 0 0\x00\x00")
    with pytest.raises(gk.XYZFormatError, match="NUL bytes"):
        gk.MoleculeSpec.from_xyz(nul)
    for given in (tmp_path, str(tmp_path)):
        with pytest.raises(gk.XYZFormatError, match="is a directory"):
            gk.MoleculeSpec.from_xyz(given)
    with pytest.raises(gk.XYZFormatError, match="cannot read XYZ file .*missing.xyz.*No such file"):
        gk.MoleculeSpec.from_xyz(tmp_path / "missing.xyz")
    with pytest.raises(gk.XYZFormatError, match="cannot read XYZ file"):
        gk.MoleculeSpec.from_xyz(str(tmp_path / "missing.xyz"))
    with pytest.raises(gk.XYZFormatError, match="takes XYZ text, bytes or a path"):
        gk.MoleculeSpec.from_xyz(42)


def test_xyz_from_bytes_and_an_unreadable_file(tmp_path):
    import os

    assert gk.MoleculeSpec.from_xyz(b"H 0 0 0\nH 0 0 0.74\n") == gk.MoleculeSpec(**H2)
    locked = tmp_path / "locked.xyz"
    locked.write_text("H 0 0 0\nH 0 0 0.74\n")
    locked.chmod(0)
    try:
        if os.access(locked, os.R_OK):  # running as root: permissions do not stop reading
            pytest.skip("this user can read a file of mode 000")
        with pytest.raises(gk.XYZFormatError, match="Permission denied"):
            gk.MoleculeSpec.from_xyz(locked)
    finally:
        locked.chmod(0o600)
