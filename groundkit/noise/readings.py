"""Energies from noisy states: measurement groups read through the assignment matrices, with optional tensored
readout mitigation and symmetry post-selection; exact expectations or finite shots.

A *state* is a density matrix (2^n × 2^n) or a list of trajectory statevectors of shape (2^n, 2^m). For each group
the state is (optionally) projected onto the right N and Sz (keep probability Tr Πρ), rotated so the group is
measured in Z, and read through A = ⊗ A_q.

Standard errors. Density matrix with shots: Σ_g s_g²/N_g over the kept shots. Trajectories: each trajectory k gets
the same number of shots per group; per group the estimate is R_g = Σ_k S_kg / Σ_k C_kg (S: sum of kept shot
values, C: kept shots), and the standard error is that of the ratio estimator over the K independent
trajectories, sqrt(var_k(r_k)/K) with r_k = Σ_g (S_kg − R_g C_kg)/C̄_g (delta method; common practice, no
single source). It holds the shot noise and the spread between trajectories alike.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..errors import NoiseError
from .readout import apply_per_qubit, shot_values, term_transfer

_H = np.array([[1, 1], [1, -1]], dtype=complex) / np.sqrt(2)
ROTATION = {"X": _H, "Y": _H @ np.diag([1, -1j]), "Z": np.eye(2, dtype=complex)}


@dataclass(frozen=True)
class Reading:
    """An energy (Ha), its standard error (Ha), the kept fraction of shots (or of probability) and the shots."""

    energy: float
    standard_error: float
    kept_fraction: float
    shots: int | None


class GroupReader:
    """Reads measurement groups of one register from noisy states."""

    def __init__(self, constant: float, groups: list, n_qubits: int, assignment: list[np.ndarray],
                 weights: list[np.ndarray] | None = None, mask: np.ndarray | None = None) -> None:
        self.constant, self.groups, self.n = constant, groups, n_qubits
        self.assignment, self.weights, self.mask = assignment, weights, mask
        self.transfer = term_transfer(assignment, weights)

    # probabilities ---------------------------------------------------------------------------------------
    def true_probabilities(self, state: np.ndarray, basis: dict[int, str], density: bool) -> np.ndarray:
        """Unnormalised outcome probabilities (projected when a mask is set) in the group's basis, before readout;
        their sum is the kept probability."""
        n = self.n
        if density:
            rho = state
            if self.mask is not None:
                rho = rho * self.mask[:, None] * self.mask[None, :]
            tensor = rho.reshape((2,) * (2 * n))
            for q, op in basis.items():
                if op != "Z":
                    r = ROTATION[op]
                    tensor = np.moveaxis(np.tensordot(r, tensor, axes=([1], [q])), 0, q)
                    tensor = np.moveaxis(np.tensordot(r.conj(), tensor, axes=([1], [n + q])), 0, n + q)
            p = np.real(np.diagonal(tensor.reshape(2 ** n, 2 ** n)))
        else:
            psi = state if self.mask is None else state * self.mask[:, None]
            tensor = psi.reshape((2,) * n + (psi.shape[1],))
            for q, op in basis.items():
                if op != "Z":
                    tensor = np.moveaxis(np.tensordot(ROTATION[op], tensor, axes=([1], [q])), 0, q)
            p = np.sum(np.abs(tensor.reshape(2 ** n, -1)) ** 2, axis=1)
        return np.clip(p, 0.0, None)

    def _group_expectation(self, p: np.ndarray, group) -> float:
        g = apply_per_qubit(p.reshape((2,) * self.n), self.transfer).reshape(-1)
        return float(np.real(g[group.masks] @ group.coefficients))

    def _values(self, outcomes: np.ndarray, group) -> np.ndarray:
        if self.weights is None:
            return group.values(outcomes)
        return shot_values(outcomes, group.masks, group.coefficients, self.n, self.weights)

    def _read_shots(self, rng: np.random.Generator, p: np.ndarray, count: int) -> tuple[np.ndarray, np.ndarray]:
        """(distinct read outcomes, their counts) of ``count`` shots: true outcomes drawn from ``p``, then each
        bit read through its qubit's assignment matrix (independent per qubit, as A = ⊗ A_q says)."""
        true = rng.multinomial(count, p / p.sum())
        outcomes = np.repeat(np.flatnonzero(true), true[true > 0])
        shifts = self.n - 1 - np.arange(self.n)
        bits = (outcomes[:, None] >> shifts[None, :]) & 1
        flip_probability = np.array([[a[1, 0], a[0, 1]] for a in self.assignment])  # P(flip | true 0), (| true 1)
        chance = flip_probability[np.arange(self.n)[None, :], bits]
        bits = bits ^ (rng.random(bits.shape) < chance)
        read = bits @ (1 << shifts)
        seen, counts = np.unique(read, return_counts=True)
        return seen.astype(np.int64), counts

    # exact expectations ----------------------------------------------------------------------------------
    def exact(self, states: list[np.ndarray], density: bool) -> Reading:
        """The expectation under the noise (no shots); with trajectories, its standard error over them."""
        numerators, keeps = [], []
        for state in states:
            total, keep = 0.0, None
            for group in self.groups:
                p = self.true_probabilities(state, group.basis, density)
                keep = float(p.sum()) if keep is None else keep
                total += self._group_expectation(p, group)
            keeps.append(1.0 if keep is None else keep)
            numerators.append(total)
        a, b = np.array(numerators), np.array(keeps)
        if b.sum() <= 1e-14:
            raise NoiseError("no probability is left after symmetry post-selection (kept fraction 0): the noisy "
                             "state has no weight with the right electron number and Sz")
        ratio = a.sum() / b.sum()
        stderr = 0.0
        if len(states) > 1:
            residual = (a - ratio * b) / b.mean()
            stderr = float(np.std(residual, ddof=1) / np.sqrt(len(states)))
        return Reading(float(self.constant + ratio), stderr, float(b.mean()), None)

    # shots -----------------------------------------------------------------------------------------------
    def sampled(self, states: list[np.ndarray], density: bool, shots_per_group: np.ndarray,
                rng: np.random.Generator) -> Reading:
        """Energy from ``shots_per_group[g]`` shots of group g on each state (each trajectory)."""
        k_states, n_groups = len(states), len(self.groups)
        sums = np.zeros((k_states, n_groups))
        squares = np.zeros((k_states, n_groups))
        kept = np.zeros((k_states, n_groups))
        for k, state in enumerate(states):
            for g, group in enumerate(self.groups):
                p = self.true_probabilities(state, group.basis, density)
                keep = float(p.sum())
                count = int(shots_per_group[g]) if self.mask is None else \
                    int(rng.binomial(int(shots_per_group[g]), min(max(keep, 0.0), 1.0)))
                if count == 0:
                    continue
                seen, counts = self._read_shots(rng, p / keep, count)
                values = self._values(seen, group)
                sums[k, g] = counts @ values
                squares[k, g] = counts @ (values * values)
                kept[k, g] = count
        total_shots = int(np.sum(shots_per_group)) * k_states
        fraction = float(kept.sum() / total_shots)
        empty = np.flatnonzero(kept.sum(axis=0) == 0)
        if empty.size:
            raise NoiseError(f"no shot of measurement group {int(empty[0])} passed symmetry post-selection "
                             f"(kept fraction {fraction:.3g} of {total_shots} shots): give more shots or less noise")
        per_group = sums.sum(axis=0) / kept.sum(axis=0)
        energy = float(self.constant + per_group.sum())
        if k_states == 1:
            c = kept[0]
            variance = (squares[0] - c * per_group ** 2) / np.maximum(c - 1, 1) / c
            return Reading(energy, float(np.sqrt(np.sum(np.clip(variance, 0.0, None)))), fraction, total_shots)
        residual = ((sums - per_group[None, :] * kept) / kept.mean(axis=0)[None, :]).sum(axis=1)
        stderr = float(np.std(residual, ddof=1) / np.sqrt(k_states))
        return Reading(energy, stderr, fraction, total_shots)
