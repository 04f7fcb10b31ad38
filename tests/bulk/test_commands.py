"""The classify and summarise commands: outputs, summaries and exit codes."""

from __future__ import annotations

import json

import pytest

from knotsift.bulk.commands import CLOSURE_CHOICES, EXIT_OUTPUT
from knotsift.cli import main
from knotsift.demo import demo_path

from .inputs import write_mixed


def test_classify_command_exit_code_counts_failures(tmp_path, capsys):
    """A run with an unreadable code exits 1, prints the totals and the failed count."""
    src = write_mixed(tmp_path / "mixed.txt")
    out = tmp_path / "r.sqlite"
    assert main(["classify", str(src), "--out", str(out), "--workers", "1"]) == 1
    text = capsys.readouterr().out
    assert ("classified 11 items: 10 identified, 0 ambiguous, 0 not in table, 0 undetermined, "
            "1 error") in text
    assert "1 failed" in text
    assert main(["classify", str(src), "--out", str(out), "--json", "--quiet"]) == 1
    report = json.loads(capsys.readouterr().out)
    assert (report["written"], report["skipped"], report["failed"]) == (0, 11, 1)


def test_classify_command_all_good_exits_0(tmp_path, capsys):
    """The demo batch has no unreadable entry: exit 0."""
    out = tmp_path / "demo.csv"
    assert main(["classify", str(demo_path()), "--out", str(out), "-w", "1", "--quiet"]) == 0
    assert capsys.readouterr().out == ""


def test_classify_command_other_options_exit_4(tmp_path, capsys):
    """Resuming with another notation is refused with one line and exit code 4."""
    src = tmp_path / "c.txt"
    src.write_text("4 6 2\n")
    out = tmp_path / "r.csv"
    assert main(["classify", str(src), "--out", str(out), "-w", "1", "-q"]) == 0
    assert main(["classify", str(src), "--out", str(out), "-w", "1", "-n", "dt"]) == EXIT_OUTPUT
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "other options" in err[0]


def test_classify_command_unreachable_database_exit_4(tmp_path, capsys):
    """A database that cannot be reached is one line and exit code 4."""
    src = tmp_path / "c.txt"
    src.write_text("4 6 2\n")
    url = "postgresql://nobody@127.0.0.1:1/none?connect_timeout=2"
    assert main(["classify", str(src), "--out", url, "-w", "1"]) == EXIT_OUTPUT
    assert "cannot reach the database" in capsys.readouterr().err


def test_classify_command_missing_input_exit_1(tmp_path, capsys):
    """A missing input file is a one-line error before any work."""
    assert main(["classify", str(tmp_path / "nope.csv"), "--out",
                 str(tmp_path / "r.csv")]) == 1
    assert "does not exist" in capsys.readouterr().err


def test_summarise_command_json_and_plot(tmp_path, capsys):
    """summarise prints the exact spectrum of the mixed batch and writes the chart."""
    src = write_mixed(tmp_path / "mixed.txt")
    out = tmp_path / "r.parquet"
    main(["classify", str(src), "--out", str(out), "-w", "1", "-q"])
    capsys.readouterr()
    plot = tmp_path / "spectrum.svg"
    assert main(["summarise", str(out), "--json", "--plot", str(plot)]) == 0
    data = json.loads(capsys.readouterr().out)
    assert {r["type"]: r["fraction"] for r in data["spectrum"]} == \
        {"0_1": 0.5, "3_1": 0.3, "4_1": 0.2}
    assert data["rows"] == 11 and plot.exists() and data["plots"] == [str(plot)]
    assert main(["summarise", str(out)]) == 0
    text = capsys.readouterr().out
    assert "all: 10 classified, 1 failed" in text


def test_closure_choices_match_identify_curves():
    """The CLI's closure names are those of knotsift.curves."""
    closure = pytest.importorskip("knotsift.curves.closure")
    assert CLOSURE_CHOICES == closure.CLOSURES


def test_classify_command_default_output_is_sqlite(tmp_path, monkeypatch, capsys):
    """Without --out, the rows go to results.sqlite in the current folder."""
    src = tmp_path / "c.txt"
    src.write_text("DT: 4 6 2\n")
    monkeypatch.chdir(tmp_path)
    assert main(["classify", str(src), "-w", "1", "-q"]) == 0
    import sqlite3

    with sqlite3.connect(tmp_path / "results.sqlite") as db:
        assert db.execute("SELECT knot FROM classifications").fetchall() == [("3_1",)]
