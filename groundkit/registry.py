"""The registry: every component class under a role and a name, built-ins and users' alike.

Roles: ``active_space``, ``mapping``, ``trial_state``, ``estimator``, ``minimiser`` and ``pool`` (the operator
pools of adaptive states); later roles (a device profile, a measurement grouping) are added with
:func:`define_role`. A class joins a role with the decorator::

    @gk.register("trial_state", "my-pairs", label="my pair doubles")
    @dataclass(frozen=True)
    class MyPairs(gk.TrialState): ...

after which ``Pipeline().trial_state("my-pairs")``, TOML study files, ``gk.compare``, the explorer and saved
results all know it. Names are looked up with case, spaces, ``-`` and ``_`` ignored ("Hartree-Fock",
"hartree_fock" and "HartreeFock" are one name); a class's own name is always accepted too, and ``aliases`` keep
former names working.
"""

from __future__ import annotations

import difflib
from dataclasses import dataclass, field
from typing import Any

from .errors import ComponentError, GroundkitError


@dataclass
class Entry:
    """One registered class: its role, name, aliases, readable label and whether selectors list it."""

    role: str
    name: str
    cls: type
    aliases: tuple[str, ...] = ()
    label: str = ""
    listed: bool = True


@dataclass
class Role:
    """A role: the base classes its components derive from, and the error its bad options raise."""

    name: str
    bases: list[type] = field(default_factory=list)
    error: type[GroundkitError] = ComponentError
    entries: dict[str, Entry] = field(default_factory=dict)  # registered name -> entry, in registration order
    keys: dict[str, Entry] = field(default_factory=dict)  # folded name or alias -> entry


_ROLES: dict[str, Role] = {}
_BY_CLASS: dict[type, Entry] = {}
ROLE_NAMES = ("active_space", "mapping", "trial_state", "estimator", "minimiser", "pool")


def fold(name: str) -> str:
    """The lookup key of a name: lower case, letters and digits only."""
    return "".join(ch for ch in str(name).lower() if ch.isalnum())


def define_role(role: str, base: type | None = None, error: type[GroundkitError] | None = None) -> Role:
    """Create ``role`` (or add ``base`` to its base classes); ``error`` is the class its refusals raise."""
    entry = _ROLES.get(role)
    if entry is None:
        entry = _ROLES[role] = Role(role)
    if base is not None and base not in entry.bases:
        entry.bases.append(base)
    if error is not None:
        entry.error = error
    return entry


def role(name: str) -> Role:
    """The role called ``name``; ComponentError listing the roles for anything else."""
    _load_builtins()
    if not isinstance(name, str) or name not in _ROLES:
        raise ComponentError(f"unknown component role {name!r}; accepted roles: {', '.join(_ROLES)}")
    return _ROLES[name]


def register(role_name: str, name: str, *, aliases: tuple[str, ...] | list[str] = (), label: str | None = None,
             listed: bool = True) -> Any:
    """Class decorator: register the class under ``role_name`` as ``name`` (and ``aliases``).

    The class's own name is accepted too, unless another class of the role already answers to it.
    ``label`` is the readable text selectors show (default: the name); ``listed=False`` keeps a class that
    needs options (e.g. a list of excitations) out of selectors, while its name still works. Refused with a
    ComponentError: an unknown role, a class that is not a component of that role, a name taken by another
    class of the role. Registering a class again under the same name (a notebook cell run twice) replaces it.
    """
    if role_name not in _ROLES and role_name not in ROLE_NAMES:
        raise ComponentError(f"register({role_name!r}, {name!r}): unknown role {role_name!r}; accepted roles: "
                             f"{', '.join(dict.fromkeys((*ROLE_NAMES, *_ROLES)))}")
    target = define_role(role_name)
    if not isinstance(name, str) or not fold(name):
        raise ComponentError(f"register({role_name!r}, {name!r}): the name must be a non-empty string")
    if isinstance(aliases, str):
        aliases = (aliases,)

    def decorate(cls: Any) -> Any:
        from .component import Component

        if not isinstance(cls, type) or not issubclass(cls, Component):
            raise ComponentError(
                f"register({role_name!r}, {name!r}) was given {cls!r}, which is not a component class; decorate a "
                f"subclass of one of {_base_names(target)}"
            )
        if target.bases and not issubclass(cls, tuple(target.bases)):
            raise ComponentError(
                f"register({role_name!r}, {name!r}): {cls.__name__} is not a {role_name.replace('_', ' ')} class; "
                f"a {role_name} derives from {_base_names(target)}"
                + _actual_role(cls)
            )
        explicit = (name, *aliases)
        keys = [fold(k) for k in explicit]
        class_key = fold(cls.__name__)  # the class name is a name too, unless another class already holds it
        holder = target.keys.get(class_key)
        if class_key not in keys and (holder is None or holder.cls is cls or _same_definition(holder.cls, cls)):
            keys.append(class_key)
        for key, shown in zip(keys, explicit):
            holder = target.keys.get(key)
            if holder is not None and holder.cls is not cls and not _same_definition(holder.cls, cls):
                raise ComponentError(
                    f"register({role_name!r}, {name!r}): the {role_name} name {shown!r} is taken by "
                    f"{holder.cls.__module__}.{holder.cls.__qualname__} (registered as {holder.name!r}); choose "
                    f"another name"
                )
        old = _BY_CLASS.get(cls)
        if old is not None and (old.role != role_name or old.name != name):
            raise ComponentError(
                f"register({role_name!r}, {name!r}): {cls.__name__} is already registered as {old.role} "
                f"{old.name!r}; a class has one name (give aliases= for more)"
            )
        for key in keys:
            previous = target.keys.get(key)
            if previous is not None and previous.cls is not cls:  # a redefinition replaces the old class
                _forget(target, previous)
        entry = Entry(role_name, name, cls, tuple(aliases), label or name, listed)
        target.entries[name] = entry
        for key in keys:
            target.keys[key] = entry
        _BY_CLASS[cls] = entry
        return cls

    return decorate


def unregister(role_name: str, name: str) -> type:
    """Remove the class registered as ``name`` (or an alias) from ``role_name``; returns it."""
    target = role(role_name)
    cls = lookup(role_name, name)
    _forget(target, _BY_CLASS[cls])
    return cls


def _forget(target: Role, entry: Entry) -> None:
    target.entries.pop(entry.name, None)
    for key in [k for k, e in target.keys.items() if e is entry]:
        del target.keys[key]
    _BY_CLASS.pop(entry.cls, None)


def _same_definition(a: type, b: type) -> bool:
    return a.__module__ == b.__module__ and a.__qualname__ == b.__qualname__


def _base_names(target: Role) -> str:
    return " or ".join(b.__name__ for b in target.bases) or "groundkit.component.Component"


def _actual_role(cls: type) -> str:
    for other in _ROLES.values():
        if other.bases and issubclass(cls, tuple(other.bases)):
            return f" (it is a {other.name.replace('_', ' ')}: register it under {other.name!r})"
    return ""


def lookup(role_name: str, name: str) -> type:
    """The class registered for ``role_name`` under ``name`` (or an alias); ComponentError listing the names."""
    target = role(role_name)
    entry = target.keys.get(fold(name)) if isinstance(name, str) else None
    if entry is None:
        accepted = ", ".join(target.entries)
        close = difflib.get_close_matches(fold(name) if isinstance(name, str) else "", list(target.keys), n=1)
        hint = f" (did you mean {target.keys[close[0]].name!r}?)" if close else ""
        raise target.error(f"unknown {role_name.replace('_', ' ')} {name!r}{hint}; accepted names: {accepted}")
    return entry.cls


def build(role_name: str, name: str, **options: Any) -> Any:
    """An instance of the class registered as ``name``, built with ``options``."""
    return lookup(role_name, name)(**options)


def entry_of(value: Any) -> Entry | None:
    """The registry entry of a component class or instance (exact class), or None if it is not registered."""
    cls = value if isinstance(value, type) else type(value)
    return _BY_CLASS.get(cls)


def name_of(value: Any) -> str:
    """The registered name of a component (class or instance); ComponentError when its class is not registered."""
    entry = entry_of(value)
    if entry is None:
        cls = value if isinstance(value, type) else type(value)
        role_name = role_of(cls)
        raise ComponentError(
            f"{cls.__name__} is not registered, so it has no name to save or look up; decorate it with "
            f"@groundkit.register({role_name or 'role'!r}, 'a-name')"
        )
    return entry.name


def role_of(value: Any) -> str | None:
    """The role whose base classes a component (class or instance) derives from, or None."""
    cls = value if isinstance(value, type) else type(value)
    entry = _BY_CLASS.get(cls)
    if entry is not None:
        return entry.role
    for target in _ROLES.values():
        if target.bases and issubclass(cls, tuple(target.bases)):
            return target.name
    return None


def is_component_of(role_name: str, value: Any) -> bool:
    """True when ``value`` is an instance of the role's base classes."""
    target = _ROLES.get(role_name) or role(role_name)
    return bool(target.bases) and isinstance(value, tuple(target.bases))


def names(role_name: str) -> tuple[str, ...]:
    """The registered names of a role, in registration order (built-ins first)."""
    return tuple(role(role_name).entries)


def entries(role_name: str, *, listed_only: bool = False) -> tuple[Entry, ...]:
    """The registry entries of a role; ``listed_only`` keeps those that selectors show."""
    return tuple(e for e in role(role_name).entries.values() if e.listed or not listed_only)


def error_for(cls: type) -> type[GroundkitError]:
    """The error class a component class's refusals raise (its role's)."""
    role_name = role_of(cls)
    return _ROLES[role_name].error if role_name else ComponentError


_builtins_loaded = False


def _load_builtins() -> None:
    """Import the built-in component modules once, so their registrations exist before the first lookup."""
    global _builtins_loaded
    if _builtins_loaded:
        return
    _builtins_loaded = True
    from . import active_space, estimators, mapping, minimisers, qubit_states, trial_states  # noqa: F401
    from .adaptive import component, pools, qubit_pool  # noqa: F401
    from .device import builtins, figures  # noqa: F401
