"""Occupation strings of one spin: re-exports :mod:`groundkit.occupation_strings` (the chemistry layer, so the
exact reference can label determinants without importing the engine)."""

from ..occupation_strings import (
    determinant_label,
    interleaved_index,
    interleaved_signs,
    make_strings,
    occupied,
    popcount,
)

__all__ = ['determinant_label', 'interleaved_index', 'interleaved_signs', 'make_strings', 'occupied', 'popcount']
