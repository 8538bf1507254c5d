"""Classical baselines beside every variational number, each computed on first access and cached.

Keys: ``hf``, ``mp2``, ``cisd``, ``ccsd``, ``ccsd(t)`` (correlating the active orbitals only, core and dropped
orbitals frozen, so they compare with the exact reference), ``casci`` (exact in the active space: the
reference), ``fci`` (every orbital and electron, when the determinant count is at most ``FCI_DETERMINANT_LIMIT``).
A method that cannot run or does not converge has the value ``None`` and a reason; it never raises.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator, Mapping
from math import comb
from typing import TYPE_CHECKING

from . import chemistry
from .errors import GroundkitError

if TYPE_CHECKING:  # pragma: no cover
    from .problem import Problem

FCI_DETERMINANT_LIMIT = 1_000_000  # full-space FCI only up to this many determinants (a minute or so here)
METHODS = ("hf", "mp2", "cisd", "ccsd", "ccsd(t)", "casci", "fci")
SPACE = {"hf": "full", "mp2": "active", "cisd": "active", "ccsd": "active", "ccsd(t)": "active",
         "casci": "active", "fci": "full"}


class Baselines(Mapping):
    """Read-only mapping method -> total energy (Ha) or None; ``reason(method)`` says why a value is missing."""

    def __init__(self, problem: Problem) -> None:
        self._problem = problem
        self._values: dict[str, float | None] = {}
        self._reasons: dict[str, str] = {}

    def __getitem__(self, method: str) -> float | None:
        key = str(method).lower()
        if key not in METHODS:
            raise KeyError(f"unknown baseline {method!r}; available: {', '.join(METHODS)}")
        if key not in self._values:
            try:
                self._values[key] = self._compute(key)
            except (GroundkitError, ArithmeticError, RuntimeError, ValueError, MemoryError) as err:
                self._values[key] = None
                self._reasons[key] = f"{type(err).__name__}: {err}"
        return self._values[key]

    def __iter__(self) -> Iterator[str]:
        return iter(METHODS)

    def __len__(self) -> int:
        return len(METHODS)

    def reason(self, method: str) -> str | None:
        """Why a baseline is None (after it was asked for), else None."""
        self[method]
        return self._reasons.get(str(method).lower())

    @staticmethod
    def space(method: str) -> str:
        """'active' when the method correlates only the active orbitals, 'full' otherwise."""
        return SPACE[str(method).lower()]

    def rows(self, methods: tuple[str, ...] = METHODS) -> list[dict]:
        """One dict per method: method, energy (Ha), error against the reference (mHa), space, note."""
        reference = self._problem.reference.energy
        out = []
        for m in methods:
            value = self[m]
            out.append({"method": m, "energy": value, "space": self.space(m),
                        "error_mha": None if value is None else 1000.0 * (value - reference),
                        "note": self._reasons.get(m, "")})
        return out

    def table(self, methods: tuple[str, ...] = METHODS) -> str:
        """Plain-text table: method, energy, error against the exact active-space reference, space."""
        lines = [f"{'method':<9}{'energy/Ha':>16}{'vs exact/mHa':>14}  space", "-" * 48]
        for r in self.rows(methods):
            energy = "—" if r["energy"] is None else f"{r['energy']:16.8f}"
            error = "" if r["error_mha"] is None else f"{r['error_mha']:14.3f}"
            lines.append(f"{r['method']:<9}{energy:>16}{error:>14}  {r['space']}  {r['note']}".rstrip())
        return "\n".join(lines)

    def _compute(self, key: str) -> float | None:
        p = self._problem
        return _COMPUTE[key](p)

    def __repr__(self) -> str:
        known = {k: v for k, v in self._values.items()}
        return f"Baselines(computed={known})"


def _hf(p: Problem) -> float:
    return p.scf.energy


def _correlated(method: str) -> Callable[[Problem], float]:
    def compute(p: Problem) -> float:
        space = p.active_orbitals
        occupied = [i for i in space.active if p.scf.mo_occ[i] > 0.5]
        virtual = [i for i in space.active if p.scf.mo_occ[i] < 1.5]
        if not occupied or not virtual:
            raise GroundkitError(f"the active space has no {'occupied' if not occupied else 'virtual'} orbitals")
        return chemistry.correlated_baseline(p.scf, method, list(space.core) + list(space.external))

    return compute


def _casci(p: Problem) -> float:
    return p.reference.energy


def _fci(p: Problem) -> float:
    space = p.active_orbitals
    if not space.core and not space.external:
        return p.reference.energy
    n_mo = p.scf.n_orbitals
    n_alpha = space.n_alpha + len(space.core)
    n_beta = space.n_beta + len(space.core)
    n_det = comb(n_mo, n_alpha) * comb(n_mo, n_beta)
    if n_det > FCI_DETERMINANT_LIMIT:
        raise GroundkitError(
            f"full-space FCI needs {n_det:,} determinants, above the limit of {FCI_DETERMINANT_LIMIT:,}"
        )
    core_energy, h1, h2 = chemistry.active_integrals(p.scf, [], list(range(n_mo)))
    states = chemistry.lowest_states(h1, h2, core_energy, n_alpha, n_beta, p.spin)
    return states[0][0]


_COMPUTE: dict[str, Callable[[Problem], float | None]] = {
    "hf": _hf, "mp2": _correlated("mp2"), "cisd": _correlated("cisd"), "ccsd": _correlated("ccsd"),
    "ccsd(t)": _correlated("ccsd(t)"), "casci": _casci, "fci": _fci,
}
