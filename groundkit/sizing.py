"""Cost estimates made before any heavy work, and the limits that refuse a request too large for this machine.

:func:`cost_estimate` predicts, from the molecule, the basis set, the active space and the trial state alone (no
SCF, no integral): atomic orbitals, the memory of the two-electron integrals (the SCF's n_ao^4/8 and the
active-space n^4 tensor), SCF time, determinants, the determinant engine's CI vectors, qubit statevectors,
parameters and the time of one energy+gradient. The pipeline checks the estimate before each stage
(``Pipeline.problem`` before the SCF, ``Problem.lowest_states`` before the exact reference, ``Pipeline.objective`` and
``Pipeline.run`` before anything) and a request above a limit raises :class:`~groundkit.errors.SizeLimitError` at
once, with the figures and a smaller active space that fits. Scans and comparison grids check points × one point.

Limits live in :data:`limits` (module level, settable: ``groundkit.limits.evaluation_seconds = 600``, ``None``
switches one off; ``with groundkit.limits.changed(...)`` for a block). Memory defaults to a fraction of the
machine's available memory (``MemAvailable`` of ``/proc/meminfo``), read at each check.

The time model's constants were measured on the development machine (2 cores) by ``benchmarks/cost_model.py``,
which prints measured against predicted times for a range of sizes; rerun it to recalibrate. Predictions are for a
quiet machine: on busy cores expect up to a few times longer. See docs/limits.md.
"""

from __future__ import annotations

import math
import numbers
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import dataclass, field, fields, replace
from math import comb
from typing import Any

import numpy as np

from . import chemistry
from .elements import frozen_core_orbitals
from .errors import ComponentError, GroundkitError, SizeLimitError
from .workspace import workspace

# ----------------------------------------------------------------------------------------------------------------
# the cost model; constants fitted by ``benchmarks/cost_model.py --fit`` on the 2-core development machine, shared with
# other work (load average 1 to 4); a fit under heavier load (about 5) gave constants 2 to 4 times larger
ERI_SECONDS = 1.25e-8
"""Seconds per primitive quartet, W^4/8, of the AO two-electron integrals (W: primitives × (2l+1) summed over
shells). The SCF model is this alone in core (the cycles cost little beside it): within 0.2 to 1.6 of the measured
time on the benchmark molecules; compact hydrogen clusters run longer, extended molecules a little faster."""
SCF_CYCLES = 20
"""SCF cycles assumed when the integrals are recomputed in every cycle (direct SCF); plain DIIS converged in 8 to
15 cycles on the benchmark molecules."""
TRANSFORM_SECONDS = 3.3e-10
"""Seconds per n_ao^4 × n_active of the AO-to-active-orbital integral transformation."""
H_PAIR_SECONDS = 3.2e-11
"""Seconds per determinant × (active orbital pairs)^2 of one H·ψ (PySCF's contract_2e is a matrix product)."""
PAIR_SECONDS = 1.4e-8
"""Seconds per determinant pair rotated by one excitation in one energy+gradient (forward and backward sweeps)."""
STEP_SECONDS = 2.6e-5
"""Seconds of fixed (Python) cost per excitation in one energy+gradient."""
REFERENCE_SIGMA_CALLS = 37
"""H·ψ products of PySCF's Davidson solver for the exact reference (with the spin check and restarts)."""
ENGINE_VECTORS = 8
"""CI-sized float64 arrays the determinant engine holds at once in an energy+gradient: ψ and Hψ with a transposed
copy of each in the backward sweep, contract_2e's output and the gathered blocks (measured peak NumPy memory /
8 bytes / determinants: 6.9 to 8.3)."""
REFERENCE_VECTORS = 36
"""CI-sized arrays of PySCF's Davidson solver (its subspace of 12 vectors and their H images, and work arrays):
measured 29 to 36 on sectors above 10^4 determinants."""
STATEVECTORS = 4
"""2^n complex128 statevectors a qubit-level objective holds (state, adjoint, H·ψ, work)."""
ENGINE_MAX_ORBITALS = 62
"""Most active orbitals the determinant engine takes (occupation strings are 64-bit integers)."""
TYPICAL_EVALUATIONS = 50
"""Energy+gradient evaluations assumed for one minimisation in study estimates (BFGS on the engine benchmarks:
17 to 45 iterations)."""


@dataclass
class Limits:
    """What groundkit refuses to start. ``None`` switches a limit off. Times in seconds, memory in bytes.

    - ``memory_bytes``: the largest memory one stage may need; ``None`` (default) means ``memory_fraction`` (half)
      of the machine's available memory at the moment of the check: the other half is room for other processes
      and for the temporary arrays the model does not count;
    - ``scf_seconds``: predicted SCF plus integral transformation time;
    - ``reference_seconds``: predicted time of the exact reference (PySCF's FCI in the active space);
    - ``evaluation_seconds``: predicted time of one energy+gradient of the trial state;
    - ``study_seconds``: predicted time of a whole scan or comparison grid (points × one point, each point
      SCF + reference + ``TYPICAL_EVALUATIONS`` energy+gradients).
    """

    memory_bytes: float | None = None
    memory_fraction: float = 0.5
    scf_seconds: float | None = 1800.0
    reference_seconds: float | None = 900.0
    evaluation_seconds: float | None = 60.0
    study_seconds: float | None = 12 * 3600.0

    def __setattr__(self, name: str, value: Any) -> None:
        if name not in {f.name for f in fields(self)}:
            accepted = ", ".join(f.name for f in fields(self))
            raise ComponentError(f"limits has no setting {name!r}; accepted: {accepted}")
        number = _finite(value)
        if name == "memory_fraction":
            if number is None or not 0 < number <= 1:
                raise ComponentError(f"limits.memory_fraction={value!r}; give a number in (0, 1]")
        elif value is not None and (number is None or number <= 0):
            raise ComponentError(f"limits.{name}={value!r}; give a positive finite number or None (no limit)")
        object.__setattr__(self, name, value if number is None else number)

    def memory_limit(self) -> float | None:
        """Bytes one stage may use: ``memory_bytes``, else ``memory_fraction`` of the available memory."""
        if self.memory_bytes is not None:
            return float(self.memory_bytes)
        available = available_memory()
        return None if available is None else self.memory_fraction * available

    @contextmanager
    def changed(self, **settings: Any) -> Iterator[Limits]:
        """``with limits.changed(evaluation_seconds=None): ...`` sets limits for a block and restores them."""
        saved = {f.name: getattr(self, f.name) for f in fields(self)}
        try:
            for name, value in settings.items():
                setattr(self, name, value)
            yield self
        finally:
            for name, value in saved.items():
                object.__setattr__(self, name, value)


def _finite(value: Any) -> float | None:
    """``value`` as a finite float, or None for anything else (bools, strings, NaN, infinities, huge integers)."""
    if isinstance(value, (bool, np.bool_)) or not isinstance(value, numbers.Real):
        return None
    try:
        number = float(value)
    except OverflowError:
        return None
    return number if math.isfinite(number) else None


limits = Limits()
"""The limits in force (module level; see :class:`Limits`)."""


def available_memory() -> float | None:
    """Bytes of memory available to new work (``MemAvailable`` of ``/proc/meminfo``), or None where unknown."""
    try:
        with open("/proc/meminfo", encoding="ascii") as fh:
            for line in fh:
                if line.startswith("MemAvailable:"):
                    return 1024.0 * float(line.split()[1])
    except (OSError, ValueError, IndexError):
        pass
    try:
        import psutil  # optional: only where /proc/meminfo is missing

        return float(psutil.virtual_memory().available)
    except Exception:  # noqa: BLE001 - no way to know: no memory limit
        return None


# ----------------------------------------------------------------------------------------------------------------
@dataclass(frozen=True)
class Window:
    """An active space predicted without SCF: active orbitals, alpha and beta electrons, and core orbitals."""

    n_orbitals: int
    n_alpha: int
    n_beta: int
    n_core: int = 0

    @property
    def n_electrons(self) -> int:
        return self.n_alpha + self.n_beta

    @property
    def n_determinants(self) -> int:
        return comb(self.n_orbitals, self.n_alpha) * comb(self.n_orbitals, self.n_beta)

    def __str__(self) -> str:
        return f"({self.n_electrons}e, {self.n_orbitals}o)"


@dataclass(frozen=True)
class CostEstimate:
    """Predicted sizes, memory (bytes) and times (seconds) of a request; ``None`` where not known beforehand.

    ``refusals`` lists each limit the request exceeds (empty when it fits). Print it for a table.
    """

    label: str
    n_atoms: int
    n_ao: int
    scf_in_core: bool
    eri_bytes: float
    scf_bytes: float
    scf_seconds: float
    window: Window | None = None
    integral_bytes: float | None = None
    integral_seconds: float | None = None
    n_determinants: int | None = None
    reference_bytes: float | None = None
    reference_seconds: float | None = None
    engine_vectors: int = ENGINE_VECTORS
    engine_bytes: float | None = None
    n_qubits: int | None = None
    qubit_level: bool = False
    statevector_bytes: float | None = None
    n_parameters: int | None = None
    parameter_note: str = ""
    evaluation_seconds: float | None = None
    points: int = 1
    memory_limit: float | None = None
    refusals: tuple[str, ...] = field(default=())

    @property
    def fits(self) -> bool:
        """True when no limit is exceeded."""
        return not self.refusals

    @property
    def point_seconds(self) -> float:
        """One point of a study: SCF and integrals, the exact reference, ``TYPICAL_EVALUATIONS`` evaluations."""
        return (self.scf_seconds + (self.integral_seconds or 0.0) + (self.reference_seconds or 0.0)
                + TYPICAL_EVALUATIONS * (self.evaluation_seconds or 0.0))

    @property
    def study_seconds(self) -> float:
        return self.points * self.point_seconds

    def lines(self) -> list[str]:
        """The figures, one per line."""
        out = [f"{self.label}: {self.n_atoms} atoms, {self.n_ao} atomic orbitals"]
        how = "in core" if self.scf_in_core else "direct (integrals recomputed each cycle)"
        out.append(f"  SCF: two-electron integrals {format_bytes(self.eri_bytes)} (n_ao^4/8 doubles), {how}; "
                   f"memory {format_bytes(self.scf_bytes)}, time ~{format_seconds(self.scf_seconds)}")
        if self.window is None:
            out.append("  active space: decided after the SCF (MP2 occupations); later stages estimated then")
            return out
        w = self.window
        out.append(f"  active space {w}: {w.n_core} core orbitals; integrals {format_bytes(self.integral_bytes)} "
                   f"(n^4 tensor and its compact form), time ~{format_seconds(self.integral_seconds)}")
        out.append(f"  determinants: {format_count(self.n_determinants)}; exact reference "
                   f"{format_bytes(self.reference_bytes)}, ~{format_seconds(self.reference_seconds)}")
        if self.engine_vectors:
            out.append(f"  determinant engine: {self.engine_vectors} CI vectors, {format_bytes(self.engine_bytes)}")
        else:
            out.append(f"  statevector objective: {STATEVECTORS} statevectors, {format_bytes(self.engine_bytes)}")
        tag = " (the trial state or estimator works on the register)" if self.qubit_level else ""
        out.append(f"  qubits: {self.n_qubits}; one statevector {format_bytes(self.statevector_bytes)}{tag}")
        params = format_count(self.n_parameters) if self.n_parameters is not None else "unknown"
        note = f" ({self.parameter_note})" if self.parameter_note else ""
        out.append(f"  parameters: {params}{note}; one energy+gradient ~{format_seconds(self.evaluation_seconds)}")
        if self.points > 1:
            out.append(f"  study: {self.points} points × ~{format_seconds(self.point_seconds)} = "
                       f"~{format_seconds(self.study_seconds)}")
        return out

    def __repr__(self) -> str:
        limit = "no memory limit" if self.memory_limit is None else f"memory limit {format_bytes(self.memory_limit)}"
        verdict = "fits the limits" if self.fits else "REFUSED: " + "; ".join(self.refusals)
        return "\n".join(["CostEstimate(", *self.lines(), f"  {limit}; {verdict})"])


# ----------------------------------------------------------------------------------------------------------------
def format_bytes(value: float | None) -> str:
    if value is None:
        return "unknown"
    value = float(value)
    for unit, size in (("TiB", 2**40), ("GiB", 2**30), ("MiB", 2**20), ("KiB", 2**10)):
        if value >= size:
            scaled = value / size
            if scaled >= 1e4:
                return f"{value:.3g} bytes"
            return f"{scaled:.3g} {unit}" if scaled < 1000 else f"{scaled:.0f} {unit}"
    return f"{value:.0f} bytes"


def format_seconds(value: float | None) -> str:
    if value is None:
        return "not estimated"
    if value < 1:
        return f"{value * 1e3:.3g} ms"
    if value < 120:
        return f"{value:.3g} s"
    if value < 2 * 3600:
        return f"{value / 60:.3g} min"
    if value < 3 * 86400:
        return f"{value / 3600:.3g} h"
    return f"{value / 86400:.3g} days" if value < 1e6 * 86400 else f"{value:.3g} s"


def format_count(value: int | None) -> str:
    if value is None:
        return "unknown"
    return f"{value:,}" if value < 10**12 else f"{float(min(value, 10**300)):.3g}"


def _big(value: int) -> float:
    return float(min(value, 10**300))


# ----------------------------------------------------------------------------------------------------------------
# the model
def basis_sizes(molecule: Any) -> tuple[int, int]:
    """(atomic orbitals, primitive weight W) of the molecule in its basis, from the basis data alone."""
    n_ao = weight = 0
    for symbol in molecule.symbols:
        n, w = chemistry.atom_basis_size(molecule.basis, symbol)
        n_ao, weight = n_ao + n, weight + w
    return n_ao, weight


def scf_cost(n_ao: int, weight: int) -> tuple[bool, float, float, float]:
    """(in core, ERI bytes, SCF memory bytes, SCF seconds) for ``n_ao`` orbitals of primitive weight ``weight``."""
    eri_bytes = 8.0 * n_ao**4 / 8
    matrices = 8.0 * 12 * n_ao**2  # Fock, density, overlap, DIIS history
    # PySCF keeps the integrals when n_ao^4/1e6 MB fit in 95% of its max_memory (scf.hf.SCF._is_mem_enough)
    in_core = n_ao**4 / 1e6 < 0.95 * chemistry.pyscf_max_memory()
    eri_seconds = ERI_SECONDS * weight**4 / 8
    if in_core:
        return True, eri_bytes, eri_bytes + matrices, eri_seconds
    return False, eri_bytes, matrices, SCF_CYCLES * eri_seconds


def integral_cost(n_ao: int, weight: int, n_active: int, n_core: int) -> tuple[float, float]:
    """(bytes, seconds) of the active-space integrals: the full n^4 tensor beside its 4-fold compact form and
    PySCF's half-transformed block (bounded by its max_memory), AO integrals again, the core's J and K."""
    npair, nao_pair = n_active * (n_active + 1) // 2, n_ao * (n_ao + 1) // 2
    work = min(8.0 * nao_pair * npair, 1e6 * chemistry.pyscf_max_memory())
    memory = 8.0 * (n_active**4 + npair**2) + work
    eri_seconds = ERI_SECONDS * weight**4 / 8
    seconds = eri_seconds * (2 if n_core else 1) + TRANSFORM_SECONDS * n_ao**4 * n_active
    return memory, seconds


def hamiltonian_seconds(n_orbitals: int, n_alpha: int, n_beta: int) -> float:
    """Seconds of one H·ψ in the (n_alpha, n_beta) sector of ``n_orbitals`` orbitals (PySCF's contract_2e)."""
    dets = _big(comb(n_orbitals, n_alpha) * comb(n_orbitals, n_beta))
    npair = n_orbitals * (n_orbitals + 1) // 2
    return H_PAIR_SECONDS * dets * npair**2


def reference_cost(n_orbitals: int, n_alpha: int, n_beta: int) -> tuple[float, float]:
    """(bytes, seconds) of the exact reference by PySCF's Davidson solver."""
    dets = _big(comb(n_orbitals, n_alpha) * comb(n_orbitals, n_beta))
    return 8.0 * REFERENCE_VECTORS * dets, REFERENCE_SIGMA_CALLS * hamiltonian_seconds(n_orbitals, n_alpha, n_beta)


def rotated_pairs(excitations: Any, n_orbitals: int, n_alpha: int, n_beta: int) -> int:
    """Determinant pairs the excitations rotate, summed (each excitation acts on the determinants with its
    annihilated orbitals occupied and its created ones empty), counted without building the sector."""
    from .sector.excitation import split_by_spin

    all_alpha, all_beta = comb(n_orbitals, n_alpha), comb(n_orbitals, n_beta)
    total = 0
    for excitation in excitations:
        _, alpha_ops, beta_ops = split_by_spin(excitation)
        rows = _sources(alpha_ops, n_orbitals, n_alpha) if alpha_ops else all_alpha
        cols = _sources(beta_ops, n_orbitals, n_beta) if beta_ops else all_beta
        total += rows * cols
    return total


def _sources(operators: list[tuple[int, bool]], n_orbitals: int, n_electrons: int) -> int:
    removed = {p for p, creator in operators if not creator}
    touched = {p for p, _ in operators}
    free, needed = n_orbitals - len(touched), n_electrons - len(removed)
    return comb(free, needed) if 0 <= needed <= free else 0


def evaluation_seconds(n_orbitals: int, n_alpha: int, n_beta: int, n_excitations: int, pairs: int) -> float:
    """Seconds of one energy+gradient of a product of ``n_excitations`` exponentials rotating ``pairs`` pairs."""
    return (hamiltonian_seconds(n_orbitals, n_alpha, n_beta) + PAIR_SECONDS * _big(pairs)
            + STEP_SECONDS * n_excitations)


@dataclass(frozen=True)
class _Shape:
    """What a built-in fermionic trial state reads of a problem to list its excitations."""

    n_orbitals: int
    n_alpha: int
    n_beta: int
    multiplicity: int


def predict_window(molecule: Any, active_space: Any, n_ao: int) -> Window | None:
    """The active space that :meth:`ActiveSpace.resolve` will choose, predicted without SCF (orbitals are as many
    as atomic orbitals; ROHF fills doubly occupied, then singly occupied orbitals). None where the choice needs
    the SCF (MP2 occupations) or the request is inconsistent (the resolve step then explains why)."""
    n_total, unpaired = molecule.n_electrons, molecule.multiplicity - 1
    n_docc = (n_total - unpaired) // 2
    n_frozen = sum(frozen_core_orbitals(s) for s in molecule.symbols) if active_space.frozen_core else 0
    if active_space.selection != "window":
        return None
    if active_space.indices is not None:
        indices = set(active_space.indices)
        if max(indices) >= n_ao:
            return None
        core = sum(1 for i in range(n_docc) if i not in indices)
        n_orbitals = len(indices)
    elif active_space.electrons is None:
        core, n_orbitals = n_frozen, n_ao - n_frozen
    else:
        electrons, n_orbitals = int(active_space.electrons), int(active_space.orbitals)
        if (n_total - electrons) % 2 or electrons > n_total:
            return None
        core = (n_total - electrons) // 2
    n_active_electrons = n_total - 2 * core
    n_alpha, n_beta = (n_active_electrons + unpaired) // 2, (n_active_electrons - unpaired) // 2
    if n_orbitals < 1 or core < 0 or core + n_orbitals > n_ao or n_beta < 0 or n_alpha > n_orbitals:
        return None
    return Window(n_orbitals, n_alpha, n_beta, core)


def _trial_plan(trial_state: Any, window: Window, multiplicity: int) -> tuple[int | None, int, int, str]:
    """(parameters, excitations, rotated pairs, note) of a fermionic trial state on a window, without integrals
    (kept in the workspace per trial state and window: a scan's points share one)."""
    return workspace().fetch("trial-state plan", (trial_state, window, multiplicity),
                             lambda: _plan_figures(trial_state, window, multiplicity))


def _plan_figures(trial_state: Any, window: Window, multiplicity: int) -> tuple[int | None, int, int, str]:
    from .sector.space import MAX_DETERMINANTS

    if window.n_determinants > MAX_DETERMINANTS or window.n_orbitals > ENGINE_MAX_ORBITALS:
        return None, 0, 0, "not listed: above the engine's limits"
    try:
        plan = trial_state.plan(_Shape(window.n_orbitals, window.n_alpha, window.n_beta, multiplicity))
    except GroundkitError as err:  # refused by the trial state itself: the objective will say why
        return None, 0, 0, "refused: " + str(err).split(";")[0][:80]
    except (AttributeError, TypeError, KeyError):  # a user trial state that reads integrals: known after the SCF
        return None, 0, 0, "known once the problem is built"
    pairs = rotated_pairs(plan.excitations, window.n_orbitals, window.n_alpha, window.n_beta)
    return plan.n_parameters, len(plan.excitations), pairs, ""


def estimate_for(molecule: Any, active_space: Any = None, trial_state: Any = None, estimator: Any = None,
                 mapping: Any = None, *, window: Window | None = None, points: int = 1,
                 with_plan: bool = True) -> CostEstimate:
    """The estimate for one molecule with these components (defaults as in a Pipeline), without running anything.

    ``window`` overrides the predicted active space (used for the suggestions and once the problem exists);
    ``with_plan=False`` skips listing the trial state's excitations (no parameter count, no evaluation time).
    """
    from .active_space import ActiveSpace
    from .mapping import QubitMapping
    from .qubit_states import QubitTrialState
    from .trial_states import UCCSD

    active_space = active_space if active_space is not None else ActiveSpace()
    trial_state = trial_state if trial_state is not None else UCCSD()
    mapping = mapping if mapping is not None else QubitMapping()
    n_ao, weight = basis_sizes(molecule)
    in_core, eri_bytes, scf_bytes, scf_seconds = scf_cost(n_ao, weight)
    base: dict[str, Any] = dict(label=f"{molecule.formula}/{molecule.basis}", n_atoms=molecule.n_atoms, n_ao=n_ao,
                                scf_in_core=in_core, eri_bytes=eri_bytes, scf_bytes=scf_bytes,
                                scf_seconds=scf_seconds, points=points)
    window = window if window is not None else predict_window(molecule, active_space, n_ao)
    if window is None:
        return _judged(CostEstimate(**base))
    n, na, nb = window.n_orbitals, window.n_alpha, window.n_beta
    integral_bytes, integral_seconds = integral_cost(n_ao, weight, n, window.n_core)
    reference_bytes, reference_seconds = reference_cost(n, na, nb)
    n_qubits = 2 * n - (2 if mapping.taper else 0)
    qubit_level = isinstance(trial_state, QubitTrialState) or (estimator is not None and not estimator.exact)
    if isinstance(trial_state, QubitTrialState):
        n_params, note = _qubit_parameters(trial_state, n_qubits), ""
        seconds, engine_vectors = None, 0
        engine_bytes = 16.0 * STATEVECTORS * 2.0 ** min(n_qubits, 1000)
    else:
        n_params, n_exc, pairs, note = (_trial_plan(trial_state, window, molecule.multiplicity) if with_plan
                                        else (None, 0, 0, "not listed"))
        seconds = evaluation_seconds(n, na, nb, n_exc, pairs) if n_params is not None else None
        engine_bytes, engine_vectors = 8.0 * ENGINE_VECTORS * _big(window.n_determinants), ENGINE_VECTORS
    estimate = CostEstimate(
        **base, window=window, integral_bytes=integral_bytes, integral_seconds=integral_seconds,
        n_determinants=window.n_determinants, reference_bytes=reference_bytes, reference_seconds=reference_seconds,
        engine_vectors=engine_vectors, engine_bytes=engine_bytes, n_qubits=n_qubits, qubit_level=qubit_level,
        statevector_bytes=16.0 * 2.0 ** min(n_qubits, 1000), n_parameters=n_params, parameter_note=note,
        evaluation_seconds=seconds,
    )
    return _judged(estimate)


def _qubit_parameters(trial_state: Any, n_qubits: int) -> int | None:
    """Parameters of a qubit trial state from its declared symbols, when it needs only the register size."""
    if n_qubits > 64:
        return None

    @dataclass(frozen=True)
    class _Register:
        n_qubits: int
        reference_bits: tuple[int, ...]
        mapping: Any = None

    register = _Register(n_qubits, (0,) * n_qubits)
    try:
        circuit = trial_state.parametrised_circuit(register)
        return len(trial_state.parameter_symbols(register, circuit))
    except Exception:  # noqa: BLE001 - a user state that needs more of the encoding: known later
        return None


# ----------------------------------------------------------------------------------------------------------------
# judging against the limits
STAGES = ("scf", "integrals", "reference", "engine", "study")


def _judged(estimate: CostEstimate, stages: tuple[str, ...] = STAGES) -> CostEstimate:
    return replace(estimate, memory_limit=limits.memory_limit(), refusals=tuple(_refusals(estimate, stages)))


def _refusals(e: CostEstimate, stages: tuple[str, ...]) -> list[str]:
    from .qubits import QUBIT_STATE_LIMIT

    memory = limits.memory_limit()
    out = []

    def over_memory(what: str, value: float | None) -> None:
        if memory is not None and value is not None and value > memory:
            out.append(f"{what} needs {format_bytes(value)}, above the memory limit of {format_bytes(memory)}")

    def over_time(what: str, value: float | None, limit: float | None, name: str) -> None:
        if limit is not None and value is not None and value > limit:
            out.append(f"{what} would take ~{format_seconds(value)}, above limits.{name} = {format_seconds(limit)}")

    if "scf" in stages:
        over_memory("the SCF", e.scf_bytes)
    if "integrals" in stages:
        over_memory(f"the active-space integrals {e.window}", e.integral_bytes)
    if "scf" in stages or "integrals" in stages:
        over_time("the SCF and integrals", e.scf_seconds + (e.integral_seconds or 0.0), limits.scf_seconds,
                  "scf_seconds")
    if "reference" in stages:
        from .problem import REFERENCE_DETERMINANT_LIMIT

        if e.n_determinants is not None and e.n_determinants > REFERENCE_DETERMINANT_LIMIT:
            out.append(f"the exact reference needs {format_count(e.n_determinants)} determinants, above the limit "
                       f"of {REFERENCE_DETERMINANT_LIMIT:,}")
        else:
            over_memory("the exact reference", e.reference_bytes)
            over_time("the exact reference", e.reference_seconds, limits.reference_seconds, "reference_seconds")
    if "engine" in stages:
        if e.qubit_level and e.n_qubits is not None and e.n_qubits > QUBIT_STATE_LIMIT:
            out.append(f"a statevector on {e.n_qubits} qubits ({format_bytes(e.statevector_bytes)}) is above the "
                       f"limit of {QUBIT_STATE_LIMIT} qubits")
        from .sector.space import MAX_DETERMINANTS

        if not e.qubit_level or e.n_qubits is None or e.n_qubits <= QUBIT_STATE_LIMIT:
            if e.window is not None and e.window.n_orbitals > ENGINE_MAX_ORBITALS:
                out.append(f"the determinant engine takes at most {ENGINE_MAX_ORBITALS} active orbitals, not "
                           f"{e.window.n_orbitals}")
            elif e.n_determinants is not None and e.n_determinants > MAX_DETERMINANTS:
                out.append(f"the determinant engine needs {format_count(e.n_determinants)} determinants, above "
                           f"its limit of {MAX_DETERMINANTS:,}")
            else:
                what = (f"the determinant engine ({e.engine_vectors} CI vectors)" if e.engine_vectors
                        else f"the statevector objective ({STATEVECTORS} statevectors)")
                over_memory(what, e.engine_bytes)
        over_time("one energy+gradient", e.evaluation_seconds, limits.evaluation_seconds, "evaluation_seconds")
    if "study" in stages and e.points > 1:
        over_time(f"the study ({e.points} points)", e.study_seconds, limits.study_seconds, "study_seconds")
    return out


def suggest_window(molecule: Any, estimate: CostEstimate, stages: tuple[str, ...], trial_state: Any = None,
                   estimator: Any = None, mapping: Any = None) -> Window | None:
    """The largest window around the Fermi level, with no more electrons or orbitals than asked, that passes
    ``stages``: for o orbitals it holds min(asked electrons, o) electrons (half filling, where the determinants
    peak), and the largest o that fits is found by bisection (costs grow with o along these windows)."""
    window = estimate.window
    if window is None:
        return None
    unpaired = molecule.multiplicity - 1

    def candidate(n_orbitals: int) -> Window | None:
        electrons = min(window.n_electrons, n_orbitals)
        electrons -= (electrons - unpaired) % 2
        if electrons < unpaired or (electrons + unpaired) // 2 > n_orbitals:
            return None
        core = window.n_core + (window.n_electrons - electrons) // 2
        if core + n_orbitals > estimate.n_ao:
            return None
        return Window(n_orbitals, (electrons + unpaired) // 2, (electrons - unpaired) // 2, core)

    def fits(n_orbitals: int) -> bool:
        trial = candidate(n_orbitals)
        if trial is None:
            return False
        options = dict(trial_state=trial_state, estimator=estimator, mapping=mapping, window=trial,
                       points=estimate.points)
        if _refusals(estimate_for(molecule, with_plan=False, **options), stages):  # cheap figures first
            return False
        return not _refusals(estimate_for(molecule, **options), stages)

    low = next((o for o in range(max(unpaired, 1), min(window.n_orbitals, unpaired + 2) + 1) if fits(o)), None)
    if low is None:
        return None
    high = window.n_orbitals
    while low < high:
        middle = (low + high + 1) // 2
        if fits(middle):
            low = middle
        else:
            high = middle - 1
    return candidate(low)


def refuse(molecule: Any, estimate: CostEstimate, stages: tuple[str, ...], what: str, **components: Any) -> None:
    """Raise SizeLimitError when ``estimate`` exceeds a limit of ``stages``: the figures, and a window that fits."""
    problems = _refusals(estimate, stages)
    if not problems:
        return
    message = [f"{what} refused before any heavy work: " + "; ".join(problems) + "."]
    message += estimate.lines()
    suggestion = suggest_window(molecule, estimate, stages, **components)
    if suggestion is not None and estimate.window is not None and suggestion != estimate.window:
        message.append(f"A window that fits: ActiveSpace(electrons={suggestion.n_electrons}, "
                       f"orbitals={suggestion.n_orbitals}) ({format_count(suggestion.n_determinants)} determinants, "
                       f"{2 * suggestion.n_orbitals} qubits).")
    elif any("SCF" in p for p in problems) or suggestion is None:
        message.append("No smaller active space of this molecule fits: the SCF and integrals alone are at the "
                       "limits; choose a smaller basis set or fewer atoms.")
    message.append("Limits are in groundkit.limits (see docs/limits.md); raise one to run anyway.")
    raise SizeLimitError("\n".join(message))


# ----------------------------------------------------------------------------------------------------------------
# the checks the pipeline and the studies call
def check_problem(molecule: Any, active_space: Any) -> None:
    """Before the SCF: the SCF and the active-space integrals must fit the limits."""
    estimate = estimate_for(molecule, active_space)
    refuse(molecule, estimate, ("scf", "integrals"), f"{molecule.formula}/{molecule.basis}")
    w = estimate.window
    if getattr(active_space, "orbital_set", "canonical") == "casscf" and w is not None:
        from .orbitals import cost

        memory, seconds = cost.casscf_cost(estimate.n_ao, w.n_orbitals, w.n_alpha, w.n_beta)
        cost.refuse_if_over(f"CASSCF orbitals in {w} for {molecule.formula}/{molecule.basis}", memory, seconds,
                            "choose a smaller active space or orbital_set='mp2-natural'")


def check_reference(n_orbitals: int, n_alpha: int, n_beta: int) -> None:
    """Before the exact reference: its memory and time must fit the limits."""
    from .problem import REFERENCE_DETERMINANT_LIMIT

    dets = comb(n_orbitals, n_alpha) * comb(n_orbitals, n_beta)
    memory, seconds = reference_cost(n_orbitals, n_alpha, n_beta)
    problems = []
    if dets > REFERENCE_DETERMINANT_LIMIT:
        problems.append(f"it needs {dets:,} determinants, above the limit of {REFERENCE_DETERMINANT_LIMIT:,}")
    limit = limits.memory_limit()
    if limit is not None and memory > limit:
        problems.append(f"it needs {format_bytes(memory)}, above the memory limit of {format_bytes(limit)}")
    if limits.reference_seconds is not None and seconds > limits.reference_seconds:
        problems.append(f"it would take ~{format_seconds(seconds)}, above limits.reference_seconds = "
                        f"{format_seconds(limits.reference_seconds)}")
    if problems:
        raise SizeLimitError(
            f"the exact reference in ({n_alpha + n_beta}e, {n_orbitals}o) refused: " + "; ".join(problems)
            + "; choose a smaller active space (limits: groundkit.limits, docs/limits.md)"
        )


def pipeline_estimate(pipeline: Any, *, points: int = 1, problem: Any = None) -> CostEstimate:
    """The estimate of a pipeline (its molecule, or the given ``problem``'s actual active space)."""
    from .active_space import ActiveSpace

    c = pipeline.resolved_components()
    molecule = c["molecule"]
    if molecule is None:
        raise ComponentError("a cost estimate needs a pipeline with a molecule; use Pipeline(molecule)")
    window = None
    if problem is not None:
        window = Window(problem.n_orbitals, problem.n_alpha, problem.n_beta, len(problem.active_orbitals.core))
    return estimate_for(molecule, c["active_space"] or ActiveSpace(), c["trial_state"], c["estimator"],
                        c["mapping"], window=window, points=points)


def check_pipeline(pipeline: Any, stages: tuple[str, ...], what: str, *, problem: Any = None,
                   points: int = 1) -> CostEstimate:
    """Raise SizeLimitError when the pipeline's request exceeds a limit of ``stages``; else the estimate."""
    estimate = pipeline_estimate(pipeline, points=points, problem=problem)
    c = pipeline.resolved_components()
    refuse(c["molecule"], estimate, stages, what, trial_state=c["trial_state"], estimator=c["estimator"],
           mapping=c["mapping"])
    return estimate


def check_study(pipelines: list[Any], what: str) -> None:
    """Before a scan or grid of these pipelines (one per point): the sum of the points' predicted times against
    ``limits.study_seconds``; SizeLimitError naming the figures. A point that a limit refuses is left out of the
    sum: its own run refuses it at once and the study records it as a failed point."""
    total, counted, worst = 0.0, 0, None
    for pipeline in pipelines:
        if pipeline.components["molecule"] is None:
            continue
        estimate = pipeline_estimate(pipeline)
        if estimate.refusals:
            continue
        total, counted = total + estimate.point_seconds, counted + 1
        if worst is None or estimate.point_seconds > worst.point_seconds:
            worst = estimate
    if worst is not None and limits.study_seconds is not None and total > limits.study_seconds:
        raise SizeLimitError(
            f"{what} refused before any heavy work: {counted} points would take ~{format_seconds(total)} "
            f"(the longest point ~{format_seconds(worst.point_seconds)}: SCF, exact reference and "
            f"{TYPICAL_EVALUATIONS} energy+gradients), above limits.study_seconds = "
            f"{format_seconds(limits.study_seconds)}. Use fewer points or a smaller active space; limits are in "
            "groundkit.limits (docs/limits.md)\n" + "\n".join(worst.lines())
        )


def cost_estimate(pipeline: Any) -> CostEstimate:
    """What the pipeline's run would cost, predicted without running anything (no SCF, no integrals): sizes,
    memory and times, and the limits it exceeds (``.refusals``; empty when it fits). See docs/limits.md."""
    from .pipeline import Pipeline

    if not isinstance(pipeline, Pipeline):
        raise ComponentError(f"cost_estimate takes a Pipeline, got {type(pipeline).__name__}")
    return pipeline_estimate(pipeline)

