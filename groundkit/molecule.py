"""MoleculeSpec: an immutable description of one molecule at one geometry, in one basis set."""

from __future__ import annotations

import math
import numbers
import os
from collections.abc import Iterable, Sequence
from dataclasses import dataclass, field, replace
from typing import TYPE_CHECKING, Any

import numpy as np

from .chemistry import atom_basis_size, check_basis
from .elements import atomic_number, canonical_symbol
from .errors import BasisError, ChargeError, ElementError, GeometryError, MultiplicityError, XYZFormatError
from .upcalls import upcall

if TYPE_CHECKING:  # pragma: no cover
    from .pipeline import Pipeline

BOHR_PER_ANGSTROM = 1.8897261245650618  # CODATA 2018 Bohr radius 0.529177210903 Å
MIN_DISTANCE_ANGSTROM = 0.1
MAX_EXTENT_ANGSTROM = 100.0
"""Largest distance between two atoms of one molecule (Å): fragments 50 Å apart (a dissociation limit) are fine,
1e6 Å is a unit or typing mistake."""
MAX_COORDINATE_ANGSTROM = 1000.0
"""Largest magnitude of any coordinate (Å, after conversion from bohr)."""
UNITS = ("angstrom", "bohr")


@dataclass(frozen=True)
class MoleculeSpec:
    """A molecule: element symbols, Cartesian coordinates (``unit``), charge, spin multiplicity 2S+1 and basis.

    Value object: equal specs compare and hash equal, so they key the SCF cache. Use :meth:`with_coordinates`
    for a new geometry.
    """

    symbols: tuple[str, ...]
    coordinates: tuple[tuple[float, float, float], ...]
    charge: int = 0
    multiplicity: int = 1
    basis: str = "sto-3g"
    unit: str = "angstrom"
    name: str | None = field(default=None, compare=False)

    def __post_init__(self) -> None:
        symbols = tuple(canonical_symbol(s) for s in _as_sequence(self.symbols, "symbols"))
        coords = _check_coordinates(self.coordinates, len(symbols))
        unit = str(self.unit).lower()
        if unit not in UNITS:
            raise GeometryError(f"unit {self.unit!r} is not accepted; use one of {UNITS}")
        if not isinstance(self.basis, str) or not self.basis.strip():
            raise BasisError(f"basis {self.basis!r} must be a basis-set name such as 'sto-3g' or 'cc-pvdz'")
        object.__setattr__(self, "symbols", symbols)
        object.__setattr__(self, "coordinates", coords)
        object.__setattr__(self, "unit", unit)
        object.__setattr__(self, "basis", self.basis.strip().lower())
        for symbol in set(symbols):
            check_basis(self.basis, symbol)
        _check_distances(symbols, self.coordinates_angstrom)
        charge, multiplicity = _whole_number(self.charge, "charge"), _whole_number(self.multiplicity, "multiplicity")
        _check_charge_and_spin(symbols, charge, multiplicity)
        n_orbitals = sum(atom_basis_size(self.basis, s)[0] for s in symbols)
        _check_occupation(self.basis, hill_formula(symbols), n_orbitals, charge, multiplicity,
                          sum(atomic_number(s) for s in symbols))
        object.__setattr__(self, "charge", charge)
        object.__setattr__(self, "multiplicity", multiplicity)

    # construction -------------------------------------------------------------------------------------------
    @classmethod
    def from_xyz(
        cls,
        text_or_path: str | bytes | os.PathLike,
        *,
        basis: str = "sto-3g",
        charge: int = 0,
        multiplicity: int = 1,
        unit: str = "angstrom",
        name: str | None = None,
    ) -> MoleculeSpec:
        """Read plain XYZ text (str or UTF-8 bytes) or a file: optional count and comment lines, then ``symbol x y z``
        per atom. A directory, a missing or unreadable file, or binary content raises XYZFormatError."""
        text = _read_text(text_or_path)
        symbols, coords, comment = parse_xyz(text)
        return cls(
            symbols=symbols,
            coordinates=coords,
            charge=charge,
            multiplicity=multiplicity,
            basis=basis,
            unit=unit,
            name=name if name is not None else (comment or None),
        )

    def with_coordinates(self, coordinates: Iterable[Sequence[float]], unit: str | None = None) -> MoleculeSpec:
        """The same molecule at new coordinates (in ``unit``, default this spec's unit)."""
        return replace(self, coordinates=tuple(tuple(c) for c in coordinates), unit=unit or self.unit)

    def with_options(self, **changes: Any) -> MoleculeSpec:
        """A copy with some fields changed (``basis``, ``charge``, ``multiplicity``, ``name``...)."""
        return replace(self, **changes)

    def pipeline(self) -> Pipeline:
        """A :class:`~groundkit.pipeline.Pipeline` for this molecule."""
        return upcall("pipeline", self)

    # derived facts --------------------------------------------------------------------------------------------
    @property
    def n_atoms(self) -> int:
        return len(self.symbols)

    @property
    def atomic_numbers(self) -> tuple[int, ...]:
        return tuple(atomic_number(s) for s in self.symbols)

    @property
    def n_electrons(self) -> int:
        """Total electron count: sum of atomic numbers minus the charge."""
        return sum(self.atomic_numbers) - self.charge

    @property
    def n_unpaired(self) -> int:
        """Unpaired electrons, multiplicity − 1 (= 2S)."""
        return self.multiplicity - 1

    @property
    def coordinates_angstrom(self) -> tuple[tuple[float, float, float], ...]:
        if self.unit == "angstrom":
            return self.coordinates
        return tuple(tuple(x / BOHR_PER_ANGSTROM for x in c) for c in self.coordinates)  # type: ignore[misc]

    @property
    def formula(self) -> str:
        """Hill-order formula: with carbon, C then H then the rest alphabetically ('CH4', 'CO2', 'CF4');
        without carbon, every element alphabetically ('H2O', 'H3N'). Counts of one are not written."""
        return hill_formula(self.symbols)

    def distance(self, i: int, j: int) -> float:
        """Distance between atoms ``i`` and ``j`` in angstrom."""
        a, b = self.coordinates_angstrom[i], self.coordinates_angstrom[j]
        return math.dist(a, b)

    def to_xyz(self) -> str:
        """XYZ text in angstrom, with the count and comment lines."""
        lines = [str(self.n_atoms), self.name or self.formula]
        for s, (x, y, z) in zip(self.symbols, self.coordinates_angstrom):
            lines.append(f"{s:<2} {x:14.8f} {y:14.8f} {z:14.8f}")
        return "\n".join(lines) + "\n"

    def _repr_html_(self) -> str:
        return upcall("html:molecule", self)

    def __repr__(self) -> str:
        label = f"{self.name!r}, " if self.name else ""
        charge = f", charge={self.charge:+d}" if self.charge else ""
        return (
            f"MoleculeSpec({label}{self.formula}, {self.n_atoms} atoms, basis={self.basis!r}{charge}, "
            f"multiplicity={self.multiplicity}, unit={self.unit!r})"
        )


# helpers --------------------------------------------------------------------------------------------------------
def hill_formula(symbols: Iterable[str]) -> str:
    """Hill-order formula of a list of element symbols (common practice, no single source; e.g. the CAS and
    NIST Chemistry WebBook indexes): C first and H second when carbon is present, then alphabetical; without
    carbon, all alphabetical."""
    counts: dict[str, int] = {}
    for symbol in symbols:
        counts[symbol] = counts.get(symbol, 0) + 1
    if "C" in counts:
        leading = ["C"] + (["H"] if "H" in counts else [])
    else:
        leading = []
    order = leading + sorted(k for k in counts if k not in leading)
    return "".join(f"{k}{counts[k] if counts[k] > 1 else ''}" for k in order)


def _as_sequence(value: Any, what: str) -> tuple:
    if isinstance(value, str):
        value = value.split()
    try:
        return tuple(value)
    except TypeError:
        raise GeometryError(f"{what} must be a sequence, got {value!r}") from None


def _check_coordinates(coordinates: Any, n_atoms: int) -> tuple[tuple[float, float, float], ...]:
    rows = _as_sequence(coordinates, "coordinates")
    if len(rows) != n_atoms:
        raise GeometryError(f"coordinates have {len(rows)} rows for {n_atoms} atoms; give one (x, y, z) per atom")
    out = []
    for k, row in enumerate(rows):
        try:
            values = tuple(float(x) for x in row)
        except (TypeError, ValueError, OverflowError):
            raise GeometryError(f"coordinates row {k} = {row!r} is not three numbers (x, y, z)") from None
        if len(values) != 3:
            raise GeometryError(f"coordinates row {k} = {row!r} has {len(values)} values; give three (x, y, z)")
        if not all(math.isfinite(x) for x in values):
            raise GeometryError(f"coordinates row {k} = {row!r} is not finite; give finite numbers")
        out.append(values)
    if n_atoms == 0:
        raise GeometryError("a molecule needs at least one atom; symbols was empty")
    return tuple(out)  # type: ignore[return-value]


def _check_distances(symbols: tuple[str, ...], coords: tuple[tuple[float, float, float], ...]) -> None:
    """Every coordinate within ±MAX_COORDINATE_ANGSTROM, atoms at least MIN_DISTANCE_ANGSTROM apart and at most
    MAX_EXTENT_ANGSTROM apart (all in Å)."""
    xyz = np.asarray(coords, dtype=float).reshape(-1, 3)
    far = np.flatnonzero(np.abs(xyz).max(axis=1) > MAX_COORDINATE_ANGSTROM)
    if far.size:
        k = int(far[0])
        raise GeometryError(
            f"atom {k} ({symbols[k]}) is at {tuple(float(x) for x in xyz[k])} Å; every coordinate must lie within "
            f"±{MAX_COORDINATE_ANGSTROM:g} Å of the origin (check the unit)"
        )
    for i in range(1, len(xyz)):
        d = np.sqrt(((xyz[:i] - xyz[i]) ** 2).sum(axis=1))
        j = int(np.argmin(d))
        if d[j] < MIN_DISTANCE_ANGSTROM:
            raise GeometryError(
                f"atoms {j} ({symbols[j]}) and {i} ({symbols[i]}) are {d[j]:.4f} Å apart; "
                f"atoms must be at least {MIN_DISTANCE_ANGSTROM} Å apart (check the unit)"
            )
        j = int(np.argmax(d))
        if d[j] > MAX_EXTENT_ANGSTROM:
            raise GeometryError(
                f"atoms {j} ({symbols[j]}) and {i} ({symbols[i]}) are {d[j]:.6g} Å apart; atoms of one molecule "
                f"must be at most {MAX_EXTENT_ANGSTROM:g} Å apart (fragments 50 Å apart model a dissociation "
                "limit; check the unit and the coordinates)"
            )


def _whole_number(value: Any, what: str) -> int:
    """``value`` as an int: an integer or a float with an integral value; never a bool, None, string, NaN or inf."""
    error = ChargeError if what == "charge" else MultiplicityError
    accepted = ("an integer such as 0, 1 or -1" if what == "charge"
                else "an integer 2S+1 >= 1 (1 singlet, 2 doublet, 3 triplet, ...)")
    if isinstance(value, (bool, np.bool_)) or not isinstance(value, (numbers.Integral, numbers.Real)):
        raise error(f"{what} {value!r} ({type(value).__name__}) is not accepted; give {accepted}")
    if isinstance(value, numbers.Integral):
        return int(value)
    number = float(value)
    if not math.isfinite(number) or number != int(number):
        raise error(f"{what} {value!r} is not accepted; give {accepted}")
    return int(number)


def _check_charge_and_spin(symbols: tuple[str, ...], charge: int, multiplicity: int) -> None:
    n_electrons = sum(atomic_number(s) for s in symbols) - int(charge)
    if n_electrons <= 0:
        raise ChargeError(
            f"charge {charge} leaves {n_electrons} electrons; the charge must be below "
            f"{sum(atomic_number(s) for s in symbols)} (the nuclear charge) for this molecule"
        )
    multiplicity = int(multiplicity)
    if multiplicity < 1:
        raise MultiplicityError(f"multiplicity {multiplicity} is below 1; use 2S+1 (1 singlet, 2 doublet, ...)")
    unpaired = multiplicity - 1
    if unpaired % 2 != n_electrons % 2 or unpaired > n_electrons:
        accepted = "even: 2, 4, 6, ..." if n_electrons % 2 else "odd: 1, 3, 5, ..."
        raise MultiplicityError(
            f"multiplicity {multiplicity} does not fit {n_electrons} electrons; with this electron count the "
            f"multiplicity must be {accepted} and at most {n_electrons + 1}"
        )


def _check_occupation(basis: str, formula: str, n_orbitals: int, charge: int, multiplicity: int,
                      nuclear_charge: int) -> None:
    """The electrons must fit the basis: at most 2 per spatial orbital, and the alpha electrons (N + 2S)/2 at most
    one per orbital. Refused here, before PySCF is called (PySCF itself fails with 'Failed to assign mo_occ')."""
    n_electrons = nuclear_charge - charge
    n_unpaired = multiplicity - 1
    n_alpha = (n_electrons + n_unpaired) // 2
    if n_electrons > 2 * n_orbitals:
        raise ChargeError(
            f"charge {charge:+d} leaves {n_electrons} electrons but {formula} in {basis} has {n_orbitals} spatial "
            f"orbitals ({2 * n_orbitals} spin orbitals); the charge must be at least "
            f"{nuclear_charge - 2 * n_orbitals:+d} (at most {2 * n_orbitals} electrons) in this basis"
        )
    if n_alpha > n_orbitals:
        highest = min(n_electrons, 2 * n_orbitals - n_electrons) + 1
        raise MultiplicityError(
            f"multiplicity {multiplicity} puts {n_alpha} alpha electrons ({n_unpaired} unpaired of {n_electrons}) "
            f"in {n_orbitals} spatial orbital(s) of {formula} in {basis}; at most {n_orbitals} fit, so the "
            f"multiplicity can be at most {highest} here (or choose a larger basis set)"
        )


def _read_text(text_or_path: str | bytes | os.PathLike) -> str:
    """XYZ text itself, or the content of the file it names; XYZFormatError for a directory, a missing or
    unreadable file, or content that is not UTF-8 text."""
    if isinstance(text_or_path, (bytes, bytearray)):
        return _decode(bytes(text_or_path), "the bytes given")
    if isinstance(text_or_path, os.PathLike):
        return _read_file(os.fspath(text_or_path))
    if not isinstance(text_or_path, str):
        raise XYZFormatError(
            f"from_xyz takes XYZ text, bytes or a path, got {type(text_or_path).__name__} {text_or_path!r:.60}"
        )
    text = text_or_path
    stripped = text.strip()
    if "\n" not in stripped and "\x00" not in stripped and (os.path.exists(stripped)
                                                          or stripped.lower().endswith(".xyz")):
        return _read_file(stripped)
    return text


def _read_file(path: str) -> str:
    if os.path.isdir(path):
        raise XYZFormatError(f"{path!r} is a directory; give an XYZ file or XYZ text")
    try:
        with open(path, "rb") as fh:
            data = fh.read()
    except OSError as err:
        raise XYZFormatError(f"cannot read XYZ file {path!r}: {err.strerror or err}") from None
    return _decode(data, f"file {path!r}")


def _decode(data: bytes, what: str) -> str:
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as err:
        raise XYZFormatError(
            f"{what} is not UTF-8 text (byte 0x{data[err.start]:02x} at offset {err.start}); an XYZ file is plain "
            "text: a count line, a comment line, then 'symbol x y z' per atom"
        ) from None
    if "\x00" in text:
        raise XYZFormatError(f"{what} holds NUL bytes, so it is binary, not XYZ text")
    return text


def parse_xyz(text: str) -> tuple[tuple[str, ...], tuple[tuple[float, float, float], ...], str]:
    """Parse XYZ text: returns (symbols, coordinates, comment). Header lines are optional."""
    lines = text.splitlines()
    while lines and not lines[-1].strip():
        lines.pop()
    start, comment, expected = 0, "", None
    while start < len(lines) and not lines[start].strip():
        start += 1
    if start < len(lines) and lines[start].strip().isdecimal() and lines[start].strip().isascii():
        expected = int(lines[start].strip()[:30])
        comment = lines[start + 1].strip() if start + 1 < len(lines) else ""
        start += 2
    symbols: list[str] = []
    coords: list[tuple[float, float, float]] = []
    for number, line in enumerate(lines[start:], start=start + 1):
        fields = line.split()
        if not fields:
            raise XYZFormatError(f"line {number} is empty inside the atom block; expected 'symbol x y z'")
        if len(fields) < 4:
            raise XYZFormatError(f"line {number}: {line.strip()!r} has {len(fields)} fields; expected 'symbol x y z'")
        try:
            xyz = (float(fields[1]), float(fields[2]), float(fields[3]))
        except (ValueError, OverflowError):
            raise XYZFormatError(f"line {number}: {line.strip()!r} has coordinates that are not numbers") from None
        try:
            symbols.append(canonical_symbol(fields[0]))
        except ElementError as err:
            raise XYZFormatError(f"line {number}: {err}") from None
        coords.append(xyz)
    if not symbols:
        raise XYZFormatError("no atoms found; expected lines of 'symbol x y z' (optionally after a count and comment)")
    if expected is not None and expected != len(symbols):
        raise XYZFormatError(f"line {start - 1}: the count line says {expected} atoms but {len(symbols)} follow")
    return tuple(symbols), tuple(coords), comment

