"""Calls from a lower layer into a higher one, bound late: the higher layer provides the function when it loads.

The layers (DEVELOPERS.md, "Layers"; checked by import-linter) let a module import only its own layer and those
below. A few conveniences still go upwards: a molecule's ``pipeline()``, the notebook display of molecules,
problems, results and scans (``_repr_html_``, ``show``, ``plot``), and ``Pipeline.scan``. The lower module calls
``upcall("name", ...)``; the module that owns the work registers it with ``@provides("name")`` at import time.
``import groundkit`` loads every layer, so every name is provided before user code runs.
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any, TypeVar

F = TypeVar("F", bound=Callable[..., Any])

_PROVIDED: dict[str, Callable[..., Any]] = {}


def provides(name: str) -> Callable[[F], F]:
    """Decorator: register ``function`` as the provider of ``name`` (the last registration wins)."""
    def register(function: F) -> F:
        _PROVIDED[name] = function
        return function

    return register


def upcall(name: str, *args: Any, **kwargs: Any) -> Any:
    """Call the provider of ``name``; RuntimeError if the layer that provides it was never imported."""
    function = _PROVIDED.get(name)
    if function is None:
        import importlib

        importlib.import_module("groundkit")  # the package loads every layer and so every provider
        function = _PROVIDED.get(name)
    if function is None:
        raise RuntimeError(f"nothing provides {name!r}; import groundkit (its layers register their providers)")
    return function(*args, **kwargs)
