"""Linear encodings from the Jordan–Wigner image by Clifford conjugation, against OpenFermion's own transforms."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pytest
from openfermion import (
    BinaryCode,
    FermionOperator,
    binary_code_transform,
    bravyi_kitaev,
    bravyi_kitaev_code,
    get_fermion_operator,
    linearize_decoder,
    parity_code,
)

import groundkit as gk
from groundkit.qubits.gf2 import inverse
from groundkit.qubits.linear_images import linear_image


def _same(a, b) -> bool:
    difference = a - b
    difference.compress(1e-12)
    return not difference.terms


@pytest.fixture(scope="module")
def lih_hamiltonian():
    spec = gk.MoleculeSpec(symbols=("Li", "H"), coordinates=((0, 0, 0), (0, 0, 1.5949)), basis="sto-3g")
    problem = gk.Pipeline(spec).active_space(electrons=2, orbitals=4).problem()
    return problem.fermion_hamiltonian(), problem.n_qubits


def _random_operator(n: int, seed: int) -> FermionOperator:
    rng = np.random.default_rng(seed)
    out = FermionOperator()
    for _ in range(40):
        k = int(rng.integers(1, 5))
        term = tuple((int(rng.integers(n)), int(rng.integers(2))) for _ in range(k))
        out += FermionOperator(term, complex(rng.normal(), rng.normal()))
    return out


def _random_invertible(n: int, seed: int) -> np.ndarray:
    rng = np.random.default_rng(seed)
    while True:
        m = rng.integers(0, 2, (n, n)).astype(np.uint8)
        try:
            inverse(m)
            return m
        except ValueError:
            continue


def test_parity_hamiltonian_equals_openfermion_binary_code_transform(lih_hamiltonian):
    hamiltonian, n = lih_hamiltonian
    reference = binary_code_transform(get_fermion_operator(hamiltonian), parity_code(n))  # OpenFermion
    mine = gk.QubitMapping("parity").transform(hamiltonian, n)
    assert len(mine.terms) == len(reference.terms) and _same(mine, reference)


def test_bravyi_kitaev_matrix_gives_openfermion_bravyi_kitaev(lih_hamiltonian):
    hamiltonian, n = lih_hamiltonian
    mine = linear_image(hamiltonian, bravyi_kitaev_code(n).encoder.toarray())
    assert _same(mine, bravyi_kitaev(get_fermion_operator(hamiltonian), n_qubits=n))  # OpenFermion


@pytest.mark.parametrize("seed", [1, 2, 3])
def test_any_invertible_matrix_equals_openfermion_on_random_operators(seed):
    n = 6
    matrix = _random_invertible(n, seed)
    code = BinaryCode(matrix.astype(int), linearize_decoder(inverse(matrix).astype(int)))
    operator = _random_operator(n, seed)
    assert _same(linear_image(operator, matrix), binary_code_transform(operator, code))  # OpenFermion


def test_a_user_linear_mapping_transform_equals_openfermion(lih_hamiltonian):
    hamiltonian, n = lih_hamiltonian

    @dataclass(frozen=True, repr=False)
    class Shuffled(gk.LinearMapping):
        def basis_matrix(self, n_modes: int) -> np.ndarray:
            return _random_invertible(n_modes, 11)

    from groundkit.qubits.transforms import linear_code

    reference = binary_code_transform(get_fermion_operator(hamiltonian), linear_code(Shuffled(), n))  # OpenFermion
    assert _same(Shuffled().transform(hamiltonian, n), reference)


def test_parity_basis_matrix_is_the_lower_triangle():
    expected = np.tril(np.ones((5, 5), dtype=np.uint8))  # qubit k: parity of modes 0..k (from memory)
    assert np.array_equal(gk.QubitMapping("parity").basis_matrix(5), expected)


@pytest.mark.parametrize("name", ["jordan-wigner", "parity", "bravyi-kitaev"])
def test_encoding_hamiltonian_from_the_shared_jordan_wigner_image_equals_openfermion(name, lih_hamiltonian):
    from groundkit.qubits.transforms import hamiltonian_image

    hamiltonian, n = lih_hamiltonian
    spec = gk.MoleculeSpec(symbols=("Li", "H"), coordinates=((0, 0, 0), (0, 0, 1.5949)), basis="sto-3g")
    problem = gk.Pipeline(spec).active_space(electrons=2, orbitals=4).problem()
    fermion = get_fermion_operator(hamiltonian)
    reference = {"jordan-wigner": lambda: __import__("openfermion").jordan_wigner(fermion),  # OpenFermion
                 "parity": lambda: binary_code_transform(fermion, parity_code(n)),  # OpenFermion
                 "bravyi-kitaev": lambda: bravyi_kitaev(fermion, n_qubits=n)}[name]()  # OpenFermion
    image = hamiltonian_image(problem, gk.QubitMapping(name), n)
    assert _same(image, reference)
    image.terms.clear()  # a new operator each time: the kept Jordan–Wigner image is untouched
    assert _same(hamiltonian_image(problem, gk.QubitMapping(name), n), reference)
