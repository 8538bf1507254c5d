"""Thermal relaxation of one qubit over a time t: amplitude damping from T1 and pure dephasing from T2.

Over t, amplitude damping with γ₁ = 1 − exp(−t/T1) relaxes the excited population by exp(−t/T1) and the
coherence by exp(−t/2T1); phase damping with γφ = 1 − exp(−2t/Tφ), 1/Tφ = 1/T2 − 1/(2T1), multiplies the
coherence by the remaining exp(−t/Tφ), so the coherence decays as exp(−t/T2) in all (Nielsen and Chuang,
Quantum Computation and Quantum Information, section 8.3.5-8.3.6; textbook). T2 ≤ 2·T1 is required.
"""

from __future__ import annotations

import math

import cirq

from ..errors import NoiseError


def relaxation_rates(t_ns: float, t1_us: float, t2_us: float) -> tuple[float, float]:
    """(γ₁, γφ) of the amplitude and phase damping over ``t_ns`` nanoseconds; T1 and T2 in microseconds."""
    if not (t1_us > 0 and t2_us > 0):
        raise NoiseError(f"T1={t1_us!r} µs and T2={t2_us!r} µs must both be > 0")
    if t2_us > 2.0 * t1_us * (1 + 1e-12):
        raise NoiseError(f"T2={t2_us!r} µs is above 2·T1={2 * t1_us!r} µs; physical qubits have T2 ≤ 2·T1")
    if t_ns < 0:
        raise NoiseError(f"duration {t_ns!r} ns must be >= 0")
    t = t_ns * 1e-3  # µs
    gamma1 = -math.expm1(-t / t1_us)
    dephasing_rate = max(1.0 / t2_us - 0.5 / t1_us, 0.0)  # 1/Tφ in 1/µs
    gamma_phi = -math.expm1(-2.0 * t * dephasing_rate)
    return gamma1, gamma_phi


def relaxation_channels(qubit: cirq.Qid, t_ns: float, t1_us: float, t2_us: float) -> list[cirq.Operation]:
    """The amplitude- and phase-damping operations on ``qubit`` for ``t_ns`` nanoseconds (empty if none)."""
    gamma1, gamma_phi = relaxation_rates(t_ns, t1_us, t2_us)
    out = []
    if gamma1 > 0:
        out.append(cirq.amplitude_damp(gamma1).on(qubit))
    if gamma_phi > 0:
        out.append(cirq.phase_damp(gamma_phi).on(qubit))
    return out
