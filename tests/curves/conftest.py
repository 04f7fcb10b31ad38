"""Fixtures of the 3D tests: the reference table (shipped, or a partial one built for the run)."""

from __future__ import annotations

import pytest

from knotsift.errors import TableError


@pytest.fixture(scope="session")
def table(tmp_path_factory):
    """The shipped table; while it is not there yet, one built from reference/ for this run."""
    from knotsift.table import ReferenceTable, open_table

    try:
        return open_table()
    except TableError:
        pass
    try:
        from knotsift.data_build.build import build_table

        path = tmp_path_factory.mktemp("table") / "knots.sqlite"
        build_table(path, max_crossings=10, keep_going=True, show_progress=False)
        return ReferenceTable(path)
    except Exception as exc:  # the builder is someone else's work in progress
        pytest.skip(f"no reference table available ({exc})")


def has_name(table, name: str) -> bool:
    return table.knot(name) is not None
