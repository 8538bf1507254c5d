"""Orbital continuity along scans: CASSCF started from the previous point's orbitals (placeholder)."""

from __future__ import annotations

from typing import Any

import numpy as np


def casscf_start(molecule: Any, scf: Any, core: list[int], active: list[int]) -> np.ndarray | None:
    """Start orbitals for the CASSCF of ``molecule`` (core, active, external order), or None for canonical."""
    return None
