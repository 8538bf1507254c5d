"""The workspace: every piece of reusable computed work, kept by kind and key under one budget in bytes.

SCF solutions, problems, objectives, qubit encodings, sparse operators, excitation images, Pauli actions on 2^n
states and trial-state plans all live here, so pipelines that share a problem share its work, and the whole
stays under :attr:`Workspace.budget_bytes` by evicting the least recently used entries first.

Entry sizes are measured, not guessed from counts: NumPy arrays by ``nbytes``, SciPy sparse matrices through
their arrays, other objects by walking their attributes and containers (``sys.getsizeof`` for the small parts).
An entry that refers to another entry (a problem holds its SCF solution, an objective its problem) is measured
without it and names it as a parent: fetching the child marks its parents used, and evicting a parent evicts
its children (else the parent would stay alive unseen). Sizes are measured when an entry is stored, and entries
that keep computed parts of themselves (problems, objectives) again each time they are fetched.

``gk.workspace()`` is the one process-wide workspace; ``gk.workspace(budget_bytes=2e9)`` sets its budget,
``.clear()`` forgets everything, ``.report()`` (also its ``repr``) lists kinds, entries and bytes. Thread-safe:
one lock guards the book-keeping and one lock per key makes threads that ask for the same missing entry build
it once. See docs/workspace.md.
"""

from __future__ import annotations

import os
import sys
import threading
import types
import weakref
from collections import OrderedDict
from collections.abc import Callable, Hashable
from dataclasses import dataclass
from typing import Any

import numpy as np

from .errors import WorkspaceBudgetError

DEFAULT_FRACTION = 0.5  # default budget: this fraction of the memory available when the workspace is created
FALLBACK_BUDGET = 4 * 2**30  # bytes, when the available memory cannot be read
SAMPLED_ITEMS = 64  # a larger container is measured from this many evenly spaced items

_SKIP = (type, types.ModuleType, types.FunctionType, types.BuiltinFunctionType, types.MethodType,
         weakref.ReferenceType, threading.Thread, type(threading.Lock()), type(threading.RLock()))


def available_memory() -> int | None:
    """Bytes of memory available to new work (Linux ``MemAvailable``; else free pages), or None if unknown."""
    try:
        with open("/proc/meminfo", encoding="ascii") as handle:
            for line in handle:
                if line.startswith("MemAvailable:"):
                    return int(line.split()[1]) * 1024
    except OSError:
        pass
    try:
        return int(os.sysconf("SC_AVPHYS_PAGES") * os.sysconf("SC_PAGE_SIZE"))
    except (ValueError, OSError, AttributeError):
        return None


def default_budget() -> int:
    """:data:`DEFAULT_FRACTION` of the available memory, in bytes (:data:`FALLBACK_BUDGET` if unknown)."""
    free = available_memory()
    return FALLBACK_BUDGET if free is None else int(DEFAULT_FRACTION * free)


def measure(value: Any, stop: frozenset[int] | set[int] = frozenset()) -> int:
    """Bytes held by ``value``: arrays by ``nbytes``, objects through their attributes, containers through their
    items; objects whose ``id`` is in ``stop`` (other workspace entries) and modules, classes, functions are not
    counted. Each object is counted once. A container of more than :data:`SAMPLED_ITEMS` items is estimated from
    that many evenly spaced items, so measuring costs at most a few milliseconds."""
    seen: set[int] = set()
    alive: list[Any] = []
    total = 0.0
    pending: list[tuple[Any, float]] = [(value, 1.0)]
    while pending:
        obj, weight = pending.pop()
        if id(obj) in seen or (id(obj) in stop and obj is not value) or isinstance(obj, _SKIP):
            continue
        seen.add(id(obj))
        alive.append(obj)  # held until the walk ends, so no id in ``seen`` is reused by a new object
        if isinstance(obj, np.ndarray):
            base = obj
            while isinstance(base.base, np.ndarray):
                base = base.base
            # sys.getsizeof counts the header (about 100 B, which dominates for the many small arrays of
            # measurement groups and tables) and, for an array owning its data, the data too; a view adds its base
            total += weight * max(sys.getsizeof(obj), obj.nbytes if base is obj else 0)
            if base is not obj:
                pending.append((base, weight))
            continue
        try:
            total += weight * sys.getsizeof(obj)
        except TypeError:
            pass
        if isinstance(obj, (str, bytes, bytearray, int, float, complex, bool, type(None))):
            continue
        if isinstance(obj, dict):  # keys and values, never new (key, value) tuples: a temporary's id is reused
            items: Any = [*obj.keys(), *obj.values()]
        elif isinstance(obj, (list, tuple)):
            items = obj
        elif isinstance(obj, (set, frozenset)):
            items = list(obj)
        elif isinstance(obj, memoryview):
            total += weight * obj.nbytes
            continue
        else:
            items = []
            attributes = getattr(obj, "__dict__", None)
            if isinstance(attributes, dict):
                items.append(attributes)
            for cls in type(obj).__mro__:
                for slot in getattr(cls, "__slots__", ()):
                    if isinstance(slot, str) and slot not in ("__dict__", "__weakref__"):
                        found = getattr(obj, slot, None)
                        if found is not None:
                            items.append(found)
        n = len(items)
        if n > SAMPLED_ITEMS:  # evenly spaced sample, each standing for n / SAMPLED_ITEMS items
            step = n / SAMPLED_ITEMS
            pending.extend((items[int(k * step)], weight * step) for k in range(SAMPLED_ITEMS))
        else:
            pending.extend((item, weight) for item in items)
    return int(total)


@dataclass
class _Entry:
    kind: str
    key: Hashable
    value: Any
    nbytes: int
    parents: tuple[tuple[str, Hashable], ...]
    grows: bool = False


@dataclass(frozen=True)
class EntryInfo:
    """One kept entry as the report shows it: kind, a short description of the key, bytes."""

    kind: str
    key: str
    nbytes: int


class Workspace:
    """Computed work by ``(kind, key)``, least recently used evicted first so the total stays under the budget.

    ``budget_bytes``: an int (bytes); default :func:`default_budget` (half of the available memory when the
    workspace is made). An entry larger than the whole budget is returned to its caller but not kept.
    """

    def __init__(self, budget_bytes: float | None = None) -> None:
        self._lock = threading.RLock()
        self._entries: OrderedDict[tuple[str, Hashable], _Entry] = OrderedDict()
        self._children: dict[tuple[str, Hashable], set[tuple[str, Hashable]]] = {}
        self._by_value: dict[int, tuple[str, Hashable]] = {}
        self._building: dict[tuple[str, Hashable], threading.RLock] = {}
        self._total = 0
        self.evictions = 0
        self.not_kept = 0
        self._budget = default_budget() if budget_bytes is None else _checked_budget(budget_bytes)

    # budget ---------------------------------------------------------------------------------------------------
    @property
    def budget_bytes(self) -> int:
        """The budget in bytes; setting it evicts at once down to the new value."""
        return self._budget

    @budget_bytes.setter
    def budget_bytes(self, value: float) -> None:
        with self._lock:
            self._budget = _checked_budget(value)
            self._evict()

    @property
    def nbytes(self) -> int:
        """Bytes held by the kept entries, as last measured."""
        return self._total

    def __len__(self) -> int:
        return len(self._entries)

    def __contains__(self, kind_key: tuple[str, Hashable]) -> bool:
        try:
            return kind_key in self._entries
        except TypeError:
            return False

    # use ------------------------------------------------------------------------------------------------------
    def get(self, kind: str, key: Hashable, default: Any = None) -> Any:
        """The kept value of ``(kind, key)``, marked used (with its parents) and measured again; else ``default``."""
        full = (kind, key)
        with self._lock:
            try:
                entry = self._entries.get(full)
            except TypeError:  # an unhashable key is never kept
                return default
            if entry is None:
                return default
            self._touch(full)
            if entry.grows:
                self._remeasure(entry)
            value = entry.value
            self._evict()
            return value

    def put(self, kind: str, key: Hashable, value: Any, *, parents: tuple[Any, ...] = (),
            owner: Any = None, grows: bool = False) -> Any:
        """Keep ``value`` under ``(kind, key)`` and return it.

        ``parents``: values held by ``value`` that are workspace entries themselves (their entries are marked used
        with this one, and evicting one evicts this entry). ``owner``: an object whose lifetime bounds the entry
        (dropped when the owner is garbage-collected; the owner is also a parent if it is an entry). ``grows``:
        the value keeps computed parts of itself as it is used (a problem's exact reference), so it is measured
        again each time it is fetched.
        """
        full = (kind, key)
        try:
            hash(full)
        except TypeError:
            return value
        with self._lock:
            if full in self._entries:
                self._drop(full)
            linked = [self._by_value[id(p)] for p in (*parents, owner) if p is not None and id(p) in self._by_value]
            stop = set(self._by_value)
            entry = _Entry(kind, key, value, measure(value, stop), tuple(dict.fromkeys(linked)), grows)
            if entry.nbytes > self._budget:
                self.not_kept += 1
                return value
            self._entries[full] = entry
            self._by_value[id(value)] = full
            self._total += entry.nbytes
            for parent in entry.parents:
                self._children.setdefault(parent, set()).add(full)
            self._touch(full)
            if owner is not None:
                weakref.finalize(owner, self._discard_quietly, full, id(value))
            self._evict()
        return value

    def fetch(self, kind: str, key: Hashable, build: Callable[[], Any], *, parents: Callable[[Any], tuple] | None
              = None, owner: Any = None, valid: Callable[[Any], bool] | None = None, grows: bool = False) -> Any:
        """The kept value of ``(kind, key)``, or ``build()`` kept and returned (built once when threads ask at the
        same time). ``parents(value)`` names the entries the value holds; ``valid(value)`` rejects a kept value
        (rebuilt then). An unhashable key builds afresh without keeping."""
        full = (kind, key)
        try:
            hash(full)
        except TypeError:
            return build()
        found = self.get(kind, key, _MISSING)
        if found is not _MISSING and (valid is None or valid(found)):
            return found
        with self._lock:
            building = self._building.setdefault(full, threading.RLock())
        with building:
            found = self.get(kind, key, _MISSING)
            if found is not _MISSING and (valid is None or valid(found)):
                return found
            value = build()
            self.put(kind, key, value, parents=parents(value) if parents is not None else (), owner=owner,
                     grows=grows)
        with self._lock:
            self._building.pop(full, None)
        return value

    def discard(self, kind: str, key: Hashable) -> None:
        """Forget ``(kind, key)`` (and the entries that hold it) if kept."""
        with self._lock:
            try:
                if (kind, key) in self._entries:
                    self._drop((kind, key))
            except TypeError:
                pass

    def clear(self, kind: str | None = None) -> None:
        """Forget every entry, or every entry of one ``kind``."""
        with self._lock:
            for full in [k for k in self._entries if kind is None or k[0] == kind]:
                if full in self._entries:
                    self._drop(full)

    # report ---------------------------------------------------------------------------------------------------
    def entries(self, kind: str | None = None) -> list[EntryInfo]:
        """The kept entries, least recently used first."""
        with self._lock:
            return [EntryInfo(e.kind, _describe(e.key), e.nbytes) for e in self._entries.values()
                    if kind is None or e.kind == kind]

    def summary(self) -> dict[str, tuple[int, int]]:
        """Kind -> (entries, bytes), kinds in order of first appearance."""
        out: dict[str, list[int]] = {}
        with self._lock:
            for e in self._entries.values():
                row = out.setdefault(e.kind, [0, 0])
                row[0] += 1
                row[1] += e.nbytes
        return {k: (n, b) for k, (n, b) in sorted(out.items())}

    def report(self) -> str:
        """A table of kinds, entries and bytes, with the total against the budget."""
        rows = self.summary()
        width = max([len("kind"), *(len(k) for k in rows)])
        lines = [f"{'kind':<{width}}  {'entries':>7}  {'bytes':>10}"]
        lines += [f"{k:<{width}}  {n:>7}  {format_bytes(b):>10}" for k, (n, b) in rows.items()]
        share = self._total / self._budget if self._budget else 0.0
        lines.append(f"{'total':<{width}}  {len(self._entries):>7}  {format_bytes(self._total):>10}  of "
                     f"{format_bytes(self._budget)} ({100 * share:.1f}%); {self.evictions} evicted, "
                     f"{self.not_kept} too large to keep")
        return "\n".join(lines)

    def __repr__(self) -> str:
        return "Workspace\n" + self.report()

    # book-keeping (under the lock) ----------------------------------------------------------------------------
    def _touch(self, full: tuple[str, Hashable]) -> None:
        todo, done = [full], set()
        while todo:
            k = todo.pop()
            if k in done or k not in self._entries:
                continue
            done.add(k)
            self._entries.move_to_end(k)
            todo.extend(self._entries[k].parents)

    def _remeasure(self, entry: _Entry) -> None:
        size = measure(entry.value, set(self._by_value))
        self._total += size - entry.nbytes
        entry.nbytes = size

    def _evict(self) -> None:
        while self._total > self._budget and self._entries:
            oldest = next(iter(self._entries))
            self._drop(oldest)
            self.evictions += 1

    def _drop(self, full: tuple[str, Hashable]) -> None:
        entry = self._entries.pop(full, None)
        if entry is None:
            return
        self._total -= entry.nbytes
        if self._by_value.get(id(entry.value)) == full:
            del self._by_value[id(entry.value)]
        for parent in entry.parents:
            self._children.get(parent, set()).discard(full)
        for child in list(self._children.pop(full, ())):
            self._drop(child)

    def _discard_quietly(self, full: tuple[str, Hashable], value_id: int) -> None:
        with self._lock:
            entry = self._entries.get(full)
            if entry is not None and id(entry.value) == value_id:
                self._drop(full)


_MISSING = object()


def _checked_budget(value: Any) -> int:
    try:
        number = float(value)
    except (TypeError, ValueError):
        number = float("nan")
    if isinstance(value, bool) or not number > 0 or number == float("inf"):
        raise WorkspaceBudgetError(
            f"workspace budget_bytes={value!r} is not accepted; give a positive, finite number of bytes, e.g. "
            "2e9 for 2 GB")
    return int(number)


def _describe(key: Any, limit: int = 60) -> str:
    text = repr(key)
    return text if len(text) <= limit else text[:limit - 1] + "…"


def format_bytes(n: float) -> str:
    """``1234567`` -> ``'1.2 MB'`` (powers of 1000)."""
    for unit in ("B", "kB", "MB", "GB"):
        if abs(n) < 1000 or unit == "GB":
            return f"{n:.0f} {unit}" if unit == "B" else f"{n:.1f} {unit}"
        n /= 1000
    return f"{n:.1f} GB"


_WORKSPACE: Workspace | None = None
_WORKSPACE_LOCK = threading.Lock()


def workspace(budget_bytes: float | None = None) -> Workspace:
    """The process-wide :class:`Workspace` (made on first use); ``budget_bytes`` sets its budget."""
    global _WORKSPACE
    with _WORKSPACE_LOCK:
        if _WORKSPACE is None:
            _WORKSPACE = Workspace(budget_bytes)
        elif budget_bytes is not None:
            _WORKSPACE.budget_bytes = budget_bytes
        return _WORKSPACE
