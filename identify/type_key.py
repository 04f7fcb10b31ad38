"""The type key: a short, stable text naming a knot type by its canonical invariants.

A knot beyond the table has no name, yet an ensemble study needs to count
it: the same knot met in many frames must be counted as one type.  The key
is formed only from invariants that are always computed, whatever the
diagram's size (:data:`KEY_INVARIANTS`: the Alexander polynomial, the
determinant, the signature and the hash of rho_1, i.e. rho_1 evaluated at two
points modulo primes, which is computed from the exact rho_1 on small
diagrams and directly on large ones; the Jones polynomial is left out because
it may be skipped for cost).  It is therefore the same for the same knot in
every frame, projection and simplified diagram, and it differs between a
knot and its mirror image whenever these invariants do (whenever the
signature or rho_1 is not 0).

Form: ``K<version>.d<determinant>.s<signature>.<10 hex digits>``, the digits
being the start of the SHA-256 of the canonical texts of the key invariants,
in the order of :data:`KEY_INVARIANTS`.  Determinant and signature are shown
so that a reader sees at a glance what kind of knot it is.

Equal keys are evidence, not proof, of the same knot type: different knots
can share all key invariants (and a 40-bit digest can collide, though with
about one chance in 10^12 per pair).
"""

from __future__ import annotations

import hashlib
from typing import Mapping

__all__ = ["KEY_INVARIANTS", "KEY_VERSION", "MIRROR_RULES", "type_key", "unoriented_type_key"]

#: The invariants the key is made of, in order; each entry names a key of
#: ``IdentifyResult.invariants`` (canonical text).  Extend here (and bump
#: KEY_VERSION): every caller uses this list.
KEY_INVARIANTS: list[str] = ["alexander", "determinant", "signature", "rho_1_hash"]

#: How each key invariant's text changes under mirror image (None: unchanged).
#: An invariant added to KEY_INVARIANTS gets its rule here.
MIRROR_RULES = {
    "alexander": None,
    "determinant": None,
    "signature": lambda text: str(-int(text)),
    "rho_1_hash": lambda text: _mirror_hash_text(text),
}


def _mirror_hash_text(text: str) -> str:
    from .invariants.perturbed_alexander import mirror_hash_text

    return mirror_hash_text(text)

#: Changes whenever KEY_INVARIANTS or the form changes, so keys of different
#: versions never compare equal by accident.
KEY_VERSION = 2


def type_key(invariants: Mapping[str, str]) -> str | None:
    """The type key of a knot from its invariants in canonical text, or None.

    Parameters
    ----------
    invariants : mapping of str to str
        As in ``IdentifyResult.invariants`` or ``Fingerprint.texts()``.

    Returns
    -------
    str or None
        None for links and when a key invariant was not computed.

    Examples
    --------
    >>> right = {"components": "1", "alexander": "t^-1 - 1 + t", "determinant": "3",
    ...          "signature": "-2", "rho_1_hash": "954437172,257698021"}
    >>> type_key(right)
    'K2.d3.s-2.6d4339f821'
    >>> type_key(dict(right, signature="2")) != type_key(right)
    True
    """
    if str(invariants.get("components", "1")) != "1":
        return None
    texts = []
    for name in KEY_INVARIANTS:
        value = invariants.get(name)
        if value is None or str(value) == "":
            return None
        texts.append(f"{name}={value}")
    digest = hashlib.sha256(";".join(texts).encode()).hexdigest()[:10]
    return (f"K{KEY_VERSION}.d{invariants['determinant']}.s{invariants['signature']}."
            f"{digest}")


def unoriented_type_key(invariants: Mapping[str, str]) -> str | None:
    """The key shared by a knot and its mirror image: the smaller of the two keys.

    Examples
    --------
    >>> right = {"alexander": "t^-1 - 1 + t", "determinant": "3", "signature": "-2"}
    >>> unoriented_type_key(right) == unoriented_type_key(dict(right, signature="2"))
    True
    """
    key = type_key(invariants)
    if key is None:
        return None
    mirrored = dict(invariants)
    for name in KEY_INVARIANTS:
        rule = MIRROR_RULES[name]
        if rule is not None:
            mirrored[name] = rule(str(invariants[name]))
    return min(key, type_key(mirrored))
