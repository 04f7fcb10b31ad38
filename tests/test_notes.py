"""Notes a knot theorist would sign: DT shadows with two-edge cuts, 2-bridge input.

Sources: the DT code of 3_1 (Dowker and Thistlethwaite 1983, from memory),
the table's own diagram of 9_24 written as a DT code; the granny (3_1 # 3_1)
and square (3_1 # 3_1*) knots share their unsigned DT code (common practice);
2-bridge knots are prime and b(p, q) is classified by p and q^(+-1) mod p
(Schubert 1956); Conway notations 4212 (9_12) and 2312 (8_8) from Conway 1970
and Rolfsen 1976 Appendix C (from memory).
"""

from __future__ import annotations

import pytest

from knotsift.diagram import Diagram
from knotsift.identification import identify
from knotsift.notations.dt import dt_drawings
from knotsift.table import open_table
from knotsift.two_bridge import same_two_bridge

TABLE = open_table()
#: 9_24 as write_dt gives it from the table's diagram (built from Conway's 3,21,2+).
DT_9_24 = [-8, -10, -16, -4, -2, -14, -18, -6, -12]
#: A 3-crossing unknot: the trefoil's shadow with one crossing changed (common practice).
UNKNOT_3 = [4, -6, 2]


def dt_sum(a: list[int], b: list[int]) -> list[int]:
    """DT code of the connected sum drawn walk after walk: b's labels shifted by 2 len(a)."""
    shift = 2 * len(a)
    return a + [(abs(x) + shift) * (1 if x > 0 else -1) for x in b]


def text(code: list[int]) -> str:
    return "DT: " + " ".join(map(str, code))


def test_trivial_piece_behind_a_two_edge_cut_is_determined():
    """9_24 with a 3-crossing unknotted piece was refused; both drawings give 9_24 with the
    chirality of 9_24's own DT code, and the PD code of the drawing agrees (the issue)."""
    code = dt_sum(DT_9_24, UNKNOT_3)
    drawings, pieces = dt_drawings(code)
    assert len(drawings) == 2 and pieces == [3]
    r = identify(text(code), table=TABLE)
    alone = identify(text(DT_9_24), table=TABLE)
    assert r.status == "identified" and r.name == alone.name and r.name.startswith("9_24")
    assert "agree, so the code determines the knot" in r.notes[0]
    assert identify(Diagram(drawings[0].pd_code()), table=TABLE).name == r.name


def test_granny_or_square_is_not_determined():
    """Two trefoils in a row: the drawings give the granny and the square knot, which the
    code cannot tell apart; the result is ambiguous with both, and says why."""
    r = identify(text(dt_sum([4, 6, 2], [4, 6, 2])), table=TABLE)
    assert r.status == "ambiguous"
    names = {c.name for c in r.candidates}
    assert names == {"3_1#3_1", "3_1#3_1*"}
    assert "may not determine the knot" in r.notes[0]
    assert "drawings of the code" in r.to_text()
    assert sum(x["count"] for x in r.resolutions) == 2


def test_mirror_only_ambiguity_is_undetermined_chirality():
    """When the rule's crossing lies in the unknotted piece, the drawings are K and K*: the
    knot is named, its chirality left undetermined."""
    code = dt_sum(UNKNOT_3, [4, 6, 2])
    r = identify(text(code), table=TABLE)
    assert r.status == "identified" and r.name == "3_1"
    assert r.candidates[0].chirality == "undetermined"
    assert "only up to mirror image" in r.notes[0]


@pytest.mark.parametrize("conway,expected,ruled_out", [
    ("Conway: 4212", "9_12", "4_1#5_2"),
    ("Conway: 2312", "8_8", "10_129"),
    ("Conway: 2 1 2 4", "9_12", "4_1#5_2"),  # the reversed chain, same knot (Schubert)
])
def test_rational_input_settles_ambiguity(conway, expected, ruled_out):
    """The invariants here cannot tell 9_12 from 4_1#5_2, nor 8_8 from 10_129; the rational
    notation can: a 2-bridge knot is prime, and 10_129 is not 2-bridge."""
    r = identify(conway, table=TABLE)
    assert r.status == "identified" and r.candidates[0].name == expected
    assert ruled_out in r.notes[0] and "Schubert 1956" in r.notes[0]
    assert not any(n.startswith("several table knots") for n in r.notes)


def test_other_notations_stay_ambiguous():
    """A DT code of 9_12 carries no 2-bridge information: still ambiguous (honestly)."""
    dt = "DT: 4 10 16 14 2 18 8 6 12"
    r = identify(dt, table=TABLE)
    assert r.status == "ambiguous" and {"9_12", "4_1#5_2"} <= {c.name for c in r.candidates}


@pytest.mark.parametrize("a,b,same", [
    ((5, 2), (5, 3), True),  # figure-eight: 2 = -3 mod 5
    ((7, 3), (7, 2), True),  # 5_2 as '3 2' and as '2 3': 2 = -3^-1 mod 7
    ((7, 1), (7, 3), False),  # 7_1 and 5_2 share determinant 7
    ((7, 1), (7, 6), True),  # 7_1 and its mirror
    ((13, 5), (13, 8), True),
    ((35, 13), (35, 27), True),  # 13 * 27 = 351 = 1 mod 35
    ((25, 9), (25, 7), False),
])
def test_schubert_classification(a, b, same):
    """b(p, q) = b(p, q') up to mirror iff q' = +-q^(+-1) mod p (Schubert 1956)."""
    assert same_two_bridge(a, b) is same
