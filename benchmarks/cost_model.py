"""Calibration of the cost model in ``groundkit/sizing.py``: measured against predicted times and memory.

Run ``python benchmarks/cost_model.py`` (about five minutes on a quiet 2-core machine). For a range of sizes it measures
the SCF, the active-space integral transformation, one H·ψ, one UCCSD energy+gradient, the exact reference (PySCF's
Davidson solver) and the determinant engine's peak memory in CI vectors, and prints each beside the model's
prediction. ``--fit`` also prints least-squares constants (non-negative, relative errors) to copy into
``groundkit/sizing.py``. ``--quick`` leaves out the largest cases. Figures to read, never timed assertions: they
depend on the machine and on whatever else runs on it.
"""

from __future__ import annotations

import argparse
import gc
import math
import time
import tracemalloc

import numpy as np

import groundkit as gk
from groundkit import chemistry, sizing
from groundkit.objective import Objective
from groundkit.trial_states import UCCSD

SEED = 7


def cluster(n: int, symbol: str = "H", spacing: float = 0.9) -> gk.MoleculeSpec:
    """``n`` atoms on a cubic grid (a compact cluster: little integral screening, the model's worst case)."""
    k = math.ceil(n ** (1 / 3))
    grid = [(i, j, m) for i in range(k) for j in range(k) for m in range(k)][:n]
    z = n * gk.elements.atomic_number(symbol)
    return gk.MoleculeSpec(symbols=(symbol,) * n, coordinates=tuple(tuple(spacing * x for x in p) for p in grid),
                           multiplicity=1 + z % 2)


def water_chain(k: int, basis: str) -> gk.MoleculeSpec:
    symbols, coords = [], []
    for i in range(k):  # waters 3 A apart along x
        symbols += ["O", "H", "H"]
        coords += [(3.0 * i, 0.0, 0.0), (3.0 * i + 0.757, 0.586, 0.0), (3.0 * i - 0.757, 0.586, 0.0)]
    return gk.MoleculeSpec(symbols=tuple(symbols), coordinates=tuple(coords), basis=basis)


def acetylene() -> gk.MoleculeSpec:  # NIST CCCBDB experimental r(CC) 1.203 A, r(CH) 1.063 A (from memory)
    return gk.MoleculeSpec(symbols=("C", "C", "H", "H"), basis="cc-pvdz",
                           coordinates=((0, 0, 0.6015), (0, 0, -0.6015), (0, 0, 1.6645), (0, 0, -1.6645)))


def chain(n: int) -> gk.MoleculeSpec:
    return gk.MoleculeSpec(symbols=("H",) * n, coordinates=tuple((0, 0, 1.0 * k) for k in range(n)))


def best_of(f, repeat: int = 2) -> float:
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        f()
        times.append(time.perf_counter() - t0)
    return min(times)


def scf_rows(quick: bool) -> list[dict]:
    cases = [("H20 cluster", cluster(20)), ("H40 cluster", cluster(40)), ("H60 cluster", cluster(60)),
             ("(H2O)2 cc-pVDZ", water_chain(2, "cc-pvdz")), ("(H2O)4 cc-pVDZ", water_chain(4, "cc-pvdz")),
             ("C2H2 cc-pVDZ", acetylene())]
    if not quick:
        cases += [("H80 cluster", cluster(80)), ("(H2O)6 cc-pVDZ", water_chain(6, "cc-pvdz"))]
    rows = []
    for label, molecule in cases:
        chemistry.clear_cache()
        n_ao, weight = sizing.basis_sizes(molecule)
        t0 = time.perf_counter()
        scf = chemistry.solve_scf(molecule)
        t_scf = time.perf_counter() - t0
        t0 = time.perf_counter()
        chemistry.active_integrals(scf, [], list(range(n_ao)))
        t_int = time.perf_counter() - t0
        _, _, _, p_scf = sizing.scf_cost(n_ao, weight)
        _, p_int = sizing.integral_cost(n_ao, weight, n_ao, 0)
        rows.append(dict(label=label, n_ao=n_ao, weight=weight, cycles=scf.attempts[0], scf=t_scf, scf_model=p_scf,
                         ints=t_int, ints_model=p_int))
    return rows


def engine_cases(quick: bool) -> list[tuple[str, gk.MoleculeSpec, gk.ActiveSpace]]:
    cases = [("H8", chain(8), gk.ActiveSpace()), ("H10", chain(10), gk.ActiveSpace()),
             ("C2H2 (6e,10o)", acetylene(), gk.ActiveSpace(electrons=6, orbitals=10)),
             ("C2H2 (6e,14o)", acetylene(), gk.ActiveSpace(electrons=6, orbitals=14)),
             ("C2H2 (10e,12o)", acetylene(), gk.ActiveSpace(electrons=10, orbitals=12)),
             ("C2H2 (6e,18o)", acetylene(), gk.ActiveSpace(electrons=6, orbitals=18))]
    if not quick:
        cases += [("H12", chain(12), gk.ActiveSpace()),
                  ("C2H2 (6e,22o)", acetylene(), gk.ActiveSpace(electrons=6, orbitals=22))]
    return cases


def engine_rows(quick: bool) -> list[dict]:
    return [engine_row(label, molecule, space) for label, molecule, space in engine_cases(quick)]


def traced_peak(f) -> float:
    """Peak NumPy (Python-allocator) memory in bytes while ``f`` runs."""
    gc.collect()
    tracemalloc.start()
    base = tracemalloc.get_traced_memory()[0]
    f()
    peak = tracemalloc.get_traced_memory()[1] - base
    tracemalloc.stop()
    return peak


def engine_row(label: str, molecule: gk.MoleculeSpec, space: gk.ActiveSpace) -> dict:
    with gk.limits.changed(evaluation_seconds=None, reference_seconds=None):
        problem = gk.build_problem(molecule, space)
        objective = Objective(problem, UCCSD())
    n, na, nb = problem.n_orbitals, problem.n_alpha, problem.n_beta
    theta = np.random.default_rng(SEED).uniform(-0.05, 0.05, objective.n_parameters)
    psi = objective.state(theta)
    objective.hamiltonian.apply(psi)
    t_h = best_of(lambda: objective.hamiltonian.apply(psi))
    objective.energy_and_gradient(theta)
    t_eg = best_of(lambda: objective.energy_and_gradient(theta))
    pairs = sizing.rotated_pairs(objective.plan.excitations, n, na, nb)
    measured_pairs = sum(step.n_pairs for step in objective.steps.steps)
    dets = problem.n_determinants
    peak = traced_peak(lambda: objective.energy_and_gradient(theta))
    t_ref = ref_vectors = None
    if dets <= 1_000_000:
        def reference() -> None:
            problem._states = []
            problem.lowest_states(1)

        t_ref = best_of(reference, repeat=1)
        ref_vectors = traced_peak(reference) / (8.0 * dets)
    npair = n * (n + 1) // 2
    return dict(
        label=label, dets=dets, params=objective.n_parameters, excitations=len(objective.plan.excitations),
        pairs=pairs, pairs_ok=pairs == measured_pairs, h=t_h, h_model=sizing.hamiltonian_seconds(n, na, nb),
        eg=t_eg, eg_model=sizing.evaluation_seconds(n, na, nb, len(objective.plan.excitations), pairs),
        vectors=peak / (8.0 * dets), ref=t_ref, ref_model=sizing.reference_cost(n, na, nb)[1],
        ref_vectors=ref_vectors, h_features=(dets * npair**2,),
    )


def fit(rows_scf: list[dict], rows_engine: list[dict]) -> None:
    from scipy.optimize import nnls

    def solve(features, measured):
        a = np.array(features, dtype=float) / np.array(measured)[:, None]
        coef, _ = nnls(a, np.ones(len(measured)))
        return coef

    h = solve([r["h_features"] for r in rows_engine], [r["h"] for r in rows_engine])
    print(f"\nfit H·psi: H_PAIR_SECONDS = {h[0]:.3g}")
    rest = [(r["pairs"], r["excitations"]) for r in rows_engine]
    h_model = [h[0] * r["h_features"][0] for r in rows_engine]
    residual = [max(r["eg"] - m, 1e-6) for r, m in zip(rows_engine, h_model)]
    e = solve(rest, residual)
    print(f"fit energy+gradient: PAIR_SECONDS = {e[0]:.3g}, STEP_SECONDS = {e[1]:.3g}")
    refs = [(r["ref"], m) for r, m in zip(rows_engine, h_model) if r["ref"] is not None]
    calls = solve([[m] for _, m in refs], [t for t, _ in refs])
    print(f"fit reference: REFERENCE_SIGMA_CALLS = {calls[0]:.3g}")
    eri = solve([[r["weight"] ** 4 / 8] for r in rows_scf], [r["scf"] for r in rows_scf])
    print(f"fit SCF: ERI_SECONDS = {eri[0]:.3g}")
    tr = solve([[r["n_ao"] ** 5] for r in rows_scf],
               [max(r["ints"] - eri[0] * r["weight"] ** 4 / 8, 1e-6) for r in rows_scf])
    print(f"fit integrals: TRANSFORM_SECONDS = {tr[0]:.3g}")


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--fit", action="store_true", help="print least-squares constants for groundkit/sizing.py")
    parser.add_argument("--quick", action="store_true", help="leave out the largest cases")
    args = parser.parse_args()
    print("SCF and active-space integrals (full space), measured vs predicted (s)")
    print(f"{'case':16s} {'n_ao':>5s} {'W':>5s} {'SCF':>8s} {'model':>8s} {'ratio':>6s} {'ints':>8s} {'model':>8s} "
          f"{'ratio':>6s}  first attempt")
    rows_scf = scf_rows(args.quick)
    for r in rows_scf:
        print(f"{r['label']:16s} {r['n_ao']:5d} {r['weight']:5d} {r['scf']:8.3f} {r['scf_model']:8.3f} "
              f"{r['scf_model'] / r['scf']:6.2f} {r['ints']:8.3f} {r['ints_model']:8.3f} "
              f"{r['ints_model'] / r['ints']:6.2f}  {r['cycles']}")
    print("\nDeterminant engine (UCCSD), measured vs predicted (s); vectors = peak NumPy memory / (8 bytes × dets)")
    print(f"{'case':15s} {'dets':>9s} {'params':>6s} {'H.psi':>8s} {'model':>8s} {'E+grad':>8s} {'model':>8s} "
          f"{'ratio':>6s} {'vectors':>7s} {'ref':>8s} {'model':>8s} {'ref vec':>7s}")
    rows_engine = engine_rows(args.quick)
    for r in rows_engine:
        ref = f"{r['ref']:8.3f} {r['ref_model']:8.3f} {r['ref_vectors']:7.1f}" if r["ref"] is not None else \
            f"{'-':>8s} {r['ref_model']:8.3f} {'-':>7s}"
        print(f"{r['label']:15s} {r['dets']:9,d} {r['params']:6d} {r['h']:8.4f} {r['h_model']:8.4f} {r['eg']:8.4f} "
              f"{r['eg_model']:8.4f} {r['eg_model'] / r['eg']:6.2f} {r['vectors']:7.1f} {ref}"
              + ("" if r["pairs_ok"] else "  (pair count differs from the engine's!)"))
    print(f"\nmodel constants: ENGINE_VECTORS = {sizing.ENGINE_VECTORS}, REFERENCE_VECTORS = "
          f"{sizing.REFERENCE_VECTORS}; a ratio above 1 means the model over-predicts")
    if args.fit:
        fit(rows_scf, rows_engine)


if __name__ == "__main__":
    main()
