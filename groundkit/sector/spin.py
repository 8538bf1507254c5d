"""Total spin <S^2> of a CI array (through PySCF's ``fci.spin_op``)."""

from __future__ import annotations

import numpy as np
from pyscf.fci import spin_op


def spin_square(ci: np.ndarray, n_orbitals: int, n_alpha: int, n_beta: int) -> float:
    """<ci|S^2|ci> / <ci|ci>, dimensionless (S(S+1): 0 for a singlet, 0.75 a doublet, 2 a triplet)."""
    ci = np.ascontiguousarray(ci, dtype=float)
    value, _ = spin_op.spin_square0(ci, n_orbitals, (int(n_alpha), int(n_beta)))
    return float(value) / float(np.vdot(ci, ci))


def multiplicity_of(spin_square_value: float) -> float:
    """2S + 1 for a given <S^2> = S(S+1)."""
    return 2.0 * (np.sqrt(max(spin_square_value, 0.0) + 0.25) - 0.5) + 1.0
