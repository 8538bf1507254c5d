"""Ready-made geometry functions for scans."""

from __future__ import annotations

import math
from dataclasses import dataclass

from groundkit.molecule import MoleculeSpec

from .errors import ScanInputError


@dataclass(frozen=True)
class BondStretch:
    """``BondStretch(molecule, i, j)(r)``: the molecule with atom ``j`` moved along the i→j direction so that the
    i–j distance is ``r`` (the molecule's unit); every other atom stays put."""

    molecule: MoleculeSpec
    i: int = 0
    j: int = 1

    def __post_init__(self) -> None:
        n = self.molecule.n_atoms
        if self.i == self.j or not (0 <= self.i < n and 0 <= self.j < n):
            raise ScanInputError(f"atoms ({self.i}, {self.j}) must be two different indices in 0..{n - 1}")

    def __call__(self, r: float) -> MoleculeSpec:
        coords = [list(c) for c in self.molecule.coordinates]
        a, b = coords[self.i], coords[self.j]
        d = math.dist(a, b)
        unit = [(b[k] - a[k]) / d for k in range(3)]
        coords[self.j] = [a[k] + float(r) * unit[k] for k in range(3)]
        return self.molecule.with_coordinates(coords)
