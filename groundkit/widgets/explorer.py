"""``gk.explore(pipeline)``: choose each component, run, and compare the runs in a growing table."""

from __future__ import annotations

import html
import time
from dataclasses import replace
from typing import Any

import ipywidgets as widgets

from ..active_space import ActiveSpace
from ..errors import ComponentError
from ..mapping import QubitMapping
from . import palette
from .html import table, verdict_html
from .live import RunView

_WIDE = {"description_width": "120px"}
_LOGICAL = "logical"  # the device selector's value for the logical all-to-all register (no device)
_MITIGATIONS = [("none", ()), ("readout", ("readout",)), ("zero-noise extrapolation", ("zne",)),
                ("symmetry verification", ("symmetry",))]


def _listed(role: str) -> list[tuple[str, Any]]:
    """(label, component with default options) of every class the registry lists for ``role``; a class that
    cannot be built without options is left out."""
    from ..errors import GroundkitError
    from ..registry import entries

    options = []
    for entry in entries(role, listed_only=True):
        try:
            options.append((entry.label, entry.cls()))
        except (GroundkitError, TypeError):  # needs options (TypeError: a user class with a custom __init__)
            continue
    return options


def _trial_states() -> list[tuple[str, Any]]:
    return _listed("trial_state")


def _minimisers() -> list[tuple[str, Any]]:
    return _listed("minimiser")


def _mappings() -> list[tuple[str, str]]:
    from ..registry import entries

    return [(e.label, e.name) for e in entries("mapping", listed_only=True)]


def _devices(own: Any) -> list[tuple[str, Any]]:
    """The device selector's options: the logical register, every listed device, and the pipeline's own."""
    return _with_own([("logical (all-to-all, no routing)", _LOGICAL), *_listed("device")], own)


def _chosen(options: list[tuple[str, Any]], resolved: Any) -> Any:
    """The pipeline's (resolved) component when it is among the options (moved to the top), else the first."""
    for k, (_label, value) in enumerate(options):
        if value == resolved:
            options.insert(0, options.pop(k))
            return value
    return options[0][1]


def _with_own(options: list[tuple[str, Any]], own: Any) -> list[tuple[str, Any]]:
    """The options, with the pipeline's own component first when it is not among them."""
    if own is None or any(value == own for _, value in options):
        return options
    return [(f"pipeline's own: {own!r}", own), *options]


class Explorer(widgets.VBox):
    """Selectors for every component, a run button, the live view of the latest run and a table of all runs.

    ``rows`` holds one dict per finished run; ``message`` shows the library's message when a choice is refused.
    """

    def __init__(self, pipeline: Any) -> None:
        if pipeline.components["molecule"] is None:
            raise ComponentError("explore needs a pipeline with a molecule; use Pipeline(molecule)")
        self.pipeline = pipeline
        self.rows: list[dict[str, Any]] = []
        self.results: list[Any] = []
        own = pipeline.components
        resolved = pipeline.resolved_components()
        self._own_space = resolved["active_space"]
        space = pipeline.problem().active_orbitals
        self._own_counts = (space.n_electrons, space.n_orbitals)
        self.electrons = widgets.IntText(value=space.n_electrons, description="active electrons", style=_WIDE)
        self.orbitals = widgets.IntText(value=space.n_orbitals, description="active orbitals", style=_WIDE)
        mapping = resolved["mapping"]
        mapping_options: list[tuple[str, Any]] = _mappings()
        own_mapping = mapping.untapered()
        if any(value == mapping.name and QubitMapping(value) == own_mapping for _, value in mapping_options):
            mapping_value: Any = mapping.name
        else:  # a mapping with options of its own, or one the registry does not list
            mapping_value = own_mapping
            mapping_options.insert(0, (f"pipeline's own: {own_mapping!r}", own_mapping))
        self.mapping = widgets.Dropdown(options=mapping_options, value=mapping_value, description="mapping",
                                        style=_WIDE)
        self.taper = widgets.Checkbox(value=bool(mapping.taper), description="taper symmetry qubits")
        trial_options = _with_own(_trial_states(), own["trial_state"])
        self.trial_state = widgets.Dropdown(options=trial_options,
                                            value=_chosen(trial_options, resolved["trial_state"]),
                                            description="trial state", style=_WIDE)
        self.estimator, self.shots, self.seed = self._estimator_widgets(own["estimator"], resolved["estimator"])
        minimiser_options = _with_own(_minimisers(), own["minimiser"])
        self.minimiser = widgets.Dropdown(options=minimiser_options,
                                          value=_chosen(minimiser_options, resolved["minimiser"]),
                                          description="minimiser", style=_WIDE)
        device_options = _devices(own["device"])
        self.device = widgets.Dropdown(options=device_options,
                                       value=_chosen(device_options, own["device"] or _LOGICAL),
                                       description="device", style=_WIDE)
        self.tolerance = widgets.Checkbox(value=False, description="noise threshold after each run (slower)",
                                          style={"description_width": "initial"})
        self.tolerance_mitigation = widgets.Dropdown(options=_MITIGATIONS, value=(), description="mitigation",
                                                     style=_WIDE)
        self.run_button = widgets.Button(description="Run this configuration", button_style="primary",
                                         icon="play", layout=widgets.Layout(width="220px"))
        self.run_button.on_click(self.run)
        self.message = widgets.HTML()
        self.view_area = widgets.Box()
        self.table_area = widgets.HTML(value=self._table_html())
        selectors = widgets.VBox([
            widgets.HTML("<b>Configuration</b>"),
            widgets.HBox([self.electrons, self.orbitals]),
            widgets.HBox([self.mapping, self.taper]),
            self.trial_state,
            widgets.HBox([self.estimator, self.shots, self.seed]),
            self.minimiser,
            self.device,
            widgets.HBox([self.tolerance, self.tolerance_mitigation]),
            widgets.HBox([self.run_button, self.message]),
        ])
        super().__init__([selectors, self.view_area, widgets.HTML("<b>Runs so far</b>"), self.table_area])
        self.add_class("groundkit-explorer")

    def _estimator_widgets(self, own: Any, default: Any) -> tuple[Any, Any, Any]:
        """The estimator selector (registered estimators by label) and the shots and seed fields, which apply to
        every estimator that takes those options."""
        from ..registry import entries, entry_of

        options: list[tuple[str, Any]] = [(e.label, e.name) for e in entries("estimator", listed_only=True)]
        default_entry = entry_of(default)
        value: Any = _chosen(options, default_entry.name) if default_entry is not None else options[0][1]
        shots, seed = 10_000, 7
        if own is not None:
            entry = entry_of(own)
            shared = {k: getattr(own, k) for k in ("shots", "seed") if k in type(own).accepted_options()}
            if entry is not None and entry.listed and type(own)(**shared) == own and \
                    shared.get("shots", 1) is not None and shared.get("seed", 1) is not None:
                value = entry.name
                shots, seed = shared.get("shots", shots), shared.get("seed", seed)
            else:
                options.insert(0, (f"pipeline's own: {own!r}", own))
                value = own
        return (widgets.Dropdown(options=options, value=value, description="estimator", style=_WIDE),
                widgets.IntText(value=shots, description="shots", layout=widgets.Layout(width="200px")),
                widgets.IntText(value=seed, description="seed", layout=widgets.Layout(width="160px")))

    # building and running ---------------------------------------------------------------------------------------
    def configured(self) -> Any:
        """The pipeline for the current selection (raises the library's errors for bad choices)."""
        counts = (int(self.electrons.value), int(self.orbitals.value))
        space = self._own_space if counts == self._own_counts else ActiveSpace(electrons=counts[0],
                                                                                  orbitals=counts[1])
        estimator = self.estimator.value
        if isinstance(estimator, str):
            from ..registry import lookup

            cls = lookup("estimator", estimator)
            given = {"shots": int(self.shots.value), "seed": int(self.seed.value)}
            estimator = cls(**{k: v for k, v in given.items() if k in cls.accepted_options()})
        minimiser = self.minimiser.value
        if "seed" in type(minimiser).accepted_options() and getattr(minimiser, "seed", 0) is None:
            minimiser = replace(minimiser, seed=int(self.seed.value))  # every random thing takes a seed
        mapping = self.mapping.value
        mapping = QubitMapping(mapping, taper=self.taper.value) if isinstance(mapping, str) else \
            replace(mapping, taper=self.taper.value)
        p = self.pipeline.active_space(space).mapping(mapping)
        p = p.trial_state(self.trial_state.value).estimator(estimator).minimiser(minimiser)
        p = p.device(None if self.device.value == _LOGICAL else self.device.value)
        p.problem()  # refuse an impossible active space before the view is built
        return p

    def run(self, _button: Any = None) -> Any:
        """Run the selected configuration (the button's handler); returns the result, or None when refused."""
        self.run_button.disabled = True
        self.message.value = self._note("running…", palette.GREY)
        try:
            pipeline = self.configured()
            view = RunView.for_pipeline(pipeline)
            self.view_area.children = (view,)
            start = time.perf_counter()
            result = pipeline.run(view.update)
            elapsed = time.perf_counter() - start
            view.finish(result)
        except Exception as err:  # the library's message in the widget; the explorer stays usable
            self.message.value = self._note(f"{type(err).__name__}: {err}", palette.VERMILION, "Not run — ")
            return None
        finally:
            self.run_button.disabled = False
        row = self._row(pipeline, result, elapsed)
        if self.tolerance.value:
            self.message.value = self._note("finding the noise threshold…", palette.GREY)
            row.update(self._threshold(pipeline, result))
        self.results.append(result)
        self.rows.append(row)
        self.table_area.value = self._table_html()
        self.message.value = self._note(f"run {len(self.rows)} added to the table", palette.GREEN, "Done — ")
        return result

    def _threshold(self, pipeline: Any, result: Any) -> dict[str, Any]:
        """The noise-threshold cells of a row (opt-in: it costs several noisy evaluations); a refusal becomes
        the note, so the run still joins the table."""
        from ..noise.threshold import noise_threshold

        mitigation = self.tolerance_mitigation.value
        label = self.tolerance_mitigation.label
        try:
            found = noise_threshold(pipeline, result=result, mitigation=mitigation, tolerance=0.5,
                                    seed=int(self.seed.value))
        except Exception as err:  # the run stands; the cell says why there is no threshold
            return {"threshold_two_qubit": None, "threshold_mitigation": label,
                    "threshold_note": f"{type(err).__name__}: {err}"}
        return {"threshold_two_qubit": found.two_qubit, "threshold_mitigation": label,
                "threshold_note": found.reason or found.confidence}

    @property
    def table(self) -> Any:
        """The runs so far as a pandas DataFrame."""
        import pandas as pd

        return pd.DataFrame([{k: v for k, v in row.items() if k != "verdict_html"} for row in self.rows])

    # presentation -----------------------------------------------------------------------------------------------
    def _row(self, pipeline: Any, result: Any, elapsed: float) -> dict[str, Any]:
        c = pipeline.resolved_components()
        space = pipeline.problem().active_orbitals
        mapping = c["mapping"].name + (" (tapered)" if c["mapping"].taper else "")
        r = result.resources
        return {"run": len(self.rows) + 1, "active_space": f"{space.n_electrons}e/{space.n_orbitals}o",
                "mapping": mapping, "trial_state": self.trial_state.label, "estimator": repr(c["estimator"]),
                "minimiser": self.minimiser.label, "energy": result.energy, "error_mha": 1000 * result.error,
                "standard_error_mha": 1000 * result.standard_error, "verdict": result.verdict,
                "qubits": r.qubits, "parameters": r.parameters, "two_qubit_gates": r.two_qubit_gates,
                "measurement_groups": r.measurement_groups, "iterations": result.iterations, "time_s": elapsed,
                "device": r.device or "logical", "logical_two_qubit_gates": r.logical_two_qubit_gates,
                "swaps": r.swaps, "device_seconds": r.device_seconds}

    def _table_html(self) -> str:
        if not self.rows:
            return "<div style='font-family:sans-serif;color:#555'>No runs yet: choose a configuration and run.</div>"
        header = ["run", "active space", "mapping", "trial state", "estimator", "minimiser", "energy / Ha",
                  "error / mHa", "verdict", "qubits", "parameters", "2-qubit gates", "groups", "iterations",
                  "time / s", "device", "logical 2-qubit gates", "SWAPs", "device s / energy",
                  "noise threshold (2-qubit rate)"]
        body = []
        for row in self.rows:
            error = f"{row['error_mha']:+.3f}" + (f" ± {row['standard_error_mha']:.3f}"
                                                   if row["standard_error_mha"] else "")
            body.append([row["run"], *(html.escape(str(row[k])) for k in
                                       ("active_space", "mapping", "trial_state", "estimator", "minimiser")),
                         f"{row['energy']:.8f}", error, verdict_html(row["verdict"]),
                         *("—" if row[k] is None else row[k] for k in
                           ("qubits", "parameters", "two_qubit_gates", "measurement_groups", "iterations")),
                         f"{row['time_s']:.2f}", html.escape(str(row["device"])),
                         *("—" if row[k] is None else row[k] for k in ("logical_two_qubit_gates", "swaps")),
                         "—" if row["device_seconds"] is None else f"{row['device_seconds']:.3g}",
                         self._threshold_cell(row)])
        return "<div class='gk-box' style='font-family:sans-serif;font-size:12px'>" + table(
            header, body, left=6) + "</div>"

    @staticmethod
    def _threshold_cell(row: dict[str, Any]) -> str:
        """The threshold with its mitigation, the note as a tooltip; "—" when not asked for."""
        if "threshold_mitigation" not in row:
            return "—"
        rate = row["threshold_two_qubit"]
        value = "none found" if not rate else f"{rate:.2e}"
        return (f"<span title='{html.escape(row['threshold_note'], quote=True)}'>{value} "
                f"({html.escape(row['threshold_mitigation'])})</span>")

    @staticmethod
    def _note(text: str, colour: str, prefix: str = "") -> str:
        return (f"<div role='status' style='font-family:sans-serif;padding:4px 8px;border-left:4px solid {colour}'>"
                f"<b>{html.escape(prefix)}</b>{html.escape(text)}</div>")


def explore(pipeline: Any) -> Explorer:
    """A configuration explorer for ``pipeline`` (which must have a molecule); display it in a notebook."""
    return Explorer(pipeline)
