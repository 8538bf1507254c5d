"""Determinant-space engine timings: setup, one energy, one energy+gradient, a whole BFGS minimisation.

Run ``python benchmarks/engine.py`` (add ``--skip-bfgs h12`` to leave out the longest minimisation; ``--only h12 h14
--skip-bfgs h12 h14`` compares H12 and H14, 28 spin orbitals and 11.8 M determinants, with PySCF's FCI side by side:
minutes, run it alone). Every case runs
in its own subprocess, so the peak memory reported is that case's own. In the same run it times the route a user
composes by hand from general-purpose libraries (an OpenFermion UCCSD generator, Jordan-Wigner, a sparse matrix and
``scipy.sparse.linalg.expm_multiply`` on all 2^n amplitudes) for water, and PySCF's full FCI solve of the H12 chain.
These are figures to read, never timed assertions; they depend on the machine and on whatever else runs on it.
"""

from __future__ import annotations

import argparse
import json
import math
import os
import resource
import subprocess
import sys
import time

CASES = ("h2o", "n2", "h10", "h12")
LARGE = ("h12", "h14")  # compared with PySCF's FCI of the same chain; h14 (28 spin orbitals) only with --only h14
SEED = 7


def molecule(name: str):
    import groundkit as gk

    if name == "h2o":  # NIST CCCBDB experimental geometry: r(OH) 0.9578 A, angle 104.48 degrees
        half = math.radians(104.48) / 2
        x, z = 0.9578 * math.sin(half), 0.9578 * math.cos(half)
        return gk.MoleculeSpec(symbols=("O", "H", "H"), coordinates=((0, 0, 0), (x, 0, z), (-x, 0, z)), basis="sto-3g")
    if name == "n2":  # NIST CCCBDB experimental r(NN) 1.0977 A
        return gk.MoleculeSpec(symbols=("N", "N"), coordinates=((0, 0, 0), (0, 0, 1.0977)), basis="sto-3g")
    n = int(name[1:])  # linear hydrogen chain, 1.0 A spacing
    return gk.MoleculeSpec(symbols=("H",) * n, coordinates=tuple((0, 0, 1.0 * k) for k in range(n)), basis="sto-3g")


def peak_mb() -> float:
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024


def engine_case(name: str, bfgs: bool) -> dict:
    import numpy as np
    import scipy.optimize

    import groundkit as gk
    from groundkit.objective import Objective
    from groundkit.trial_states import UCCSD

    t0 = time.perf_counter()
    problem = gk.Problem(molecule(name))
    t_problem = time.perf_counter() - t0
    t0 = time.perf_counter()
    objective = Objective(problem, UCCSD())
    t_setup = time.perf_counter() - t0
    theta = np.random.default_rng(SEED).uniform(-0.05, 0.05, objective.n_parameters)
    objective.energy(theta)  # first call: the allocator settles; not reported
    t0 = time.perf_counter()
    objective.energy(theta)
    t_energy = time.perf_counter() - t0
    t0 = time.perf_counter()
    objective.energy_and_gradient(theta)
    t_gradient = time.perf_counter() - t0
    row = dict(
        case=name, spin_orbitals=2 * problem.n_orbitals, determinants=objective.sector.size,
        parameters=objective.n_parameters, problem_s=t_problem, setup_s=t_setup, energy_s=t_energy,
        gradient_s=t_gradient,
    )
    if bfgs:
        t0 = time.perf_counter()
        result = scipy.optimize.minimize(
            objective.energy_and_gradient, objective.initial_parameters(), jac=True, method="BFGS",
            options={"maxiter": 1000},
        )
        row.update(bfgs_s=time.perf_counter() - t0, iterations=int(result.nit), evaluations=int(result.nfev))
        row["peak_mb"] = peak_mb()
        row["error_mha"] = 1e3 * (result.fun - problem.reference.energy)  # reference: PySCF FCI in the same space
    else:
        row["peak_mb"] = peak_mb()
    return row


def hand_composed_case() -> dict:
    """Water's UCCSD energy composed by hand: OpenFermion generator, Jordan-Wigner, expm_multiply on 2^14."""
    import numpy as np
    import scipy.sparse.linalg
    from openfermion import get_sparse_operator, jordan_wigner, uccsd_generator

    import groundkit as gk
    from groundkit.trial_states import UCCSD

    problem = gk.Problem(molecule("h2o"))
    n = problem.n_orbitals
    fermion_hamiltonian = problem.fermion_hamiltonian()
    t0 = time.perf_counter()
    hamiltonian = get_sparse_operator(jordan_wigner(fermion_hamiltonian), 2 * n)
    t_hamiltonian = time.perf_counter() - t0

    plan = UCCSD().plan(problem)
    theta = np.random.default_rng(SEED).uniform(-0.05, 0.05, plan.n_parameters)
    t0 = time.perf_counter()
    singles = np.zeros((2 * n, 2 * n))
    doubles = np.zeros((2 * n,) * 4)
    for excitation, value in zip(plan.excitations, theta):
        if excitation.rank == 1:
            singles[excitation.creators[0], excitation.annihilators[0]] = value
        else:  # uccsd_generator's term a+_p a_q a+_r a_s equals a+_p a+_r a_s a_q
            (p, r), (s, q) = excitation.creators, excitation.annihilators
            doubles[p, q, r, s] = value
    generator = get_sparse_operator(jordan_wigner(uccsd_generator(singles, doubles)), 2 * n)
    start = np.zeros(2 ** (2 * n))
    start[int("1" * (problem.n_alpha + problem.n_beta) + "0" * (2 * n - problem.n_alpha - problem.n_beta), 2)] = 1
    state = scipy.sparse.linalg.expm_multiply(generator, start)
    energy = float(np.real(np.vdot(state, hamiltonian @ state)))
    t_energy = time.perf_counter() - t0
    return dict(case="h2o-hand", hamiltonian_s=t_hamiltonian, energy_s=t_energy, energy=energy, peak_mb=peak_mb())


def fci_case(name: str) -> dict:
    """PySCF's full FCI solve (direct solver chosen by PySCF) on canonical RHF orbitals."""
    from pyscf import fci, gto, scf

    spec = molecule(name)
    mol = gto.M(atom=[(s, c) for s, c in zip(spec.symbols, spec.coordinates)], basis="sto-3g", verbose=0)
    mf = scf.RHF(mol).run()
    t0 = time.perf_counter()
    energy, _ = fci.FCI(mf).kernel()
    return dict(case=f"{name}-fci", fci_s=time.perf_counter() - t0, energy=float(energy), peak_mb=peak_mb())


def run_case(arg: str) -> dict:
    if arg == "h2o-hand":
        return hand_composed_case()
    if arg.endswith("-fci"):
        return fci_case(arg[: -len("-fci")])
    name, _, mode = arg.partition(":")
    return engine_case(name, bfgs=mode != "nobfgs")


def subprocess_case(arg: str) -> dict:
    out = subprocess.run([sys.executable, __file__, "--case", arg], capture_output=True, text=True, check=True)
    return json.loads(out.stdout.strip().splitlines()[-1])


def fmt(value, spec: str) -> str:
    return "-" if value is None else format(value, spec)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--case", help="run one case in this process and print it as JSON")
    parser.add_argument("--skip-bfgs", nargs="*", default=[], help="cases whose BFGS minimisation is skipped")
    parser.add_argument("--only", nargs="*", default=list(CASES), help="engine cases to run")
    args = parser.parse_args()
    if args.case:
        print(json.dumps(run_case(args.case)))
        return

    print(f"cores: {os.cpu_count()}, load average at start: {os.getloadavg()[0]:.2f}, "
          f"OMP_NUM_THREADS={os.environ.get('OMP_NUM_THREADS', 'unset')}, "
          f"OPENBLAS_NUM_THREADS={os.environ.get('OPENBLAS_NUM_THREADS', 'unset')}")
    hand = subprocess_case("h2o-hand")
    rows = [subprocess_case(c + (":nobfgs" if c in args.skip_bfgs else "")) for c in args.only]
    fci = {name: subprocess_case(f"{name}-fci") for name in LARGE if name in args.only}

    head = (f"{'case':6} {'spin-orb':>8} {'dets':>9} {'params':>6} {'SCF+ints s':>10} {'setup s':>8} "
            f"{'energy s':>9} {'E+grad s':>9} {'BFGS s':>8} {'iter':>5} {'error mHa':>9} {'peak MB':>8}")
    print(head)
    print("-" * len(head))
    for r in rows:
        print(f"{r['case']:6} {r['spin_orbitals']:>8} {r['determinants']:>9,} {r['parameters']:>6} "
              f"{r['problem_s']:>10.2f} {r['setup_s']:>8.3f} {r['energy_s']:>9.4f} {r['gradient_s']:>9.4f} "
              f"{fmt(r.get('bfgs_s'), '>8.2f')} {fmt(r.get('iterations'), '>5')} "
              f"{fmt(r.get('error_mha'), '>9.4f')} {r['peak_mb']:>8.0f}")
    print()
    print(f"hand-composed H2O (OpenFermion + Jordan-Wigner + expm_multiply on 2^14): sparse H build "
          f"{hand['hamiltonian_s']:.2f} s, ONE energy {hand['energy_s']:.2f} s, peak {hand['peak_mb']:.0f} MB")
    water = next((r for r in rows if r["case"] == "h2o" and "bfgs_s" in r), None)
    if water:
        whole = water["problem_s"] + water["setup_s"] + water["bfgs_s"]
        print(f"whole H2O UCCSD minimisation, SCF to converged energy: {whole:.2f} s = "
              f"{whole / hand['energy_s']:.3f} x one hand-composed energy (target < 1)")
    large = [(r, fci[r["case"]]) for r in rows if r["case"] in fci]
    if large:
        print()
        head = (f"{'chain':6} {'spin-orb':>8} {'dets':>11} {'params':>6} {'E+grad s':>9} {'FCI s':>8} {'x FCI':>6} "
                f"{'target':>6} {'engine peak MB':>14} {'FCI peak MB':>11}")
        print(head)
        print("-" * len(head))
        for r, f in large:
            print(f"{r['case']:6} {r['spin_orbitals']:>8} {r['determinants']:>11,} {r['parameters']:>6} "
                  f"{r['gradient_s']:>9.2f} {f['fci_s']:>8.2f} {r['gradient_s'] / f['fci_s']:>6.2f} {'<= 1':>6} "
                  f"{r['peak_mb']:>14.0f} {f['peak_mb']:>11.0f}")
        print("(one UCCSD energy+gradient against PySCF's FCI of the same molecule, same run; engine peak target "
              "< 6144 MB, including the exact reference only if BFGS ran)")
    print(f"load average at end: {os.getloadavg()[0]:.2f} (2 cores shared with other work: timings are indicative)")


if __name__ == "__main__":
    main()
