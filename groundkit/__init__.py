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
from .reference import ExactState, Reference
from .result import CHEMICAL_ACCURACY, History, ReferenceRecord, Resources, RunResult
from .trial_states import PUCCD, UCCSD, ExcitationList, HartreeFock, TrialState, UpCCGSD

__version__ = "0.1.0"

__all__ = [
    "BFGS", "CHEMICAL_ACCURACY", "COBYLA", "LBFGSB", "MINIMISER_NAMES", "PUCCD", "SPSA", "UCCSD", "ActiveSpace",
    "ActiveSpaceError", "Adam", "BasisError", "Baselines", "ChargeError", "ComponentError", "ConvergenceError",
    "DegenerateBoundaryWarning", "ElementError", "Estimator", "ExactEstimator", "ExactState", "ExcitationError",
    "ExcitationList", "GeometryError", "GradientDescent", "GroundkitError", "HartreeFock", "History",
    "IterationRecord", "Minimiser", "MinimiserOutcome", "MoleculeError", "MoleculeSpec", "MultiplicityError",
    "NelderMead", "Objective", "ParameterError", "Pipeline", "Problem", "QubitMapping", "Reference",
    "ReferenceRecord", "ResolvedActiveSpace", "Resources", "ResultFileError", "RunResult", "SizeLimitError",
    "TrialState", "UpCCGSD", "XYZFormatError", "as_estimator", "as_mapping", "as_minimiser", "as_trial_state",
    "build_problem", "load_result", "minimiser_from_name",
]
