"""Reading input: files named as arguments, the notation stated, unsure detections explained.

The issue's inputs are quoted: ``nothere.xyz`` (no such file), ``diagram.json``
holding a PD code, ``hello``, ``4 6 2 2`` and the flat list ``[4, 2, 5, 1]``.
The trefoil PD code and DT codes are the common ones of the trade (common
practice); 3_1 has determinant 3 and 4_1 determinant 5 (Rolfsen 1976, from memory).
"""

from __future__ import annotations

import json

import pytest

from knotsift.cli import main
from knotsift.identification import identify

TREFOIL_PD = "[[1,5,2,4],[3,1,4,6],[5,3,6,2]]"


def run(capsys, *argv):
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def test_missing_file_is_no_such_file(capsys, tmp_path, monkeypatch):
    """'nothere.xyz' said "braid word: unexpected character '.'"; now "no such file"."""
    monkeypatch.chdir(tmp_path)
    for arg in ("nothere.xyz", "diagrams/today.txt", "codes.json"):
        code, out, err = run(capsys, "identify", arg)
        assert code == 1 and "no such file" in err and "braid" not in err, err


def test_existing_json_file_is_read_as_a_pd_code(capsys, tmp_path, monkeypatch):
    """'diagram.json' holding a PD code was read as a braid word; now it is the trefoil."""
    monkeypatch.chdir(tmp_path)
    (tmp_path / "diagram.json").write_text(TREFOIL_PD + "\n", encoding="utf-8")
    code, out, _ = run(capsys, "identify", "diagram.json", "--json")
    data = json.loads(out)["results"][0]
    assert code == 0 and data["name"] == "3_1" and data["notation"] == "pd"
    assert data["source"] == "diagram.json"
    (tmp_path / "codes.json").write_text('["DT: 4 6 2", "DT: 4 6 8 2"]', encoding="utf-8")
    code, out, _ = run(capsys, "identify", "codes.json", "--json")
    assert [r["name"] for r in json.loads(out)["results"]] == ["3_1", "4_1"]
    (tmp_path / "bad.json").write_text('{"pd": 1}', encoding="utf-8")
    code, _, err = run(capsys, "identify", "bad.json")
    assert code == 1 and "expected a JSON list" in err


def test_existing_codes_file_is_read_line_by_line(capsys, tmp_path, monkeypatch):
    """A plain file named as an argument is a codes file, one code per line."""
    monkeypatch.chdir(tmp_path)
    (tmp_path / "codes").write_text("# two knots\nDT: 4 6 2\n\n4 6 8 2\n", encoding="utf-8")
    code, out, _ = run(capsys, "identify", "codes", "--json")
    results = json.loads(out)["results"]
    assert code == 0 and [r["name"] for r in results] == ["3_1", "4_1"]
    assert [r["source"] for r in results] == ["codes, line 2", "codes, line 4"]


@pytest.mark.parametrize("text,notation,how", [
    ("DT: 4 6 2", "dt", "named"), ("4 6 2", "dt", "detected"),
    (TREFOIL_PD, "pd", "detected"), ("Conway: 3", "conway", "named"),
    ("s1^3", "braid", "detected"), ("O1+ U2+ O3+ U1+ O2+ U3+", "gauss", "detected")])
def test_every_result_states_the_notation(text, notation, how):
    """The notation read and how it was settled, in JSON and in text."""
    r = identify(text)
    assert (r.notation, r.notation_how) == (notation, how)
    assert r.to_dict()["notation"] == notation and r.to_dict()["notation_how"] == how
    assert "read as: " in r.to_text()
    assert identify(text.split(":")[-1], notation).notation_how == "given"


@pytest.mark.parametrize("text,words", [
    ("hello", "braid on 16 strands"),
    ("4 6 2 2", "mistyped DT code"),
    ("[4, 2, 5, 1]", "neither a DT code"),
    ("1 -1 2 -2", "read as a Gauss code"),
])
def test_unsure_detection_is_explained(text, words):
    """Letters or bare integers read as a braid (or a Gauss code) say so and how to force
    another reading; clear-cut inputs carry no such note."""
    r = identify(text)
    assert words in r.notes[0] and "--notation" in r.notes[0]
    assert not any("read as a" in n for n in identify("DT: 4 6 2").notes)
    assert not any("read as a" in n for n in identify("s1^3 s2^-1").notes)


def test_forcing_another_reading():
    """'4 6 2 2' forced as DT is refused with the DT reason, not read as a link."""
    from knotsift.errors import NotationError

    with pytest.raises(NotationError):
        identify("DT: 4 6 2 2")
    assert identify("4 6 2", "braid").notation == "braid"
