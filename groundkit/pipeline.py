"""Pipeline: a fluent, immutable chain of components from a molecule to a result.

Every chaining call returns a new Pipeline; the old one is untouched. Computed work lives in shared Problem
objects (see :func:`groundkit.problem.build_problem`), so pipelines that differ only downstream share it.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

from .active_space import ActiveSpace
from .errors import ComponentError
from .molecule import MoleculeSpec
from .problem import Problem, build_problem


@dataclass(frozen=True)
class _Components:
    molecule: MoleculeSpec | None = None
    active_space: ActiveSpace | None = None


class Pipeline:
    """``Pipeline(molecule)`` or ``molecule.pipeline()``; ``Pipeline()`` holds components without a molecule."""

    __slots__ = ("_components",)

    def __init__(self, molecule: MoleculeSpec | None = None) -> None:
        if molecule is not None and not isinstance(molecule, MoleculeSpec):
            raise ComponentError(f"Pipeline takes a MoleculeSpec or nothing, got {type(molecule).__name__}")
        self._components = _Components(molecule=molecule)

    def _with(self, **changes) -> Pipeline:
        new = Pipeline.__new__(Pipeline)
        new._components = replace(self._components, **changes)
        return new

    # chaining -------------------------------------------------------------------------------------------------
    def molecule(self, molecule: MoleculeSpec) -> Pipeline:
        """A pipeline with the same components for another molecule."""
        if not isinstance(molecule, MoleculeSpec):
            raise ComponentError(f"molecule must be a MoleculeSpec, got {type(molecule).__name__}")
        return self._with(molecule=molecule)

    def active_space(self, space: ActiveSpace | None = None, **options) -> Pipeline:
        """Choose the active space: an :class:`ActiveSpace`, or its options (``electrons=2, orbitals=3``)."""
        if space is None:
            space = ActiveSpace(**options)
        elif options:
            raise ComponentError("give an ActiveSpace or keyword options, not both")
        elif not isinstance(space, ActiveSpace):
            raise ComponentError(f"active_space takes an ActiveSpace, got {space!r}")
        return self._with(active_space=space)

    # components and computed objects ------------------------------------------------------------------------
    @property
    def components(self) -> dict:
        """The configured components by role (None where the default applies)."""
        c = self._components
        return {"molecule": c.molecule, "active_space": c.active_space}

    def problem(self) -> Problem:
        """The active-space problem with its exact reference and baselines (shared, computed once)."""
        molecule = self._components.molecule
        if molecule is None:
            raise ComponentError("this pipeline has no molecule yet; use Pipeline(molecule) or .molecule(spec)")
        return build_problem(molecule, self._components.active_space)

    def __repr__(self) -> str:
        c = self._components
        mol = "no molecule" if c.molecule is None else repr(c.molecule)
        space = repr(c.active_space or ActiveSpace())
        return f"Pipeline({mol}\n  .active_space({space}))"
