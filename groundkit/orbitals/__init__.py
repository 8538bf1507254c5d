"""Orbitals of the active space: the choice of orbital set (canonical, natural, CASSCF), orbital rotations and
orbital-optimised runs, and orbital continuity along scans. PySCF calls live in :mod:`.solvers` only."""

from .choice import ORBITAL_SETS, OrbitalBasis, orbital_basis

__all__ = ["ORBITAL_SETS", "OrbitalBasis", "orbital_basis"]
