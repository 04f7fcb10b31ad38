"""Fixtures of the bulk tests: one scrambled batch of table knots, built once per session."""

from __future__ import annotations

import pytest

from .inputs import write_scrambled


@pytest.fixture(scope="session")
def scrambled(tmp_path_factory):
    """(path, rows) of a CSV of every table knot through 8 crossings, scrambled twice, plus
    a few unreadable codes."""
    path = tmp_path_factory.mktemp("inputs") / "scrambled.csv"
    return path, write_scrambled(path)
