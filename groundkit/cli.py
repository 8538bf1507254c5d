"""Command line: ``python -m groundkit run study.toml [--resume]`` (also installed as ``groundkit``)."""

from __future__ import annotations

import argparse
import sys

from .errors import GroundkitError


def parser() -> argparse.ArgumentParser:
    top = argparse.ArgumentParser(prog="groundkit", description="Variational ground-state studies of molecules.")
    commands = top.add_subparsers(dest="command", required=True)
    run = commands.add_parser("run", help="run a TOML study file (a single point or a bond scan)")
    run.add_argument("study", help="path of the TOML study file")
    run.add_argument("--resume", action="store_true", help="continue the scan from its checkpoint")
    run.add_argument("--quiet", action="store_true", help="no progress bar and no summary on standard output")
    return top


def main(argv: list[str] | None = None) -> int:
    """Entry point; returns the exit status (0 done, 1 some scan points failed, 2 bad input)."""
    from .studies.batch import run_study
    from .studies.toml_file import read_study

    args = parser().parse_args(argv)
    try:
        study = read_study(args.study)
        text, failed = run_study(study, resume=args.resume, progress=not args.quiet)
    except GroundkitError as err:
        print(f"groundkit: error: {err}", file=sys.stderr)
        return 2
    if not args.quiet:
        print(text)
        print(f"written to {study.output}")
    return 1 if failed else 0
