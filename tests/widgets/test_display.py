"""Rich HTML of molecules, problems, results and scans; PNG files of results and scans."""

from __future__ import annotations

import numpy as np
import pytest

import groundkit as gk

from .conftest import hydrogen

pytestmark = pytest.mark.filterwarnings("ignore::groundkit.DegenerateBoundaryWarning")


@pytest.fixture(scope="module")
def scan():
    return gk.Pipeline().scan(hydrogen, [0.6, 0.7, 0.8, 0.9, 1.0])


def test_molecule_html_has_formula_charge_multiplicity_basis_and_geometry():
    mol = gk.MoleculeSpec(symbols=("O", "H"), coordinates=((0, 0, 0), (0, 0, 0.97)), charge=-1, basis="6-31g")
    text = mol._repr_html_()
    for part in ("HO", "-1", "6-31g", "multiplicity", "0.970000", "x / Å"):
        assert part in text
    assert len(repr(mol)) < 120


def test_problem_html_marks_the_active_orbitals(lih_pipeline):
    problem = lih_pipeline.problem()
    text = problem._repr_html_()
    assert text.count("● active") == problem.n_orbitals
    assert text.count(">core<") == len(problem.active_orbitals.core)
    assert f"{problem.reference.energy:.8f}" in text
    for name in problem.baselines:
        assert f">{name}<" in text


def test_result_html_has_reference_error_verdict_and_resources(lih_pipeline):
    result = lih_pipeline.run()
    text = result._repr_html_()
    assert f"{result.reference.energy:.10f}" in text
    assert f"{1000 * result.error:+.4f}" in text
    assert "✔ within" in text and "chemical accuracy" in text
    assert "two qubit gates" in text and str(result.resources.two_qubit_gates) in text
    assert len(repr(result)) < 160


@pytest.mark.slow  # the scan takes a few seconds
def test_scan_html_has_curve_and_table(scan):
    text = scan._repr_html_()
    assert "data:image/png;base64," in text
    assert text.count("<tr>") == len(scan.points) + 1


def _drawn(path) -> float:
    import matplotlib.image

    pixels = matplotlib.image.imread(str(path))
    return float(np.std(pixels[..., :3]))


def test_result_plot_saves_a_png(lih_pipeline, tmp_path):
    path = lih_pipeline.run().plot(tmp_path / "run.png")
    assert open(path, "rb").read(8) == b"\x89PNG\r\n\x1a\n"
    assert _drawn(path) > 0.05


@pytest.mark.slow
def test_scan_plot_saves_a_png_and_still_draws_on_axes(scan, tmp_path):
    path = scan.plot(str(tmp_path / "scan.png"))
    assert _drawn(path) > 0.05
    from matplotlib.figure import Figure

    ax = Figure().subplots()
    assert scan.plot(ax) is ax
