"""Determinant-space engine: CI vectors over (alpha-string, beta-string) pairs."""
