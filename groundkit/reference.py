"""The exact reference: lowest eigenstates of the active-space Hamiltonian with the requested N, Sz and S."""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from .occupation_strings import determinant_label, interleaved_signs, make_strings

AMPLITUDE_CUTOFF = 1e-10  # weights |c|^2 below this are left out of ``amplitudes``
MAX_AMPLITUDES = 10_000  # at most this many determinants in ``amplitudes``; the full vector is ``ci``


@dataclass(frozen=True, eq=False)
class ExactState:
    """One eigenstate of the active-space Hamiltonian. Energy in Ha.

    ``ci`` is the PySCF-ordered CI array (alpha strings x beta strings, ascending), phase-fixed so that the
    largest amplitude is positive in the interleaved (OpenFermion) convention.
    """

    energy: float
    spin_square: float
    n_orbitals: int
    n_alpha: int
    n_beta: int
    ci: np.ndarray = field(repr=False)

    @property
    def multiplicity(self) -> int:
        """2S+1 recovered from <S^2> = S(S+1)."""
        spin = 0.5 * (np.sqrt(1.0 + 4.0 * max(self.spin_square, 0.0)) - 1.0)
        return int(round(2 * spin + 1))

    @property
    def n_determinants(self) -> int:
        return int(self.ci.size)

    def interleaved_ci(self) -> np.ndarray:
        """The CI array with each determinant's sign in the interleaved spin-orbital convention."""
        return self.ci * interleaved_signs(*self.strings())

    def strings(self) -> tuple[np.ndarray, np.ndarray]:
        """Alpha and beta occupation strings indexing the rows and columns of ``ci``."""
        return make_strings(self.n_orbitals, self.n_alpha), make_strings(self.n_orbitals, self.n_beta)

    @property
    def amplitudes(self) -> dict[str, float]:
        """Amplitude per determinant label ('2ab0'...), interleaved sign convention, largest weight first."""
        return labelled_amplitudes(self.interleaved_ci(), *self.strings(), self.n_orbitals)


@dataclass(frozen=True, eq=False)
class Reference:
    """The exact ground state in the problem's active space, N, Sz and S, plus any further states asked for."""

    states: tuple[ExactState, ...]
    method: str = ("exact diagonalisation in the active space, restricted to the requested total spin (whole "
                   "determinant block, or Davidson in the spin-projected subspace; PySCF FCI kernels)")

    @property
    def ground(self) -> ExactState:
        return self.states[0]

    @property
    def energy(self) -> float:
        """Exact ground-state energy (Ha) in the active space."""
        return self.ground.energy

    @property
    def multiplicity(self) -> int:
        return self.ground.multiplicity

    @property
    def spin_square(self) -> float:
        return self.ground.spin_square

    @property
    def ci(self) -> np.ndarray:
        return self.ground.ci

    @property
    def amplitudes(self) -> dict[str, float]:
        return self.ground.amplitudes

    @property
    def energies(self) -> tuple[float, ...]:
        return tuple(s.energy for s in self.states)

    def __repr__(self) -> str:
        return (f"Reference(energy={self.energy:.10f} Ha, multiplicity={self.multiplicity}, "
                f"<S^2>={self.spin_square:.6f}, states={len(self.states)})")


def labelled_amplitudes(
    signed_ci: np.ndarray, alpha_strings: np.ndarray, beta_strings: np.ndarray, n_orbitals: int
) -> dict[str, float]:
    """Map determinant label -> amplitude of an interleaved-sign CI array, largest weight first."""
    flat = signed_ci.ravel()
    order = np.argsort(-np.abs(flat), kind="stable")[:MAX_AMPLITUDES]
    n_b = len(beta_strings)
    out: dict[str, float] = {}
    for k in order:
        if flat[k] ** 2 < AMPLITUDE_CUTOFF:
            break
        out[determinant_label(int(alpha_strings[k // n_b]), int(beta_strings[k % n_b]), n_orbitals)] = float(flat[k])
    return out


def make_state(
    energy: float, ci: np.ndarray, spin_square: float, n_orbitals: int, n_alpha: int, n_beta: int
) -> ExactState:
    """An ExactState with a fixed phase: the largest interleaved-convention amplitude is positive."""
    ci = np.array(ci, dtype=float)
    state = ExactState(energy, spin_square, n_orbitals, n_alpha, n_beta, ci)
    signed = state.interleaved_ci().ravel()
    if signed[np.argmax(np.abs(signed))] < 0:
        state = ExactState(energy, spin_square, n_orbitals, n_alpha, n_beta, -ci)
    return state
