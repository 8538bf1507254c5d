"""groundkit: prepare variational ground-state calculations of molecules.

Energies in Hartree; input coordinates in angstrom unless ``unit="bohr"``.
"""

from . import adaptive, constraints, registry, studies
from .active_space import ActiveSpace, ResolvedActiveSpace
from .adaptive import (
    Adaptive,
    ExcitationPool,
    GeneralisedPool,
    GrowthStep,
    OperatorPool,
    PauliStringPool,
    QubitPool,
    SinglesDoublesPool,
    grown_sequence,
    grown_trial_state,
    growth_steps,
    growth_table,
)
from .baselines import Baselines
from .circuits import circuit_from_openqasm, circuit_resources, openqasm_text, trial_circuit
from .component import Component, component_from_dict
from .components import as_active_space, as_component, as_estimator, as_mapping, as_minimiser, as_trial_state
from .device import DeviceCircuit, DeviceProfile, compare_devices, compile_for_device
from .errors import (
    ActiveSpaceError,
    AnalysisError,
    BasisError,
    ChargeError,
    CheckpointError,
    ComponentError,
    ConvergenceError,
    DegenerateBoundaryWarning,
    DeviceError,
    ElementError,
    ExcitationError,
    ExecutorError,
    GeometryError,
    GroundkitError,
    IntegralConsistencyError,
    MoleculeError,
    MultiplicityError,
    OrbitalJumpWarning,
    ParameterError,
    ResultFileError,
    ScanInputError,
    ScfFallbackWarning,
    ScfInstabilityWarning,
    ScfWarning,
    SizeLimitError,
    StudyFileError,
    SymmetryError,
    WorkspaceBudgetError,
    XYZFormatError,
)
from .estimators import (
    NOISY_QUBIT_LIMIT,
    Estimator,
    ExactEstimator,
    Measurement,
    NoisyEstimator,
    SampledEstimator,
    compare_measurements,
    shot_budget,
)
from .mapping import BravyiKitaev, JordanWigner, LinearMapping, Parity, QubitMapping
from .minimisers import (
    BFGS,
    COBYLA,
    LBFGSB,
    MINIMISER_NAMES,
    SPSA,
    Adam,
    FixedStepDescent,
    IterationRecord,
    Minimiser,
    MinimiserOutcome,
    NelderMead,
    minimiser_from_name,
)
from .molecule import MoleculeSpec
from .noise.threshold import NoiseThreshold, noise_threshold
from .objective import Objective
from .orbitals.optimised import orbital_optimised_run
from .persistence import load_result
from .pipeline import Pipeline
from .problem import Problem, build_problem
from .qubit_states import CircuitTrialState, HardwareEfficient, PauliRotations, QubitObjective, QubitTrialState
from .qubits import QubitEncoding, compare_mappings
from .reference import ExactState, Reference
from .registry import register, unregister
from .result import CHEMICAL_ACCURACY, History, ReferenceRecord, Resources, RunResult
from .sizing import CostEstimate, Limits, cost_estimate, limits
from .studies import (
    BondStretch,
    GeometryOptimum,
    PlanInputError,
    PlanLimits,
    PlanResult,
    Recommendation,
    ScanPoint,
    ScanResult,
    compare,
    load_plan,
    load_scan,
    plan,
)
from .trial_states import UCCSD, ExcitationList, PairDoubles, ReferenceDeterminant, TrialState, UpCCGSD
from .widgets import explore
from .workspace import Workspace, workspace

__version__ = "0.1.0"

__all__ = [
    "BravyiKitaev", "Component", "JordanWigner", "LinearMapping", "Parity", "as_active_space", "as_component",
    "component_from_dict", "constraints", "register", "registry", "unregister",
    "ActiveSpace", "ActiveSpaceError", "Adam", "Adaptive", "AnalysisError", "BFGS", "Baselines", "BasisError",
    "BondStretch", "CHEMICAL_ACCURACY", "COBYLA", "ChargeError", "CheckpointError", "CircuitTrialState",
    "ComponentError", "ConvergenceError", "DegenerateBoundaryWarning", "ElementError", "Estimator", "ExactEstimator",
    "ExactState", "ExcitationError", "ExcitationList", "ExcitationPool", "ExecutorError", "GeneralisedPool",
    "GeometryError", "GeometryOptimum", "FixedStepDescent", "GroundkitError", "GrowthStep", "HardwareEfficient",
    "ReferenceDeterminant", "History", "IntegralConsistencyError", "IterationRecord", "LBFGSB", "MINIMISER_NAMES",
    "Measurement", "Minimiser",
    "MinimiserOutcome", "MoleculeError", "MoleculeSpec", "MultiplicityError", "NOISY_QUBIT_LIMIT", "NelderMead",
    "NoiseThreshold",
    "NoisyEstimator", "Objective", "OperatorPool", "PairDoubles", "ParameterError", "PauliRotations", "PauliStringPool",
    "Pipeline", "Problem", "QubitEncoding", "QubitMapping", "QubitObjective", "QubitPool", "QubitTrialState",
    "Reference", "ReferenceRecord", "ResolvedActiveSpace", "Resources", "ResultFileError", "RunResult", "SPSA",
    "SampledEstimator", "ScanInputError", "ScanPoint", "ScanResult", "ScfFallbackWarning", "ScfInstabilityWarning",
    "OrbitalJumpWarning", "ScfWarning", "SinglesDoublesPool", "SizeLimitError",
    "StudyFileError", "SymmetryError", "TrialState", "UCCSD", "UpCCGSD", "XYZFormatError", "adaptive", "as_estimator",
    "as_mapping", "as_minimiser", "as_trial_state", "build_problem", "circuit_from_openqasm", "circuit_resources",
    "compare", "compare_mappings", "compare_measurements", "explore", "grown_sequence", "grown_trial_state",
    "growth_steps", "growth_table", "load_result", "load_scan", "minimiser_from_name", "openqasm_text", "shot_budget",
    "studies", "trial_circuit", "CostEstimate", "Limits", "cost_estimate", "limits", "noise_threshold",
    "orbital_optimised_run",
    "DeviceCircuit", "DeviceError", "DeviceProfile", "compare_devices", "compile_for_device",
    "PlanInputError", "PlanLimits", "PlanResult", "Recommendation", "load_plan", "plan",
    "Workspace", "WorkspaceBudgetError", "workspace",
]
