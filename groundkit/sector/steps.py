"""Excitation tables prepared for repeated use on a working buffer.

A step indexes a CI array in one of three ways, by what the excitation touches:

- ``"rows"`` (alpha only): whole rows move, so the step indexes the row axis with the alpha source and target
  indices; contiguous copies, the cheapest case;
- ``"columns"`` (beta only): whole columns move; the step indexes the rows of the transposed array, which
  :class:`Buffer` keeps and syncs only when the kind of step changes;
- ``"flat"`` (both spins): the step indexes the raveled array with flat indices ``ia * nb + ib``. Flat indices and
  signs are kept for as many steps as fit in ``flat_budget`` (pairs) and formed on use for the rest, so memory stays
  bounded on large sectors.
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from groundkit.sector.tables import ExcitationTable

FLAT_BUDGET = 8_000_000
"""Largest total number of (source, target) pairs whose flat indices and signs are kept: about 190 MB."""


class Step:
    """One excitation as index arrays into a working buffer; see the module docstring."""

    __slots__ = ("kind", "table", "_index", "_signs", "_shape")

    def __init__(self, table: ExcitationTable, shape: tuple[int, int], keep: bool = False):
        self.table = table
        self._shape = shape
        self._index: tuple[np.ndarray, np.ndarray] | None = None
        self._signs: np.ndarray | None = None
        if table.beta is None:
            self.kind = "rows"
            self._index = (table.alpha.source, table.alpha.target)
            self._signs = table.alpha.sign[:, None]
        elif table.alpha is None:
            self.kind = "columns"
            self._index = (table.beta.source, table.beta.target)
            self._signs = table.beta.sign[:, None]
        else:
            self.kind = "flat"
            if keep:
                self._index = self._flat_index()
                self._signs = self._flat_signs()

    @property
    def n_pairs(self) -> int:
        """Number of (source, target) determinant pairs the step rotates."""
        a, b = self.table.alpha, self.table.beta
        rows = a.source.size if a is not None else self._shape[0]
        cols = b.source.size if b is not None else self._shape[1]
        return rows * cols

    @property
    def kept(self) -> bool:
        """Whether the index arrays are stored (always for row and column steps)."""
        return self._index is not None

    def index(self) -> tuple[np.ndarray, np.ndarray]:
        """(source, target) row indices (row and column steps) or flat determinant indices (flat steps)."""
        return self._index if self._index is not None else self._flat_index()

    def signs(self) -> np.ndarray:
        """Sign of tau on each source, shaped to broadcast over the gathered block."""
        return self._signs if self._signs is not None else self._flat_signs()

    def _flat_index(self) -> tuple[np.ndarray, np.ndarray]:
        nb = self._shape[1]
        a, b = self.table.alpha, self.table.beta
        return np.add.outer(a.source * nb, b.source).ravel(), np.add.outer(a.target * nb, b.target).ravel()

    def _flat_signs(self) -> np.ndarray:
        return np.multiply.outer(self.table.alpha.sign, self.table.beta.sign).ravel()


class Steps:
    """The steps of an ordered list of tables over a sector of ``shape`` (alpha strings, beta strings)."""

    def __init__(self, tables: Sequence[ExcitationTable], shape: tuple[int, int], flat_budget: int = FLAT_BUDGET):
        self.shape = (int(shape[0]), int(shape[1]))
        self.steps: list[Step] = []
        left = flat_budget
        for table in tables:
            step = Step(table, self.shape)
            if step.kind == "flat" and step.n_pairs <= left:
                left -= step.n_pairs
                step = Step(table, self.shape, keep=True)
            self.steps.append(step)

    def __len__(self) -> int:
        return len(self.steps)

    @property
    def kept_pairs(self) -> int:
        """Number of flat (source, target) pairs stored."""
        return sum(s.n_pairs for s in self.steps if s.kind == "flat" and s.kept)


class Buffer:
    """A CI array that steps of every kind can index; it owns ``ci`` and a transposed copy synced on demand."""

    def __init__(self, ci: np.ndarray):
        self.ci = np.array(ci, dtype=float, order="C", copy=True)
        self._transposed: np.ndarray | None = None
        self._in_transposed = False

    def view(self, kind: str) -> np.ndarray:
        """The array a step of ``kind`` indexes: rows of ``ci``, rows of ``ci.T``, or ``ci`` raveled."""
        if kind == "columns":
            if not self._in_transposed:
                if self._transposed is None:
                    self._transposed = np.empty(self.ci.shape[::-1])
                np.copyto(self._transposed, self.ci.T)
                self._in_transposed = True
            return self._transposed
        self.settle()
        return self.ci if kind == "rows" else self.ci.reshape(-1)

    def settle(self) -> np.ndarray:
        """``ci`` brought up to date (copies back from the transposed array if that was written last)."""
        if self._in_transposed:
            np.copyto(self.ci, self._transposed.T)
            self._in_transposed = False
        return self.ci
