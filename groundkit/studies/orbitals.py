"""Warm starts across geometries (orbital matching): the names studies have always imported from here.

The module lives in :mod:`groundkit.orbital_matching`, in the objectives' layer, because fermionic objectives
hand over and warm-start by it (see DEVELOPERS.md, "Layers").
"""

from groundkit.orbital_matching import (  # noqa: F401
    Handover,
    OrbitalMatch,
    active_orbitals,
    match_orbitals,
    orbital_handover,
    orbital_warm_start,
    previous_match,
    transfer_parameters,
    warm_note,
)
