"""Where tasks run: in this process (serial), in a local process pool, or on a Dask cluster.

``executor`` may be ``None`` or ``"serial"``, ``"processes"`` (a pool of spawned processes, at most
:data:`MAX_LOCAL_WORKERS`, created and shut down here), any ``concurrent.futures.Executor`` the caller owns, or a
``distributed.Client``. Tasks are plain data, answers are plain dicts; the order in which answers arrive never
changes what a study records, because each answer is filed under its own point.

Workers of the ``"processes"`` pool exit when their parent dies (even by SIGKILL): each starts a watchdog thread
(:func:`exit_with_parent`) that waits on the parent's sentinel and checks the parent's process id every
:data:`WATCH_INTERVAL` seconds, then ends the worker with ``os._exit``. Once they are gone, multiprocessing's
resource tracker sees its pipe close and exits too.
"""

from __future__ import annotations

import concurrent.futures as cf
import multiprocessing
import os
import threading
from collections.abc import Callable, Iterator, Sequence
from contextlib import contextmanager
from typing import Any

from .errors import ExecutorError

MAX_LOCAL_WORKERS = 2  # this project's machines have 2 cores
WATCH_INTERVAL = 0.5  # s between two looks of a worker's watchdog at its parent
ORPHAN_EXIT_STATUS = 70  # a worker's exit status once its parent has gone


def exit_with_parent(parent_pid: int, interval: float = WATCH_INTERVAL) -> None:
    """Start a daemon thread that ends this process (``os._exit``) once the process ``parent_pid`` is gone.

    Portable: it waits on ``multiprocessing.parent_process().sentinel`` (ready when the parent dies, on every
    platform) and, where there is no sentinel, notices that ``os.getppid()`` changed (POSIX re-parents orphans)."""
    parent = multiprocessing.parent_process()
    sentinel = None if parent is None else parent.sentinel

    def watch() -> None:
        from multiprocessing.connection import wait

        while True:
            if sentinel is not None:
                if wait([sentinel], timeout=interval):
                    os._exit(ORPHAN_EXIT_STATUS)
            else:
                threading.Event().wait(interval)
            if os.getppid() != parent_pid:
                os._exit(ORPHAN_EXIT_STATUS)

    threading.Thread(target=watch, name="groundkit-parent-watch", daemon=True).start()


class SerialRunner:
    """Runs each task in this process, one at a time, when it is waited for."""

    workers = 1

    def submit(self, fn: Callable[[Any], Any], arg: Any) -> list:
        return [fn, arg]

    def wait_first(self, handles: Sequence[list]) -> list:
        handle = handles[0]
        fn, arg = handle
        handle[:] = [None, fn(arg)]
        return [handle]

    def result(self, handle: list) -> Any:
        return handle[1]


class FuturesRunner:
    """Runs tasks on a ``concurrent.futures.Executor`` (a process pool, usually)."""

    def __init__(self, executor: cf.Executor, workers: int) -> None:
        self.executor = executor
        self.workers = workers

    def submit(self, fn: Callable[[Any], Any], arg: Any) -> cf.Future:
        return self.executor.submit(fn, arg)

    def wait_first(self, handles: Sequence[cf.Future]) -> list:
        done, _ = cf.wait(handles, return_when=cf.FIRST_COMPLETED)
        return [h for h in handles if h in done]

    def result(self, handle: cf.Future) -> Any:
        return handle.result()


class DaskRunner:
    """Runs tasks on the workers of a ``distributed.Client``."""

    def __init__(self, client: Any) -> None:
        self.client = client
        self.workers = max(1, len(client.scheduler_info().get("workers", {})))

    def submit(self, fn: Callable[[Any], Any], arg: Any) -> Any:
        return self.client.submit(fn, arg, pure=False)

    def wait_first(self, handles: Sequence[Any]) -> list:
        from distributed import wait

        done, _ = wait(list(handles), return_when="FIRST_COMPLETED")
        return [h for h in handles if h in done]

    def result(self, handle: Any) -> Any:
        return handle.result()


def _is_dask_client(value: Any) -> bool:
    if not type(value).__module__.startswith("distributed"):
        return False
    from distributed import Client

    return isinstance(value, Client)


@contextmanager
def runner_for(executor: Any) -> Iterator[Any]:
    """A runner for ``executor`` (see the module docstring); a pool created here is shut down on exit."""
    if executor is None or executor == "serial":
        yield SerialRunner()
    elif executor == "processes":
        workers = max(1, min(MAX_LOCAL_WORKERS, os.cpu_count() or 1))
        pool = cf.ProcessPoolExecutor(max_workers=workers, mp_context=multiprocessing.get_context("spawn"),
                                      initializer=exit_with_parent, initargs=(os.getpid(),))
        try:
            yield FuturesRunner(pool, workers)
        finally:
            pool.shutdown(wait=True, cancel_futures=True)
    elif isinstance(executor, cf.Executor):
        yield FuturesRunner(executor, int(getattr(executor, "_max_workers", 1) or 1))
    elif _is_dask_client(executor):
        yield DaskRunner(executor)
    else:
        raise ExecutorError(
            f"executor {executor!r} is not accepted; use None or 'serial', 'processes', a "
            "concurrent.futures.Executor, or a distributed.Client"
        )


def run_chains(
    runner: Any,
    chains: Sequence[Sequence[Any]],
    make_task: Callable[[Any, dict | None], Any],
    on_answer: Callable[[Any, dict], None],
    work: Callable[[Any], dict],
) -> None:
    """Run every chain of items; within a chain each task is made from the previous item's answer.

    The first item of every chain is submitted at once; the next item of a chain follows when its predecessor's
    answer arrives. ``on_answer(item, answer)`` is called in this process as each answer arrives.
    """
    pending: dict[int, tuple[Any, int, int]] = {}
    handles: list[Any] = []

    def submit(chain: int, position: int, previous: dict | None) -> None:
        item = chains[chain][position]
        handle = runner.submit(work, make_task(item, previous))
        pending[id(handle)] = (handle, chain, position)
        handles.append(handle)

    for chain, items in enumerate(chains):
        if items:
            submit(chain, 0, None)
    while handles:
        for handle in runner.wait_first(handles):
            handles[:] = [h for h in handles if h is not handle]
            _, chain, position = pending.pop(id(handle))
            answer = runner.result(handle)
            on_answer(chains[chain][position], answer)
            if position + 1 < len(chains[chain]):
                submit(chain, position + 1, answer)
