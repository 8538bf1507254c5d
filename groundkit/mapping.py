"""Fermion-to-qubit mappings as values: each registered mapping class carries its transform.

``QubitMapping("parity", taper=True)`` builds the mapping registered as "parity" (the class :class:`Parity`);
``QubitMapping()`` is Jordan–Wigner. Every mapping has

- ``transform(operator, n_modes)``: the image (an ``openfermion.QubitOperator``) of a FermionOperator or
  InteractionOperator on ``n_modes`` spin orbitals;
- ``basis_matrix(n_modes)``: the 0/1 matrix M with qubit bits b = M n (mod 2) for occupations n, which the
  embedding of determinants, tapering and circuits use. By default it is read off the images of the number
  operators; a mapping that is not linear in this sense cannot be used for those.

A mapping of your own defined by its binary matrix is a small :class:`LinearMapping` subclass that implements
``basis_matrix``; its transform is OpenFermion's ``binary_code_transform`` of that code (see docs/components.md).
``taper=True`` removes the qubits of the Z2 symmetries (electron-number parities) of any mapping.
"""

from __future__ import annotations

from abc import abstractmethod
from dataclasses import dataclass, fields
from typing import Any

import numpy as np

from .component import Component
from .constraints import Bool
from .registry import lookup, name_of, register


@dataclass(frozen=True, repr=False)
class QubitMapping(Component, role="mapping"):
    """``QubitMapping("parity", taper=True)``. Built-in names: 'jordan-wigner', 'bravyi-kitaev', 'parity'."""

    taper: bool = False

    constraints = {"taper": Bool()}

    @classmethod
    def _by_name(cls, name: str = "jordan-wigner", taper: bool = False, **options: Any) -> QubitMapping:
        """``QubitMapping(name, taper=..., **options)``: the mapping class registered as ``name``."""
        mapping_class = lookup("mapping", name)
        return mapping_class(taper=taper, **options)

    @classmethod
    def display_name(cls) -> str:
        """``QubitMapping('parity')`` for a registered mapping (as users write it), else the class name."""
        from .registry import entry_of

        entry = entry_of(cls)
        return f"QubitMapping({entry.name!r})" if entry is not None else cls.__name__

    @property
    def name(self) -> str:
        """The registered name ('jordan-wigner', 'bravyi-kitaev', 'parity', or a user's); the class name for a
        mapping that is not registered (it runs, but cannot be saved in a record or chosen by name)."""
        from .registry import entry_of

        return name_of(self) if entry_of(self) is not None else type(self).__name__

    @abstractmethod
    def transform(self, operator: Any, n_modes: int) -> Any:
        """The ``openfermion.QubitOperator`` image of ``operator`` (FermionOperator or InteractionOperator)."""

    def basis_matrix(self, n_modes: int) -> np.ndarray:
        """0/1 matrix M (n_modes x n_modes) with qubit bits b = M n mod 2, read off the number operators."""
        from .qubits.transforms import matrix_from_number_operators

        return matrix_from_number_operators(self, n_modes)

    def untapered(self) -> QubitMapping:
        """The same mapping with ``taper=False`` (the transform and matrix do not depend on tapering)."""
        return self if not self.taper else type(self)(**{**self.options(), "taper": False})

    def __repr__(self) -> str:
        from .registry import entry_of

        extra = [f"{f.name}={getattr(self, f.name)!r}" for f in fields(self) if f.name != "taper"]
        tail = ", taper=True" if self.taper else ""
        if not extra and entry_of(self) is not None:
            return f"QubitMapping({self.name!r}{tail})"
        return f"{type(self).__name__}({', '.join(extra)}{tail})"


def _fermion(operator: Any) -> Any:
    from openfermion import FermionOperator, get_fermion_operator

    return operator if isinstance(operator, FermionOperator) else get_fermion_operator(operator)


@register("mapping", "jordan-wigner", aliases=("jw",), label="Jordan–Wigner")
@dataclass(frozen=True, repr=False)
class JordanWigner(QubitMapping):
    """Jordan–Wigner: qubit k holds the occupation of spin orbital k (OpenFermion's ``jordan_wigner``)."""

    def transform(self, operator: Any, n_modes: int) -> Any:
        from openfermion import jordan_wigner

        return jordan_wigner(operator)


@register("mapping", "bravyi-kitaev", aliases=("bk",), label="Bravyi–Kitaev")
@dataclass(frozen=True, repr=False)
class BravyiKitaev(QubitMapping):
    """Bravyi–Kitaev (OpenFermion's ``bravyi_kitaev`` on ``n_modes`` qubits)."""

    def transform(self, operator: Any, n_modes: int) -> Any:
        from openfermion import bravyi_kitaev

        return bravyi_kitaev(_fermion(operator), n_qubits=n_modes)


@register("mapping", "parity", label="parity")
@dataclass(frozen=True, repr=False)
class Parity(QubitMapping):
    """The parity encoding: qubit k holds the parity of spin orbitals 0..k (OpenFermion's ``parity_code``)."""

    def basis_matrix(self, n_modes: int) -> np.ndarray:
        """The encoder matrix of OpenFermion's ``parity_code``: lower triangle of ones."""
        from openfermion import parity_code

        return np.asarray(parity_code(n_modes).encoder.toarray(), dtype=np.uint8)

    def transform(self, operator: Any, n_modes: int) -> Any:
        """Equal to OpenFermion's ``binary_code_transform`` with ``parity_code``, computed from the Jordan–Wigner
        image (see :mod:`groundkit.qubits.linear_images`)."""
        from .qubits.linear_images import linear_image
        from .qubits.transforms import basis_matrix

        return linear_image(operator, basis_matrix(self, n_modes))


@dataclass(frozen=True, repr=False)
class LinearMapping(QubitMapping):
    """A mapping given by its binary matrix: implement ``basis_matrix(n_modes)`` (an invertible 0/1 matrix M,
    qubit bits b = M n mod 2); the transform is OpenFermion's ``binary_code_transform`` with encoder M and the
    linear decoder M^-1 (mod 2), computed from the Jordan–Wigner image by one Clifford conjugation
    (:mod:`groundkit.qubits.linear_images`). Register the subclass to use it by name."""

    @abstractmethod
    def basis_matrix(self, n_modes: int) -> np.ndarray:
        """The 0/1 matrix M (n_modes x n_modes) of the encoding for ``n_modes`` spin orbitals."""

    def transform(self, operator: Any, n_modes: int) -> Any:
        from .qubits.linear_images import linear_image
        from .qubits.transforms import basis_matrix

        return linear_image(operator, basis_matrix(self, n_modes))


MAPPINGS = ("jordan-wigner", "bravyi-kitaev", "parity")
"""The built-in mapping names (every registered name: ``groundkit.registry.names("mapping")``)."""
