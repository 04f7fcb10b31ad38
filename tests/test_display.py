"""Results as values, DataFrames, HTML and brief lines; the one-line missing-extra error.

Values: the right-handed trefoil has V = t + t^3 - t^4, Delta = t^-1 - 1 + t,
determinant 3 and signature -2 in the project's convention (README,
Conventions; Jones 1985 and Rolfsen 1976, from memory); the figure-eight
knot has determinant 5 (Rolfsen 1976, from memory).  The values are checked
against sympy (a general-purpose library) by evaluating the polynomials.
"""

from __future__ import annotations

import sys

import pytest
import sympy

from knotsift import identify, to_dataframe
from knotsift.brief import brief_line
from knotsift.extras import MissingExtraError, require
from knotsift.laurent import Laurent


def test_invariant_values_are_laurent_and_ints():
    v = identify("DT: 4 6 2").invariant_values
    assert isinstance(v["jones"], Laurent) and isinstance(v["determinant"], int)
    assert (v["components"], v["determinant"], v["signature"]) == (1, 3, -2)
    t = sympy.Symbol("t")
    jones = sum(c * t ** sympy.Rational(e) for e, c in v["jones"].terms())
    assert sympy.expand(jones - (t + t**3 - t**4)) == 0
    alex = sum(c * t ** sympy.Rational(e) for e, c in v["alexander"].terms())
    assert sympy.expand(alex - (1 / t - 1 + t)) == 0
    assert abs(alex.subs(t, -1)) == v["determinant"]  # det = |Delta(-1)|


def test_dataframe_of_results_in_one_call():
    from knotsift.result import IdentifyResult

    bad = IdentifyResult(status="error", error="unreadable", source="input 3")
    df = to_dataframe([identify("DT: 4 6 2"), identify("DT: 4 6 8 2"), bad])
    assert df["name"].tolist()[:2] == ["3_1", "4_1"]
    assert df["determinant"].tolist()[:2] == [3, 5]
    assert df["status"].tolist()[2] == "error"


def test_dataframe_of_frames_and_html():
    from knotsift.curves import identify_file
    from knotsift.demo.ring_polymer import demo_xyz_path

    frames = list(identify_file(demo_xyz_path(), frames="0:2"))
    df = to_dataframe(frames)
    assert len(df) == sum(len(f.chains) for f in frames)
    assert df["frame"].tolist() == [0, 1]
    html = frames[0]._repr_html_()
    assert html.startswith("<table>") and f"<td>{frames[0].chains[0].name}</td>" in html
    assert "<td>3_1</td>" in identify("DT: 4 6 2")._repr_html_()


def test_dataframe_of_a_classify_output(tmp_path):
    from knotsift.bulk import classify

    codes = tmp_path / "codes.txt"
    codes.write_text("DT: 4 6 2\nDT: 4 6 8 2\n")
    report = classify([codes], tmp_path / "out.sqlite", workers=1, progress=False)
    df = to_dataframe(report)
    assert sorted(df["knot"]) == ["3_1", "4_1"]


def test_brief_line():
    assert brief_line(identify("DT: 4 6 2", label="x")) == "x\tidentified\t3_1"


def test_cli_brief(capsys):
    from knotsift.cli import main

    assert main(["identify", "DT: 4 6 2", "DT: 4 6 8 2", "--brief"]) == 0
    assert capsys.readouterr().out.splitlines() == ["input 1\tidentified\t3_1",
                                                    "input 2\tidentified\t4_1"]


def test_missing_extra_is_one_line_naming_it(monkeypatch):
    monkeypatch.setitem(sys.modules, "pyarrow", None)  # as if not installed
    with pytest.raises(MissingExtraError) as exc:
        require("pyarrow", purpose="writing Parquet outputs")
    assert str(exc.value) == ('writing Parquet outputs needs the optional package pyarrow, '
                              'which is not installed: pip install "knotsift[bulk]"')


def test_missing_extra_from_the_command_line(monkeypatch, tmp_path, capsys):
    from knotsift.cli import main

    monkeypatch.setitem(sys.modules, "pyarrow", None)
    codes = tmp_path / "codes.txt"
    codes.write_text("DT: 4 6 2\n")
    code = main(["classify", str(codes), "--out", str(tmp_path / "r.parquet"), "--workers", "1"])
    err = capsys.readouterr().err.strip().splitlines()
    assert code == 1 and err == ['knotsift: writing Parquet outputs needs the optional package '
                                 'pyarrow, which is not installed: pip install "knotsift[bulk]"']
