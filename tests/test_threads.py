"""One BLAS/OpenMP thread for small problems; the environment's threads otherwise."""

from __future__ import annotations

import pickle

from threadpoolctl import threadpool_info

import groundkit as gk
from groundkit import threads


def _max_threads() -> int:
    return max(int(lib["num_threads"]) for lib in threadpool_info())


def test_a_small_problem_runs_on_one_thread_and_the_limit_is_lifted_after(h2_bohr):
    seen = []
    before = _max_threads()
    gk.Pipeline(h2_bohr).run(callback=lambda record: seen.append(_max_threads()))
    assert seen and set(seen) == {1}  # threadpoolctl's own report of every loaded BLAS/OpenMP library
    assert _max_threads() == before
    with threads.one_thread_if(False):
        assert _max_threads() == before


def test_size_rule():
    assert threads.is_small(441, 7) and not threads.is_small(853_776) and not threads.is_small(10, 200)


def test_a_run_leaves_its_baselines_to_the_first_read_and_pickles_them_as_a_dict(h2_bohr, monkeypatch):
    spec = gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.8)), basis="sto-3g")
    gk.workspace().discard("problem", (spec, gk.ActiveSpace()))
    result = gk.Pipeline(spec).run()
    problem = gk.Pipeline(spec).problem()
    assert "ccsd" not in problem.baselines._values  # nothing correlated computed by the run itself
    values = dict(result.baselines)
    assert values == {m: problem.baselines[m] for m in problem.baselines}  # internal consistency
    assert result.baselines == values and values["fci"] is not None
    copy = pickle.loads(pickle.dumps(result))
    assert type(copy.baselines) is dict and copy == result
