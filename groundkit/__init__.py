"""groundkit: prepare variational ground-state calculations of molecules.

Energies in Hartree; input coordinates in angstrom unless ``unit="bohr"``.
"""

from .active_space import ActiveSpace, ResolvedActiveSpace
from .baselines import Baselines
from .errors import (
    ActiveSpaceError,
    BasisError,
    ChargeError,
    ComponentError,
    ConvergenceError,
    DegenerateBoundaryWarning,
    ElementError,
    GeometryError,
    GroundkitError,
    MoleculeError,
    MultiplicityError,
    SizeLimitError,
    XYZFormatError,
)
from .molecule import MoleculeSpec
from .pipeline import Pipeline
from .problem import Problem, build_problem
from .reference import ExactState, Reference

__version__ = "0.1.0"

CHEMICAL_ACCURACY = 1.6e-3  # Hartree (1 kcal/mol = 1.5936 mHa); common practice, no single source

__all__ = [
    "CHEMICAL_ACCURACY", "ActiveSpace", "ActiveSpaceError", "BasisError", "Baselines", "ChargeError",
    "ComponentError", "ConvergenceError", "DegenerateBoundaryWarning", "ElementError", "ExactState",
    "GeometryError", "GroundkitError", "MoleculeError", "MoleculeSpec", "MultiplicityError", "Pipeline",
    "Problem", "Reference", "ResolvedActiveSpace", "SizeLimitError", "XYZFormatError", "build_problem",
]
