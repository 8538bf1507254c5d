"""QubitMapping: which fermion-to-qubit encoding a pipeline uses, and whether to taper symmetries."""

from __future__ import annotations

from dataclasses import dataclass

from .errors import ComponentError

MAPPINGS = ("jordan-wigner", "bravyi-kitaev", "parity")
_ALIASES = {"jw": "jordan-wigner", "jordan_wigner": "jordan-wigner", "bk": "bravyi-kitaev",
            "bravyi_kitaev": "bravyi-kitaev"}


@dataclass(frozen=True)
class QubitMapping:
    """``QubitMapping("parity", taper=True)``. Names: 'jordan-wigner', 'bravyi-kitaev', 'parity'."""

    name: str = "jordan-wigner"
    taper: bool = False

    def __post_init__(self) -> None:
        key = str(self.name).strip().lower()
        key = _ALIASES.get(key, key)
        if key not in MAPPINGS:
            raise ComponentError(f"unknown mapping {self.name!r}; accepted: {', '.join(MAPPINGS)}")
        if not isinstance(self.taper, bool):
            raise ComponentError(f"taper={self.taper!r} must be True or False")
        object.__setattr__(self, "name", key)

    def __repr__(self) -> str:
        return f"QubitMapping({self.name!r}{', taper=True' if self.taper else ''})"
