"""Every subcommand stops quietly when the reader of its output goes away (``| head``).

A process whose standard output is a pipe with no reader gets EPIPE; the
convention of the trade is to end without a message and with the status a
shell reports for a process ended by SIGPIPE, 128 + 13 = 141 (common practice).
"""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import pytest

from knotsift.demo import demo_path

DEMO_XYZ = Path(demo_path()).with_name("phantom_ring_run.xyz")


def run_with_closed_stdout(args: list[str], cwd: Path) -> tuple[int, str]:
    """Run ``python -m knotsift ARGS`` with its standard output closed by the reader at once."""
    proc = subprocess.Popen([sys.executable, "-m", "knotsift", *args], cwd=cwd,
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE)
    proc.stdout.close()  # the reader quits before the first line is written
    err = proc.stderr.read().decode()
    proc.stderr.close()
    return proc.wait(timeout=300), err


@pytest.fixture(scope="module")
def classified(tmp_path_factory) -> Path:
    """A small classify output for summarise to read."""
    where = tmp_path_factory.mktemp("pipe")
    codes = where / "codes.txt"
    codes.write_text("DT: 4 6 2\nDT: 4 6 8 2\nDT: 6 8 10 2 4\n", encoding="utf-8")
    out = where / "out.csv"
    from knotsift.cli import main

    assert main(["classify", str(codes), "-o", str(out), "--workers", "1", "--quiet"]) == 0
    return out


def subcommands(classified: Path, tmp: Path) -> dict[str, list[str]]:
    codes = tmp / "more_codes.txt"
    codes.write_text("DT: 4 6 2\n", encoding="utf-8")
    return {
        "help": ["--help"],
        "identify": ["identify", "DT: 4 6 8 2"],
        "identify --json": ["identify", "--json", "DT: 4 6 8 2"],
        "show": ["show", "3_1"],
        "lookup": ["lookup", "--determinant", "3"],
        "build": ["build", "--max-crossings", "3", "-o", str(tmp / "t.sqlite")],
        "classify": ["classify", str(codes), "-o", str(tmp / "c.csv"), "--workers", "1"],
        "summarise": ["summarise", str(classified)],
        "curve": ["curve", str(DEMO_XYZ), "--frames", "0"],
    }


@pytest.mark.parametrize("name", ["help", "identify", "identify --json", "show", "lookup",
                                  "build", "classify", "summarise", "curve"])
def test_closed_pipe_is_quiet(name, classified, tmp_path):
    """No traceback, no message, exit status 141, for every subcommand.

    ``--help`` is written by argparse, which ignores a failed write itself
    and exits with 0; it must stay quiet too.
    """
    rc, err = run_with_closed_stdout(subcommands(classified, tmp_path)[name], tmp_path)
    assert "Traceback" not in err and "BrokenPipe" not in err, err
    assert rc == (0 if name == "help" else 141), (rc, err)
