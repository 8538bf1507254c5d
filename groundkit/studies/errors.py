"""Errors of the studies layer; they live in :mod:`groundkit.errors` with the rest of the hierarchy."""

from groundkit.errors import AnalysisError, CheckpointError, ExecutorError, ScanInputError, StudyFileError

__all__ = ["AnalysisError", "CheckpointError", "ExecutorError", "ScanInputError", "StudyFileError"]
