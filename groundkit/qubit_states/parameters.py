"""Checks of parameter vectors, worded like the determinant engine's."""

from __future__ import annotations

from typing import Any

import numpy as np

from ..errors import ParameterError


def checked_parameters(theta: Any, n_parameters: int, owner: Any) -> np.ndarray:
    """``theta`` as a float array of length ``n_parameters`` (radians), or :class:`ParameterError`."""
    try:
        values = np.asarray(theta, dtype=float)
    except (TypeError, ValueError):
        raise ParameterError(f"parameters {theta!r} are not numbers; expected {n_parameters} finite values") from None
    if values.ndim != 1 or values.size != n_parameters:
        raise ParameterError(
            f"parameter vector has shape {values.shape}; expected {n_parameters} values (one per parameter of "
            f"{owner!r})"
        )
    bad = np.flatnonzero(~np.isfinite(values))
    if bad.size:
        raise ParameterError(f"parameter {int(bad[0])} is {float(values[bad[0]])!r}; expected {n_parameters} "
                             "finite values")
    return values
