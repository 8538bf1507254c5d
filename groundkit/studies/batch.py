"""Running a study file: a single pipeline run or a checkpointed scan, with results and a summary table on disk.

Written to the output directory: ``result.json`` (single run) or ``scan.json`` with ``checkpoint/`` (scan),
plus ``summary.txt`` and, for scans, ``summary.csv``. An output directory that already holds any of them is
refused unless the run resumes (``resume=True``: a scan continues from its checkpoint; a single run, which has
no checkpoint, runs again) or replaces it (``overwrite=True``: the old outputs and checkpoint are removed first).
"""

from __future__ import annotations

import os
import warnings

from groundkit.errors import OutputExistsError

from .checkpoint import clear_checkpoint
from .errors import AnalysisError, StudyFileError
from .geometries import BondStretch
from .toml_file import Study

CSV_COLUMNS = ("value", "energy", "reference", "error_mha", "verdict", "hf", "ccsd", "converged", "iterations",
               "wall_time", "start", "failure")
OUTPUTS = ("result.json", "scan.json", "summary.txt", "summary.csv", "checkpoint")
CRASH_REPORT = "crash-traceback.txt"


def run_study(study: Study, *, resume: bool = False, overwrite: bool = False, retry_failed: bool = False,
              progress: bool = True) -> tuple[str, int]:
    """Run the study; returns the summary text (also written to ``summary.txt``) and the failed point count.

    ``retry_failed``: a resumed scan computes its stored failed points again."""
    if resume and overwrite:
        raise StudyFileError(f"{study.source}: resume and overwrite exclude each other; give one of them "
                             "(--resume continues the old outputs, --overwrite replaces them)")
    existing = existing_outputs(study.output)
    if existing and not (resume or overwrite):
        raise OutputExistsError(
            f"{study.source}: output directory {study.output!r} already holds {', '.join(existing)}; run with "
            "--resume to continue it, with --overwrite to replace it, or set [output] directory to another folder"
        )
    if overwrite:
        remove_outputs(study.output)
    os.makedirs(study.output, exist_ok=True)
    failed = 0
    if study.scan is None:
        result = study.pipeline.run()  # a single run has no checkpoint: resume runs it again
        result.save(os.path.join(study.output, "result.json"))
        text = f"{study.title}\n\n{result.summary()}\n"
    else:
        plan = study.scan
        scan = study.pipeline.scan(
            BondStretch(study.pipeline.components["molecule"], *plan.bond), list(plan.values),
            checkpoint=os.path.join(study.output, "checkpoint"),
            executor=None if plan.executor == "serial" else plan.executor,
            warm_start=plan.warm_start, progress=progress, retry_failed=retry_failed,
        )
        scan.save(os.path.join(study.output, "scan.json"))
        table = scan.table
        table[[c for c in CSV_COLUMNS if c in table]].to_csv(os.path.join(study.output, "summary.csv"), index=False)
        text = f"{study.title}\n\n{scan.summary()}\n{_analysis(scan)}"
        failed = len(scan.failures)
    with open(os.path.join(study.output, "summary.txt"), "w", encoding="utf-8") as fh:
        fh.write(text)
    return text, failed


def existing_outputs(directory: str) -> list[str]:
    """The study outputs already in ``directory`` (an empty checkpoint folder does not count)."""
    found = []
    for name in OUTPUTS:
        path = os.path.join(directory, name)
        if name == "checkpoint":
            if os.path.isdir(path) and any(not n.startswith(".groundkit-") for n in os.listdir(path)):
                found.append("checkpoint/")
        elif os.path.exists(path):
            found.append(name)
    return found


def remove_outputs(directory: str) -> None:
    """Remove the study outputs from ``directory`` (the checkpoint under its lock); other files stay."""
    clear_checkpoint(os.path.join(directory, "checkpoint"))
    for name in OUTPUTS + (CRASH_REPORT,):
        path = os.path.join(directory, name)
        if name != "checkpoint" and os.path.isfile(path):
            os.unlink(path)


def _analysis(scan) -> str:
    """Equilibrium, wavenumber and non-parallelity lines where the scan allows them; points left out of the fits
    (not converged) are named."""

    lines = []
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        try:
            value, energy = scan.equilibrium()
            lines.append(f"\nequilibrium (spline minimum): {value:.6f} at {energy:.10f} Ha")
            lines.append(f"harmonic wavenumber: {scan.harmonic_wavenumber():.1f} cm^-1")
        except AnalysisError as err:
            lines.append(f"\nanalysis: {err}")
    notes = list(dict.fromkeys(str(w.message) for w in caught))
    lines += [f"note: {note}" for note in notes]
    npe = scan.non_parallelity()
    if npe:
        lines.append("non-parallelity error / mHa: " + ", ".join(f"{k} {1000 * v:.4f}" for k, v in npe.items()))
    if scan.failures:
        lines.append(f"failed points: {len(scan.failures)}")
    return "\n".join(lines) + "\n"
