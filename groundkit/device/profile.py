"""DeviceProfile: what a device offers a circuit: its coupling graph, native two-qubit gate, durations and errors.

A component of role ``device``. ``connectivity`` names a kind (see :mod:`groundkit.device.connectivity`) with its
``size``, or is ``"graph"`` with ``edges``; :meth:`DeviceProfile.from_graph` takes a networkx graph or an edge
list. The device's qubits are ``cirq.LineQubit(k)`` for the graph's nodes k = 0…n−1.

Built-in profiles (:mod:`groundkit.device.builtins`) carry illustrative numbers of our own; none describes a
real device.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property
from typing import Any

import cirq
import networkx as nx

from ..component import Component
from ..constraints import ComponentOf, Constraint, OneOf, Refused
from ..errors import DeviceError
from ..registry import register
from .connectivity import KINDS, connectivity_graph, edges_of
from .figures import ErrorFigures, GateDurations
from .native import NATIVE_GATES, target_gateset, two_qubit_gate


class _Text(Constraint):
    def check(self, value: Any) -> Any:
        if not isinstance(value, str) or not value.strip():
            raise self.refuse()
        return value

    def describe(self) -> str:
        return "a non-empty string"


class _Size(Constraint):
    """None, a qubit count, or (rows, columns); the kind decides which (checked with the kind)."""

    def check(self, value: Any) -> Any:
        if value is None or (isinstance(value, int) and not isinstance(value, bool)):
            return value
        if isinstance(value, (tuple, list)) and len(value) == 2:
            return tuple(value)
        raise self.refuse()

    def describe(self) -> str:
        return "None, a number of qubits, or a pair (rows, columns)"


class _Edges(Constraint):
    """None, or the couplings as integer pairs (a networkx graph or any edge list is relabelled 0…n−1)."""

    def check(self, value: Any) -> Any:
        if value is None:
            return None
        if isinstance(value, (str, bytes, dict)):
            raise self.refuse()
        try:
            return edges_of(value if isinstance(value, nx.Graph) else list(value))
        except TypeError:
            raise Refused(self.describe()) from None

    def describe(self) -> str:
        return "None, a networkx graph, or a list of qubit pairs [(a, b), ...]"


class Device(Component, role="device", error=DeviceError):
    """Base of the device role (a component that describes a device)."""


@register("device", "custom", label="custom device", listed=False)
@dataclass(frozen=True)
class DeviceProfile(Device):
    """``DeviceProfile(name="my-grid", connectivity="grid", size=(3, 4), native_gate="cz")``.

    ``connectivity``: one of ``"all-to-all"``, ``"line"``, ``"ring"`` (``size`` = qubit count), ``"grid"``,
    ``"heavy-hex"`` (``size`` = (rows, columns), of qubits for a grid and of hexagons for heavy-hex), or
    ``"graph"`` with ``edges`` (pairs of qubit numbers). ``native_gate``: ``"cnot"``, ``"cz"`` or
    ``"sqrt-iswap"``. ``errors`` and ``durations``: :class:`ErrorFigures` and :class:`GateDurations` (ns, µs).
    """

    name: str = "custom"
    connectivity: str = "grid"
    size: Any = (3, 3)
    edges: Any = None
    native_gate: str = "cz"
    errors: ErrorFigures = ErrorFigures()
    durations: GateDurations = GateDurations()

    constraints = {
        "name": _Text(),
        "connectivity": OneOf(*KINDS),
        "size": _Size(),
        "edges": _Edges(),
        "native_gate": OneOf(*NATIVE_GATES),
        "errors": ComponentOf("device_figures"),
        "durations": ComponentOf("device_figures"),
    }

    def check_options(self) -> None:
        if not isinstance(self.errors, ErrorFigures):
            raise DeviceError(f"DeviceProfile(errors={self.errors!r}): errors must be an ErrorFigures")
        if not isinstance(self.durations, GateDurations):
            raise DeviceError(f"DeviceProfile(durations={self.durations!r}): durations must be a GateDurations")
        if self.connectivity == "graph" and self.edges is None:
            raise DeviceError(f"DeviceProfile {self.name!r}: connectivity='graph' needs edges=[(a, b), ...]")
        if self.connectivity != "graph" and self.edges is not None:
            raise DeviceError(f"DeviceProfile {self.name!r}: edges are given only with connectivity='graph' "
                              f"(got connectivity={self.connectivity!r})")
        self.graph  # noqa: B018 (builds and checks the graph: size, connectedness)

    @classmethod
    def from_graph(cls, graph: Any, *, name: str = "custom", native_gate: str = "cz",
                   errors: ErrorFigures | None = None, durations: GateDurations | None = None) -> DeviceProfile:
        """A profile whose couplings are ``graph``: a networkx graph (nodes relabelled 0…n−1 in sorted order) or
        an edge list."""
        return DeviceProfile(name=name, connectivity="graph", size=None, edges=graph, native_gate=native_gate,
                             errors=errors or ErrorFigures(), durations=durations or GateDurations())

    @cached_property
    def graph(self) -> nx.Graph:
        """The coupling graph (networkx, nodes 0…n−1); a fresh copy is not made, so do not modify it."""
        return connectivity_graph(self.connectivity, self.size, self.edges)

    @property
    def n_qubits(self) -> int:
        """Number of qubits of the device."""
        return self.graph.number_of_nodes()

    @property
    def qubits(self) -> list[cirq.LineQubit]:
        """The device's qubits: ``cirq.LineQubit(k)`` for node k."""
        return [cirq.LineQubit(k) for k in sorted(self.graph.nodes())]

    @property
    def qubit_graph(self) -> nx.Graph:
        """The coupling graph on Cirq qubits (what Cirq's router takes)."""
        return nx.relabel_nodes(self.graph, {k: cirq.LineQubit(k) for k in self.graph.nodes()})

    @property
    def gateset(self) -> cirq.CompilationTargetGateset:
        """Cirq's compilation target of the native gate (see :mod:`groundkit.device.native`)."""
        return target_gateset(self.native_gate)

    @property
    def two_qubit_gate(self) -> cirq.Gate:
        """The native two-qubit Cirq gate."""
        return two_qubit_gate(self.native_gate)

    @property
    def all_to_all(self) -> bool:
        """True when every pair of qubits is coupled (no routing needed)."""
        n = self.n_qubits
        return self.graph.number_of_edges() == n * (n - 1) // 2

    def __repr__(self) -> str:
        shape = f"edges={len(self.edges)}" if self.connectivity == "graph" else f"size={self.size!r}"
        return (f"DeviceProfile(name={self.name!r}, connectivity={self.connectivity!r}, {shape}, "
                f"native_gate={self.native_gate!r}, qubits={self.n_qubits})")


def as_device(value: Any) -> DeviceProfile | None:
    """None (the logical all-to-all register), a :class:`DeviceProfile`, a registered device name, or a saved
    record; DeviceError for anything else, listing the names."""
    if value is None:
        return None
    from ..components import as_component

    return as_component("device", value)
