"""Energy and all angle derivatives of a product of exponentials, by one backward (adjoint) sweep.

For psi = U_K ... U_1 phi with U_k = exp(theta_k G_k) and E = <psi|H|psi>,

    dE/dtheta_k = 2 <lambda_k| G_k |psi_k>,  psi_k = U_k ... U_1 phi,  lambda_k = U_{k+1}^T ... U_K^T H psi.

The sweep starts from psi_K = psi and lambda_K = H psi and walks k = K ... 1, undoing U_k on both after reading
the derivative. Cost: one forward pass, one H.psi, and two rotations per factor backwards, whatever the number of
factors.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence

import numpy as np

from groundkit.sector.exponential import apply_product, as_steps
from groundkit.sector.steps import Buffer, Steps
from groundkit.sector.tables import ExcitationTable


def energy_and_angle_gradient(
    reference: np.ndarray,
    tables: Steps | Sequence[ExcitationTable],
    angles: Sequence[float],
    apply_hamiltonian: Callable[[np.ndarray], np.ndarray],
) -> tuple[float, np.ndarray]:
    """(<psi|H|psi>, dE/dangles) for psi = product of exponentials on the normalised ``reference``.

    ``apply_hamiltonian`` maps a CI array to H times it (without any constant); the energy is in the same units.
    """
    steps = as_steps(tables, np.shape(reference))
    psi = apply_product(reference, steps, angles)
    lam = np.asarray(apply_hamiltonian(psi), dtype=float).reshape(psi.shape)
    energy = float(np.vdot(psi, lam))
    psi_buffer, lam_buffer = Buffer(psi), Buffer(lam)
    gradient = np.zeros(len(steps))
    for k in range(len(steps) - 1, -1, -1):
        step = steps.steps[k]
        source, target = step.index()
        weight = step.signs()
        psi_w, lam_w = psi_buffer.view(step.kind), lam_buffer.view(step.kind)
        psi_s, psi_t = psi_w[source], psi_w[target]
        lam_s, lam_t = lam_w[source], lam_w[target]
        gradient[k] = 2.0 * float(np.sum(weight * (lam_t * psi_s - lam_s * psi_t)))
        theta = float(angles[k])
        if theta != 0.0:
            c, s_weight = math.cos(theta), math.sin(theta) * weight
            psi_w[source] = c * psi_s + s_weight * psi_t
            psi_w[target] = c * psi_t - s_weight * psi_s
            lam_w[source] = c * lam_s + s_weight * lam_t
            lam_w[target] = c * lam_t - s_weight * lam_s
    return energy, gradient
