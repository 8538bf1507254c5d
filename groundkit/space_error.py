"""What the active space loses: its exact energy against the full problem (every orbital and electron correlated).

``problem.active_space_error`` (computed on first use only, so runs that do not ask pay nothing) compares the
exact active-space energy (the reference: CASCI in the chosen orbitals, CASSCF for CASSCF orbitals) with
full-space FCI where :mod:`groundkit.sizing` says it fits the limits, otherwise with full-space CCSD(T), and says
which. The error is active − full in mHa: positive when the space misses correlation (always, against FCI; against
CCSD(T) it can be slightly negative, since CCSD(T) is not exact). Both are model energies in the same basis set.
"""

from __future__ import annotations

from dataclasses import dataclass
from math import comb
from typing import TYPE_CHECKING, Any

from . import chemistry, sizing

if TYPE_CHECKING:  # pragma: no cover
    from .problem import Problem

AGAINST_FCI = "full-space FCI"
AGAINST_CCSD_T = "full-space CCSD(T)"
AGAINST_ITSELF = "itself (the active space is the full space)"


@dataclass(frozen=True)
class SpaceError:
    """Exact active-space energy against the full-space energy (Ha), what the full energy is, and why."""

    active_energy: float
    full_energy: float
    against: str
    note: str = ""

    @property
    def error(self) -> float:
        """active − full (Ha)."""
        return self.active_energy - self.full_energy

    @property
    def mha(self) -> float:
        """active − full (mHa)."""
        return 1000.0 * self.error

    def line(self) -> str:
        """One line for reports, e.g. 'active-space error +15.889 mHa against full-space FCI'."""
        return f"active-space error {self.mha:+.3f} mHa against {self.against}" + (f" ({self.note})" if self.note
                                                                                   else "")

    def to_dict(self) -> dict[str, Any]:
        return {"active_energy": float(self.active_energy), "full_energy": float(self.full_energy),
                "against": self.against, "note": self.note, "error_mha": self.mha}

    @classmethod
    def from_dict(cls, data: dict[str, Any]) -> SpaceError:
        return cls(float(data["active_energy"]), float(data["full_energy"]), str(data["against"]),
                   str(data.get("note", "")))


def full_fci_refusal(problem: Problem) -> str | None:
    """Why full-space FCI is not affordable for this problem (determinant count, sizing's memory and time
    estimates against ``groundkit.limits``), or None when it is."""
    from .baselines import FCI_DETERMINANT_LIMIT

    n_mo = problem.scf.n_orbitals
    n_core = len(problem.active_orbitals.core)
    n_alpha, n_beta = problem.n_alpha + n_core, problem.n_beta + n_core
    dets = comb(n_mo, n_alpha) * comb(n_mo, n_beta)
    if dets > FCI_DETERMINANT_LIMIT:
        return f"full-space FCI needs {dets:,} determinants, above {FCI_DETERMINANT_LIMIT:,}"
    memory, seconds = sizing.reference_cost(n_mo, n_alpha, n_beta)
    limit = sizing.limits.memory_limit()
    if limit is not None and memory > limit:
        return f"full-space FCI needs {sizing.format_bytes(memory)}, above the memory limit"
    if sizing.limits.reference_seconds is not None and seconds > sizing.limits.reference_seconds:
        return f"full-space FCI would take ~{sizing.format_seconds(seconds)}, above limits.reference_seconds"
    return None


def space_error(problem: Problem) -> SpaceError:
    """The active-space error of ``problem`` (see the module docstring). Full-space FCI comes from the problem's
    ``fci`` baseline (shared with it); CCSD(T) from PySCF with no orbital frozen. Raises
    :class:`~groundkit.errors.ConvergenceError` when neither can be computed."""
    active = float(problem.reference.energy)
    space = problem.active_orbitals
    if not space.core and not space.external:
        return SpaceError(active, active, AGAINST_ITSELF)
    refusal = full_fci_refusal(problem)
    if refusal is None:
        full = problem.baselines["fci"]
        if full is not None:
            return SpaceError(active, float(full), AGAINST_FCI)
        refusal = f"full-space FCI failed: {problem.baselines.reason('fci')}"
    found = chemistry.correlated_baseline(problem.scf, "ccsd(t)", [])
    return SpaceError(active, found.energy, AGAINST_CCSD_T, f"{refusal}; CCSD(T) is not exact")
