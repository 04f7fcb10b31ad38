"""Sinks: the same rows back from CSV, Parquet and SQLite; chunks whole or absent after a crash."""

from __future__ import annotations

import json
import subprocess
import sys
import textwrap

import pytest

from knotsift.bulk.resume import ResumeError
from knotsift.bulk.rows import ClassifyOptions, classify_item
from knotsift.bulk.sinks import open_sink
from knotsift.bulk.sources import iter_items

from .inputs import comparable, write_mixed

OUTS = ["r.csv", "r.parquet", "r.sqlite"]


def _rows(tmp_path):
    return [r for i in iter_items([write_mixed(tmp_path / "mixed.txt")]) for r in classify_item(i)]


@pytest.mark.parametrize("name", OUTS)
def test_sink_round_trip(tmp_path, name):
    """Rows written in two chunks read back equal, in every sink, with their key status."""
    rows = _rows(tmp_path)
    sink = open_sink(tmp_path / name)
    sink.prepare(ClassifyOptions().to_dict())
    sink.write(rows[:4])
    sink.write(rows[4:])
    import pandas as pd

    back = sink.read()
    assert comparable(back) == comparable(pd.DataFrame(rows).astype(back.dtypes.to_dict()))
    assert sink.done() == {r["key"]: r["status"] for r in rows}


@pytest.mark.parametrize("name", OUTS)
def test_sink_refuses_other_options(tmp_path, name):
    """An output made with one notation is not resumed with another."""
    sink = open_sink(tmp_path / name)
    sink.prepare(ClassifyOptions().to_dict())
    with pytest.raises(ResumeError, match="notation: None there, 'dt' now"):
        open_sink(tmp_path / name).prepare(ClassifyOptions(notation="dt").to_dict())


def test_csv_sink_refuses_foreign_file(tmp_path):
    """A CSV file not written by knotsift is never appended to."""
    p = tmp_path / "r.csv"
    p.write_text("a,b\n1,2\n")
    with pytest.raises(ResumeError, match="not written by knotsift"):
        open_sink(p).prepare({})


def test_open_sink_rejects_unknown_form(tmp_path):
    """--out must name a known kind of output."""
    with pytest.raises(ResumeError, match="must end in"):
        open_sink(tmp_path / "r.xlsx")


_CRASH = textwrap.dedent("""
    import json, os, signal, sys
    from knotsift.bulk.rows import ClassifyOptions, classify_item
    from knotsift.bulk.sinks import open_sink
    from knotsift.bulk.sources import iter_items

    out, src = sys.argv[1], sys.argv[2]
    rows = [r for i in iter_items([src]) for r in classify_item(i)]
    sink = open_sink(out)
    sink.prepare(ClassifyOptions().to_dict())
    sink.write(rows[:5])

    def die(*a, **k):
        os.kill(os.getpid(), signal.SIGKILL)

    if out.endswith((".csv", ".parquet")):
        os.fsync = die              # dies after the chunk's bytes, before its commit
    else:
        import sqlalchemy
        sqlalchemy.event.listen(sink.engine, "commit", die)  # dies inside the transaction
    sink.write(rows[5:])
    print("not reached")
""")


@pytest.mark.parametrize("name", OUTS)
def test_sink_killed_inside_a_chunk_keeps_only_whole_chunks(tmp_path, name):
    """A process killed (SIGKILL) while writing its second chunk leaves exactly the first."""
    src = write_mixed(tmp_path / "mixed.txt")
    out = tmp_path / name
    proc = subprocess.run([sys.executable, "-c", _CRASH, str(out), str(src)],
                          capture_output=True, text=True, timeout=120)
    assert proc.returncode == -9, proc.stderr
    rows = _rows(tmp_path)
    sink = open_sink(out)
    sink.prepare(ClassifyOptions().to_dict())
    assert sorted(sink.done()) == sorted(r["key"] for r in rows[:5])
    sink.write(rows[5:])
    back = sink.read()
    assert sorted(back["key"]) == sorted(r["key"] for r in rows)
    assert back["key"].is_unique
    if name == "r.csv":
        manifest = (tmp_path / "r.csv.manifest").read_text().splitlines()
        assert [json.loads(line).get("rows") for line in manifest[1:]] == [5, len(rows) - 5]
