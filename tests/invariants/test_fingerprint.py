"""The fingerprint's canonical texts, worked out once per (immutable) fingerprint."""

import pickle

from knotsift.diagram import Diagram
from knotsift.invariants.fingerprint import fingerprint

from tests.knots import FIGURE_EIGHT, TREFOIL


def _fresh(fp):
    """The texts and key computed from scratch, not from what the fingerprint kept."""
    t = fp._texts_once()
    key = (f"c={t['components']};V={t['jones']};A={t['alexander']};D={t['determinant']};"
           f"s={t['signature']};r={t['rho_1']};H={t['homology']}")
    return t, key


def test_texts_and_key_are_kept_and_equal_a_fresh_computation():
    for d in (TREFOIL, FIGURE_EIGHT, Diagram.unknot()):
        fp = fingerprint(d)
        texts, key = _fresh(fp)
        assert fp.texts() == texts and fp.key() == key
        assert fp.texts() == texts and fp.key() == key  # second time from what was kept
        m = fp.mirror()
        assert m.texts() == _fresh(m)[0] and m.key() == _fresh(m)[1]


def test_trefoil_key_published_values():
    """Right-handed trefoil: V = t + t^3 - t^4, Delta = t^-1 - 1 + t, det 3 (common practice)."""
    assert fingerprint(TREFOIL).key().startswith("c=1;V=t + t^3 - t^4;A=t^-1 - 1 + t;D=3;")


def test_texts_are_a_fresh_dict_each_time():
    fp = fingerprint(TREFOIL)
    t = fp.texts()
    t["jones"] = "changed"
    assert fp.texts()["jones"] == "t + t^3 - t^4"


def test_kept_texts_do_not_change_equality_hash_or_pickling():
    a, b = fingerprint(TREFOIL), fingerprint(TREFOIL)
    a.key()
    assert a == b and hash(a) == hash(b)
    c = pickle.loads(pickle.dumps(a))
    assert c == a and c.key() == b.key()
