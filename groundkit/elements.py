"""Element symbols and atomic numbers (periodic table up to Rn), and frozen-core orbital counts."""

from __future__ import annotations

from .errors import ElementError

SYMBOLS = (
    "H He Li Be B C N O F Ne Na Mg Al Si P S Cl Ar K Ca Sc Ti V Cr Mn Fe Co Ni Cu Zn Ga Ge As Se Br Kr "
    "Rb Sr Y Zr Nb Mo Tc Ru Rh Pd Ag Cd In Sn Sb Te I Xe Cs Ba La Ce Pr Nd Pm Sm Eu Gd Tb Dy Ho Er Tm Yb Lu "
    "Hf Ta W Re Os Ir Pt Au Hg Tl Pb Bi Po At Rn"
).split()
_NUMBER = {s.lower(): z for z, s in enumerate(SYMBOLS, start=1)}
_ALIASES = {"d": "H", "t": "H"}  # deuterium and tritium: same electrons and basis functions as H


def canonical_symbol(symbol: object) -> str:
    """'h' -> 'H', 'CL' -> 'Cl', 'd' -> 'H'; raises ElementError naming the bad symbol."""
    text = str(symbol).strip()
    key = text.lower()
    if key in _ALIASES:
        return _ALIASES[key]
    if key not in _NUMBER:
        raise ElementError(f"unknown element symbol {text!r}; use a symbol of the periodic table H..Rn, e.g. 'O'")
    return SYMBOLS[_NUMBER[key] - 1]


def atomic_number(symbol: str) -> int:
    """Nuclear charge Z of an element symbol."""
    return _NUMBER[canonical_symbol(symbol).lower()]


# Core spatial orbitals frozen per atom, by the last noble-gas shell below the element (common practice, no
# single source): none for H-He, 1s for Li-Ne, 1s2s2p for Na-Ar, [Ne]3s3p for K-Kr, [Ar]3d4s4p for Rb-Xe,
# [Kr]4d5s5p for Cs-Rn.
_CORE_BY_ROW = ((2, 0), (10, 1), (18, 5), (36, 9), (54, 18), (86, 27))


def frozen_core_orbitals(symbol: str) -> int:
    """Number of core spatial orbitals of one atom that a frozen-core calculation leaves uncorrelated."""
    z = atomic_number(symbol)
    for last_z, n_core in _CORE_BY_ROW:
        if z <= last_z:
            return n_core
    raise ElementError(f"no frozen-core rule for {symbol!r} (Z={z}); frozen core is defined up to Rn")
