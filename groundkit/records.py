"""Pipelines as data: the component records a result's provenance keeps, and the pipeline rebuilt from them.

A provenance holds, beside the readable ``configuration`` strings,

- ``"components"``: role -> :meth:`~groundkit.component.Component.to_dict` record of every resolved component
  (None, with the reason under ``"component_notes"``, for a component that cannot be recorded: an unregistered
  class, or an option without a JSON form);
- ``"molecule"``: the MoleculeSpec's fields (coordinates at full precision, in the molecule's own unit).

:func:`pipeline_from_provenance` builds the pipeline back, through the registry and the components' own checks;
nothing is evaluated. Files written before component records existed have neither key and are refused with a
:class:`~groundkit.errors.ResultFileError` that says so.
"""

from __future__ import annotations

from dataclasses import fields
from typing import Any

from .errors import GroundkitError, ResultFileError

ROLES = ("active_space", "mapping", "trial_state", "estimator", "minimiser")


def molecule_record(molecule: Any) -> dict[str, Any]:
    """The fields of a MoleculeSpec as JSON values (tuples as lists)."""
    def plain(value: Any) -> Any:
        return [plain(v) for v in value] if isinstance(value, (tuple, list)) else value

    return {f.name: plain(getattr(molecule, f.name)) for f in fields(molecule)}


def molecule_from_record(data: Any, source: str = "data") -> Any:
    """The MoleculeSpec of :func:`molecule_record` output; ResultFileError when it is not one."""
    from .molecule import MoleculeSpec

    names = {f.name for f in fields(MoleculeSpec)}
    if not isinstance(data, dict) or not set(data) <= names or "symbols" not in data or "coordinates" not in data:
        raise ResultFileError(f"{source}: the stored molecule {str(data)[:60]!r} is not a molecule record with keys "
                              f"{', '.join(sorted(names))}")
    try:
        return MoleculeSpec(**data)
    except (GroundkitError, TypeError) as err:
        raise ResultFileError(f"{source}: the stored molecule is not valid ({err})") from None


def component_records(components: dict[str, Any]) -> tuple[dict[str, Any], dict[str, str]]:
    """(role -> record or None, role -> why a component could not be recorded) for the resolved components."""
    records: dict[str, Any] = {}
    notes: dict[str, str] = {}
    optional = ("device",) if components.get("device") is not None else ()  # no record: logical register
    for role in (*ROLES, *optional):
        component = components.get(role)
        try:
            records[role] = component.to_dict()
        except (GroundkitError, AttributeError) as err:  # AttributeError: not a Component at all
            records[role] = None
            notes[role] = f"{type(err).__name__}: {err}"
    return records, notes


def pipeline_from_provenance(provenance: Any, source: str = "result", molecule: bool = True) -> Any:
    """The Pipeline recorded in ``provenance`` (with its molecule unless ``molecule=False``)."""
    from .component import component_from_dict
    from .pipeline import Pipeline

    if not isinstance(provenance, dict) or "components" not in provenance:
        raise ResultFileError(
            f"{source} predates component records (its provenance has only the readable configuration strings), "
            "so its pipeline cannot be rebuilt; re-run it with this version of groundkit to record them"
        )
    records = provenance["components"]
    if not isinstance(records, dict):
        raise ResultFileError(f"{source}: provenance 'components' is {str(records)[:60]!r}; expected an object")
    notes = provenance.get("component_notes") or {}
    pipeline = Pipeline()
    if molecule:
        if "molecule" not in provenance:
            raise ResultFileError(f"{source}: the provenance has no molecule record")
        pipeline = Pipeline(molecule_from_record(provenance["molecule"], source))
    for role in ROLES:
        record = records.get(role)
        if record is None:
            why = notes.get(role, "it is missing from the record") if isinstance(notes, dict) else ""
            raise ResultFileError(f"{source}: the {role.replace('_', ' ')} was not recorded ({why}); register its "
                                  "class (groundkit.register) and give its options JSON values to make it savable")
        try:
            component = component_from_dict(record, role)
        except GroundkitError as err:
            raise ResultFileError(f"{source}: the recorded {role.replace('_', ' ')} cannot be rebuilt: {err}") \
                from None
        pipeline = getattr(pipeline, role)(component)
    if records.get("device") is not None:  # results without a device have no device record
        try:
            pipeline = pipeline.device(component_from_dict(records["device"], "device"))
        except GroundkitError as err:
            raise ResultFileError(f"{source}: the recorded device cannot be rebuilt: {err}") from None
    return pipeline
