"""Classical baselines beside every variational number, each computed on first access, checked and cached.

Keys: ``hf``, ``mp2``, ``cisd``, ``ccsd``, ``ccsd(t)`` (correlating the active orbitals only, core and dropped
orbitals frozen, so they compare with the exact reference), ``casci`` (exact in the active space: the
reference), ``fci`` (every orbital and electron, when the determinant count is at most ``FCI_DETERMINANT_LIMIT``).

A method that cannot be computed, whatever the exception, has the value ``None`` and a reason; it never raises.
A value that fails a plausibility check (:func:`solution_objections`, :func:`breakdown_objections`) is kept
but marked suspect with the reason; a CCSD start that gives an improper solution is first replaced by the next
start of ``chemistry.CC_STARTS``. docs/baselines.md lists the checks and why they hold.
"""

from __future__ import annotations

import threading
from collections.abc import Callable, Iterator, Mapping
from dataclasses import dataclass, field
from math import comb
from typing import TYPE_CHECKING, Any

from . import chemistry
from .errors import GroundkitError
from .threads import is_small, one_thread_if

if TYPE_CHECKING:  # pragma: no cover
    from .problem import Problem

FCI_DETERMINANT_LIMIT = 1_000_000  # full-space FCI only up to this many determinants (a minute or so here)
METHODS = ("hf", "mp2", "cisd", "ccsd", "ccsd(t)", "casci", "fci")
SPACE = {"hf": "full", "mp2": "active", "cisd": "active", "ccsd": "active", "ccsd(t)": "active",
         "casci": "active", "fci": "full"}
CORRELATED = ("mp2", "cisd", "ccsd", "ccsd(t)", "casci", "fci")  # at or below HF when right
EXACT_FOR_TWO = ("cisd", "ccsd", "ccsd(t)")  # exact in a space with at most two electrons or two holes
NON_VARIATIONAL = ("mp2", "ccsd", "ccsd(t)")
NOISE = 1e-6  # Ha: solver tolerance allowed before an energy relation counts as broken
BREAKDOWN = 1.6e-3  # Ha (chemical accuracy): how far below exact a non-variational method may go unflagged
T1_THRESHOLD = 0.02  # Lee & Taylor, Int. J. Quantum Chem. Symp. 23, 199 (1989), closed shells (from memory)


class Baselines(Mapping):
    """Read-only mapping method -> total energy (Ha) or None.

    ``reason(method)`` says why a value is missing, ``suspect(method)`` why a value is implausible, ``note``
    gives either (or how a CCSD solution was found after a rejected start), ``diagnostics`` the amplitude
    diagnostics (T1, largest amplitudes, CISD reference weight).
    """

    def __init__(self, problem: Problem) -> None:
        self._problem = problem
        self._values: dict[str, float | None] = {}
        self._reasons: dict[str, str] = {}
        self._suspect: dict[str, str] = {}
        self._notes: dict[str, str] = {}
        self._diagnostics: dict[str, dict[str, float]] = {}
        self._checked: set[str] = set()

    def __getitem__(self, method: str) -> float | None:
        key = str(method).lower()
        if key not in METHODS:
            raise KeyError(f"unknown baseline {method!r}; available: {', '.join(METHODS)}")
        if key not in self._values:
            try:
                self._values[key] = self._compute(key)
            except Exception as err:  # a baseline never takes a run with it, whatever PySCF raises
                self._values[key] = None
                self._reasons[key] = f"{type(err).__name__}: {' '.join(str(err).split())}"
        return self._values[key]

    def __iter__(self) -> Iterator[str]:
        return iter(METHODS)

    def __len__(self) -> int:
        return len(METHODS)

    def reason(self, method: str) -> str | None:
        """Why a baseline is None (computing it if needed), else None."""
        self[method]
        return self._reasons.get(str(method).lower())

    def suspect(self, method: str) -> str | None:
        """Why a computed baseline cannot be trusted (computing and checking it if needed), else None.

        The checks run on first use of ``suspect``, ``status``, ``note``, ``rows``, ``table`` or
        ``result_fields``; those against the exact reference compute it (a plain lookup does not)."""
        key = str(method).lower()
        self[key]
        if key not in self._checked:
            self._checked.add(key)
            self._check(key)
        return self._suspect.get(key)

    def note(self, method: str) -> str:
        """Everything to say beside the value: why missing, why suspect, how it was found ('' for none)."""
        self.suspect(method)
        key = str(method).lower()
        return "; ".join(t for t in (self._reasons.get(key), self._suspect.get(key), self._notes.get(key)) if t)

    def diagnostics(self, method: str) -> dict[str, float]:
        """Amplitude diagnostics of a method (``t1_diagnostic``, ``largest_t1``, ``largest_t2`` for CCSD and
        CCSD(T), ``reference_weight`` for CISD); empty for the others."""
        self[method]
        return dict(self._diagnostics.get(str(method).lower(), {}))

    @staticmethod
    def space(method: str) -> str:
        """'active' when the method correlates only the active orbitals, 'full' otherwise."""
        return SPACE[str(method).lower()]

    def status(self, method: str) -> str:
        """'missing', 'suspect' or 'ok'."""
        if self[method] is None:
            return "missing"
        return "suspect" if self.suspect(method) else "ok"

    def rows(self, methods: tuple[str, ...] = METHODS) -> list[dict]:
        """One dict per method: method, energy (Ha), error against the reference (mHa), space, status ('ok',
        'suspect', 'missing'), suspect (the reason or ''), note."""
        reference = self._problem.reference.energy
        out = []
        for m in methods:
            value = self[m]
            out.append({"method": m, "energy": value, "space": self.space(m),
                        "error_mha": None if value is None else 1000.0 * (value - reference),
                        "status": self.status(m), "suspect": self.suspect(m) or "", "note": self.note(m)})
        return out

    def table(self, methods: tuple[str, ...] = METHODS) -> str:
        """Plain-text table: method, energy, error against the exact active-space reference, space, check and
        the note (why missing or suspect)."""
        lines = [f"{'method':<9}{'energy/Ha':>16}{'vs exact/mHa':>14}  {'space':<7}{'check':<8} note", "-" * 64]
        for r in self.rows(methods):
            energy = "—" if r["energy"] is None else f"{r['energy']:16.8f}"
            error = "" if r["error_mha"] is None else f"{r['error_mha']:14.3f}"
            check = {"ok": "ok", "suspect": "SUSPECT", "missing": "missing"}[r["status"]]
            lines.append(f"{r['method']:<9}{energy:>16}{error:>14}  {r['space']:<7}{check:<8} {r['note']}".rstrip())
        return "\n".join(lines)

    def result_fields(self) -> dict[str, Any]:
        """What a RunResult keeps: ``baselines`` (values), ``suspect_baselines`` and ``baseline_notes``."""
        values = {name: self[name] for name in METHODS}
        for name in METHODS:
            self.suspect(name)
        return {"baselines": values,
                "suspect_baselines": {m: self._suspect[m] for m in METHODS if m in self._suspect},
                "baseline_notes": {m: self.note(m) for m in METHODS if self.note(m)}}

    def _compute(self, key: str) -> float:
        p = self._problem
        with one_thread_if(is_small(0, int(p.scf.mo_coeff.shape[0]))):  # busy cores: threads slow small solvers
            computed = _COMPUTE[key](p)
        if isinstance(computed, Computed):
            if computed.diagnostics:
                self._diagnostics[key] = dict(computed.diagnostics)
            if computed.note:
                self._notes[key] = computed.note
            return computed.energy
        return float(computed)

    def _check(self, key: str) -> None:
        value = self._values[key]
        if value is None:
            return
        try:
            objections = solution_objections(self._problem, key, value)
            objections += breakdown_objections(self._problem, key, value)
            if key == "ccsd(t)" and self["ccsd"] is not None and self.suspect("ccsd"):
                objections.append("built on a suspect CCSD solution")
            notes = diagnostic_notes(key, self._diagnostics.get(key, {}))
        except Exception as err:  # a check that cannot run leaves the value unflagged, and says so
            self._notes[key] = f"plausibility checks not run ({type(err).__name__}: {err})"
            return
        if objections:
            self._suspect[key] = "; ".join(objections)
        if notes:
            self._notes[key] = "; ".join(notes + ([self._notes[key]] if key in self._notes else []))

    def __repr__(self) -> str:
        known = {k: v for k, v in self._values.items()}
        return f"Baselines(computed={known}, suspect={sorted(self._suspect)})"


@dataclass(frozen=True)
class Computed:
    """What a compute function may return instead of a bare energy: the energy (Ha), amplitude diagnostics and
    a note on how it was found."""

    energy: float
    diagnostics: dict[str, float] = field(default_factory=dict)
    note: str = ""


# ---------------------------------------------------------------------------------------------------------------
# plausibility checks: relations every right answer obeys
def exact_for_space(problem: Problem) -> bool:
    """True when CISD, CCSD and CCSD(T) are exact in the problem's active space: at most two active electrons or
    two empty active spin orbitals, so no determinant is more than doubly excited from HF."""
    holes = 2 * problem.n_orbitals - problem.n_electrons
    return min(problem.n_electrons, holes) <= 2


def solution_objections(problem: Problem, method: str, energy: float) -> list[str]:
    """Reasons why ``energy`` (Ha) of ``method`` is not a proper solution for ``problem``; empty when it passes.
    A CCSD start that fails one of these is rejected and the next start tried.

    1. A correlated energy above HF by more than ``NOISE``: the HF determinant lies in each of these spaces, so
       CISD, CASCI and FCI cannot be above it, and MP2 and a physical CCSD root lie below it in practice (a
       CCSD root above HF is the spurious one of stretched bonds).
    2. CISD, CCSD, CCSD(T) differing from the exact reference by more than ``NOISE`` where they are exact
       (:func:`exact_for_space`; the same frozen orbitals, so the same space).
    3. CISD below the exact reference of the same space by more than ``NOISE``, closed shells only (RCISD is
       variational among singlets; the unrestricted open-shell CISD may mix in a lower state of higher spin).
    4. Full-space FCI above the active-space exact reference (the full space contains the active one).
    """
    out: list[str] = []
    # the determinant every one of these spaces contains: the SCF one, or for natural and CASSCF orbitals the
    # reference determinant of those orbitals (above the SCF energy)
    hf = problem.scf.energy if problem.active_orbitals.mo_coeff is None else problem.hf_energy
    if method in CORRELATED and energy > hf + NOISE:
        out.append(f"{1000 * (energy - hf):.3f} mHa above HF")
    if method in EXACT_FOR_TWO and exact_for_space(problem):  # a small space: its reference is cheap
        exact = _exact_or_none(problem)
        if exact is not None and abs(energy - exact) > NOISE:
            out.append(f"{1000 * (energy - exact):+.3f} mHa from the exact reference, where {method.upper()} is "
                       "exact (at most two active electrons or holes)")
    exact = _exact_or_none(problem) if method in ("cisd", "fci") else None
    if exact is not None and method == "cisd" and problem.multiplicity == 1 and energy < exact - NOISE:
        out.append(f"{1000 * (exact - energy):.3f} mHa below the exact reference of the same space (impossible "
                   "for a variational method)")
    if exact is not None and method == "fci" and energy > exact + NOISE:
        out.append(f"{1000 * (energy - exact):.3f} mHa above the exact active-space reference (the full space "
                   "contains it)")
    return out


def breakdown_objections(problem: Problem, method: str, energy: float) -> list[str]:
    """Reasons why a proper solution of a non-variational method (MP2, CCSD, CCSD(T)) is no benchmark: more
    than ``BREAKDOWN`` (chemical accuracy) below the exact reference of the same space, the collapse of
    perturbation theory and single-reference coupled cluster far from equilibrium."""
    if method not in NON_VARIATIONAL:
        return []
    exact = _exact_or_none(problem)
    if exact is not None and energy < exact - BREAKDOWN:
        return [f"{1000 * (exact - energy):.3f} mHa below the exact reference of the same space "
                "(non-variational breakdown)"]
    return []


def diagnostic_notes(method: str, diagnostics: dict[str, float]) -> list[str]:
    """Informational notes from the amplitudes (no flag): T1 above ``T1_THRESHOLD``.

    T1 alone does not mark a baseline suspect: on small molecules it misjudges both ways (LiH/STO-3G at 3 Å has
    T1 = 0.095 while CCSD is within 0.1 mHa of exact; a stretched H4 chain has T1 = 0.007 while CCSD lies
    18 mHa below exact), and here the exact reference of the same space is always at hand."""
    t1 = diagnostics.get("t1_diagnostic")
    if method in ("ccsd", "ccsd(t)") and t1 is not None and t1 > T1_THRESHOLD:
        return [f"T1 diagnostic {t1:.3f} > {T1_THRESHOLD} (multireference character)"]
    return []


def _exact_or_none(problem: Problem) -> float | None:
    """The exact reference energy (Ha), or None when it cannot be computed (the checks that need it are skipped;
    a problem without a reference has no run to compare with)."""
    try:
        return float(problem.reference.energy)
    except Exception:  # a size limit or a solver failure: the run reports it; the checks step aside
        return None


def _has_excitations(p: Problem) -> bool:
    """An occupied-to-virtual excitation of one spin exists in the active space."""
    occ = [p.scf.mo_occ[i] for i in p.active_orbitals.active]
    alpha = any(o > 0.5 for o in occ) and any(o < 0.5 for o in occ)
    beta = any(o > 1.5 for o in occ) and any(o < 1.5 for o in occ)
    return alpha or beta


def _hf(p: Problem) -> float:
    return p.scf.energy


def _correlated(method: str) -> Callable[[Problem], Computed]:
    def compute(p: Problem) -> Computed:
        if not _has_excitations(p):
            return Computed(p.scf.energy, note="no excitation fits in the active space, so the correlation "
                                               "energy is zero: equal to HF")
        space = p.active_orbitals

        def check(energy: float) -> str | None:  # what makes a CCSD start rejected
            reasons = solution_objections(p, "ccsd", energy)
            return reasons[0] if reasons else None

        orbitals = None
        if space.mo_coeff is not None:
            from .orbitals.choice import semicanonical

            orbitals = semicanonical(p.scf, space.mo_coeff, list(space.core), list(space.active), space.n_alpha,
                                     space.n_beta)
        found = chemistry.correlated_baseline(p.scf, method, list(space.core) + list(space.external), check,
                                              orbitals)
        note = "CCSD starts tried: " + "; ".join(found.attempts) if len(found.attempts) > 1 else ""
        if orbitals is not None:
            note = "; ".join(t for t in (note, f"in the {space.orbital_set} orbitals of the active space "
                                         "(semicanonical in its occupied and empty blocks)") if t)
        return Computed(found.energy, dict(found.diagnostics), note)

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


_COMPUTE: dict[str, Callable[[Problem], float | Computed]] = {
    "hf": _hf, "mp2": _correlated("mp2"), "cisd": _correlated("cisd"), "ccsd": _correlated("ccsd"),
    "ccsd(t)": _correlated("ccsd(t)"), "casci": _casci, "fci": _fci,
}


class DeferredFields:
    """A problem's :meth:`Baselines.result_fields`, computed on first use and then kept as plain dicts.

    A run hands these to its :class:`~groundkit.result.RunResult`, so the baselines a run does not need (CCSD(T)
    and FCI on a new molecule) are computed only when the result is read, saved, compared or shown, and only once
    per problem (the problem keeps them). Until then the result holds the problem's ``Baselines``.
    """

    def __init__(self, baselines: Baselines) -> None:
        self._source: Baselines | None = baselines
        self._fields: dict[str, Any] | None = None
        self._lock = threading.Lock()

    def fields(self) -> dict[str, Any]:
        with self._lock:
            if self._fields is None:
                assert self._source is not None
                self._fields = self._source.result_fields()
                self._source = None  # from now on plain data only
            return self._fields

    def mappings(self) -> dict[str, DeferredMapping]:
        """``baselines``, ``suspect_baselines`` and ``baseline_notes`` as lazy mappings (RunResult fields)."""
        return {name: DeferredMapping(self, name) for name in ("baselines", "suspect_baselines", "baseline_notes")}


class DeferredMapping(Mapping):
    """One field of :class:`DeferredFields`: a read-only mapping that computes on first access; copies, pickles
    and compares as the plain dict it stands for."""

    def __init__(self, deferred: DeferredFields, name: str) -> None:
        self._deferred, self._name = deferred, name

    def _dict(self) -> dict:
        return self._deferred.fields()[self._name]

    def __getitem__(self, key: str) -> Any:
        return self._dict()[key]

    def __iter__(self) -> Iterator[str]:
        return iter(self._dict())

    def __len__(self) -> int:
        return len(self._dict())

    def __reduce__(self) -> tuple:
        return (dict, (dict(self._dict()),))

    def __repr__(self) -> str:
        return repr(self._dict())
