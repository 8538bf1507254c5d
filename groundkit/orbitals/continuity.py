"""Orbital continuity along scans: CASSCF started from the previous point's orbitals, and jumps detected.

A scan point whose active space uses CASSCF orbitals hands its orbitals to the next point (key
``casscf_orbitals`` of the warm-start handover). The next CASSCF starts from them, projected onto the new
geometry's basis functions (``C = S_new^-1 S(old, new)^T C_old``, then orthonormalised in the new overlap metric),
so it follows the same solution instead of starting afresh from canonical orbitals. After it converges, the
active spaces of the two points are compared: the smallest singular value of ``C_old,act^T S(old, new)
C_new,act`` is 1 for the same space and falls towards 0 when the CASSCF has moved to another solution (another
set of orbitals in the space). Below :data:`JUMP_OVERLAP` the point is reported as a jump.
"""

from __future__ import annotations

from collections.abc import Iterator
from contextlib import contextmanager
from contextvars import ContextVar
from typing import Any

import numpy as np

JUMP_OVERLAP = 0.9
"""Smallest singular value of the active-space overlap between neighbouring points below which the CASSCF is
reported to have jumped to another solution (dimensionless; neighbouring points of a smooth curve give 0.99+)."""

_GUIDE: ContextVar[tuple[Any, np.ndarray] | None] = ContextVar("casscf_guide", default=None)


@contextmanager
def casscf_guide(previous: Any, orbitals: np.ndarray) -> Iterator[None]:
    """Inside the block, CASSCF orbitals of a molecule with the same atoms and basis start from ``orbitals``
    (n_ao, n_mo; core, active, external) of the molecule ``previous``, projected."""
    token = _GUIDE.set((previous, np.asarray(orbitals, dtype=float)))
    try:
        yield
    finally:
        _GUIDE.reset(token)


def casscf_start(molecule: Any, scf: Any, core: list[int], active: list[int]) -> np.ndarray | None:
    """Start orbitals for the CASSCF of ``molecule`` (core, active, external order) from the guide set by
    :func:`casscf_guide`, or None (canonical orbitals) outside one or for another kind of molecule."""
    guide = _GUIDE.get()
    if guide is None:
        return None
    previous, orbitals = guide
    if previous.symbols != molecule.symbols or previous.basis != molecule.basis or \
            orbitals.shape != scf.mo_coeff.shape:
        return None
    return project(previous, molecule, orbitals)


def project(previous: Any, molecule: Any, orbitals: np.ndarray) -> np.ndarray:
    """Orbitals of ``previous`` carried to ``molecule``'s basis functions: least-squares projection, then
    symmetric (Löwdin) orthonormalisation in the new overlap metric, which keeps each orbital's character."""
    from ..chemistry import cross_overlap

    s_new = cross_overlap(molecule, molecule)
    carried = np.linalg.solve(s_new, cross_overlap(previous, molecule).T @ orbitals)
    metric = carried.T @ s_new @ carried
    values, vectors = np.linalg.eigh(metric)
    return carried @ (vectors * values**-0.5) @ vectors.T


def active_overlap(previous: Any, previous_orbitals: np.ndarray, molecule: Any, orbitals: np.ndarray,
                   core: int, n_active: int) -> float:
    """Smallest singular value of the overlap between the active spaces of two points (1 for the same space)."""
    from ..chemistry import cross_overlap

    block = slice(core, core + n_active)
    overlap = previous_orbitals[:, block].T @ cross_overlap(previous, molecule) @ orbitals[:, block]
    return float(np.min(np.linalg.svd(overlap, compute_uv=False)))


def jump_message(overlap: float) -> str | None:
    """The report of a jump for an active-space overlap, or None when the space continued."""
    if overlap >= JUMP_OVERLAP:
        return None
    return (f"CASSCF moved to another solution: the active space overlaps the previous point's by only "
            f"{overlap:.3f} (smallest singular value; below {JUMP_OVERLAP}); energies on either side belong to "
            "different orbital solutions")
