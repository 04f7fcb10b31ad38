"""Tests of the ``knotsift curve`` command and of 3D files given to ``knotsift identify``."""

from __future__ import annotations

import json

import numpy as np
import pytest

from knotsift.cli import main
from knotsift.curves.xyz import write_xyz
from tests.curves.curves import figure_eight, right_torus_knot


@pytest.fixture
def table_path(table):
    return str(table.path)


def test_curve_command_text_with_a_bad_frame(tmp_path, table_path, capsys):
    """A bad frame is reported on stderr with file, line and frame; the rest is printed; exit 1."""
    path = tmp_path / "run.xyz"
    write_xyz(path, [right_torus_knot(2, 3, 60), figure_eight(60)])
    text = path.read_text().splitlines()
    text[5] = "C 1.0 two 3.0"  # frame 0, bead 3
    path.write_text("\n".join(text) + "\n")
    code = main(["curve", str(path), "--table", table_path, "--quiet"])
    out, err = capsys.readouterr()
    assert code == 1
    assert "line 6, frame 0, bead 3" in err and "'two' is not a number" in err
    assert "frame 1" in out and "4_1" in out
    assert "Traceback" not in err


def test_curve_command_json_open_chain(tmp_path, table_path, capsys):
    """--json gives one object with results per frame and a summary; options reach the pipeline."""
    path = tmp_path / "chain.xyz"
    write_xyz(path, [right_torus_knot(2, 3, 80)] * 3)
    code = main(["curve", str(path), "--open", "--closure", "stochastic", "--closures", "7",
                 "--seed", "3", "--frames", "1:3", "--json", "--table", table_path])
    out, _ = capsys.readouterr()
    data = json.loads(out)
    assert code == 0
    assert [r["frame"] for r in data["results"]] == [1, 2]
    chain = data["results"][0]["chains"][0]
    assert chain["curve"]["closure"] == "stochastic"
    assert chain["curve"]["geometry"]["closures"] == 7
    assert data["summary"]["frames"] == 2


def test_identify_routes_coordinate_files(tmp_path, table_path, capsys):
    """`knotsift identify FILE.xyz` runs the 3D pipeline."""
    path = tmp_path / "ring.xyz"
    write_xyz(path, [figure_eight(90)])
    assert main(["identify", str(path), "--table", table_path]) == 0
    assert "4_1" in capsys.readouterr().out


def test_curve_demo_runs(table_path, capsys):
    """The shipped demo trajectory runs through the command (invented data: no facts checked)."""
    assert main(["curve", "--demo", "--frames", "0:2", "--table", table_path]) == 0
    assert "frame 1" in capsys.readouterr().out


def test_missing_file_is_one_line(tmp_path, table_path, capsys):
    code = main(["curve", str(tmp_path / "none.xyz"), "--table", table_path])
    err = capsys.readouterr().err
    assert code == 1 and "no such file" in err and len(err.strip().splitlines()) == 1


def test_bad_option_values_are_usage_errors(table_path, capsys):
    for argv in (["curve", "x.xyz", "--closure", "sideways"],
                 ["curve", "x.xyz", "--closures", "0"]):
        with pytest.raises(SystemExit) as info:
            main(argv)
        assert info.value.code == 2
    capsys.readouterr()


def test_demo_file_is_deterministic(tmp_path):
    """The demo generator writes the shipped file byte for byte (seeded)."""
    from knotsift.demo.ring_polymer import demo_xyz_path, generate

    fresh = generate(tmp_path / "again.xyz")
    assert fresh.read_bytes() == demo_xyz_path().read_bytes()
    assert np.isfinite(np.loadtxt(fresh, comments=None, skiprows=2, max_rows=5,
                                  usecols=(1, 2, 3))).all()
