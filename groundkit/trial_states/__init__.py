"""Fermionic trial states: ordered products of excitation exponentials on a reference determinant."""

from groundkit.trial_states.base import ExcitationPlan, TrialState, excitation_label
from groundkit.trial_states.custom import ExcitationList
from groundkit.trial_states.hartree_fock import HartreeFock
from groundkit.trial_states.paired import PUCCD, UpCCGSD
from groundkit.trial_states.uccsd import UCCSD

__all__ = [
    "PUCCD",
    "UCCSD",
    "ExcitationList",
    "ExcitationPlan",
    "HartreeFock",
    "TrialState",
    "UpCCGSD",
    "excitation_label",
]
