"""The component base: options declared once, checked in one place, saved as data.

Every component class (active spaces, mappings, trial states, estimators, minimisers, pools) derives from
:class:`Component`, usually as a frozen dataclass whose fields are its options. Constructing one goes through
:class:`ComponentMeta`, which

1. refuses an option name the constructor does not take (``SampledEstimator(shotz=10)``) with the role's error,
   naming the bad key, suggesting a close match and listing the accepted ones;
2. builds the object (the dataclass ``__init__`` and any ``__post_init__``);
3. checks every option declared in the class's ``constraints`` mapping (merged along the class hierarchy; see
   :mod:`groundkit.constraints`), storing normalised values;
4. calls ``check_options()`` for checks that involve several options.

``to_dict()`` gives ``{"role": ..., "name": <registered name>, "options": {...}}`` with JSON values (nested
components as dicts of the same form, Cirq circuits through ``cirq.to_json``, non-finite floats as
``{"float": "inf"}``); :func:`component_from_dict` (or ``Component.from_dict``) builds it back, through the same
checks. Nothing is evaluated on the way back: names are looked up in the registry.
"""

from __future__ import annotations

import difflib
import inspect
import json
import math
from abc import ABCMeta
from typing import Any, ClassVar

import numpy as np

from .constraints import Constraint, Refused
from .errors import ComponentError

_SIGNATURES: dict[type, tuple[Any, inspect.Signature]] = {}
_CONSTRAINTS: dict[type, dict[str, Constraint]] = {}
_RECORD_KEYS = ("role", "name", "options")


def _shown(value: Any) -> str:
    text = repr(value)
    return text if len(text) <= 80 else text[:77] + "..."


class ComponentMeta(ABCMeta):
    """Metaclass of components: checks option names before construction and option values after it."""

    def __call__(cls, *args: Any, **kwargs: Any) -> Any:
        by_name = cls.__dict__.get("_by_name")
        if by_name is not None:  # e.g. QubitMapping("parity", taper=True) builds the registered Parity class
            return by_name.__get__(None, cls)(*args, **kwargs)
        signature = cls._init_signature()
        try:
            signature.bind(None, *args, **kwargs)
        except TypeError as err:
            raise cls._option_error(args, kwargs, err) from None
        obj = super().__call__(*args, **kwargs)
        obj._check_declared()
        obj.check_options()
        return obj

    @property
    def __signature__(cls) -> inspect.Signature:
        """The constructor's signature (so help() and notebooks show the options, not ``*args, **kwargs``)."""
        by_name = cls.__dict__.get("_by_name")
        if by_name is not None:
            return inspect.signature(by_name.__get__(None, cls))
        parameters = list(cls._init_signature().parameters.values())[1:]
        return inspect.Signature(parameters)

    def _init_signature(cls) -> inspect.Signature:
        init = cls.__init__
        cached = _SIGNATURES.get(cls)
        if cached is None or cached[0] is not init:
            cached = _SIGNATURES[cls] = (init, inspect.signature(init))
        return cached[1]

    def accepted_options(cls) -> tuple[str, ...]:
        """Names of the options the constructor takes, in order."""
        return tuple(p.name for p in list(cls._init_signature().parameters.values())[1:]
                     if p.kind not in (p.VAR_POSITIONAL, p.VAR_KEYWORD))

    def declared_constraints(cls) -> dict[str, Constraint]:
        """Option name -> constraint, merged along the class hierarchy (a subclass's declaration wins)."""
        merged = _CONSTRAINTS.get(cls)
        if merged is None:
            merged = {}
            for klass in reversed(cls.__mro__):
                merged.update(klass.__dict__.get("constraints", {}) or {})
            _CONSTRAINTS[cls] = merged
        return merged

    def _owner(cls) -> str:
        return cls.display_name()

    def _option_error(cls, args: tuple, kwargs: dict, err: TypeError) -> Exception:
        from .registry import error_for

        error = error_for(cls)
        accepted = cls.accepted_options()
        shown = ", ".join(accepted) if accepted else "none"
        parameters = cls._init_signature().parameters
        takes_any = any(p.kind is p.VAR_KEYWORD for p in parameters.values())
        unknown = [k for k in kwargs if k not in accepted] if not takes_any else []
        if unknown:
            key = unknown[0]
            lowered = {name.lower(): name for name in accepted}
            close = [lowered[key.lower()]] if key.lower() in lowered else difflib.get_close_matches(key, accepted, n=1)
            hint = f" (did you mean {close[0]!r}?)" if close else ""
            return error(f"{cls._owner()} has no option {key!r}{hint}; accepted options: {shown}")
        positional = [p.name for p in list(parameters.values())[1:]
                      if p.kind in (p.POSITIONAL_ONLY, p.POSITIONAL_OR_KEYWORD)]
        if len(args) > len(positional):
            first = f"{len(positional)} positional option(s) ({', '.join(positional)})" if positional else \
                "its options by keyword only"
            return error(f"{cls._owner()} takes {first} and was given {len(args)} positional values; give options "
                         f"by keyword: {shown}")
        detail = str(err)
        return error(f"{cls._owner()}: {detail}; accepted options: {shown}")


class Component(metaclass=ComponentMeta):
    """Base of every component. Subclasses are (frozen) dataclasses of options; see the module docstring.

    Class attributes a subclass may set: ``constraints`` (option name -> :class:`~groundkit.constraints.
    Constraint`); and override ``check_options()`` for checks across options, ``options()`` when the constructor's
    arguments are not attributes of the same names.
    """

    constraints: ClassVar[dict[str, Constraint]] = {}

    def __init_subclass__(cls, *, role: str | None = None, error: type | None = None, **kwargs: Any) -> None:
        """``class TrialState(Component, role="trial_state")`` makes the class a base of that role."""
        super().__init_subclass__(**kwargs)
        if role is not None:
            from .registry import define_role

            define_role(role, cls, error)

    @classmethod
    def display_name(cls) -> str:
        """How messages name the class (its class name unless a role says otherwise)."""
        return cls.__name__

    def check_options(self) -> None:
        """Checks that involve several options (raise the role's error); none by default."""
        return None

    def options(self) -> dict[str, Any]:
        """The constructor's arguments that rebuild this component: ``type(self)(**self.options()) == self``."""
        return {name: getattr(self, name) for name in type(self).accepted_options()}

    def _check_declared(self) -> None:
        from .registry import error_for

        cls = type(self)
        for name, constraint in cls.declared_constraints().items():
            if not hasattr(self, name):
                continue
            value = getattr(self, name)
            try:
                checked = constraint.check(value)
            except Refused as refusal:
                raise error_for(cls)(f"{cls._owner()}({name}={_shown(value)}): {name} must be {refusal}") from None
            if checked is not value:
                object.__setattr__(self, name, checked)

    def to_dict(self) -> dict[str, Any]:
        """``{"role", "name", "options"}`` with JSON values; :func:`component_from_dict` builds it back."""
        from .registry import name_of, role_of

        name = name_of(self)
        options = {}
        for key, value in self.options().items():
            options[key] = encode_option(value, f"{type(self).__name__}.{key}")
        return {"role": role_of(self), "name": name, "options": options}

    @classmethod
    def from_dict(cls, data: Any) -> Any:
        """The component described by ``data`` (a :meth:`to_dict` record); it must be an instance of ``cls``."""
        component = component_from_dict(data)
        if not isinstance(component, cls):
            raise ComponentError(f"{_shown(data)} describes a {type(component).__name__}, not a {cls.__name__}")
        return component


def encode_option(value: Any, where: str) -> Any:
    """A JSON form of one option value (see the module docstring); ComponentError for one without."""
    if value is None or isinstance(value, (bool, str)):
        return value
    if isinstance(value, np.bool_):
        return bool(value)
    if isinstance(value, (int, np.integer)):
        return int(value)
    if isinstance(value, (float, np.floating)):
        value = float(value)
        if math.isfinite(value):
            return value
        return {"float": "nan" if math.isnan(value) else ("inf" if value > 0 else "-inf")}
    if isinstance(value, Component):
        return value.to_dict()
    if isinstance(value, (tuple, list)):
        return [encode_option(v, where) for v in value]
    if isinstance(value, np.ndarray):
        return [encode_option(v, where) for v in value.tolist()]
    module = type(value).__module__ or ""
    if module.startswith("cirq"):
        import cirq

        if isinstance(value, cirq.AbstractCircuit):
            return {"cirq": json.loads(cirq.to_json(value))}
    if module.startswith("sympy"):
        import sympy

        if isinstance(value, sympy.Symbol):
            return value.name
    if isinstance(value, dict) and all(isinstance(k, str) for k in value):
        return {"dict": {k: encode_option(v, where) for k, v in value.items()}}
    raise ComponentError(f"{where} holds {_shown(value)} ({type(value).__name__}), which has no JSON form; "
                         "options must be numbers, strings, booleans, None, lists, components or Cirq circuits")


def decode_option(value: Any) -> Any:
    """The option value of a JSON form written by :func:`encode_option` (lists become tuples)."""
    if isinstance(value, list):
        return tuple(decode_option(v) for v in value)
    if isinstance(value, dict):
        if set(value) == set(_RECORD_KEYS):
            return component_from_dict(value)
        if set(value) == {"float"} and value["float"] in ("inf", "-inf", "nan"):
            return float(value["float"])
        if set(value) == {"cirq"}:
            import cirq

            try:
                return cirq.read_json(json_text=json.dumps(value["cirq"]))
            except Exception as err:  # cirq raises ValueError, KeyError, TypeError for malformed records
                raise ComponentError(f"a stored Cirq circuit could not be read ({type(err).__name__}: {err})") \
                    from None
        if set(value) == {"dict"} and isinstance(value["dict"], dict):
            return {k: decode_option(v) for k, v in value["dict"].items()}
        raise ComponentError(f"option value {_shown(value)} is not a component record, a circuit or a number")
    return value


def component_from_dict(data: Any, role: str | None = None) -> Any:
    """The component of a :meth:`Component.to_dict` record; ``role`` (if given) must match the record's."""
    from .registry import lookup

    if not isinstance(data, dict) or set(data) != set(_RECORD_KEYS):
        raise ComponentError(f"{_shown(data)} is not a component record; expected an object with keys "
                             f"{', '.join(_RECORD_KEYS)}")
    stored_role, name, options = data["role"], data["name"], data["options"]
    if not isinstance(stored_role, str) or not isinstance(name, str) or not isinstance(options, dict):
        raise ComponentError(f"{_shown(data)}: role and name must be strings and options an object")
    if role is not None and stored_role != role:
        raise ComponentError(f"{_shown(data)} is a {stored_role} record where a {role} is expected")
    cls = lookup(stored_role, name)
    return cls(**{str(k): decode_option(v) for k, v in options.items()})
