"""Progress bars for runs outside (and inside) notebooks, with tqdm."""

from __future__ import annotations

from typing import Any


class RunProgress:
    """A tqdm bar counting iterations, showing the energy and its error against the exact reference."""

    def __init__(self, reference: float | None = None, description: str = "minimising") -> None:
        from tqdm.auto import tqdm

        self.reference = reference
        self.bar = tqdm(desc=description, unit="it", mininterval=0.5, leave=True)

    def update(self, record: Any) -> None:
        """Advance by one iteration record."""
        postfix = {"energy": f"{record.energy:.8f}"}
        if self.reference is not None:
            postfix["error_mHa"] = f"{1000 * (record.energy - self.reference):+.3f}"
        self.bar.set_postfix(postfix, refresh=False)
        self.bar.update(1)

    def close(self) -> None:
        self.bar.close()
