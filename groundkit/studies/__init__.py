"""Studies: bond scans with warm starts and checkpoints, curve analysis, geometry optimisation, comparison grids.

Scans and grids run on an executor (serial, local processes or a Dask ``distributed.Client``) and ship only
plain data to workers. See docs/studies.md and docs/dask.md.
"""

from .analysis import harmonic_wavenumber, non_parallelity, spline_minimum
from .compare import compare
from .errors import AnalysisError, CheckpointError, ExecutorError, ScanInputError, StudyFileError
from .geometries import BondStretch
from .geometry_optimisation import GeometryOptimum, optimise_geometry
from .orbitals import Handover, OrbitalMatch, match_orbitals, transfer_parameters
from .plan_input import PlanInputError, PlanLimits
from .plan_persistence import load_plan
from .plan_result import PlanResult, Recommendation
from .planning import plan
from .scan import run_scan
from .scan_persistence import load_scan, save_scan
from .scan_result import ScanPoint, ScanResult

__all__ = [
    "AnalysisError", "BondStretch", "PlanInputError", "PlanLimits", "PlanResult", "Recommendation", "load_plan",
    "plan", "CheckpointError", "ExecutorError", "GeometryOptimum", "Handover", "OrbitalMatch",
    "ScanInputError", "ScanPoint", "ScanResult", "StudyFileError", "compare", "harmonic_wavenumber",
    "load_scan", "match_orbitals", "non_parallelity", "optimise_geometry", "run_scan", "save_scan",
    "spline_minimum", "transfer_parameters",
]
