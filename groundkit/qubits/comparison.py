"""``compare_mappings``: one table row per mapping, with and without tapering."""

from __future__ import annotations

from typing import Any

from ..mapping import MAPPINGS, QubitMapping


def compare_mappings(pipeline: Any, parameters: Any = None, circuits: bool = True) -> Any:
    """pandas DataFrame: qubits, Pauli terms, largest weight, 1-norm (Ha), QWC groups, symmetries, and, with
    ``circuits``, two-qubit gates and depth of the trial-state circuit at ``parameters`` (default: its start)."""
    import pandas as pd

    rows = []
    for name in MAPPINGS:
        for taper in (False, True):
            branch = pipeline.mapping(QubitMapping(name, taper=taper))
            encoding = branch.encoding()
            stats = branch.pauli_statistics()
            row: dict[str, Any] = {
                "mapping": name, "tapered": taper, "qubits": encoding.n_qubits, "pauli_terms": stats.pauli_terms,
                "largest_weight": stats.largest_weight, "one_norm": stats.one_norm,
                "measurement_groups": stats.measurement_groups,
                "symmetries": ", ".join(encoding.describe()["symmetries"]),
            }
            if circuits:
                from ..circuits.counting import trial_resources

                theta = branch.objective().initial_parameters() if parameters is None else parameters
                row.update(trial_resources(branch, theta))
            rows.append(row)
    return pd.DataFrame(rows)
