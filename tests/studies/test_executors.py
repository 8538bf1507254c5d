import concurrent.futures as cf
import os
import signal
import time

import pytest

import groundkit as gk
from groundkit.studies import ExecutorError

from .faults import session_processes, start_scan
from .helpers import assert_same_scan, h2

VALUES = [0.6, 0.7, 0.8, 0.9]


@pytest.fixture(scope="module")
def serial_tables():
    pipeline = gk.Pipeline().trial_state(gk.UCCSD())
    return {warm: pipeline.scan(h2, VALUES, warm_start=warm).table for warm in (False, 2)}


@pytest.mark.slow
def test_local_processes_give_the_serial_table(serial_tables):
    pipeline = gk.Pipeline().trial_state(gk.UCCSD())
    for warm, table in serial_tables.items():
        parallel = pipeline.scan(h2, VALUES, warm_start=warm, executor="processes")
        assert_same_scan(table, parallel.table, atol=1e-9, same_process=False)


def test_a_callers_executor_is_used_and_left_open(serial_tables):
    with cf.ThreadPoolExecutor(max_workers=2) as pool:
        threaded = gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, VALUES, warm_start=False, executor=pool)
        assert pool.submit(lambda: 1).result() == 1  # still open
    assert_same_scan(serial_tables[False], threaded.table, atol=1e-9)


@pytest.mark.slow
def test_a_dask_local_cluster_of_two_processes_gives_the_serial_table(serial_tables):
    distributed = pytest.importorskip("distributed")
    cluster = distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=True, host="127.0.0.1",
                                       dashboard_address=None)
    try:
        with distributed.Client(cluster) as client:
            pipeline = gk.Pipeline().trial_state(gk.UCCSD())
            for warm, table in serial_tables.items():
                on_cluster = pipeline.scan(h2, VALUES, warm_start=warm, executor=client)
                assert_same_scan(table, on_cluster.table, atol=1e-9, same_process=False)
    finally:
        cluster.close()


def test_an_unknown_executor_is_refused():
    with pytest.raises(ExecutorError, match="'threads' is not accepted"):
        gk.Pipeline().scan(h2, [0.7], executor="threads")


@pytest.mark.slow
@pytest.mark.skipif(not os.path.isdir("/proc/self"), reason="reads the process table from Linux's /proc")
def test_process_workers_exit_when_their_parent_is_killed(tmp_path):
    directory = tmp_path / "checkpoint"
    values = [round(0.5 + 0.05 * k, 2) for k in range(16)]
    parent = start_scan(directory, values, executor="processes", warm="false", new_session=True)
    try:
        deadline = time.monotonic() + 120
        while time.monotonic() < deadline and parent.poll() is None and not list(directory.glob("point-*.json")):
            time.sleep(0.05)  # the workers are running points
        assert parent.poll() is None, parent.stderr.read()
        others = [pid for pid, _ in session_processes(parent.pid) if pid != parent.pid]
        assert len(others) >= 2, others  # two workers (and multiprocessing's resource tracker)
        os.kill(parent.pid, signal.SIGKILL)
        parent.wait()
        deadline = time.monotonic() + 10
        while session_processes(parent.pid) and time.monotonic() < deadline:
            time.sleep(0.1)
        assert session_processes(parent.pid) == []  # no worker, no resource tracker left behind
    finally:
        for pid, _ in session_processes(parent.pid):
            os.kill(pid, signal.SIGKILL)
