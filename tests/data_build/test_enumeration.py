"""The enumerator of small diagrams, independent of the name list."""

from collections import Counter

from knotsift.data_build.build import PRIME_COUNTS
from knotsift.data_build.enumeration import _canonical_pairing, enumerate_classes
from knotsift.table import open_table


def test_enumerated_classes_through_seven_crossings():
    """Rational, Montesinos and DT diagrams through 7 crossings fall into exactly 1, 1, 2, 3, 7
    prime knot classes of 3..7 crossings (published counts: Rolfsen 1976; Hoste, Thistlethwaite
    and Weeks 1998), and every class is a knot of the shipped table."""
    classes = enumerate_classes(7, dt_alternating=7, dt_signed=5)
    by = Counter(c.min_crossings for c in classes.values())
    assert by[0] == 1
    for c in range(3, 8):
        assert by[c] == PRIME_COUNTS[c]
    table = open_table()
    keys = {f.fingerprint for f in table.all_forms()}
    for cls in classes.values():
        assert cls.fingerprint.key() in keys or cls.fingerprint.mirror().key() in keys


def test_canonical_dt_code_is_invariant():
    """Relabelling a DT code (shifting the start, reversing) gives the same canonical code."""
    code = (4, 8, 10, 2, 6)
    assert _canonical_pairing(code) == _canonical_pairing(_canonical_pairing(code))
    # 5_2's code with every label moved on by one: (1,4)->(2,5), (3,8)->(4,9), ...
    assert _canonical_pairing((4, 8, 10, 2, 6)) == _canonical_pairing((6, 8, 2, 10, 4))
