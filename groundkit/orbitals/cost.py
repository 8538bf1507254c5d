"""Cost of orbital preparation before it starts: CASSCF and CCSD natural orbitals against ``groundkit.limits``.

The CASSCF model: PySCF's CASSCF repeats, per macro iteration, a CI solve in the active space and a
transformation of the integrals with one active index (n_ao^4 × n_active), so its time is
a fixed cost plus ``CASSCF_SIGMA_CALLS`` H·ψ products of the active sector plus
``CASSCF_MACRO_ITERATIONS`` transformations; its
memory is the CI solver's vectors plus the (n_mo, n_active^3) and (n_ao pairs, n_active pairs) integral blocks.
Constants from ``benchmarks/casscf_cost.py --fit`` on the 2-core development machine (shared, load 1 to 4).
"""

from __future__ import annotations

from math import comb

from .. import sizing
from ..errors import SizeLimitError

CASSCF_SIGMA_CALLS = 4000
"""H·ψ products of one whole CASSCF (CI solves of all macro and micro iterations), fitted on (10e,10o) and
(8e,10o) in cc-pVDZ."""
CASSCF_FIXED_SECONDS = 4.0
"""Fixed (Python) cost of one CASSCF: small active spaces took 2.6 to 5.8 s whatever their size."""
CASSCF_MACRO_ITERATIONS = 12
"""Macro iterations assumed for the integral transformations (PySCF's CASSCF converged in 6 to 15)."""
CCSD_SECONDS_PER_FLOP = 2e-9
"""Seconds per o^2 v^4 operation of PySCF's CCSD on the development machine (rough)."""
CCSD_ITERATIONS = 20
"""Iterations of a CCSD that converges."""


def casscf_cost(n_ao: int, n_active: int, n_alpha: int, n_beta: int) -> tuple[float, float]:
    """(bytes, seconds) predicted for PySCF's CASSCF in (n_alpha + n_beta electrons, ``n_active`` orbitals)."""
    dets = float(min(comb(n_active, n_alpha) * comb(n_active, n_beta), 10**300))
    npair, nao_pair = n_active * (n_active + 1) // 2, n_ao * (n_ao + 1) // 2
    memory = 8.0 * sizing.REFERENCE_VECTORS * dets + 8.0 * (n_ao * n_active**3 + nao_pair * npair + 4 * n_ao**2)
    seconds = (CASSCF_FIXED_SECONDS + CASSCF_SIGMA_CALLS * sizing.hamiltonian_seconds(n_active, n_alpha, n_beta)
               + CASSCF_MACRO_ITERATIONS * sizing.TRANSFORM_SECONDS * n_ao**4 * n_active)
    return memory, seconds


def ccsd_cost(n_mo: int, occupied: int, virtual: int) -> tuple[float, float]:
    """(bytes, seconds) predicted for PySCF's CCSD: integrals in the MO basis and amplitudes; o^2 v^4 per
    iteration."""
    memory = 8.0 * (comb(n_mo + 1, 2) ** 2 + 4 * occupied**2 * virtual**2)
    return memory, CCSD_ITERATIONS * CCSD_SECONDS_PER_FLOP * occupied**2 * virtual**4


def refuse_if_over(what: str, memory: float, seconds: float, advice: str) -> None:
    """Raise :class:`SizeLimitError` naming the figures when ``memory`` (bytes) or ``seconds`` exceed the limits
    (memory limit, and ``limits.scf_seconds`` for orbital preparation)."""
    limit = sizing.limits.memory_limit()
    problems = []
    if limit is not None and memory > limit:
        problems.append(f"it needs {sizing.format_bytes(memory)}, above the memory limit of "
                        f"{sizing.format_bytes(limit)}")
    if sizing.limits.scf_seconds is not None and seconds > sizing.limits.scf_seconds:
        problems.append(f"it would take ~{sizing.format_seconds(seconds)}, above limits.scf_seconds = "
                        f"{sizing.format_seconds(sizing.limits.scf_seconds)}")
    if problems:
        raise SizeLimitError(f"{what} refused before any heavy work: " + "; ".join(problems)
                             + f" (predicted memory {sizing.format_bytes(memory)}, time "
                             f"~{sizing.format_seconds(seconds)}); {advice} (limits: groundkit.limits, "
                             "docs/limits.md)")
