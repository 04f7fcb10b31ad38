"""The knotsift command: output, JSON, and bad input with messages and exit codes."""

import json
import subprocess
import sys

import pytest

from knotsift.cli import main


def run(capsys, *argv):
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def test_identify_text(capsys):
    """Readable output names the knot and its chirality."""
    code, out, _ = run(capsys, "identify", "DT: 4 6 8 2")
    assert code == 0
    assert "4_1" in out and "amphichiral" in out


def test_identify_json(capsys):
    """--json prints the documented top-level object."""
    code, out, _ = run(capsys, "identify", "--json", "s1^3", "s1^-3")
    data = json.loads(out)
    assert code == 0
    assert data["summary"] == {"identified": 2, "ambiguous": 0, "not in table": 0,
                               "too complex": 0, "error": 0, "total": 2}
    assert [r["name"] for r in data["results"]] == ["3_1", "3_1*"]
    assert data["results"][1]["candidates"][0]["chirality"] == "mirror"


def test_identify_demo(capsys):
    """The built-in demo runs and reports each transcribed micrograph."""
    code, out, _ = run(capsys, "identify", "--demo")
    assert code == 0
    assert "R7-01" in out and "summary:" in out
    assert "resolutions of the uncertain crossings" in out


def test_identify_file_with_a_bad_line(capsys, tmp_path):
    """In a batch a bad line is reported with file and line, and the rest is still done."""
    f = tmp_path / "batch.txt"
    f.write_text("# two codes\n4 6 2\n[[1,5,2,4],[3,1,4,6],[5,3,6,7]]\n4 6 8 2\n")
    code, out, err = run(capsys, "identify", "--file", str(f))
    assert code == 1
    assert "3_1" in out and "4_1" in out
    assert f"{f}, line 3" in err and "exactly twice" in err


def test_show_fuzzy(capsys):
    """Names are found despite variants and typos."""
    for query, name in (("figure eight", "4_1"), ("7-4", "7_4"), ("74", "7_4"),
                        ("trefoil", "3_1")):
        code, out, _ = run(capsys, "show", query)
        assert code == 0
        assert out.startswith(name), (query, out)
    code, out, err = run(capsys, "show", "figure-eigth")  # a typo: shown, marked as a guess
    assert code == 0 and out.startswith("guess:") and "\n4_1 " in out and "guess" in err
    code, out, _ = run(capsys, "show", "3_1 mirror")
    assert out.startswith("3_1*")


def test_lookup_alexander(capsys):
    """An Alexander polynomial typed in another normalisation finds both trefoils."""
    code, out, _ = run(capsys, "lookup", "--alexander", "t^2 - t + 1", "--json")
    data = json.loads(out)
    assert code == 0
    assert {m["label"] for m in data["matches"]} == {"3_1", "3_1*"}


BAD = [
    (["identify", "[[1,5,2,4],[3,1,4,6],[5,3,6,5]]"], 1, "exactly twice"),
    (["identify", "[[1,2,3,4],[3,4,1,2]]"], 1, "not planar"),
    (["identify", "[[1,5,2,4],[3,1"], 1, "PD"),
    (["identify", "[[1,5,2.5,4]]"], 1, "integer"),
    (["identify", "DT: 4 6"], 1, "DT"),
    (["identify", "DT: 3 5 7"], 1, "even"),
    (["identify", "O1+ U2+"], 1, "crossing"),
    (["identify", "braid: s1^x"], 1, "position"),
    (["identify", "Conway: 2a"], 1, "Conway"),
    (["identify", ""], 1, "empty"),
    (["identify", "--file", "/nonexistent/codes.txt"], 1, "cannot read"),
    (["identify", "--notation", "morse", "4 6 2"], 2, "invalid choice"),
    (["identify", "--table", "/nonexistent/knots.sqlite", "4 6 2"], 3, "knotsift build"),
    (["lookup", "--alexander", "t^^2"], 1, "position"),
    (["lookup", "--alexander", "t^2 + t"], 1, "not an Alexander polynomial"),
    (["lookup"], 1, "at least one"),
    (["show", "qqqqqqqq"], 1, "no table entry"),
    (["identify", "[[1,5,2,4],[3,1,4,6],[3,6,5,2]]"], 1, "orientation"),
]


@pytest.mark.parametrize("argv, code, fragment", BAD)
def test_bad_input(capsys, argv, code, fragment):
    """Bad input gives one clear line on stderr, a non-zero exit code and no traceback."""
    try:
        got = main(argv)
    except SystemExit as exc:  # argparse usage errors
        got = exc.code
    out, err = capsys.readouterr()
    assert got == code
    assert fragment in err, err
    assert "Traceback" not in err


def test_corrupt_table(capsys, tmp_path):
    """A corrupt table file names the path and the rebuild command (exit 3)."""
    bad = tmp_path / "knots.sqlite"
    bad.write_bytes(b"not a database at all" * 50)
    code, _, err = run(capsys, "identify", "--table", str(bad), "4 6 2")
    assert code == 3
    assert str(bad) in err and "knotsift build" in err


def test_entry_point_process():
    """The installed entry point runs as a separate process."""
    p = subprocess.run([sys.executable, "-m", "knotsift", "identify", "4 6 2"],
                       capture_output=True, text=True, timeout=60)
    assert p.returncode == 0
    assert "3_1" in p.stdout
