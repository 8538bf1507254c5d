"""Determinant-space engine: CI vectors over (alpha-string, beta-string) pairs.

One concept per module: :mod:`strings` (occupation strings, labels, the interleaved sign), :mod:`space` (the
sector of fixed electron numbers per spin), :mod:`excitation` (excitations and their checks), :mod:`tables` (where
an excitation sends each determinant), :mod:`exponential` (G and exp(theta G)), :mod:`hamiltonian` (H.psi through
PySCF), :mod:`adjoint` (all derivatives in one backward sweep), :mod:`spin` (<S^2>), :mod:`perturbation`
(first-order amplitudes).
"""

from groundkit.sector.adjoint import energy_and_angle_gradient
from groundkit.sector.excitation import Excitation, as_excitation, check_excitation, check_excitations
from groundkit.sector.exponential import apply_exponential, apply_generator, apply_product
from groundkit.sector.hamiltonian import SectorHamiltonian
from groundkit.sector.space import MAX_DETERMINANTS, Sector, lowest_strings, sector_size
from groundkit.sector.spin import spin_square
from groundkit.sector.tables import ExcitationTable, excitation_table, excitation_tables

__all__ = [
    "MAX_DETERMINANTS",
    "Excitation",
    "ExcitationTable",
    "Sector",
    "SectorHamiltonian",
    "apply_exponential",
    "apply_generator",
    "apply_product",
    "as_excitation",
    "check_excitation",
    "check_excitations",
    "energy_and_angle_gradient",
    "excitation_table",
    "excitation_tables",
    "lowest_strings",
    "sector_size",
    "spin_square",
]
