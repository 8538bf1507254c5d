"""PlanResult: the costed configurations of a plan, its frontier and its recommendation, as plain data.

Units: errors in mHa, device time in hours, time per shot in microseconds, target in Hartree.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any

from .scan_result import ScanResult

COLUMNS = ("configuration", "active_space", "mapping", "trial_state", "minimiser", "grouping", "device",
           "mitigation", "run", "worst_error_mha", "worst_geometry", "non_parallelity_mha", "qubits",
           "two_qubit_gates", "depth", "swaps", "shots_per_energy", "shot_time_us", "evaluations",
           "energy_estimates", "device_hours", "noise_threshold", "active_space_error_mha", "meets_target",
           "within_limits", "meets", "reason", "notes")
"""Every column a plan row may hold, in table order (``noise_threshold`` only when asked,
``active_space_error_mha`` only when a problem offered one)."""

FRONTIER_COSTS = {"device_hours": "device time", "two_qubit_gates": "two-qubit gates"}


@dataclass(frozen=True, eq=False)
class RunCurve:
    """One shared minimisation scan of a plan: its index (the rows' ``run``), label and scan."""

    index: int
    label: str
    scan: ScanResult


@dataclass(frozen=True)
class Recommendation:
    """The cheapest configuration meeting the target at every geometry within the limits (``configuration``
    None when none does), the runner-up's label, and a plain-language ``justification``."""

    configuration: str | None
    row: dict[str, Any] | None
    runner_up: str | None
    justification: str

    def __str__(self) -> str:
        return self.justification


@dataclass(frozen=True, eq=False)
class PlanResult:
    """Outcome of :func:`groundkit.plan`: one row per configuration (plain dicts), the shared scans, the
    configurations skipped as invalid (with the reason), the target (Ha), the limits, whether the noise threshold
    was asked, and how much work was shared (``shared``: configurations, runs, minimisations, ...)."""

    rows: tuple[dict[str, Any], ...]
    curves: tuple[RunCurve, ...]
    skipped: tuple[dict[str, str], ...] = ()
    target: float = 1.6e-3
    limits: dict[str, Any] = field(default_factory=dict)
    noise_threshold: bool = False
    shared: dict[str, int] = field(default_factory=dict)

    # tables ---------------------------------------------------------------------------------------------------
    @property
    def table(self) -> Any:
        """pandas DataFrame, one row per configuration: the roles; worst |error| over the geometries and where
        (mHa, scan value); non-parallelity error (mHa); qubits, two-qubit gates, depth and SWAPs (worst geometry,
        after routing where the device routes); shots per energy at the target precision and time per shot (µs),
        worst geometry; minimiser evaluations and device energy estimates summed over the curve; device_hours for
        the whole curve (Σ points estimates × shots × time per shot); noise_threshold (when asked); meets_target,
        within_limits, meets (both), reason (when not), notes."""
        import pandas as pd

        columns = [c for c in COLUMNS if any(c in r for r in self.rows) or c in ("configuration",)]
        if not any(r.get("active_space_error_mha") is not None for r in self.rows):
            columns = [c for c in columns if c != "active_space_error_mha"]
        return pd.DataFrame([{c: r.get(c) for c in columns} for r in self.rows], columns=columns)

    def curve(self, configuration: str | None = None) -> ScanResult:
        """The scan behind a configuration's row (default: the recommended one)."""
        label = configuration if configuration is not None else self.recommend().configuration
        row = next((r for r in self.rows if r["configuration"] == label), None)
        if row is None:
            from .plan_input import PlanInputError

            known = ", ".join(repr(r["configuration"]) for r in self.rows)
            raise PlanInputError(f"no configuration {label!r} in this plan; its configurations: {known}")
        return next(c.scan for c in self.curves if c.index == row["run"])

    # decision -------------------------------------------------------------------------------------------------
    def frontier(self, by: str | None = None) -> Any:
        """Rows not dominated on (cost, worst error): ``by`` 'device_hours' or 'two_qubit_gates', or None for
        either (with columns ``on_device_hours_frontier`` and ``on_two_qubit_gates_frontier``). A row dominates
        another when it is no worse on both figures and better on one; rows without both figures take no part."""
        costs = list(FRONTIER_COSTS) if by is None else [by]
        for cost in costs:
            if cost not in FRONTIER_COSTS:
                from .plan_input import PlanInputError

                raise PlanInputError(f"frontier(by={by!r}); accepted: None, {', '.join(map(repr, FRONTIER_COSTS))}")
        table = self.table
        keep = None
        for cost in costs:
            flags = non_dominated([(r.get(cost), r.get("worst_error_mha")) for r in self.rows])
            table[f"on_{cost}_frontier"] = flags
            keep = flags if keep is None else [a or b for a, b in zip(keep, flags)]
        return table[keep].reset_index(drop=True) if self.rows else table

    def recommend(self) -> Recommendation:
        """The cheapest configuration (device time, then two-qubit gates, then worst error) that meets the target
        at every geometry within the limits, with a justification naming the runner-up and why it lost."""
        return recommendation(self.rows, self.target)

    # output ---------------------------------------------------------------------------------------------------
    def summary(self) -> str:
        """Plain text: one line per configuration and the recommendation."""
        lines = [f"{'configuration':<48}{'worst/mHa':>10}{'2q gates':>9}{'shots':>12}{'hours':>10}  meets"]
        for r in self.rows:
            lines.append(f"{r['configuration'][:47]:<48}{_num(r['worst_error_mha'], '.3f'):>10}"
                         f"{_num(r['two_qubit_gates'], 'd'):>9}{_num(r['shots_per_energy'], '.3g'):>12}"
                         f"{_num(r['device_hours'], '.3g'):>10}  {'yes' if r['meets'] else 'no: ' + r['reason']}")
        for s in self.skipped:
            lines.append(f"{s['configuration'][:47]:<48}  skipped: {s['reason']}")
        lines += ["", self.recommend().justification]
        return "\n".join(lines)

    def show(self) -> Any:
        """A notebook widget: frontier (cost against worst error, target line, recommended point labelled), the
        recommended configuration's curve against the exact reference and baselines, and the table."""
        from groundkit.upcalls import upcall

        return upcall("show:plan", self)

    def plot(self, path: str) -> str:
        """Save the frontier and the recommended curve as a PNG at ``path``; returns the path."""
        from groundkit.upcalls import upcall

        return upcall("png:plan", self, path)

    def _repr_html_(self) -> str:
        from groundkit.upcalls import upcall

        return upcall("html:plan", self)

    def save(self, path: str) -> None:
        """Write the plan as JSON, atomically (schema 'groundkit.plan-result', version 1)."""
        from .plan_persistence import save_plan

        save_plan(self, path)

    def __repr__(self) -> str:
        met = sum(1 for r in self.rows if r["meets"])
        return (f"PlanResult({len(self.rows)} configurations, {met} meeting the target within the limits, "
                f"{len(self.skipped)} skipped, {len(self.curves)} shared runs)")


def _num(value: Any, spec: str) -> str:
    return "—" if value is None else format(value, spec)


def dominates(a: tuple[float, float], b: tuple[float, float]) -> bool:
    """a is no worse than b on both figures and better on one (lower is better)."""
    return a[0] <= b[0] and a[1] <= b[1] and (a[0] < b[0] or a[1] < b[1])


def non_dominated(points: list[tuple[Any, Any]]) -> list[bool]:
    """For each (cost, error) pair: True when no other complete pair dominates it (None entries: False)."""
    complete = [p[0] is not None and p[1] is not None and not any(isinstance(v, float) and math.isnan(v)
                                                                  for v in p) for p in points]
    out = []
    for k, p in enumerate(points):
        if not complete[k]:
            out.append(False)
            continue
        out.append(not any(complete[j] and dominates(points[j], p) for j in range(len(points)) if j != k))
    return out


def _order(row: dict[str, Any]) -> tuple:
    big = float("inf")
    return (row["device_hours"] if row.get("device_hours") is not None else big,
            row["two_qubit_gates"] if row.get("two_qubit_gates") is not None else big,
            row["worst_error_mha"] if row.get("worst_error_mha") is not None else big, row["configuration"])


def recommendation(rows: tuple[dict[str, Any], ...] | list[dict[str, Any]], target: float) -> Recommendation:
    """See :meth:`PlanResult.recommend`. The runner-up is, of the configurations cheaper than the winner (each
    lost on a reason: a missed target or a broken limit), the one that came closest (smallest worst error); when
    none is cheaper, the next meeting one (which lost on cost)."""
    goal = f"{1000 * target:.3g} mHa"
    meeting = sorted((r for r in rows if r["meets"]), key=_order)
    if not meeting:
        if not rows:
            return Recommendation(None, None, None, "No configuration could be evaluated (all were skipped).")
        closest = min(rows, key=lambda r: (r.get("worst_error_mha") is None, r.get("worst_error_mha") or 0.0))
        return Recommendation(None, None, closest["configuration"], (
            f"No configuration holds {goal} at every geometry within the limits. The closest is "
            f"{closest['configuration']} (worst |error| {_num(closest.get('worst_error_mha'), '.3g')} mHa): "
            f"{closest['reason']}."))
    best = meeting[0]
    hours = best["device_hours"]
    text = (f"Recommended: {best['configuration']}. It holds {goal} at every geometry (worst |error| "
            f"{best['worst_error_mha']:.3g} mHa) within the limits, for {_hours(hours)} of device time for the "
            f"whole curve ({best['two_qubit_gates']} two-qubit gates, {best['shots_per_energy']:.3g} shots per "
            "energy at the worst geometry).")
    cheaper = sorted((r for r in rows if not r["meets"] and r.get("device_hours") is not None
                      and r["device_hours"] < hours),
                     key=lambda r: (r.get("worst_error_mha") is None, r.get("worst_error_mha") or 0.0, _order(r)))
    if cheaper:
        runner = cheaper[0]
        text += (f" The runner-up, {runner['configuration']}, would need only {_hours(runner['device_hours'])} but "
                 f"lost: {runner['reason']}.")
    elif len(meeting) > 1:
        runner = meeting[1]
        ratio = runner["device_hours"] / hours if hours else float("inf")
        text += (f" The runner-up, {runner['configuration']}, also holds the target but needs "
                 f"{_hours(runner['device_hours'])} ({ratio:.3g}× as much device time).")
    else:
        others = sorted((r for r in rows if r is not best), key=_order)
        if not others:
            return Recommendation(best["configuration"], dict(best), None, text + " It was the only configuration.")
        runner = others[0]
        text += f" The runner-up, {runner['configuration']}, lost: {runner['reason'] or 'it costs more'}."
    return Recommendation(best["configuration"], dict(best), runner["configuration"], text)


def _hours(hours: float | None) -> str:
    if hours is None:
        return "an unknown time"
    if hours < 1 / 60:
        return f"{hours * 3600:.3g} s"
    if hours < 1:
        return f"{hours * 60:.3g} min"
    return f"{hours:.3g} h"
