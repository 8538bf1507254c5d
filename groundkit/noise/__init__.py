"""Noise at device scale: noise models from error figures and durations (``model``, ``relaxation``), simulation
by density matrix or trajectories (``simulation``), readings of measurement groups (``readings``), error
mitigation (``readout``, ``folding``, ``extrapolation``, ``symmetry``) and the noise threshold (``threshold``)."""

from .extrapolation import FITS, Extrapolation, extrapolate
from .folding import fold
from .model import DeviceNoise
from .relaxation import relaxation_rates

__all__ = ["FITS", "DeviceNoise", "Extrapolation", "extrapolate", "fold", "relaxation_rates"]
