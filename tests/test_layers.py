"""The import layers (DEVELOPERS.md, "Layers"): checked by import-linter's own layers contract in .importlinter."""

from __future__ import annotations

from pathlib import Path

from importlinter.cli import lint_imports

import groundkit as gk

CONFIG = Path(__file__).resolve().parents[1] / ".importlinter"


def test_no_module_imports_a_higher_layer():
    assert lint_imports(config_filename=str(CONFIG), no_cache=True, no_logo=True) == 0  # import-linter


def test_the_contract_catches_an_upward_import(tmp_path):
    text = CONFIG.read_text()
    broken = text.replace("    groundkit.device.profile -> groundkit.components\n", "")  # a real upward import left
    assert broken != text
    (tmp_path / "contract.ini").write_text(broken)
    assert lint_imports(config_filename=str(tmp_path / "contract.ini"), no_cache=True, no_logo=True) != 0


def test_lower_layers_display_through_late_bound_providers(h2_bohr):
    assert "<table" in h2_bohr._repr_html_() and isinstance(h2_bohr.pipeline(), gk.Pipeline)
    assert "H2" in gk.Pipeline(h2_bohr).problem()._repr_html_()
