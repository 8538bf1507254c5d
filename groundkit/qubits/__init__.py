"""The qubit layer: mappings, tapering, Pauli statistics, qubit-level states and circuits."""

from .comparison import compare_mappings
from .encoding import QUBIT_STATE_LIMIT, QubitEncoding, SectorWarning, encoding_for
from .statistics import PauliStatistics, pauli_statistics, qubitwise_commute, qwc_groups
from .symmetry import sector_plan
from .tapering import Taper, make_taper, z2_symmetries

__all__ = [
    "QUBIT_STATE_LIMIT", "PauliStatistics", "QubitEncoding", "SectorWarning", "Taper", "compare_mappings",
    "encoding_for", "make_taper", "pauli_statistics", "qubitwise_commute", "qwc_groups", "sector_plan", "z2_symmetries",
]
