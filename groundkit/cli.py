"""Command line: ``python -m groundkit run study.toml [--resume | --overwrite]`` (also installed as ``groundkit``)
and ``python -m groundkit plan plan.toml [--resume | --overwrite]`` (see docs/plan.md).

Exit status: 0 done; 1 some scan points failed (their rows say why); 2 bad input (the study file, an existing
output, a checkpoint in use or of another configuration), with the message on standard error; 3 a crash (a
groundkit bug), with the traceback on standard error and in ``crash-traceback.txt`` in the output directory;
130 stopped by Ctrl-C (the finished points stay in the checkpoint).
"""

from __future__ import annotations

import argparse
import os
import sys
import traceback

from .errors import GroundkitError

DONE, FAILED_POINTS, BAD_INPUT, CRASHED, INTERRUPTED = 0, 1, 2, 3, 130

EPILOG = """\
exit status:
  0    done
  1    some scan points failed (see the failure column of summary.csv)
  2    bad input: the study file (the message gives the line), an output directory that already holds results
       (use --resume or --overwrite), a checkpoint in use by another scan or written for another configuration
  3    crash (a bug in groundkit): the traceback is on standard error and in crash-traceback.txt
  130  interrupted by Ctrl-C: finished points stay in the checkpoint; continue with --resume
"""


def parser() -> argparse.ArgumentParser:
    top = argparse.ArgumentParser(prog="groundkit", description="Variational ground-state studies of molecules.")
    commands = top.add_subparsers(dest="command", required=True)
    run = commands.add_parser(
        "run", help="run a TOML study file (a single point or a bond scan)", epilog=EPILOG,
        formatter_class=argparse.RawDescriptionHelpFormatter,
        description="Run a TOML study file and write its results to the output directory (see docs/studies.md).",
    )
    run.add_argument("study", help="path of the TOML study file")
    existing = run.add_mutually_exclusive_group()
    existing.add_argument("--resume", action="store_true",
                          help="continue the scan from its checkpoint in the output directory (a single run is run "
                               "again)")
    existing.add_argument("--overwrite", action="store_true",
                          help="replace the outputs (and checkpoint) already in the output directory")
    run.add_argument("--retry-failed", action="store_true",
                     help="with --resume, compute the scan points that failed before once more (their earlier "
                          "failures are kept in scan.json)")
    run.add_argument("--quiet", action="store_true", help="no progress bar and no summary on standard output")
    planned = commands.add_parser(
        "plan", help="run a TOML plan file (configurations crossed over a curve, costed on devices)",
        description="Run a TOML plan file; writes plan.csv, plan.png, plan.json and plan.html (see docs/plan.md).")
    planned.add_argument("study", help="path of the TOML plan file")
    again = planned.add_mutually_exclusive_group()
    again.add_argument("--resume", action="store_true", help="continue an interrupted plan from its checkpoint")
    again.add_argument("--overwrite", action="store_true", help="replace the outputs already in the directory")
    planned.add_argument("--quiet", action="store_true", help="no progress bar and no summary on standard output")
    return top


def main(argv: list[str] | None = None) -> int:
    """Entry point; returns the exit status (see the module docstring)."""
    from .studies.batch import CRASH_REPORT, run_study
    from .studies.toml_file import read_study

    args = parser().parse_args(argv)
    if args.command == "plan":
        return _plan(args)
    study = None
    try:
        study = read_study(args.study)
        text, failed = run_study(study, resume=args.resume, overwrite=args.overwrite,
                                 retry_failed=args.retry_failed, progress=not args.quiet)
    except GroundkitError as err:
        print(f"groundkit: error: {err}", file=sys.stderr)
        return BAD_INPUT
    except KeyboardInterrupt:
        where = "" if study is None or study.scan is None else \
            f"; the finished points are in {os.path.join(study.output, 'checkpoint')}, continue with --resume"
        print(f"groundkit: interrupted{where}", file=sys.stderr)
        return INTERRUPTED
    except Exception as err:  # a bug: say so, keep the traceback, and exit with its own status
        return _crashed(err, None if study is None else os.path.join(study.output, CRASH_REPORT))
    if not args.quiet:
        print(text)
        print(f"written to {study.output}")
    return FAILED_POINTS if failed else DONE


def _crashed(err: Exception, path: str | None) -> int:
    """Print the traceback of a bug and save it at ``path`` (if writable); the crash exit status."""
    report = traceback.format_exc()
    saved = _save_report(report, path)
    print(report, file=sys.stderr, end="")
    print(f"groundkit: crashed (a bug in groundkit, please report it): {type(err).__name__}: {err}"
          + (f"; traceback saved in {saved}" if saved else ""), file=sys.stderr)
    return CRASHED


def _save_report(report: str, path: str | None) -> str | None:
    """Write the traceback to ``path``; the path, or None when there is none or it cannot be written."""
    if path is None:
        return None
    try:
        os.makedirs(os.path.dirname(path), exist_ok=True)
        with open(path, "w", encoding="utf-8") as fh:
            fh.write(report)
    except OSError:
        return None
    return path


def _plan(args: argparse.Namespace) -> int:
    """``plan`` command: 0 done, 2 bad input, 3 crash, 130 Ctrl-C (finished minimisations stay checkpointed)."""
    from .studies.plan_file import read_plan_file, run_plan_file

    study = None
    try:
        study = read_plan_file(args.study)
        text = run_plan_file(study, resume=args.resume, overwrite=args.overwrite, progress=not args.quiet)
    except GroundkitError as err:
        print(f"groundkit: error: {err}", file=sys.stderr)
        return BAD_INPUT
    except KeyboardInterrupt:
        where = "" if study is None else f"; continue with --resume (checkpoint in {study.output})"
        print(f"groundkit: interrupted{where}", file=sys.stderr)
        return INTERRUPTED
    except Exception as err:  # a bug: say so, keep the traceback
        return _crashed(err, None if study is None else os.path.join(study.output, "crash-traceback.txt"))
    if not args.quiet:
        print(text)
        print(f"written to {study.output}")
    return DONE
