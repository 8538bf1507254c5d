"""Noise at device scale: a 16-qubit noisy energy by trajectories, the bias removed by each zero-noise fit, and
a table of noise thresholds per configuration.

1. N2 at 1.0977 Å (NIST CCCBDB r_e, from memory), STO-3G, valence CAS(10,8): 16 Jordan–Wigner qubits; the
   adaptive trial state (6 operators, exact energies) at its optimum; its energy under the illustrative
   ``ErrorFigures()`` and ``GateDurations()`` by Monte Carlo trajectories with 10^4 shots (wall and CPU time).
2. H2 (0.7414 Å), UCCSD at fixed parameters, depolarising noise only (p1 = 1e-4, p2 = 1e-3): bias of the raw
   noisy energy divided by the bias after zero-noise extrapolation, per fit (scales 1, 3, 5).
3. Thresholds (exact expectations on the density matrix, target 1.6 mHa, bracket within a factor 1.5): H2,
   LiH (2e,4o) at 1.5949 Å and water (4e,4o) at the NIST geometry (from memory), with UCCSD, k-UpCCGSD (k=1),
   adaptive and hardware-efficient (2 layers), without mitigation and with each one alone. Rates scale together
   from ``ErrorFigures()``; the column is the two-qubit rate at the threshold.

The figures are illustrative: a model of depolarising, relaxation and readout errors with made-up rates, in a
minimal basis; they describe no particular device. Run: ``OPENBLAS_NUM_THREADS=1 python benchmarks/noise.py``
(prints tables; nothing is asserted). ``--part 1``, ``2`` or ``3`` runs one part; ``--molecule LiH`` limits part 3.
"""

from __future__ import annotations

import argparse
import time

import numpy as np

import groundkit as gk
from groundkit.device import ErrorFigures
from groundkit.estimators import NoisyEstimator
from groundkit.noise.threshold import optimal_configuration


def diatomic(a: str, b: str, r: float) -> gk.MoleculeSpec:
    return gk.MoleculeSpec(symbols=(a, b), coordinates=((0, 0, 0), (0, 0, r)), basis="sto-3g")


WATER = gk.MoleculeSpec(symbols=("O", "H", "H"), coordinates=((0.0, 0.0, 0.1173), (0.0, 0.7572, -0.4692),
                                                              (0.0, -0.7572, -0.4692)), basis="sto-3g")


def part_16_qubits() -> None:
    wall, cpu = time.perf_counter(), time.process_time()
    pipeline = diatomic("N", "N", 1.0977).pipeline().active_space(electrons=10, orbitals=8).trial_state(
        gk.Adaptive(max_operators=6))
    result = pipeline.estimator("exact").run()
    fixed, theta = optimal_configuration(pipeline, result)
    grown = time.perf_counter() - wall
    wall, cpu = time.perf_counter(), time.process_time()
    measurement = NoisyEstimator(errors=ErrorFigures(), simulator="trajectories", shots=10_000, seed=1).bind(fixed)
    value, error = measurement.estimate(theta)
    record = measurement.record()
    circuit, qubits = measurement.circuit(theta)
    print("16-qubit noisy energy (N2 CAS(10,8), adaptive 6 operators, ErrorFigures(), 10^4 shots)")
    print(f"{'qubits':<28}{len(qubits)}")
    print(f"{'groups / trajectories':<28}{len(measurement.groups)} / {10_000 // len(measurement.groups)} "
          f"({record['backend']})")
    print(f"{'gates / with noise':<28}{len(list(circuit.all_operations()))} / "
          f"{len(list(measurement.noise.noisy(circuit).all_operations()))}")
    print(f"{'exact energy, same params':<28}{result.exact_energy:.6f} Ha")
    print(f"{'noisy energy':<28}{value:.6f} ± {error:.6f} Ha (bias {1000 * (value - result.exact_energy):+.1f} mHa)")
    print(f"{'time (growth excluded)':<28}{time.perf_counter() - wall:.1f} s wall, {time.process_time() - cpu:.1f} s "
          f"CPU (growth {grown:.1f} s wall)")
    print()


def part_zne() -> None:
    pipeline = diatomic("H", "H", 0.7414).pipeline()
    theta = np.array([0.04, -0.02, 0.11])
    exact = pipeline.objective().energy(theta)
    figures = ErrorFigures(one_qubit=1e-4, two_qubit=1e-3, readout=0.0, t1=None, t2=None)
    raw = NoisyEstimator(errors=figures).bind(pipeline).estimate(theta)[0] - exact
    print("zero-noise extrapolation, H2 UCCSD, depolarising p1 = 1e-4, p2 = 1e-3, scales 1, 3, 5")
    print(f"{'fit':<14}{'bias/mHa':>12}{'reduction':>12}")
    print(f"{'none':<14}{1000 * raw:>12.4f}{'':>12}")
    for fit in ("linear", "richardson", "exponential"):
        bias = NoisyEstimator(errors=figures, mitigation="zne", zne_fit=fit).bind(pipeline).estimate(theta)[0] - exact
        print(f"{fit:<14}{1000 * bias:>12.4f}{abs(raw / bias):>12.1f}")
    print()


def part_thresholds(only: tuple[str, ...] = ()) -> None:
    configurations = {
        "H2": diatomic("H", "H", 0.7414).pipeline(),
        "LiH (2e,4o)": diatomic("Li", "H", 1.5949).pipeline().active_space(electrons=2, orbitals=4),
        "water (4e,4o)": WATER.pipeline().active_space(electrons=4, orbitals=4),
    }
    trial_states = {"UCCSD": gk.UCCSD(), "k-UpCCGSD": gk.UpCCGSD(), "adaptive": gk.Adaptive(),
                    "hardware-eff.": gk.HardwareEfficient(layers=2)}
    mitigations = {"none": (), "readout": ("readout",), "zne": ("zne",), "symmetry": ("symmetry",)}
    print("noise thresholds: two-qubit error rate within 1.6 mHa (all rates of ErrorFigures() scaled together)")
    print(f"{'molecule':<15}{'trial state':<15}{'error/mHa':>10}" + "".join(f"{m:>11}" for m in mitigations)
          + f"{'time/s':>8}")
    for name, pipeline in configurations.items():
        if only and not any(name.lower().startswith(o.lower()) for o in only):
            continue
        for label, trial_state in trial_states.items():
            start = time.perf_counter()
            variant = pipeline.trial_state(trial_state)
            minimiser = "cobyla" if label == "hardware-eff." else None
            if minimiser:
                variant = variant.minimiser(gk.COBYLA(max_iterations=2000))
            result = variant.estimator("exact").run()
            cells = []
            for mitigation in mitigations.values():
                found = gk.noise_threshold(variant, result=result, mitigation=mitigation, tolerance=0.5)
                cells.append("—" if found.two_qubit == 0 else f"{found.two_qubit:.2e}")
            print(f"{name:<15}{label:<15}{1000 * result.error:>10.3f}" + "".join(f"{c:>11}" for c in cells)
                  + f"{time.perf_counter() - start:>8.0f}", flush=True)


if __name__ == "__main__":
    parser = argparse.ArgumentParser()
    parser.add_argument("--part", type=int, choices=(1, 2, 3))
    parser.add_argument("--molecule", action="append", default=[],
                        help="part 3 only for molecules whose name starts with this (repeatable: H2, LiH, water)")
    args = parser.parse_args()
    for k, run in ((1, part_16_qubits), (2, part_zne), (3, lambda: part_thresholds(tuple(args.molecule)))):
        if args.part in (None, k):
            run()
