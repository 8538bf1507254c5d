"""groundkit: prepare variational ground-state calculations of molecules.

Energies in Hartree; input coordinates in angstrom unless ``unit="bohr"``.
"""

from .active_space import ActiveSpace, ResolvedActiveSpace
from .baselines import Baselines
from .components import as_estimator, as_mapping, as_minimiser, as_trial_state
from .errors import (
    ActiveSpaceError,
    BasisError,
    ChargeError,
    ComponentError,
    ConvergenceError,
    DegenerateBoundaryWarning,
    ElementError,
    ExcitationError,
    GeometryError,
    GroundkitError,
    MoleculeError,
    MultiplicityError,
    ParameterError,
    ResultFileError,
    SizeLimitError,
    SymmetryError,
    XYZFormatError,
)
from .estimators import Estimator, ExactEstimator
from .mapping import QubitMapping
from .minimisers import (
    BFGS,
    COBYLA,
    LBFGSB,
    MINIMISER_NAMES,
    SPSA,
    Adam,
    GradientDescent,
    IterationRecord,
    Minimiser,
    MinimiserOutcome,
    NelderMead,
    minimiser_from_name,
)
from .molecule import MoleculeSpec
from .objective import Objective
from .persistence import load_result
from .pipeline import Pipeline
from .problem import Problem, build_problem
from .qubits import QubitEncoding, compare_mappings
from .reference import ExactState, Reference
from .result import CHEMICAL_ACCURACY, History, ReferenceRecord, Resources, RunResult
from .trial_states import PUCCD, UCCSD, ExcitationList, HartreeFock, TrialState, UpCCGSD

__version__ = "0.1.0"

__all__ = [
    "ActiveSpace", "ActiveSpaceError", "Adam", "BFGS", "Baselines", "BasisError", "CHEMICAL_ACCURACY", "COBYLA",
    "ChargeError", "ComponentError", "ConvergenceError", "DegenerateBoundaryWarning", "ElementError", "Estimator",
    "ExactEstimator", "ExactState", "ExcitationError", "ExcitationList", "GeometryError", "GradientDescent",
    "GroundkitError", "HartreeFock", "History", "IterationRecord", "LBFGSB", "MINIMISER_NAMES", "Minimiser",
    "MinimiserOutcome", "MoleculeError", "MoleculeSpec", "MultiplicityError", "NelderMead", "Objective", "PUCCD",
    "ParameterError", "Pipeline", "Problem", "QubitEncoding", "QubitMapping", "Reference", "ReferenceRecord",
    "ResolvedActiveSpace", "Resources", "ResultFileError", "RunResult", "SPSA", "SizeLimitError", "SymmetryError",
    "TrialState", "UCCSD", "UpCCGSD", "XYZFormatError", "as_estimator", "as_mapping", "as_minimiser",
    "as_trial_state", "build_problem", "compare_mappings", "load_result", "minimiser_from_name",
]
