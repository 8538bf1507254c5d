"""Scan timings: warm against cold starts, serial against two local processes (H2/6-31G, UCCSD, 12 points).

Each case runs in its own fresh interpreter (no shared caches); wall time includes starting the worker
processes. Prints a table; never asserts. Note the machine (2 cores) and its load when quoting figures.
"""

from __future__ import annotations

import subprocess
import sys
import time

import numpy as np

import groundkit as gk


def h2(r: float) -> gk.MoleculeSpec:
    return gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, r)), basis="6-31g")


CASES = {
    "serial, warm (1 chain)": {"warm_start": True},
    "serial, cold": {"warm_start": False},
    "2 processes, warm (2 chains)": {"warm_start": 2, "executor": "processes"},
    "2 processes, cold": {"warm_start": False, "executor": "processes"},
}


def run_case(label: str) -> None:
    values = np.round(np.linspace(0.5, 2.0, 12), 4)
    started = time.perf_counter()
    table = gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, values, **CASES[label]).table
    wall = time.perf_counter() - started
    print(f"{label:<34}{wall:>9.2f}{int(table['iterations'].sum()):>12}{float(table['error_mha'].abs().max()):>17.2e}")


def main() -> None:
    print(f"{'case':<34}{'wall/s':>9}{'iterations':>12}{'max |error|/mHa':>17}", flush=True)
    for label in CASES:
        subprocess.run([sys.executable, __file__, label], check=True)


if __name__ == "__main__":
    if len(sys.argv) > 1:
        run_case(sys.argv[1])
    else:
        main()
