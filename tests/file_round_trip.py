"""A pytest plugin (imported by conftest.py): every groundkit file that any test leaves in its ``tmp_path`` must
either be refused with ResultFileError or load, save again and reload equal.

After each test that used ``tmp_path``, the JSON files there (checkpoint directories included) whose ``schema``
names a run result, a scan or a checkpoint point are loaded; a file that loads is saved again and reloaded, and
the two objects must be equal. Files a test damaged on purpose are refused, which is allowed; any other exception
fails the test. The terminal summary says how many files were checked.
"""

from __future__ import annotations

from pathlib import Path

import pytest

import groundkit as gk
from tests.saved_files import reload_equal

KINDS = {"groundkit.run-result": "result", "groundkit.scan-result": "scan", "groundkit.scan-point": "point",
         "groundkit.plan-result": "plan"}
MAX_FILES = 200  # per test; a test writing more is sampled by name order
_counts = {"loaded": 0, "refused": 0}


def _kind(path: Path) -> str | None:
    """The file kind named by the ``"schema"`` near the start of ``path``, or None."""
    try:
        with open(path, encoding="utf-8", errors="replace") as fh:
            head = fh.read(400)
    except OSError:
        return None
    for name, kind in KINDS.items():
        if f'"schema": "{name}"' in head or f'"schema":"{name}"' in head:
            return kind
    return None


def check_folder(folder: Path, scratch: Path) -> None:
    """Round-trip every groundkit file below ``folder`` (see the module docstring), writing copies in ``scratch``."""
    files = sorted(p for p in folder.rglob("*.json") if p.is_file() and scratch not in p.parents)[:MAX_FILES]
    for path in files:
        kind = _kind(path)
        if kind is None:
            continue
        try:
            equal = reload_equal(kind, path, scratch)
        except gk.ResultFileError:
            _counts["refused"] += 1
            continue
        assert equal, f"{path} loaded but did not reload equal after saving it again"
        _counts["loaded"] += 1


@pytest.fixture(autouse=True)
def _saved_files_round_trip(request):
    folder = request.getfixturevalue("tmp_path") if "tmp_path" in request.fixturenames else None
    yield
    if folder is None or not folder.exists():
        return
    scratch = folder / ".round-trip"
    scratch.mkdir(exist_ok=True)
    check_folder(folder, scratch)


def pytest_terminal_summary(terminalreporter) -> None:
    if any(_counts.values()):
        terminalreporter.write_line(f"saved-file round trip: {_counts['loaded']} files loaded, saved and reloaded "
                                    f"equal; {_counts['refused']} refused with ResultFileError (damaged on purpose)")
