"""Where a result came from: library versions, platform, time, seeds, the readable configuration, and the
component records and molecule from which :meth:`RunResult.pipeline` rebuilds the run (see
:mod:`groundkit.records`)."""

from __future__ import annotations

import platform
import sys
from datetime import UTC, datetime
from importlib import metadata
from typing import Any

PACKAGES = ("groundkit", "numpy", "scipy", "pyscf", "openfermion", "cirq-core")


def versions() -> dict[str, str]:
    """Installed version of Python and of each library groundkit computes with."""
    out = {"python": sys.version.split()[0]}
    for name in PACKAGES:
        try:
            out[name] = metadata.version(name)
        except metadata.PackageNotFoundError:
            out[name] = "not installed"
    return out


def seeds_of(components: dict[str, Any]) -> dict[str, int]:
    """The ``seed`` option of every component that has one."""
    return {role: int(c.seed) for role, c in components.items() if getattr(c, "seed", None) is not None}


def provenance(configuration: dict[str, Any], components: dict[str, Any]) -> dict[str, Any]:
    """A JSON-ready provenance record; ``components`` are the resolved components by role, with the molecule."""
    from .records import component_records, molecule_record

    records, notes = component_records(components)
    extra: dict[str, Any] = {"components": records}
    if notes:
        extra["component_notes"] = notes
    if components.get("molecule") is not None:
        extra["molecule"] = molecule_record(components["molecule"])
    return {
        "versions": versions(),
        "platform": platform.platform(),
        "machine": platform.machine(),
        "time": datetime.now(UTC).isoformat(timespec="seconds"),
        "seeds": seeds_of(components),
        "configuration": configuration,
        **extra,
    }
