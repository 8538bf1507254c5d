"""Connectivity graphs of devices: which pairs of qubits a two-qubit gate can act on.

Named kinds, each built with networkx:

- ``"all-to-all"``: ``size`` qubits, every pair coupled (``networkx.complete_graph``);
- ``"line"``: ``size`` qubits in a chain (``networkx.path_graph``);
- ``"ring"``: ``size`` qubits in a closed chain (``networkx.cycle_graph``), ``size`` ≥ 3;
- ``"grid"``: ``(rows, columns)`` square lattice (``networkx.grid_2d_graph``);
- ``"heavy-hex"``: ``(rows, columns)`` of hexagons: the hexagonal lattice (``networkx.hexagonal_lattice_graph``)
  with one more qubit on every edge, so qubits have two or three neighbours;
- ``"graph"``: the user's edge list.

Every graph is relabelled to the integers 0…n−1 (node ``k`` is the device qubit ``cirq.LineQubit(k)``): grid
nodes row by row, heavy-hex nodes in networkx's sorted order with each edge's qubit after the lattice's.
"""

from __future__ import annotations

from collections.abc import Iterable
from typing import Any

import networkx as nx

from ..errors import DeviceError

KINDS = ("all-to-all", "line", "ring", "grid", "heavy-hex", "graph")
"""The accepted connectivity kinds."""


def _relabelled(graph: nx.Graph, order: list[Any]) -> nx.Graph:
    index = {node: k for k, node in enumerate(order)}
    out = nx.Graph()
    out.add_nodes_from(range(len(order)))
    out.add_edges_from((index[a], index[b]) for a, b in graph.edges())
    return out


def heavy_hex_graph(rows: int, columns: int) -> nx.Graph:
    """The heavy-hexagon lattice of ``rows`` × ``columns`` hexagons: networkx's hexagonal lattice with every edge
    subdivided by one qubit. One hexagon has 12 qubits; 2 × 2 hexagons have 35."""
    lattice = nx.hexagonal_lattice_graph(rows, columns)
    vertices = sorted(lattice.nodes())
    edges = sorted(tuple(sorted(e)) for e in lattice.edges())
    heavy = nx.Graph()
    for a, b in edges:
        heavy.add_edge(("v", a), ("e", a, b))
        heavy.add_edge(("e", a, b), ("v", b))
    order = [("v", v) for v in vertices] + [("e", a, b) for a, b in edges]
    return _relabelled(heavy, order)


def _size_pair(kind: str, size: Any) -> tuple[int, int]:
    if not (isinstance(size, (tuple, list)) and len(size) == 2 and all(isinstance(s, int) and not
                                                                       isinstance(s, bool) and s >= 1 for s in size)):
        raise DeviceError(f"a {kind} device needs size=(rows, columns) of two integers >= 1, got {size!r}")
    return int(size[0]), int(size[1])


def _size_count(kind: str, size: Any, least: int) -> int:
    if not isinstance(size, int) or isinstance(size, bool) or size < least:
        raise DeviceError(f"a {kind} device needs size=<number of qubits>, an integer >= {least}, got {size!r}")
    return int(size)


def edge_graph(edges: Iterable[Any]) -> nx.Graph:
    """The graph of an edge list of integer pairs (nodes relabelled 0…n−1 in sorted order)."""
    graph = nx.Graph()
    for edge in edges:
        if not (isinstance(edge, (tuple, list)) and len(edge) == 2):
            raise DeviceError(f"device edge {edge!r} is not a pair of qubit numbers")
        a, b = edge
        if a == b:
            raise DeviceError(f"device edge {edge!r} joins a qubit to itself")
        graph.add_edge(a, b)
    if graph.number_of_nodes() == 0:
        raise DeviceError("a 'graph' device needs edges=[(a, b), ...] with at least one edge")
    return _relabelled(graph, sorted(graph.nodes()))


def connectivity_graph(kind: str, size: Any = None, edges: Any = None) -> nx.Graph:
    """The networkx graph (nodes 0…n−1) of a connectivity kind; DeviceError for a bad kind or size, or a
    disconnected graph."""
    if kind == "all-to-all":
        graph = nx.complete_graph(_size_count(kind, size, 1))
    elif kind == "line":
        graph = nx.path_graph(_size_count(kind, size, 1))
    elif kind == "ring":
        graph = nx.cycle_graph(_size_count(kind, size, 3))
    elif kind == "grid":
        rows, columns = _size_pair(kind, size)
        graph = _relabelled(nx.grid_2d_graph(rows, columns), [(r, c) for r in range(rows) for c in range(columns)])
    elif kind == "heavy-hex":
        graph = heavy_hex_graph(*_size_pair(kind, size))
    elif kind == "graph":
        graph = edge_graph(edges if edges is not None else ())
    else:
        raise DeviceError(f"unknown connectivity {kind!r}; accepted kinds: {', '.join(KINDS)}")
    if not nx.is_connected(graph):
        parts = sorted(sorted(c) for c in nx.connected_components(graph))
        raise DeviceError(f"the device graph is disconnected ({len(parts)} parts: {parts}); routing needs one "
                          f"connected graph")
    return graph


def edges_of(graph: Any) -> tuple[tuple[int, int], ...]:
    """The sorted integer edge list of a user's networkx graph or edge list (nodes relabelled 0…n−1 in sorted
    order, so a graph of strings or tuples is accepted too)."""
    if isinstance(graph, nx.Graph):
        if graph.is_directed():
            graph = graph.to_undirected()
        isolated = [n for n in graph.nodes() if graph.degree(n) == 0]
        if isolated:
            raise DeviceError(f"the device graph is disconnected: qubits {isolated} have no coupling")
        try:
            order = sorted(graph.nodes())
        except TypeError:
            order = list(graph.nodes())
        relabelled = _relabelled(graph, order)
    else:
        relabelled = edge_graph(graph)
    return tuple(sorted(tuple(sorted(e)) for e in relabelled.edges()))
