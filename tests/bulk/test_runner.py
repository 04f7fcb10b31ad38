"""Runs: local processes and a real Dask cluster give the serial rows; resuming adds none twice."""

from __future__ import annotations

import pytest

from knotsift.bulk.rows import ClassifyOptions
from knotsift.bulk.runner import chunked, classify
from knotsift.bulk.summary import read_results

from .inputs import agrees_with_expected, comparable


@pytest.fixture(scope="module")
def serial_rows(scrambled, tmp_path_factory):
    path, _ = scrambled
    out = tmp_path_factory.mktemp("serial") / "serial.sqlite"
    report = classify([path], out, workers=1, chunk=25, progress=False)
    return report, comparable(read_results(out))


def test_classify_serial_counts_and_failures(serial_rows, scrambled):
    """Every item is a row; the unreadable codes are the failed ones."""
    report, rows = serial_rows
    _, inputs = scrambled
    assert report.total == report.written == len(rows) == len(inputs)
    assert report.failed == sum(1 for r in inputs if not r["expected"]) == 4
    assert {r["label"] for r in rows if r["status"] == "error"} == \
        {r["label"] for r in inputs if not r["expected"]}
    expected = {r["label"]: r["expected"] for r in inputs}
    assert all(agrees_with_expected(r["status"], r["knot"], r["candidates"], expected[r["label"]])
               for r in rows if r["status"] != "error")


def test_classify_processes_equal_serial(serial_rows, scrambled, tmp_path):
    """Two local worker processes give the serial rows (timing aside), as CSV."""
    path, _ = scrambled
    out = tmp_path / "two.csv"
    report = classify([path], out, workers=2, chunk=17, progress=False)
    assert report.backend == "process" and report.failed == 4
    assert comparable(read_results(out)) == serial_rows[1]


def test_classify_dask_local_cluster_equals_serial(serial_rows, scrambled, tmp_path):
    """A real dask.distributed LocalCluster of 2 worker processes gives the serial rows."""
    pytest.importorskip("dask.distributed")
    from dask.distributed import Client, LocalCluster

    path, _ = scrambled
    out = tmp_path / "dask.parquet"
    with LocalCluster(n_workers=2, threads_per_worker=1, processes=True,
                      dashboard_address=None) as cluster, Client(cluster) as client:
        assert len(client.scheduler_info()["workers"]) == 2
        report = classify([path], out, dask=cluster.scheduler_address, chunk=20,
                          progress=False)
        assert report.backend == "dask"
        ran_on = client.run(lambda: __import__("os").getpid())
    assert len(set(ran_on.values())) == 2
    assert comparable(read_results(out)) == serial_rows[1]


def test_classify_resume_skips_done_items(scrambled, tmp_path, serial_rows):
    """A run stopped early (here: on part of the input) and run again on all of it writes
    only the rest: no duplicated and no missing rows."""
    path, rows = scrambled
    part = tmp_path / "part.csv"
    lines = path.read_text().splitlines(keepends=True)
    part.write_text("".join(lines[:60]))
    out = tmp_path / "r.sqlite"
    first = classify([part], out, workers=1, chunk=10, progress=False)
    part.write_text("".join(lines))  # the same file, now whole: the same keys
    second = classify([part], out, workers=2, chunk=10, progress=False)
    assert first.written == 59
    assert second.skipped == 59 and second.written == len(rows) - 59
    assert second.total == len(rows)
    got = read_results(out)
    assert got["key"].is_unique and len(got) == len(rows)

    def strip(r):
        return {k: v for k, v in r.items() if k not in ("key", "source")}

    by_line = sorted(comparable(got), key=lambda r: r["frame"])
    serial = sorted(serial_rows[1], key=lambda r: r["frame"])
    assert [strip(r) for r in by_line] == [strip(r) for r in serial]


def test_classify_options_mismatch_is_refused(tmp_path):
    """Resuming with another notation is refused before any work."""
    from knotsift.bulk.resume import ResumeError

    src = tmp_path / "c.txt"
    src.write_text("4 6 2\n")
    classify([src], tmp_path / "r.csv", workers=1, progress=False)
    with pytest.raises(ResumeError):
        classify([src], tmp_path / "r.csv", workers=1, progress=False,
                 options=ClassifyOptions(notation="dt"))


def test_chunked_bounds():
    """chunked yields lists of the given size and refuses size 0."""
    assert [len(c) for c in chunked(range(450), 200)] == [200, 200, 50]
    with pytest.raises(ValueError):
        next(chunked([1], 0))


def test_classify_progress_line_on_request(tmp_path, capsys):
    """With progress on, a line with the count and rate is drawn and closed."""
    src = tmp_path / "c.txt"
    src.write_text("4 6 2\n4 6 8 2\n")
    classify([src], tmp_path / "r.csv", workers=1, progress=True)
    err = capsys.readouterr().err
    assert "classify 2/2" in err and "/s" in err and "classify 2 done in" in err


def test_classify_progress_without_total_when_counting_is_long(tmp_path, capsys, monkeypatch):
    """A long input is not read twice for the display: past the counting time, no total."""
    import knotsift.bulk.runner as runner

    monkeypatch.setattr(runner, "COUNT_SECONDS", -1.0)
    src = tmp_path / "c.txt"
    src.write_text("4 6 2\n4 6 8 2\n")
    report = classify([src], tmp_path / "r.csv", workers=1, progress=True)
    err = capsys.readouterr().err
    assert report.written == 2
    assert "classify 2 " in err and "classify 2/2" not in err and "left" not in err


def test_classify_streams_one_chunk_at_a_time(tmp_path, monkeypatch):
    """Items are read lazily: when chunk k is classified, only k + 1 chunks have been read,
    however long the input (memory stays flat)."""
    import knotsift.bulk.runner as runner

    src = tmp_path / "long.txt"
    src.write_text("braid: s1\n" * 300)
    pulled: list[int] = []
    real_items, real_chunk = runner.iter_items, runner.classify_chunk

    def counting(*a, **k):
        for item in real_items(*a, **k):
            pulled.append(1)
            yield item

    seen: list[int] = []

    def spy(block, options):
        seen.append(len(pulled))
        return real_chunk(block, options)

    monkeypatch.setattr(runner, "iter_items", counting)
    monkeypatch.setattr(runner, "classify_chunk", spy)
    report = classify([src], tmp_path / "r.sqlite", workers=1, chunk=50, progress=False)
    assert report.written == 300
    assert seen == [50 * (k + 1) for k in range(6)]
