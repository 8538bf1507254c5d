import json

import numpy as np
import pytest

import groundkit as gk
from groundkit.studies import ScanInputError, ScanResult, load_scan

from .helpers import assert_same_scan, h2

VALUES = [0.6, 0.7, 0.8, 0.9]


@pytest.fixture(scope="module")
def scan() -> ScanResult:
    return gk.Pipeline().trial_state(gk.UCCSD()).scan(h2, VALUES)


def test_table_has_a_row_per_point_with_every_column(scan):
    table = scan.table
    assert list(table["value"]) == VALUES
    for column in ("energy", "reference", "error", "error_mha", "hf", "ccsd", "converged", "parameters",
                   "wall_time", "start", "orbital_match", "failure"):
        assert column in table
    assert "stderr" not in table  # exact estimator: no standard error
    assert table["converged"].all() and table["failure"].isna().all()
    assert list(table["start"])[0] == "cold" and all(s.startswith("warm") for s in list(table["start"])[1:])


def test_each_point_equals_a_single_run(scan):
    for point in scan.points:
        single = gk.Pipeline(h2(point.value)).trial_state(gk.UCCSD()).run()
        assert point.result.energy == pytest.approx(single.energy, abs=1e-9)
        # internal consistency: the scan point and the single run share one reference (PySCF checks: test_cli.py)
        assert point.result.reference.energy == pytest.approx(single.reference.energy, abs=1e-12)


def test_save_and_load_give_the_same_scan(scan, tmp_path):
    path = tmp_path / "scan.json"
    scan.save(str(path))
    again = load_scan(path)
    assert_same_scan(scan.table, again.table, atol=0)
    assert again.configuration == scan.configuration and again.warm_start == scan.warm_start
    assert json.loads(path.read_text())["schema"] == "groundkit.scan-result"


def test_loading_refuses_other_files(scan, tmp_path):
    result_file = tmp_path / "result.json"
    scan.points[0].result.save(str(result_file))
    with pytest.raises(gk.ResultFileError, match="schema"):
        load_scan(result_file)
    scan_file = tmp_path / "scan.json"
    scan.save(str(scan_file))
    scan_file.write_text(scan_file.read_text()[:200])
    with pytest.raises(gk.ResultFileError, match="truncated"):
        load_scan(scan_file)


def test_a_failing_builder_is_recorded_and_the_scan_goes_on():
    def geometry(r):
        if r < 0.2:
            raise ValueError(f"no molecule at {r}")
        return h2(r)

    scan = gk.Pipeline().scan(geometry, [0.1, 0.05, 0.7], warm_start=False)
    assert [p.ok for p in scan.points] == [False, False, True]
    assert "no molecule at 0.1" in scan.points[0].failure
    assert np.isnan(scan.table["energy"][0]) and scan.failures[0.1].startswith("geometry(0.1) raised")


def test_a_failing_run_is_recorded_and_the_chain_restarts_cold():
    # 0.05 Å is below MoleculeSpec's closest allowed distance: the builder's error is recorded
    scan = gk.Pipeline().scan(h2, [0.7, 0.05, 0.8])
    assert scan.points[1].failure.startswith("geometry(0.05) raised GeometryError")
    assert scan.points[2].start == "cold"


def test_warm_start_chains():
    scan = gk.Pipeline().scan(h2, VALUES, warm_start=2)
    starts = [p.start.split()[0] for p in scan.points]
    assert starts == ["cold", "warm", "cold", "warm"]
    assert scan.warm_start == "2 chains"


def test_bad_input_is_refused():
    pipeline = gk.Pipeline()
    with pytest.raises(ScanInputError, match="values is empty"):
        pipeline.scan(h2, [])
    with pytest.raises(ScanInputError, match="must return a groundkit MoleculeSpec"):
        pipeline.scan(lambda r: f"H 0 0 0; H 0 0 {r}", [0.7])
    with pytest.raises(ScanInputError, match="finite real number"):
        pipeline.scan(h2, [0.7, "0.8"])
    with pytest.raises(ScanInputError, match="not callable"):
        pipeline.scan("h2", [0.7])
    with pytest.raises(ScanInputError, match="warm_start"):
        pipeline.scan(h2, [0.7], warm_start=0)
    assert issubclass(ScanInputError, ValueError)


def test_analysis_refuses_what_it_cannot_do(scan):
    from groundkit.studies import AnalysisError

    short = gk.Pipeline().scan(h2, [0.7, 0.8], warm_start=False)
    with pytest.raises(AnalysisError, match="at least 4"):
        short.equilibrium()
    edge = gk.Pipeline().scan(h2, [1.0, 1.1, 1.2, 1.3], warm_start=False)
    with pytest.raises(AnalysisError, match="no minimum inside"):
        edge.equilibrium()


def test_plot_draws_the_curve(scan):
    import matplotlib

    matplotlib.use("Agg")
    ax = scan.plot()
    assert len(ax.lines) == 3  # reference, hf, trial state
