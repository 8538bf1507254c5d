"""Compact excitation circuits after Yordanov, Arvidsson-Shukur and Barnes, Phys. Rev. A 102, 062612 (2020).

A qubit excitation rotates one pair of basis states and leaves every other basis state alone:

- single, qubits (a, c): exp(θ·(Q†_c·Q_a − Q†_a·Q_c)) turns |1_a 0_c⟩ into cos θ·|10⟩ + sin θ·|01⟩;
- double, qubits (r1, r2 → p1, p2): exp(θ·(Q†_p1·Q†_p2·Q_r2·Q_r1 − h.c.)) turns |1100⟩ into cos θ·|1100⟩ +
  sin θ·|0011⟩ (Q = |0⟩⟨1| on a qubit).

The fermionic excitation exp(θ·(τ − τ†)) under Jordan–Wigner is the same rotation with the angle's sign set by
the parity of the spin orbitals its Jordan–Wigner strings cross (the set ``S`` of :func:`jordan_wigner_sign`);
Yordanov et al. add that parity with CNOT ladders. Our constructions (checked against the dense exponentials in
``tests/circuits/test_compact.py``):

- **single** (2 CNOTs): a basis change, CNOT(a→c), Rx(−θ) on a and Rz(θ) on c, CNOT(a→c), the undo; the
  two-qubit part has two non-zero Cartan coefficients, so two CNOTs are the fewest (Shende, Markov and
  Bullock, Phys. Rev. A 69, 062321 (2004), from memory). Parity: one CZ(s, a) per
  spin orbital s in S before and after (Z_a flips the rotation's sign): 2 + 2|S| two-qubit gates.
- **double** (13 two-qubit gates, the published count): three CNOTs from r1 move the pair onto a single qubit
  (r1) with the other three fixed at (0, 1, 1); an eight-fold uniformly controlled Ry (Gray-code order, angles
  ±θ/4, CZ entanglers) rotates r1 only under that pattern; three CNOTs undo the move. The last CZ(r2, r1) and
  the undo's CNOT(r1→r2) share the control r1 and merge into S†_r1·CY(r1→r2), one CNOT: 3 + 8 + 3 − 1 = 13.
  Parity: one CZ(s, r1) per s in S before and after the whole (Z_r1 flips the generator's sign): 13 + 2|S|.
  Within circuits of CNOTs and Ry's alone a breadth-first search over all 4-qubit CNOT frames gives 14 as the
  fewest; the merge needs the CZ/CY (S-gate) freedom.
"""

from __future__ import annotations

from collections.abc import Sequence

from .steps import Step, cnot, cz, one

# Gray-code order of the controls (x, y, z) of the uniformly controlled rotation: the controls flipped before
# each of the eight Ry's after the first, and the frame (controls XOR-ed into the target) seen by each Ry.
_GRAY_FLIPS = (2, 1, 2, 0, 2, 1, 2, 0)
assert _GRAY_FLIPS[-1] == 0  # the last entangler is on controls[0] = r2, merged with the undo in qubit_double
_FRAMES = ((), (2,), (1, 2), (1,), (0, 1), (0, 1, 2), (0, 2), (0,))


def qubit_single(annihilated: int, created: int, angle: float, *, parity: Sequence[int] = (),
                 variable: bool = True) -> list[Step]:
    """Steps of exp(±angle·(Q†_c·Q_a − Q†_a·Q_c)), sign (−1)^(parity of the qubits in ``parity``); radians."""
    a, c = int(annihilated), int(created)
    flips = [cz(s, a) for s in parity]
    body = [one("h", a), one("s", a), one("h", c), one("s", c), one("h", c), cnot(a, c),
            one("rx", a, -angle, variable), one("rz", c, angle, variable), cnot(a, c),
            one("sdg", a), one("h", a), one("h", c), one("sdg", c), one("h", c)]
    return flips + body + flips[::-1]  # the CZs commute; mirrored, equal ones of a neighbour can cancel


def qubit_double(annihilated: Sequence[int], created: Sequence[int], angle: float, *,
                 parity: Sequence[int] = (), variable: bool = True) -> list[Step]:
    """Steps of exp(±angle·(Q†_p1·Q†_p2·Q_r2·Q_r1 − h.c.)), sign (−1)^(parity of the qubits in ``parity``)."""
    r1, r2 = (int(q) for q in annihilated)
    p1, p2 = (int(q) for q in created)
    target, controls, pattern = r1, (r2, p1, p2), (0, 1, 1)
    move = [cnot(target, q) for q in (p1, p2, r2)]  # commuting; p1, p2 first so a neighbour's undo cancels them
    flips = [cz(s, target) for s in parity]  # Z on r1 flips the generator's sign; outside the move
    # in the moved frame the pair is |t=1, w⟩ (the occupied side) and |t=0, w⟩; Ry(−2θ)|1⟩ = cos θ|1⟩ + sin θ|0⟩
    rotation: list[Step] = []
    for frame, flip in zip(_FRAMES, _GRAY_FLIPS):
        sign = (-1) ** sum(pattern[k] for k in frame)
        rotation.append(one("ry", target, sign * (-2.0 * angle) / 8.0, variable))
        rotation.append(cz(controls[flip], target))
    # CZ entanglers (Z on the target, like X, flips the Ry's sign, so the Gray-code frames keep their signs); the
    # last one, CZ(r2, t), then CNOT(t→r2) of the undo is |1⟩⟨1|_t ⊗ X·Z = S†_t · CY(t→r2): one CNOT with S gates
    # (13 in all; the Gray code's last entangler is on controls[0] = r2)
    merged = [one("sdg", r2), cnot(target, r2), one("s", r2), one("sdg", target)]
    undo = [cnot(target, p2), cnot(target, p1)]
    return flips + move + rotation[:-1] + merged + undo + flips[::-1]


def _apply(term: tuple[tuple[int, int], ...], occupied: set[int]) -> int:
    """Sign of a fermion operator term (rightmost acts first) on a basis state, Jordan–Wigner order; 0 if it
    annihilates the state."""
    sign = 1
    occupied = set(occupied)
    for mode, action in reversed(term):
        if (mode in occupied) != (action == 0):
            return 0
        sign *= (-1) ** sum(1 for k in occupied if k < mode)
        occupied.symmetric_difference_update({mode})
    return sign


def jordan_wigner_sign(creators: Sequence[int], annihilators: Sequence[int]) -> tuple[int, tuple[int, ...]]:
    """``(σ, S)`` with τ|n⟩ = σ·(−1)^(Σ_{k∈S} n_k)·|n'⟩ for every basis state that τ does not annihilate.

    τ = a†_{c0}…a_{a0}… in OpenFermion's order. A spin orbital k outside the excitation enters the sign once per
    operator of τ with index above k (the Jordan–Wigner string of a_j covers the modes below j), so S holds the
    modes crossed by an odd number of strings; σ is the sign on the state with only the annihilated modes filled.
    """
    involved = set(creators) | set(annihilators)
    top = max(involved)
    parity = tuple(k for k in range(top) if k not in involved and sum(1 for j in involved if j > k) % 2 == 1)
    term = tuple((p, 1) for p in creators) + tuple((q, 0) for q in annihilators)
    sigma = _apply(term, set(annihilators))
    return sigma, parity


def jordan_wigner_excitation(creators: Sequence[int], annihilators: Sequence[int], angle: float,
                             variable: bool = True) -> list[Step] | None:
    """Compact steps of exp(angle·(τ − τ†)) on a Jordan–Wigner register (qubit k = spin orbital k), or None for
    excitations of rank above two (those fall back to Pauli-string exponentials)."""
    if len(creators) not in (1, 2):
        return None
    sigma, parity = jordan_wigner_sign(creators, annihilators)
    if len(creators) == 1:
        return qubit_single(annihilators[0], creators[0], sigma * angle, parity=parity, variable=variable)
    return qubit_double(annihilators, creators, sigma * angle, parity=parity, variable=variable)

