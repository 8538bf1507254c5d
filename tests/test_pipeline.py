import pytest

import groundkit as gk


def test_chaining_returns_new_pipelines(h2o):
    p = gk.Pipeline(h2o)
    q = p.active_space(electrons=4, orbitals=4)
    assert q is not p
    assert p.components["active_space"] is None
    assert q.components["active_space"] == gk.ActiveSpace(electrons=4, orbitals=4)
    assert "electrons=4" in repr(q)


def test_problem_is_shared_between_equal_pipelines(h2o):
    a = h2o.pipeline().active_space(electrons=4, orbitals=4).problem()
    b = gk.Pipeline(h2o).active_space(gk.ActiveSpace(electrons=4, orbitals=4)).problem()
    assert a is b


def test_problem_attributes(h2o):
    problem = h2o.pipeline().active_space(electrons=4, orbitals=4).problem()
    assert (problem.n_qubits, problem.n_electrons, problem.n_orbitals) == (8, 4, 4)
    assert problem.h1.shape == (4, 4) and problem.h2.shape == (4, 4, 4, 4)
    assert problem.n_determinants == 36  # C(4,2)^2
    assert "exact reference" in problem.summary()


def test_pipeline_without_molecule_says_so():
    with pytest.raises(gk.ComponentError, match="no molecule"):
        gk.Pipeline().active_space(electrons=2, orbitals=2).problem()


def test_bad_components_are_refused(h2o):
    with pytest.raises(gk.ComponentError):
        gk.Pipeline("H2")
    with pytest.raises(gk.ComponentError):
        gk.Pipeline(h2o).active_space(gk.ActiveSpace(), electrons=2)


def test_demo_runs(capsys):
    from groundkit import demo

    demo.main()
    out = capsys.readouterr().out
    assert "exact reference" in out and "multiplicity 2" in out and "ccsd(t)" in out
