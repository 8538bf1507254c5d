"""Components from instances, registered names or saved records: ``.mapping("parity")``, ``.trial_state("uccsd")``.

Every name goes through the registry (:mod:`groundkit.registry`), so a user's registered class is found the same
way as a built-in; options given with a name go to the class's constructor, which refuses unknown ones.
"""

from __future__ import annotations

from typing import Any

from .component import component_from_dict
from .errors import ComponentError
from .registry import build, is_component_of, role


def as_component(role_name: str, value: Any, **options: Any) -> Any:
    """``value`` itself when it is a component of ``role_name``; the registered class built with ``options`` when
    it is a name; the component of a saved record (``{"role", "name", "options"}``)."""
    what = role_name.replace("_", " ")
    if is_component_of(role_name, value):
        if options:
            raise ComponentError(f"give a {what} object or a {what} name with options, not both "
                                 f"(got {value!r} and {', '.join(sorted(options))})")
        return value
    if isinstance(value, str):
        return build(role_name, value, **options)
    if isinstance(value, dict) and not options:
        return component_from_dict(value, role_name)
    kinds = " or ".join(b.__name__ for b in role(role_name).bases)
    raise ComponentError(f"{what} {value!r} is neither a {kinds} nor a registered {what} name")


def as_active_space(value: Any = None, **options: Any) -> Any:
    """An ActiveSpace from an instance, a name ('active-space') or options (``electrons=2, orbitals=2``)."""
    return as_component("active_space", "active-space" if value is None else value, **options)


def as_mapping(value: Any, **options: Any) -> Any:
    """A QubitMapping from an instance or a name ('jordan-wigner', 'bravyi-kitaev', 'parity', a user's)."""
    return as_component("mapping", value, **options)


def as_trial_state(value: Any, **options: Any) -> Any:
    """A trial state from an instance or a name ('uccsd', 'pair-doubles', 'upccgsd', 'reference-determinant',
    'adaptive', 'hardware-efficient', 'excitation-list' with ``excitations=[...]``, 'pauli-rotations' with
    ``strings=[...]``, or a user's registered name)."""
    return as_component("trial_state", value, **options)


def as_estimator(value: Any, **options: Any) -> Any:
    """An estimator from an instance or a name ('exact', 'sampled', 'noisy', a user's)."""
    return as_component("estimator", value, **options)


def as_minimiser(value: Any, **options: Any) -> Any:
    """A minimiser from an instance or a name ('bfgs', 'cobyla', 'spsa', ..., a user's)."""
    return as_component("minimiser", value, **options)
