"""The determinant space of fixed electron numbers per spin: strings, sizes and single-determinant states."""

from __future__ import annotations

from math import comb

import numpy as np

from groundkit.errors import ComponentError, SizeLimitError
from groundkit.sector.strings import determinant_label, interleaved_signs, make_strings

MAX_DETERMINANTS = 50_000_000
"""Largest sector the engine builds: a CI array of 5e7 determinants takes 400 MB, and the engine keeps a few."""


def sector_size(n_orbitals: int, n_alpha: int, n_beta: int) -> int:
    """Number of determinants, C(n, n_alpha) * C(n, n_beta)."""
    return comb(n_orbitals, n_alpha) * comb(n_orbitals, n_beta)


class Sector:
    """Determinants with ``n_alpha`` alpha and ``n_beta`` beta electrons in ``n_orbitals`` spatial orbitals."""

    def __init__(self, n_orbitals: int, n_alpha: int, n_beta: int, max_determinants: int = MAX_DETERMINANTS):
        self.n_orbitals = int(n_orbitals)
        self.n_alpha = int(n_alpha)
        self.n_beta = int(n_beta)
        size = sector_size(self.n_orbitals, self.n_alpha, self.n_beta)
        if size > max_determinants:
            raise SizeLimitError(
                f"{size:,} determinants ({self.n_orbitals} orbitals, {self.n_alpha} alpha and {self.n_beta} beta "
                f"electrons) exceed the engine's limit of {max_determinants:,}; choose a smaller active space"
            )
        self.alpha_strings = make_strings(self.n_orbitals, self.n_alpha)
        self.beta_strings = make_strings(self.n_orbitals, self.n_beta)
        self._signs: np.ndarray | None = None

    @property
    def shape(self) -> tuple[int, int]:
        """(number of alpha strings, number of beta strings)."""
        return (self.alpha_strings.size, self.beta_strings.size)

    @property
    def size(self) -> int:
        """Number of determinants."""
        return self.alpha_strings.size * self.beta_strings.size

    @property
    def n_spin_orbitals(self) -> int:
        """2 * n_orbitals."""
        return 2 * self.n_orbitals

    def index(self, alpha: int, beta: int) -> tuple[int, int]:
        """Row and column of the determinant (alpha string, beta string) in a CI array."""
        ia = int(np.searchsorted(self.alpha_strings, alpha))
        ib = int(np.searchsorted(self.beta_strings, beta))
        if ia >= self.alpha_strings.size or self.alpha_strings[ia] != alpha:
            raise ComponentError(
                f"alpha string {alpha:#b} has not {self.n_alpha} electrons in {self.n_orbitals} orbitals"
            )
        if ib >= self.beta_strings.size or self.beta_strings[ib] != beta:
            raise ComponentError(
                f"beta string {beta:#b} has not {self.n_beta} electrons in {self.n_orbitals} orbitals"
            )
        return ia, ib

    def determinant(self, alpha: int, beta: int) -> np.ndarray:
        """CI array of the single determinant (alpha string, beta string) with coefficient +1 (PySCF sign)."""
        ci = np.zeros(self.shape)
        ci[self.index(alpha, beta)] = 1.0
        return ci

    def interleaved_signs(self) -> np.ndarray:
        """Sign per determinant from PySCF's alpha-before-beta order to OpenFermion's interleaved order (cached)."""
        if self._signs is None:
            self._signs = interleaved_signs(self.alpha_strings, self.beta_strings)
        return self._signs

    def label(self, ia: int, ib: int) -> str:
        """Occupation label ('2', 'a', 'b', '0' per spatial orbital) of the determinant at (ia, ib)."""
        return determinant_label(int(self.alpha_strings[ia]), int(self.beta_strings[ib]), self.n_orbitals)


def lowest_strings(n_alpha: int, n_beta: int) -> tuple[int, int]:
    """Strings of the determinant filling the lowest orbitals: the Hartree-Fock determinant in canonical orbitals."""
    return (1 << n_alpha) - 1, (1 << n_beta) - 1
