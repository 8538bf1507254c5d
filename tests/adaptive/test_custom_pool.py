"""The pool example of docs/adaptive.md, read from the document and run."""

from __future__ import annotations

import re
from pathlib import Path

DOC = Path(__file__).parents[2] / "docs" / "adaptive.md"


def test_documented_pool_runs(h4_stretched, h4_exact):
    text = DOC.read_text()
    section = text[text.index("### Adding a pool"):]
    code = re.search(r"```python\n(.*?)```", section, re.S).group(1)
    namespace: dict = {"pipeline": h4_stretched}
    exec(compile(code, str(DOC), "exec"), namespace)
    result = namespace["result"]
    assert result.growth and result.stop_reason
    assert all(len(op[0]) == 2 for step in result.growth[1:] for op in step["operators"])  # pair moves only
    assert result.energy < h4_exact.hf - 0.01  # below PySCF's RHF energy of the same chain (reference library)
    assert result.energy >= h4_exact.exact - 1e-10  # and not below PySCF's FCI energy (variational principle)
