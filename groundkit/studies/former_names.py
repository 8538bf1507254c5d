"""Class names used before a rename, so that checkpoints written under them still resume.

A checkpoint's fingerprint hashes the readable configuration strings (``repr`` of each component). A scan
started before ``PUCCD``, ``HartreeFock`` and ``GradientDescent`` became ``PairDoubles``, ``ReferenceDeterminant``
and ``FixedStepDescent`` hashed the former names; :func:`former_descriptions` gives the description as it was
written then, so its fingerprint can be recognised.
"""

from __future__ import annotations

import re
from typing import Any

FORMER_CLASS_NAMES = {"PairDoubles": "PUCCD", "ReferenceDeterminant": "HartreeFock",
                      "FixedStepDescent": "GradientDescent"}
_PATTERN = re.compile(r"\b(" + "|".join(FORMER_CLASS_NAMES) + r")\(")


def former_descriptions(description: dict[str, Any]) -> list[dict[str, Any]]:
    """The description with every renamed class written under its former name (empty when nothing changes)."""
    changed = {key: _PATTERN.sub(lambda m: FORMER_CLASS_NAMES[m.group(1)] + "(", value)
               if isinstance(value, str) else value for key, value in description.items()}
    return [changed] if changed != description else []
