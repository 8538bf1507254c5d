"""Running a study file: a single pipeline run or a checkpointed scan, with results and a summary table on disk.

Written to the output directory: ``result.json`` (single run) or ``scan.json`` with ``checkpoint/`` (scan),
plus ``summary.txt`` and, for scans, ``summary.csv``.
"""

from __future__ import annotations

import os

from .errors import StudyFileError
from .geometries import BondStretch
from .toml_file import Study

CSV_COLUMNS = ("value", "energy", "reference", "error_mha", "verdict", "hf", "ccsd", "converged", "iterations",
               "wall_time", "start", "failure")


def run_study(study: Study, *, resume: bool = False, progress: bool = True) -> tuple[str, int]:
    """Run the study; returns the summary text (also written to ``summary.txt``) and the failed point count."""
    os.makedirs(study.output, exist_ok=True)
    failed = 0
    if study.scan is None:
        result = study.pipeline.run()
        result.save(os.path.join(study.output, "result.json"))
        text = f"{study.title}\n\n{result.summary()}\n"
    else:
        checkpoint = os.path.join(study.output, "checkpoint")
        if not resume and _has_points(checkpoint):
            raise StudyFileError(
                f"{study.source}: output directory {study.output!r} already holds a checkpoint; run with --resume "
                "to continue it, or set [output] directory to another folder"
            )
        plan = study.scan
        scan = study.pipeline.scan(
            BondStretch(study.pipeline.components["molecule"], *plan.bond), list(plan.values),
            checkpoint=checkpoint, executor=None if plan.executor == "serial" else plan.executor,
            warm_start=plan.warm_start, progress=progress,
        )
        scan.save(os.path.join(study.output, "scan.json"))
        table = scan.table
        table[[c for c in CSV_COLUMNS if c in table]].to_csv(os.path.join(study.output, "summary.csv"), index=False)
        text = f"{study.title}\n\n{scan.summary()}\n{_analysis(scan)}"
        failed = len(scan.failures)
    with open(os.path.join(study.output, "summary.txt"), "w", encoding="utf-8") as fh:
        fh.write(text)
    return text, failed


def _has_points(directory: str) -> bool:
    return os.path.isdir(directory) and any(n.startswith("point-") for n in os.listdir(directory))


def _analysis(scan) -> str:
    """Equilibrium, wavenumber and non-parallelity lines where the scan allows them."""
    from .errors import AnalysisError

    lines = []
    try:
        value, energy = scan.equilibrium()
        lines.append(f"\nequilibrium (spline minimum): {value:.6f} at {energy:.10f} Ha")
        lines.append(f"harmonic wavenumber: {scan.harmonic_wavenumber():.1f} cm^-1")
    except AnalysisError as err:
        lines.append(f"\nanalysis: {err}")
    npe = scan.non_parallelity()
    if npe:
        lines.append("non-parallelity error / mHa: " + ", ".join(f"{k} {1000 * v:.4f}" for k, v in npe.items()))
    if scan.failures:
        lines.append(f"failed points: {len(scan.failures)}")
    return "\n".join(lines) + "\n"
