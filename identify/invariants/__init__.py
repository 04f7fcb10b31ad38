"""Knot invariants computed exactly from a diagram."""
