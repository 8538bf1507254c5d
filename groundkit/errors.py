"""One hierarchy of errors. Every bad-input error is a ``ValueError`` and says what was wrong and what is accepted."""

from __future__ import annotations


class GroundkitError(ValueError):
    """Base of every groundkit error."""


class MoleculeError(GroundkitError):
    """A molecule that cannot exist as given: symbols, coordinates, charge or multiplicity."""


class ElementError(MoleculeError):
    """An element symbol that is not in the periodic table."""


class GeometryError(MoleculeError):
    """Coordinates of the wrong shape, non-finite, or atoms too close together."""


class ChargeError(MoleculeError):
    """A charge that leaves no electrons or a negative electron count."""


class MultiplicityError(MoleculeError):
    """A spin multiplicity below 1 or of the wrong parity for the electron count."""


class BasisError(MoleculeError):
    """A basis set name that PySCF does not know."""


class XYZFormatError(MoleculeError):
    """Malformed XYZ text; the message gives the line number."""


class ActiveSpaceError(GroundkitError):
    """An active space that the molecule cannot supply."""


class ConvergenceError(GroundkitError):
    """A self-consistent field that did not converge after every remedy was tried."""


class SizeLimitError(GroundkitError):
    """A computation above a documented size limit (determinants, qubits)."""


class ExcitationError(GroundkitError):
    """An excitation that breaks particle number or Sz, repeats an index or leaves the orbital range."""


class ParameterError(GroundkitError):
    """A parameter vector of the wrong length or with non-finite entries."""


class ComponentError(GroundkitError):
    """An unknown component name or an option out of range."""


class WorkspaceBudgetError(GroundkitError):
    """A workspace budget that is not a positive, finite number of bytes."""


class DegenerateBoundaryWarning(UserWarning):
    """An active-space boundary that cuts through a set of degenerate orbitals."""


class ResultFileError(GroundkitError):
    """A result file that is truncated, of another schema or version, or not a groundkit result."""


class SymmetryError(GroundkitError):
    """Tapering asked for where no Z2 symmetry is left, or an operator that breaks a tapered symmetry."""


class ScanInputError(GroundkitError):
    """Scan values or a geometry function that cannot make a scan (empty, not numbers, not a MoleculeSpec)."""


class CheckpointError(GroundkitError):
    """A checkpoint directory of another configuration, or one whose files are not groundkit scan points."""


class AnalysisError(GroundkitError):
    """A scan that cannot give the asked analysis (too few points, minimum at an end, not a diatomic)."""


class StudyFileError(GroundkitError):
    """A TOML study file that is malformed or holds an unknown key; the message names the key and line."""


class ExecutorError(GroundkitError):
    """An executor that is neither None, 'serial', 'processes', a concurrent.futures Executor nor a Dask Client."""


class IntegralConsistencyError(RuntimeError):
    """Internal fault: the Hartree–Fock determinant's energy from the active-space integrals is not the SCF energy.

    Never caused by input; it means the orbital order or the integral transformation is wrong. Please report it.
    Deliberately not a :class:`GroundkitError` (bad input): studies raise it instead of recording a failed row.
    """


class OrbitalJumpWarning(UserWarning):
    """A scan's CASSCF solution at one point is not the continuation of the previous point's."""


class ScfWarning(UserWarning):
    """Base of the warnings about an SCF solution that converged but deserves a second look."""


class ScfFallbackWarning(ScfWarning):
    """Plain DIIS did not converge: a level shift or the second-order solver was needed."""


class ScfInstabilityWarning(ScfWarning):
    """PySCF's stability analysis found a lower-energy solution (internal, or RHF→UHF for closed shells)."""


class CheckpointBusyError(CheckpointError):
    """A checkpoint directory locked by another running scan; the message names the holder (pid, host, since)."""


class OutputExistsError(StudyFileError):
    """A study's output directory that already holds results, run without ``--resume`` or ``--overwrite``."""


class CheckpointWarning(UserWarning):
    """A checkpoint point file that failed a check (checksum, value, molecule); it is set aside and recomputed."""


class ExcludedPointsWarning(UserWarning):
    """Scan points left out of a curve fit because their minimisation did not converge."""


class ResultFieldError(ResultFileError):
    """A field of a result, scan or checkpoint file that fails validation.

    ``source`` is the file, ``path`` the field (e.g. ``history.energies[3]``), ``value`` a short form of what was
    found (None when the field is missing) and ``expected`` what is accepted there.
    """

    def __init__(self, source: str, path: str, value: str | None, expected: str) -> None:
        self.source, self.path, self.value, self.expected = source, path, value, expected
        found = "is missing" if value is None else f"is {value}"
        super().__init__(f"{source}: {path} {found}; expected {expected}")

    def __reduce__(self) -> tuple:
        return (type(self), (self.source, self.path, self.value, self.expected))


class DeviceError(GroundkitError):
    """A device profile that cannot be used: connectivity, native gate, durations or error figures."""


class NoiseError(GroundkitError):
    """A noise model or mitigation option that cannot be used, or a noisy estimate with nothing left to average."""
