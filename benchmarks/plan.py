"""A whole plan: LiH over 8 bond lengths × (Jordan–Wigner, Bravyi–Kitaev, parity) × (± tapering) × (UCCSD,
k-UpCCGSD, adaptive) × every measurement grouping × every device, serial and on a 2-worker Dask cluster.

Prints the wall time of each whole plan and how much was shared (minimisation runs computed against
configurations evaluated). Each case runs in its own fresh interpreter (no shared caches). The active space is
(4e, 4o) by default so the benchmark stays short; ``--full`` uses the whole STO-3G space (12 spin orbitals).
Devices: the logical circuit until device profiles exist (then the first three registered profiles). Never
asserts; note the machine (2 cores) and its load when quoting figures.
"""

from __future__ import annotations

import subprocess
import sys
import time
import warnings

import numpy as np

import groundkit as gk

LENGTHS = tuple(float(r) for r in np.round(np.linspace(1.3, 3.4, 8), 3))  # Å


def choices(full: bool) -> dict:
    from groundkit import registry
    from groundkit.studies.plan_input import device_profile_class, grouping_names

    devices: list = [None]
    if device_profile_class() is not None:
        devices = [gk.as_component("device", name) for name in registry.names("device")[:3]]
    space = None if full else gk.ActiveSpace(electrons=4, orbitals=4)
    return {"active_space": [space], "mapping": ["jordan-wigner", "bravyi-kitaev", "parity"],
            "tapering": [False, True], "trial_state": [gk.UCCSD(), gk.UpCCGSD(k=1), gk.Adaptive()],
            "grouping": list(grouping_names()), "device": devices}


def run_case(label: str, full: bool) -> None:
    warnings.simplefilter("ignore")
    lih = gk.MoleculeSpec(symbols=("Li", "H"), coordinates=((0, 0, 0), (0, 0, 1.6)), basis="sto-3g")
    geometries = (gk.BondStretch(lih), list(LENGTHS))
    started = time.perf_counter()
    if label == "serial":
        plan = gk.plan(geometries, choices(full))
    else:
        from distributed import Client, LocalCluster

        with LocalCluster(n_workers=2, threads_per_worker=1, processes=True, host="127.0.0.1",
                          dashboard_address=None) as cluster, Client(cluster) as client:
            plan = gk.plan(geometries, choices(full), executor=client)
    wall = time.perf_counter() - started
    s = plan.shared
    best = plan.recommend().configuration or "none"
    print(f"{label:<22}{wall:>9.1f}{s['configurations']:>9}{s['runs']:>6}{s['minimisations']:>8}"
          f"{s['minimisations_unshared']:>10}{s['figure_tasks']:>9}  {best}", flush=True)


def main(full: bool) -> None:
    print(f"LiH/STO-3G, {'full space' if full else '(4e, 4o)'}, {len(LENGTHS)} geometries {LENGTHS[0]}–"
          f"{LENGTHS[-1]} Å")
    print(f"{'case':<22}{'wall/s':>9}{'configs':>9}{'runs':>6}{'minim.':>8}{'unshared':>10}{'figures':>9}"
          "  recommended", flush=True)
    for label in ("serial", "dask, 2 workers"):
        subprocess.run([sys.executable, __file__, "--case", label] + (["--full"] if full else []), check=True)


if __name__ == "__main__":
    full = "--full" in sys.argv
    if "--case" in sys.argv:
        run_case(sys.argv[sys.argv.index("--case") + 1], full)
    else:
        main(full)
