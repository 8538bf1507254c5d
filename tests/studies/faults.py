"""Helpers of the fault tests: scans in child processes, the processes of a session, Ctrl-C inside a point."""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import textwrap
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]

# a checkpointed H2/STO-3G UCCSD scan: argv = checkpoint directory, comma-separated values, executor, warm start
SCAN_SCRIPT = textwrap.dedent("""
    import sys
    import groundkit as gk
    from tests.studies.helpers import h2
    values = [float(v) for v in sys.argv[2].split(",")]
    executor = None if sys.argv[3] == "serial" else sys.argv[3]
    warm = {"true": True, "false": False}.get(sys.argv[4], None)
    warm = int(sys.argv[4]) if warm is None else warm
    try:
        gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, values, checkpoint=sys.argv[1], executor=executor,
                                                   warm_start=warm)
    except gk.GroundkitError as err:
        print(f"{type(err).__name__}: {err}", file=sys.stderr)
        sys.exit(2)
""")


def start_scan(directory: Path, values: list[float], executor: str = "serial", warm: str = "true",
               new_session: bool = False) -> subprocess.Popen:
    """A child process running :data:`SCAN_SCRIPT`; its standard error is captured."""
    return subprocess.Popen(
        [sys.executable, "-c", SCAN_SCRIPT, str(directory), ",".join(repr(v) for v in values), executor, warm],
        cwd=ROOT, stderr=subprocess.PIPE, text=True, start_new_session=new_session,
        env={**os.environ, "OMP_NUM_THREADS": "1", "OPENBLAS_NUM_THREADS": "1"},
    )


def session_processes(session: int) -> list[tuple[int, str]]:
    """(pid, command line) of every live (not zombie) process of a session, from Linux's /proc."""
    out = []
    for entry in os.listdir("/proc"):
        if not entry.isdigit():
            continue
        try:
            stat = Path(f"/proc/{entry}/stat").read_text()
            command = Path(f"/proc/{entry}/cmdline").read_bytes().replace(b"\0", b" ").decode(errors="replace")
        except OSError:
            continue
        fields = stat[stat.rindex(")") + 2:].split()  # after "pid (comm) ": state, ppid, pgrp, session, ...
        if int(fields[3]) == session and fields[0] not in ("Z", "X"):
            out.append((int(entry), command))
    return out


def point_files(directory: Path) -> dict[str, bytes]:
    """File name -> bytes of every point file of a checkpoint directory."""
    return {p.name: p.read_bytes() for p in sorted(directory.glob("point-*.json"))}


def ctrl_c_inside(monkeypatch, length: float, call: int = 2) -> dict:
    """Deliver a real SIGINT (Ctrl-C) to this process at the ``call``-th energy-and-gradient evaluation of the
    H2 point whose bond is ``length`` Å; returns a counter of those evaluations."""
    import groundkit as gk
    from groundkit.objective import Objective

    gk.workspace().clear()  # whatever earlier tests kept (objectives, minimisations) must not answer that point
    real = Objective.energy_and_gradient
    seen = {"calls": 0}

    def interrupted(self, theta):
        if abs(self.problem.molecule.distance(0, 1) - length) < 1e-9:
            seen["calls"] += 1
            if seen["calls"] == call:
                signal.raise_signal(signal.SIGINT)
        return real(self, theta)

    monkeypatch.setattr(Objective, "energy_and_gradient", interrupted)
    return seen
