"""Device profiles: connectivity graphs against networkx's own constructions, native gates, bad input, records."""

from __future__ import annotations

import networkx as nx
import pytest

import groundkit as gk
from groundkit.component import component_from_dict
from groundkit.device import BUILTIN_DEVICES, DeviceProfile, ErrorFigures, GateDurations
from groundkit.errors import DeviceError
from groundkit.registry import build


@pytest.mark.parametrize("options, reference", [
    ({"connectivity": "line", "size": 6}, nx.path_graph(6)),
    ({"connectivity": "ring", "size": 5}, nx.cycle_graph(5)),
    ({"connectivity": "grid", "size": (3, 4)}, nx.grid_2d_graph(3, 4)),
    ({"connectivity": "all-to-all", "size": 5}, nx.complete_graph(5)),
])
def test_named_kinds_are_the_textbook_graphs(options, reference):
    profile = DeviceProfile(name="t", **options)
    assert profile.n_qubits == reference.number_of_nodes()
    assert nx.is_isomorphic(profile.graph, reference)  # networkx's generators (reference library)
    assert sorted(profile.graph.nodes()) == list(range(profile.n_qubits))


def test_heavy_hex_is_the_hexagonal_lattice_with_a_qubit_on_every_edge():
    for rows, columns in ((1, 1), (2, 2), (1, 3)):
        lattice = nx.hexagonal_lattice_graph(rows, columns)  # networkx (reference library)
        heavy = DeviceProfile(name="hh", connectivity="heavy-hex", size=(rows, columns)).graph
        assert heavy.number_of_nodes() == lattice.number_of_nodes() + lattice.number_of_edges()
        assert heavy.number_of_edges() == 2 * lattice.number_of_edges()
        assert {d for _, d in heavy.degree()} <= {2, 3}  # heavy-hex: every qubit has 2 or 3 couplings (from memory)
        # subdividing every edge once: contracting the degree-2 qubits gives the lattice back (for these sizes the
        # lattice's own degree-2 corners are kept as corners, so count cycles instead): girth 12 = 2 × hexagon
        assert nx.girth(heavy) == 12
    assert DeviceProfile(name="hh", connectivity="heavy-hex", size=(1, 1)).n_qubits == 12  # 6 + 6


def test_a_user_graph_or_edge_list():
    star = DeviceProfile.from_graph(nx.star_graph(4), name="star")
    assert star.connectivity == "graph" and star.n_qubits == 5 and star.graph.number_of_edges() == 4
    named = nx.Graph([("a", "b"), ("b", "c")])
    assert DeviceProfile.from_graph(named).edges == ((0, 1), (1, 2))  # nodes relabelled in sorted order
    edges = DeviceProfile(name="e", connectivity="graph", size=None, edges=[[3, 1], [1, 2]])
    assert edges.edges == ((0, 1), (0, 2)) and edges.n_qubits == 3  # 1, 2, 3 -> 0, 1, 2
    assert component_from_dict(edges.to_dict()) == edges


def test_native_gates_use_cirqs_target_gatesets():
    import cirq

    assert isinstance(DeviceProfile(native_gate="cz").gateset, cirq.CZTargetGateset)
    assert isinstance(DeviceProfile(native_gate="sqrt-iswap").gateset, cirq.SqrtIswapTargetGateset)
    assert DeviceProfile(native_gate="cnot").two_qubit_gate == cirq.CNOT


@pytest.mark.parametrize("options, words", [
    ({"connectivity": "graph", "size": None, "edges": [(0, 1), (2, 3)]}, "disconnected"),
    ({"connectivity": "graph", "size": None, "edges": nx.Graph([(0, 1), (2, 3)])}, "disconnected"),
    ({"native_gate": "iswap"}, "native_gate must be one of 'cnot', 'cz', 'sqrt-iswap'"),
    ({"connectivity": "torus"}, "connectivity must be one of"),
    ({"connectivity": "grid", "size": 4}, r"needs size=\(rows, columns\)"),
    ({"connectivity": "line", "size": 0}, "an integer >= 1"),
    ({"connectivity": "ring", "size": 2}, "an integer >= 3"),
    ({"connectivity": "graph", "size": None}, "needs edges"),
    ({"connectivity": "line", "size": 3, "edges": [(0, 1)]}, "edges are given only with connectivity='graph'"),
    ({"connectivity": "graph", "size": None, "edges": [(0, 0), (0, 1)]}, "joins a qubit to itself"),
    ({"durations": "errors"}, "durations must be a GateDurations"),  # the registered error figures
    ({"name": ""}, "name must be a non-empty string"),
])
def test_bad_profiles_are_refused(options, words):
    with pytest.raises(DeviceError, match=words):
        DeviceProfile(**options)


def test_negative_durations_and_disconnected_graphs_are_device_errors():
    with pytest.raises(DeviceError, match="two_qubit"):
        DeviceProfile(durations=GateDurations(two_qubit=-5.0))
    isolated = nx.Graph([(0, 1)])
    isolated.add_node(2)
    with pytest.raises(DeviceError, match="disconnected"):
        DeviceProfile.from_graph(isolated)


def test_builtins_are_illustrative_profiles_of_our_own():
    for name in BUILTIN_DEVICES:
        profile = build("device", name)
        assert profile.name == name and nx.is_connected(profile.graph)
        assert isinstance(profile.errors, ErrorFigures) and isinstance(profile.durations, GateDurations)
        assert component_from_dict(profile.to_dict()) == profile
    assert gk.Pipeline().device("heavy-hex-35").device_profile.n_qubits == 35
