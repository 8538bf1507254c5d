"""Colours for every groundkit chart: the Okabe–Ito colour-blind-safe set, always used beside a text label."""

from __future__ import annotations

BLACK = "#000000"
ORANGE = "#E69F00"
SKY = "#56B4E9"
GREEN = "#009E73"
YELLOW = "#F0E442"
BLUE = "#0072B2"
VERMILION = "#D55E00"
PURPLE = "#CC79A7"
GREY = "#7F7F7F"

TRIAL = BLUE          # the trial state's energies and amplitudes
EXACT = VERMILION     # the exact reference (energy line, amplitudes)
BAND = GREEN          # the chemical-accuracy band
BASELINES = (ORANGE, PURPLE, SKY, GREY, YELLOW, BLACK, GREEN)
