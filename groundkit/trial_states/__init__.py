"""Fermionic trial states: ordered products of excitation exponentials on a reference determinant."""

from groundkit.trial_states.base import ExcitationPlan, TrialState, excitation_label
from groundkit.trial_states.custom import ExcitationList
from groundkit.trial_states.paired import PairDoubles, UpCCGSD
from groundkit.trial_states.reference_determinant import ReferenceDeterminant
from groundkit.trial_states.uccsd import UCCSD

__all__ = [
    "PairDoubles",
    "UCCSD",
    "ExcitationList",
    "ExcitationPlan",
    "ReferenceDeterminant",
    "TrialState",
    "UpCCGSD",
    "excitation_label",
]
