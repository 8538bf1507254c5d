"""Unitary folding: a circuit C made longer without changing what it computes, to scale its noise.

Global folding C → C (C†C)^k multiplies the gate count by λ = 2k + 1; a scale between odd integers folds the last
m moments L once more, C (C†C)^k L†L, for λ = 1 + 2k + 2m/d with d the number of moments (Giurgica-Tiron, Hindy,
LaRose, Mari and Zeng, IEEE QCE 2020, arXiv:2005.10921, sections on global and partial folding). The noise model
is applied to the folded circuit afterwards, so each inverse gate errs like its forward gate.
"""

from __future__ import annotations

import math

import cirq

from ..errors import NoiseError


def fold(circuit: cirq.AbstractCircuit, scale: float) -> tuple[cirq.Circuit, float]:
    """(folded circuit, achieved scale factor) for a requested ``scale`` ≥ 1."""
    if not isinstance(scale, (int, float)) or isinstance(scale, bool) or not math.isfinite(scale) or scale < 1:
        raise NoiseError(f"scale factor {scale!r} must be a finite number >= 1")
    moments = [m for m in circuit if m.operations]
    base = cirq.Circuit(moments)
    depth = len(moments)
    if depth == 0:
        return base, float(scale)
    inverse = cirq.inverse(base)
    k = int(math.floor((scale - 1.0) / 2.0 + 1e-12))
    m = int(round(((scale - 1.0) / 2.0 - k) * depth))
    if m == depth:
        k, m = k + 1, 0
    out = base.copy()
    for _ in range(k):
        out += inverse
        out += base
    if m:
        tail = cirq.Circuit(moments[depth - m:])
        out += cirq.inverse(tail)
        out += tail
    return out, 1.0 + 2.0 * k + 2.0 * m / depth
