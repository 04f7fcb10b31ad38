"""Reading items: code tables and code lists, keys, detection and early errors."""

from __future__ import annotations

import json

import pytest

from knotsift.bulk.resume import split_key
from knotsift.bulk.sources import detect_format, iter_items
from knotsift.demo import demo_path
from knotsift.errors import NotationError

from .inputs import MIXED, write_mixed


def test_iter_items_line_format_keeps_labels_and_line_numbers(tmp_path):
    """In the line format, comments are skipped; the frame is the line number."""
    items = list(iter_items([write_mixed(tmp_path / "mixed.txt")]))
    assert [(i.label, i.payload) for i in items] == MIXED
    assert [i.frame for i in items] == list(range(2, 2 + len(MIXED)))
    assert len({i.key for i in items}) == len(items)
    import os

    assert split_key(items[0].key) == (os.path.realpath(items[0].source), "label=trefoil", 0)


def test_iter_items_code_table_carries_other_columns(tmp_path):
    """A table with a code column: labels from the label column, the rest into fields."""
    p = tmp_path / "codes.csv"
    p.write_text('label,code,temperature\n'
                 'a,"[[1,5,2,4],[3,1,4,6],[5,3,6,2]]",300\n'
                 '# a comment line\n'
                 'b,DT: 4 6 8 2,310\n')
    items = list(iter_items([p]))
    assert [(i.label, i.payload, i.frame) for i in items] == [
        ("a", "[[1,5,2,4],[3,1,4,6],[5,3,6,2]]", 2), ("b", "DT: 4 6 8 2", 4)]
    assert json.loads(items[1].fields) == {"temperature": "310"}
    assert items[0].error is None


def test_iter_items_tab_table_and_other_codes_column(tmp_path):
    """A tab-separated table, with the codes in a column of another name."""
    p = tmp_path / "codes.tsv"
    p.write_text("id\tdiagram\nx1\t4 6 2\n")
    (item,) = iter_items([p], codes_column="diagram", label_column="id")
    assert (item.label, item.payload, item.fields) == ("x1", "4 6 2", "")


def test_iter_items_short_row_is_an_error_item(tmp_path):
    """A table row with the wrong number of columns becomes an item carrying its error."""
    p = tmp_path / "codes.csv"
    p.write_text("label,code,extra\na,4 6 2\n")
    (item,) = iter_items([p])
    assert "line 2: expected 3 columns as in the header, got 2" in item.error


def test_iter_items_missing_input_raises_before_yielding(tmp_path):
    """A missing file is reported when iter_items is called, not half-way through a run."""
    with pytest.raises(NotationError, match="does not exist"):
        iter_items([demo_path(), tmp_path / "nope.csv"])
    with pytest.raises(NotationError, match="format must be one of"):
        iter_items([demo_path()], "gif")


def test_detect_format_by_extension_and_header(tmp_path):
    """.csv with the code column is codes, without it 3D coordinates; .xyz is a trajectory."""
    a = tmp_path / "a.csv"
    a.write_text("label,code\nx,4 6 2\n")
    b = tmp_path / "b.csv"
    b.write_text("x,y,z\n0,0,0\n")
    assert detect_format(a) == "codes"
    assert detect_format(b) == "csv"
    assert detect_format(tmp_path / "t.xyz") == "xyz"
    assert detect_format(demo_path()) == "codes"


def test_iter_items_is_lazy(tmp_path):
    """Items are produced one at a time: the first arrives without reading the rest."""
    p = tmp_path / "many.txt"
    with open(p, "w") as fh:
        fh.write("DT: 4 6 2\n")
        fh.write("\n" * 10)
    it = iter_items([p])
    first = next(it)
    assert first.frame == 1
    assert list(it) == []
