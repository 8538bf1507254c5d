"""Rich HTML for notebooks: molecules, problems, run results and scans as small plain tables.

Only the standard library and matplotlib (for the scan's curve) are used, so these work without ipywidgets.
"""

from __future__ import annotations

import base64
from dataclasses import fields
from html import escape
from typing import Any

from ..result import CHEMICAL_ACCURACY, verdict_text
from . import palette

_STYLE = ("<style>.gk-box{font-family:sans-serif;font-size:13px;line-height:1.35}"
          ".gk-box table{border-collapse:collapse;margin:4px 0}"
          ".gk-box td,.gk-box th{padding:2px 10px;border-bottom:1px solid #ddd;text-align:right}"
          ".gk-box th{background:#f2f2f2}.gk-box td.l,.gk-box th.l{text-align:left}"
          ".gk-box .gk-active{font-weight:bold}"
          ".gk-box .gk-note{display:inline-block;max-width:420px;text-align:left;font-size:11px;color:#555}"
          "</style>")
VERDICT_MARK = {"within": ("✔", palette.GREEN), "outside": ("✘", palette.VERMILION), "uncertain": ("?", palette.ORANGE)}


def table(header: list[str], rows: list[list[Any]], left: int = 1, row_classes: list[str] | None = None) -> str:
    """An HTML table; the first ``left`` columns are left-aligned."""
    def cell(tag: str, i: int, value: Any) -> str:
        css = " class='l'" if i < left else ""
        return f"<{tag}{css}>{value}</{tag}>"

    head = "".join(cell("th", i, escape(str(h))) for i, h in enumerate(header))
    body = []
    for k, row in enumerate(rows):
        css = f" class='{row_classes[k]}'" if row_classes and row_classes[k] else ""
        body.append(f"<tr{css}>" + "".join(cell("td", i, v) for i, v in enumerate(row)) + "</tr>")
    return f"<table><thead><tr>{head}</tr></thead><tbody>{''.join(body)}</tbody></table>"


def box(title: str, *parts: str) -> str:
    return f"{_STYLE}<div class='gk-box'><b>{escape(title)}</b>{''.join(parts)}</div>"


def _energy(value: float | None, digits: int = 8) -> str:
    return "—" if value is None else f"{value:.{digits}f}"


def molecule_html(molecule: Any) -> str:
    """Formula, charge, multiplicity, basis and geometry (angstrom)."""
    facts = table(["", ""], [["formula", escape(molecule.formula)], ["charge", f"{molecule.charge:+d}"],
                             ["multiplicity", molecule.multiplicity], ["basis", escape(molecule.basis)],
                             ["electrons", molecule.n_electrons]], left=2)
    rows = [[escape(s), *(f"{c:.6f}" for c in xyz)]
            for s, xyz in zip(molecule.symbols, molecule.coordinates_angstrom)]
    geometry = table(["atom", "x / Å", "y / Å", "z / Å"], rows)
    return box(f"Molecule {molecule.name or molecule.formula}", facts, "<div>geometry</div>", geometry)


BASELINE_HEADER = ["baseline", "energy / Ha", "vs exact / mHa", "check", "note"]
CHECK_MARK = {"ok": ("ok", palette.GREEN), "suspect": ("⚠ suspect", palette.VERMILION),
              "missing": ("missing", palette.GREY)}


def baseline_rows(baselines: Any, reference: float, suspect: dict[str, str] | None = None,
                  notes: dict[str, str] | None = None) -> list[list[Any]]:
    """One row per baseline: name, energy, error against ``reference`` (mHa), check mark and note. A suspect
    value keeps its number, struck through, with the reason beside it."""
    suspect, notes = suspect or {}, notes or {}
    rows = []
    for name in baselines:
        value = baselines[name]
        status = "missing" if value is None else "suspect" if name in suspect else "ok"
        error = "—" if value is None else f"{1000 * (value - reference):+.3f}"
        energy = _energy(value) if status != "suspect" else f"<s>{_energy(value)}</s>"
        text, colour = CHECK_MARK[status]
        mark = f"<span style='color:{colour};font-weight:bold'>{escape(text)}</span>"
        note = notes.get(name, suspect.get(name, ""))
        rows.append([escape(name), energy, error, mark, f"<span class='gk-note'>{escape(note)}</span>"])
    return rows


def problem_html(problem: Any) -> str:
    """Orbital table (active ones marked) and baselines beside the exact reference."""
    space = problem.active_orbitals
    orbital_rows, classes = [], []
    for i, (energy, occupation) in enumerate(zip(space.orbital_energies, space.orbital_occupations)):
        role = "core" if i in space.core else "active" if i in space.active else "left out"
        orbital_rows.append([i, f"{energy:.5f}", f"{occupation:.2f}", ("● " if role == "active" else "") + role])
        classes.append("gk-active" if role == "active" else "")
    reference = problem.reference
    facts = table(["", ""], [
        ["active space", escape(f"{space.n_electrons} electrons in {space.n_orbitals} orbitals")],
        ["qubits (spin orbitals)", problem.n_qubits], ["determinants", f"{problem.n_determinants:,}"],
        ["exact reference / Ha", f"{reference.energy:.8f} (multiplicity {reference.multiplicity})"]], left=2)
    orbitals = table(["orbital", "energy / Ha", "HF occupation", "role"], orbital_rows, row_classes=classes)
    record = problem.baselines.result_fields()
    baselines = table(BASELINE_HEADER, baseline_rows(record["baselines"], reference.energy,
                                                     record["suspect_baselines"], record["baseline_notes"]))
    return box(f"Problem {problem.molecule.formula}", facts, "<div>orbitals (● = active)</div>", orbitals,
               baselines)


def verdict_html(verdict: str) -> str:
    """The verdict's one wording (:func:`groundkit.result.verdict_text`), marked and coloured."""
    mark, colour = VERDICT_MARK[verdict]
    return f"<span style='color:{colour};font-weight:bold'>{mark} {escape(verdict_text(verdict))}</span>"


def result_html(result: Any) -> str:
    """Energy, reference, error, verdict, resources and convergence of a run."""
    conf = result.provenance.get("configuration", {})
    stderr = f" ± {1000 * result.standard_error:.3f}" if result.standard_error else ""
    facts = table(["", ""], [
        ["energy / Ha", f"{result.energy:.10f}"],
        ["exact reference / Ha", f"{result.reference.energy:.10f} (multiplicity {result.reference.multiplicity})"],
        ["error / mHa", f"{1000 * result.error:+.4f}{stderr}"],
        ["verdict", verdict_html(result.verdict) + f" ({1000 * CHEMICAL_ACCURACY:.1f} mHa)"],
        ["fidelity with exact state", f"{result.fidelity:.6f}"],
        ["iterations", f"{result.iterations}, {'converged' if result.converged else 'not converged'}: "
                       f"{escape(result.stop_reason)}"]], left=2)
    r = result.resources
    known = [(f.name.replace("_", " "), getattr(r, f.name)) for f in fields(r) if getattr(r, f.name) is not None]
    resources = table([k for k, _ in known], [[v for _, v in known]], left=0)
    setup = table(["role", "component"], [[escape(k.replace("_", " ")), escape(str(v))] for k, v in conf.items()
                                          if k not in ("geometry_xyz", "molecule")], left=2)
    baselines = table(BASELINE_HEADER, baseline_rows(result.baselines, result.reference.energy,
                                                     result.suspect_baselines, result.baseline_notes))
    title = f"Run result {_molecule_name(conf)}"
    return box(title, facts, "<div>resources</div>", resources, setup, baselines)


def _molecule_name(conf: dict) -> str:
    text = str(conf.get("molecule", ""))
    return text[len("MoleculeSpec("):-1].split(",")[0].strip("'") if text.startswith("MoleculeSpec(") else text


def scan_html(scan: Any) -> str:
    """The scan's curve as an inline PNG beside its table."""
    from .figures import draw_scan, new_figure, png_bytes

    rows = []
    for p in scan.points:
        r = p.result
        if r is None:
            rows.append([f"{p.value:.4g}", "—", "—", "—", escape(f"failed: {p.failure}")])
        else:
            rows.append([f"{p.value:.4g}", f"{r.energy:.8f}", f"{r.reference.energy:.8f}", f"{1000 * r.error:+.3f}",
                         verdict_html(r.verdict)])
    parts = []
    if any(p.ok for p in scan.points):
        figure, (ax,) = new_figure(width=6.0, height=3.6, panels=1)
        draw_scan(ax, scan.table, scan.configuration.get("trial_state", "trial state"))
        encoded = base64.b64encode(png_bytes(figure)).decode("ascii")
        parts.append(f"<div><img alt='scan curve' src='data:image/png;base64,{encoded}'/></div>")
    parts.append(table(["value", "energy / Ha", "reference / Ha", "error / mHa", "verdict"], rows))
    return box(f"Scan of {len(scan.points)} points", *parts)
