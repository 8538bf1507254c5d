"""Shorthand names for components: ``.mapping("parity")``, ``.trial_state("uccsd")``, ``.minimiser("cobyla")``."""

from __future__ import annotations

import inspect
from collections.abc import Callable
from typing import Any

from .errors import ComponentError
from .estimators import Estimator, ExactEstimator
from .mapping import QubitMapping


def _component(
    role: str, value: Any, kind: type | tuple[type, ...], build: Callable[..., Any], options: dict[str, Any]
) -> Any:
    """``value`` itself when it is a ``kind`` instance; ``build(name, options)`` when it is a name."""
    if isinstance(value, kind):
        if options:
            raise ComponentError(f"give a {role} object or a {role} name with options, not both")
        return value
    if isinstance(value, str):
        return build(value, options)
    kinds = " or ".join(k.__name__ for k in (kind if isinstance(kind, tuple) else (kind,)))
    raise ComponentError(f"{role} {value!r} is neither a {kinds} nor a {role} name")


def _from_table(role: str, table: dict[str, Any]) -> Callable[..., Any]:
    def build(name: str, options: dict[str, Any]) -> Any:
        key = name.strip().lower()
        if key not in table:
            raise ComponentError(f"unknown {role} {name!r}; accepted: {', '.join(sorted(table))}")
        return build_with_options(table[key], options)

    return build


def build_with_options(cls: type, options: dict[str, Any]) -> Any:
    """``cls(**options)``; an option name ``cls`` does not take is a ComponentError naming it and the accepted ones."""
    try:
        parameters = inspect.signature(cls).parameters.values()
    except (TypeError, ValueError):  # no signature to read: let the constructor decide
        return cls(**options)
    if not any(p.kind is inspect.Parameter.VAR_KEYWORD for p in parameters):
        accepted = [p.name for p in parameters if p.kind in (inspect.Parameter.POSITIONAL_OR_KEYWORD,
                                                              inspect.Parameter.KEYWORD_ONLY)]
        unknown = sorted(set(options) - set(accepted))
        if unknown:
            raise ComponentError(
                f"{cls.__name__} does not take option(s) {', '.join(map(repr, unknown))}; accepted options: "
                f"{', '.join(accepted) or 'none'}"
            )
    return cls(**options)


def as_mapping(value: Any, **options: Any) -> QubitMapping:
    """A QubitMapping from an instance or a name ('jordan-wigner', 'bravyi-kitaev', 'parity')."""
    def build(name: str, given: dict[str, Any]) -> QubitMapping:
        if "name" in given:
            raise ComponentError(f"give the mapping name once: {name!r} and name={given['name']!r}")
        return build_with_options(QubitMapping, {"name": name, **given})

    return _component("mapping", value, QubitMapping, build, options)


def as_trial_state(value: Any, **options: Any) -> Any:
    """A trial state from an instance or a name ('uccsd', 'puccd', 'upccgsd', 'hartree-fock', 'adaptive',
    'hardware-efficient', 'excitation-list' with ``excitations=[...]``, 'pauli-rotations' with
    ``strings=[...]``)."""
    from .adaptive import Adaptive
    from .qubit_states import HardwareEfficient, PauliRotations, QubitTrialState
    from .trial_states import UCCSD, ExcitationList, PairDoubles, ReferenceDeterminant, TrialState, UpCCGSD

    table = {"uccsd": UCCSD, "pair-doubles": PairDoubles, "puccd": PairDoubles, "upccgsd": UpCCGSD,
             "k-upccgsd": UpCCGSD, "reference-determinant": ReferenceDeterminant, "hf": ReferenceDeterminant,
             "hartree-fock": ReferenceDeterminant, "adaptive": Adaptive, "hardware-efficient": HardwareEfficient,
             "excitation-list": ExcitationList, "pauli-rotations": PauliRotations}
    return _component("trial state", value, (TrialState, QubitTrialState), _from_table("trial state", table),
                      options)


def as_estimator(value: Any, **options: Any) -> Estimator:
    """An estimator from an instance or a name ('exact', 'sampled', 'noisy')."""
    from .estimators import NoisyEstimator, SampledEstimator

    table = {"exact": ExactEstimator, "sampled": SampledEstimator, "noisy": NoisyEstimator}
    return _component("estimator", value, Estimator, _from_table("estimator", table), options)


def as_minimiser(value: Any, **options: Any) -> Any:
    """A minimiser from an instance or a name (see ``groundkit.minimisers.minimiser_from_name``)."""
    from .minimisers import Minimiser, minimiser_from_name

    return _component("minimiser", value, Minimiser, lambda name, given: minimiser_from_name(name, **given), options)
