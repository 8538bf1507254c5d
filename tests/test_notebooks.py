"""Every notebook in notebooks/ runs top to bottom (stored without outputs)."""

from pathlib import Path

import nbformat
import pytest
from nbclient import NotebookClient

NOTEBOOKS = sorted((Path(__file__).resolve().parent.parent / "notebooks").glob("*.ipynb"))


@pytest.mark.parametrize("path", NOTEBOOKS, ids=[p.name for p in NOTEBOOKS])
def test_notebook_runs(path):
    nb = nbformat.read(path, as_version=4)
    assert all(not cell.get("outputs") for cell in nb.cells if cell.cell_type == "code"), "store without outputs"
    NotebookClient(nb, timeout=600, kernel_name="python3", resources={"metadata": {"path": str(path.parent)}}).execute()
    assert any(cell.get("outputs") for cell in nb.cells if cell.cell_type == "code")


def test_there_are_notebooks():
    assert NOTEBOOKS
