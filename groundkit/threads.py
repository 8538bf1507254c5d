"""BLAS and OpenMP threads for small problems: one thread, where threads cost more than they give.

A run on a small problem does many tiny BLAS calls (the minimiser's matrix updates, 441-determinant H·ψ through
PySCF's OpenMP kernels, a CCSD on 7 orbitals). On a busy 2-core machine each threaded call waits for cores held by
other work: CCSD on water in STO-3G ran 6 times slower with the default threads than with one. Below
:data:`SMALL_DETERMINANTS` determinants and :data:`SMALL_BASIS` basis functions a run, and each baseline, is
limited to one thread (threadpoolctl, which sets BLAS and OpenMP libraries alike); larger problems keep the
environment's threads, which they use well.

The limit is process-wide while it holds (that is how BLAS and OpenMP libraries work): threads of a scan that run
small problems at once share it, which is what they need anyway.
"""

from __future__ import annotations

import threading
from collections.abc import Iterator
from contextlib import contextmanager
from typing import Any

SMALL_DETERMINANTS = 100_000  # determinant-space size at or below which a run uses one thread
SMALL_BASIS = 60  # basis functions at or below which a baseline (CCSD, CISD, FCI, ...) uses one thread

_CONTROLLER: list[Any] = []
_LOCK = threading.Lock()


def _controller() -> Any:
    """threadpoolctl's controller, made once (finding the loaded libraries costs milliseconds)."""
    with _LOCK:
        if not _CONTROLLER:
            from pyscf import lib  # noqa: F401  (loads PySCF's OpenMP library so that it is found and limited)
            from threadpoolctl import ThreadpoolController

            _CONTROLLER.append(ThreadpoolController())
        return _CONTROLLER[0]


def is_small(n_determinants: int, n_basis: int | None = None) -> bool:
    """True when a problem of this size runs on one thread."""
    return n_determinants <= SMALL_DETERMINANTS and (n_basis is None or n_basis <= SMALL_BASIS)


@contextmanager
def one_thread_if(small: bool) -> Iterator[None]:
    """Limit BLAS and OpenMP to one thread while the block runs when ``small``; otherwise change nothing."""
    if not small:
        yield
        return
    with _controller().limit(limits=1):
        yield


def problem_threads(problem: Any) -> Any:
    """One thread for a small problem's run (see :func:`is_small`), the environment's threads otherwise."""
    return one_thread_if(is_small(int(problem.n_determinants), int(problem.scf.mo_coeff.shape[0])))
