"""Pipeline: a fluent, immutable chain of components from a molecule to a result.

Every chaining call returns a new Pipeline; the old one is untouched. Computed work lives in shared Problem and
objective objects, so pipelines that differ only downstream (minimiser, estimator) share them, and pipelines that
differ in the trial state still share the chemistry.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, replace
from typing import Any

from . import components as _c
from . import sizing
from .active_space import ActiveSpace
from .energy_surface import EnergySurface
from .errors import ComponentError
from .estimators import Estimator, ExactEstimator
from .mapping import QubitMapping
from .molecule import MoleculeSpec
from .problem import Problem, build_problem, cached_problem, problem_key
from .upcalls import provides, upcall
from .workspace import workspace


@dataclass(frozen=True)
class _Components:
    molecule: MoleculeSpec | None = None
    active_space: ActiveSpace | None = None
    mapping: QubitMapping | None = None
    trial_state: Any = None
    estimator: Estimator | None = None
    minimiser: Any = None
    device: Any = None


class Pipeline:
    """``Pipeline(molecule)`` or ``molecule.pipeline()``; ``Pipeline()`` holds components without a molecule.

    Defaults where a component is not given: full space, Jordan–Wigner, UCCSD, exact estimator, BFGS.
    """

    __slots__ = ("_components",)

    def __init__(self, molecule: MoleculeSpec | None = None) -> None:
        if molecule is not None and not isinstance(molecule, MoleculeSpec):
            raise ComponentError(f"Pipeline takes a MoleculeSpec or nothing, got {type(molecule).__name__}")
        self._components = _Components(molecule=molecule)

    def _with(self, **changes: Any) -> Pipeline:
        new = Pipeline.__new__(Pipeline)
        new._components = replace(self._components, **changes)
        return new

    # chaining -------------------------------------------------------------------------------------------------
    def molecule(self, molecule: MoleculeSpec) -> Pipeline:
        """A pipeline with the same components for another molecule."""
        if not isinstance(molecule, MoleculeSpec):
            raise ComponentError(f"molecule must be a MoleculeSpec, got {type(molecule).__name__}")
        return self._with(molecule=molecule)

    def active_space(self, space: ActiveSpace | str | None = None, **options: Any) -> Pipeline:
        """Choose the active space: an :class:`ActiveSpace`, or its options (``electrons=2, orbitals=3``), or a
        registered active-space name with options."""
        return self._with(active_space=_c.as_active_space(space, **options))

    def mapping(self, mapping: QubitMapping | str, **options: Any) -> Pipeline:
        """Choose the fermion-to-qubit mapping: a :class:`QubitMapping` or a name (``"parity"``)."""
        return self._with(mapping=_c.as_mapping(mapping, **options))

    def trial_state(self, trial_state: Any, **options: Any) -> Pipeline:
        """Choose the trial state: an instance (``gk.UCCSD()``) or a name with options (``"upccgsd", k=2``)."""
        return self._with(trial_state=_c.as_trial_state(trial_state, **options))

    def estimator(self, estimator: Estimator | str, **options: Any) -> Pipeline:
        """Choose how energies are estimated: an :class:`Estimator` or a name (``"exact"``)."""
        return self._with(estimator=_c.as_estimator(estimator, **options))

    def minimiser(self, minimiser: Any, **options: Any) -> Pipeline:
        """Choose the minimiser: an instance (``gk.COBYLA()``) or a name with options (``"adam", step=0.1``)."""
        return self._with(minimiser=_c.as_minimiser(minimiser, **options))

    def device(self, device: Any) -> Pipeline:
        """Choose the device the circuits are compiled for: a :class:`~groundkit.device.DeviceProfile`, a
        registered device name (``"grid-4x4"``), or None for the logical all-to-all register (the default)."""
        from .device import as_device

        return self._with(device=as_device(device))

    @property
    def device_profile(self) -> Any:
        """The chosen :class:`~groundkit.device.DeviceProfile`, or None (logical all-to-all register)."""
        return self._components.device

    # components and computed objects ------------------------------------------------------------------------
    @property
    def components(self) -> dict[str, Any]:
        """The configured components by role (None where the default applies)."""
        c = self._components
        return {"molecule": c.molecule, "active_space": c.active_space, "mapping": c.mapping,
                "trial_state": c.trial_state, "estimator": c.estimator, "minimiser": c.minimiser, "device": c.device}

    def resolved_components(self) -> dict[str, Any]:
        """The components with every default filled in."""
        from .minimisers import BFGS
        from .trial_states import UCCSD

        c = self._components
        return {"molecule": c.molecule, "active_space": c.active_space or ActiveSpace(),
                "mapping": c.mapping or QubitMapping(), "trial_state": c.trial_state or UCCSD(),
                "estimator": c.estimator or ExactEstimator(), "minimiser": c.minimiser or BFGS()}

    def problem(self) -> Problem:
        """The active-space problem with its exact reference and baselines (shared, computed once)."""
        molecule = self._components.molecule
        if molecule is None:
            raise ComponentError("this pipeline has no molecule yet; use Pipeline(molecule) or .molecule(spec)")
        return build_problem(molecule, self._components.active_space)

    def objective(self) -> EnergySurface:
        """E(θ) and ∇E(θ) of the trial state on the problem, exact (shared between pipelines with equal choices,
        whatever their estimator); the estimator's values come from :meth:`measurement`."""
        from .objective import Objective

        self.check_size(("scf", "integrals", "engine"), "this objective")
        problem = self.problem()
        trial_state = self.resolved_components()["trial_state"]
        if _is_qubit_trial_state(trial_state):
            return self._qubit_objective(trial_state)
        mapping = self.resolved_components()["mapping"]
        # on a tapered register only symmetry-conserving excitations are kept (see qubits.symmetry)
        tapered = mapping if mapping.taper else None

        def build() -> Objective:
            if tapered is None:
                return Objective(problem, trial_state)
            from .qubits import sector_plan

            return Objective(problem, trial_state, plan=sector_plan(trial_state, self.encoding()))

        key = (problem_key(problem), trial_state, tapered)
        return workspace().fetch("objective", key, build, parents=lambda objective: (objective.problem,),
                                 valid=lambda objective: objective.problem is problem, grows=True)

    def check_size(self, stages: tuple[str, ...] = sizing.STAGES, what: str = "this pipeline") -> Any:
        """Raise :class:`~groundkit.errors.SizeLimitError` at once, before any SCF, when a stage's predicted memory
        or time exceeds :data:`groundkit.limits`; returns the :class:`~groundkit.sizing.CostEstimate`. Once the
        problem exists its actual active space is used."""
        molecule = self._components.molecule
        if molecule is None:
            raise ComponentError("this pipeline has no molecule yet; use Pipeline(molecule) or .molecule(spec)")
        problem = cached_problem(molecule, self._components.active_space)
        return sizing.check_pipeline(self, stages, what, problem=problem)

    def encoding(self) -> Any:
        """The problem under the chosen mapping (tapered if asked): a shared :class:`QubitEncoding`."""
        from .qubits import encoding_for

        return encoding_for(self.problem(), self.resolved_components()["mapping"])

    def _qubit_objective(self, trial_state: Any) -> EnergySurface:
        """The shared QubitObjective of a qubit trial state under this pipeline's encoding."""
        from .qubit_states import QubitObjective

        encoding = self.encoding()
        key = (problem_key(encoding.problem), encoding.mapping, trial_state)
        return workspace().fetch("qubit objective", key, lambda: QubitObjective(encoding, trial_state),
                                 parents=lambda objective: (objective.encoding,),
                                 valid=lambda objective: objective.encoding is encoding, grows=True)

    def circuit(self, theta: Any = None, *, construction: str = "compact") -> Any:
        """A :class:`~groundkit.device.DeviceCircuit` preparing the trial state at ``theta`` (radians; default the
        initial parameters) under the mapping. Without a device its ``.circuit`` is the logical ``cirq.Circuit``
        from |0…0⟩ on ``cirq.LineQubit.range(n)`` (qubit k is index k of the qubit Hamiltonian), placements the
        identity; with one it is placed, routed and rewritten in the device's native gates (see docs/devices.md).
        ``construction``: "compact" excitation circuits (default) or "ladder" (Pauli-string exponentials)."""
        from .circuits import trial_circuit
        from .device import compile_for_device

        n_qubits = self.encoding().n_qubits
        return compile_for_device(trial_circuit(self, theta, construction=construction), self._components.device,
                                  n_qubits=n_qubits)

    def qubit_hamiltonian(self) -> Any:
        """The qubit Hamiltonian (``openfermion.QubitOperator``, Ha) under the mapping, tapered if asked."""
        return self.encoding().hamiltonian

    def pauli_statistics(self) -> Any:
        """Pauli term count, largest weight, 1-norm and qubit-wise commuting groups of the qubit Hamiltonian."""
        from .qubits import pauli_statistics

        encoding = self.encoding()
        return pauli_statistics(encoding.hamiltonian, encoding.n_qubits)

    def measurement(self) -> Any:
        """The pipeline's estimator bound to its objective: ``estimate(θ) -> (energy, standard error)``."""
        return self.resolved_components()["estimator"].bind(self)

    def shot_budget(self, precision: float = 1.6e-3, parameters: Any = None, grouping: str = "qwc",
                    allocation: str = "variance") -> int:
        """Total shots for one energy estimate with standard error ``precision`` (Ha) at ``parameters`` (default:
        the trial state's start), from the exact group variances (see docs/measurement.md)."""
        from .estimators import shot_budget

        return shot_budget(self, precision, parameters, grouping, allocation)

    def run(self, callback: Callable[[Any], None] | None = None, *, initial_parameters: Any = None,
            live: bool = False, progress: bool = False) -> Any:
        """Minimise the energy; returns a :class:`~groundkit.result.RunResult`.

        ``callback(record)`` is called once per iteration with the minimiser's iteration record. Ctrl-C (or a
        KeyboardInterrupt raised by the callback) ends the run early with a partial, not-converged result.
        ``initial_parameters`` (radians) replaces the trial state's own start, e.g. for a warm start.
        ``live=True`` displays a notebook view that follows the run and keeps its final figure;
        ``progress=True`` shows a tqdm bar of iterations (see docs/notebook.md).
        """
        self.check_size(("scf", "integrals", "reference", "engine"), "this run")
        if live or progress:
            return upcall("run:watched", self, callback, live=live, progress=progress,
                          initial_parameters=initial_parameters)
        from .runner import run_pipeline

        return run_pipeline(self, callback, initial_parameters=initial_parameters)

    def configuration(self) -> dict[str, str]:
        """Readable description of every resolved component (used in provenance and summaries)."""
        resolved = self.resolved_components()
        out = {role: repr(c) for role, c in resolved.items()}
        if resolved["molecule"] is not None:
            out["geometry_xyz"] = resolved["molecule"].to_xyz()
        if self._components.device is not None:  # absent for the logical register, as before devices existed
            out["device"] = repr(self._components.device)
        return out

    def scan(
        self, geometry: Callable[[float], MoleculeSpec], values: Any, *, checkpoint: str | None = None,
        executor: Any = None, warm_start: bool | int = True, progress: bool = False, retry_failed: bool = False,
    ) -> Any:
        """Run this pipeline at ``geometry(v)`` for each value; returns a :class:`~groundkit.studies.ScanResult`.

        ``warm_start``: True (one chain, each point starts from the previous one's parameters after orbital
        matching), an integer of parallel chains, or False. ``checkpoint``: a directory, one file per finished
        point, locked while the scan runs; rerunning skips the finished points (``retry_failed=True`` computes the
        failed ones again). ``executor``: None, 'processes', a concurrent.futures Executor or a
        ``distributed.Client``. Ctrl-C stops the scan (KeyboardInterrupt); the point in progress is not stored.
        See docs/studies.md.
        """
        return upcall("study:scan", self, geometry, values, checkpoint=checkpoint, executor=executor,
                      warm_start=warm_start, progress=progress, retry_failed=retry_failed)

    def optimise_geometry(
        self, geometry: Callable[..., MoleculeSpec], initial: Any, *, bounds: Any = None,
        method: str = "nelder-mead", tolerance: float = 1e-4, max_evaluations: int = 200, warm_start: bool = True,
    ) -> Any:
        """Minimise the energy over geometry parameters with SciPy; returns a
        :class:`~groundkit.studies.GeometryOptimum` with the optimised geometry. See docs/studies.md."""
        return upcall("study:optimise_geometry", self, geometry, initial, bounds=bounds, method=method,
                      tolerance=tolerance, max_evaluations=max_evaluations, warm_start=warm_start)

    def __repr__(self) -> str:
        chosen = self.components
        resolved = self.resolved_components()
        mol = "no molecule" if chosen["molecule"] is None else repr(chosen["molecule"])
        lines = [f"Pipeline({mol})"]
        for role in ("active_space", "mapping", "trial_state", "estimator", "minimiser"):
            note = "" if chosen[role] is not None else "  # default"
            lines.append(f"  .{role}({resolved[role]!r}){note}")
        if self._components.device is not None:
            lines.append(f"  .device({self._components.device!r})")
        return "\n".join(lines)


def _is_qubit_trial_state(trial_state: Any) -> bool:
    from .qubit_states import QubitTrialState

    return isinstance(trial_state, QubitTrialState)


@provides("pipeline")
def _pipeline_of(molecule: MoleculeSpec) -> Pipeline:
    """``MoleculeSpec.pipeline()``."""
    return Pipeline(molecule)
