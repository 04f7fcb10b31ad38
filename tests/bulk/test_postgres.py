"""Writing to and resuming from a real PostgreSQL server (started by .ci/run).

The server's URL comes from KNOTSIFT_TEST_POSTGRES_URL, e.g.
postgresql+psycopg://postgres@127.0.0.1:54329/knotsift_test; without it these
tests are skipped.
"""

from __future__ import annotations

import os
import subprocess
import sys
import textwrap
import uuid

import pytest

from knotsift.bulk.runner import classify
from knotsift.bulk.sinks import SQLSink
from knotsift.bulk.summary import read_results

from .inputs import comparable

URL = os.environ.get("KNOTSIFT_TEST_POSTGRES_URL")

pytestmark = pytest.mark.skipif(
    not URL, reason="no PostgreSQL server: set KNOTSIFT_TEST_POSTGRES_URL (.ci/run starts one)")


@pytest.fixture
def table_name():
    """A fresh table for each test, dropped afterwards."""
    import sqlalchemy as sa

    name = f"bulk_test_{uuid.uuid4().hex[:10]}"
    yield name
    engine = sa.create_engine(URL)
    with engine.begin() as conn:
        conn.execute(sa.text(f'DROP TABLE IF EXISTS "{name}", "{name}_meta"'))
    engine.dispose()


def test_postgres_write_then_resume_equals_sqlite(scrambled, tmp_path, table_name):
    """Half the input, then all of it, into PostgreSQL: every row once, equal to SQLite's."""
    path, rows = scrambled
    lines = path.read_text().splitlines(keepends=True)
    src = tmp_path / "batch.csv"
    src.write_text("".join(lines[:81]))
    first = classify([src], URL, workers=2, chunk=16, progress=False, table_name=table_name)
    assert first.written == 80
    src.write_text("".join(lines))
    second = classify([src], URL, workers=2, chunk=16, progress=False, table_name=table_name)
    assert (second.skipped, second.written, second.failed) == (80, len(rows) - 80, 4)
    got = read_results(URL, table=table_name)
    assert got["key"].is_unique and len(got) == len(rows)
    local = tmp_path / "r.sqlite"
    classify([src], local, workers=1, progress=False)
    assert comparable(got) == comparable(read_results(local))


_CRASH = textwrap.dedent("""
    import os, signal, sys
    import sqlalchemy
    from knotsift.bulk.rows import ClassifyOptions, classify_chunk
    from knotsift.bulk.sinks import SQLSink
    from knotsift.bulk.sources import iter_items

    url, table, src = sys.argv[1:]
    rows = classify_chunk(list(iter_items([src])), ClassifyOptions())
    sink = SQLSink(url, table)
    sink.prepare(ClassifyOptions().to_dict())
    sink.write(rows[:3])
    sqlalchemy.event.listen(sink.engine, "commit",
                            lambda conn: os.kill(os.getpid(), signal.SIGKILL))
    sink.write(rows[3:])
""")


def test_postgres_killed_inside_a_transaction_keeps_whole_chunks(tmp_path, table_name):
    """A client killed before its second chunk commits leaves only the first on the server."""
    src = tmp_path / "c.txt"
    src.write_text("DT: 4 6 2\nDT: 4 6 8 2\nbraid: s1\nDT: 4 8 10 2 6\nDT: 6 8 10 2 4\n")
    proc = subprocess.run([sys.executable, "-c", _CRASH, URL, table_name, str(src)],
                          capture_output=True, text=True, timeout=120)
    assert proc.returncode == -9, proc.stderr
    sink = SQLSink(URL, table_name)
    assert len(sink.done()) == 3
    sink.close()
    report = classify([src], URL, workers=1, progress=False, table_name=table_name)
    assert (report.skipped, report.written) == (3, 2)
    got = read_results(URL, table=table_name)
    # DT codes of 3_1, 4_1, 5_2, 5_1: Dowker and Thistlethwaite 1983 (from memory)
    assert sorted(got["knot_type"]) == ["0_1", "3_1", "4_1", "5_1", "5_2"]
    assert got["key"].is_unique
