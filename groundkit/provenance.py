"""Where a result came from: library versions, platform, time, seeds and the full configuration."""

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
    """A JSON-ready provenance record."""
    return {
        "versions": versions(),
        "platform": platform.platform(),
        "machine": platform.machine(),
        "time": datetime.now(UTC).isoformat(timespec="seconds"),
        "seeds": seeds_of(components),
        "configuration": configuration,
    }
