"""The fingerprint: the bundle of normalised invariants that the table is keyed by.

A fingerprint is chirality-aware: the mirror image of a knot has the Jones
polynomial V(1/t), the opposite signature and the opposite rho_1, while the
Alexander polynomial, the determinant and the double-cover homology do not see
mirrors.  Its canonical text (``key``) is what
the reference table stores for exact lookup.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..diagram import Diagram
from ..laurent import Laurent

__all__ = ["Fingerprint", "fingerprint", "INVARIANTS", "RHO_1_UP_TO"]

#: rho_1 is computed for knot diagrams of at most this many crossings (after
#: simplification); above, it is left out for cost and the result says so.
RHO_1_UP_TO = 60

#: The invariants in a fingerprint, in the order of the key, with what each sees.
INVARIANTS = {
    "jones": "Jones polynomial V(t); a mirror image has V(1/t)",
    "alexander": "Conway-normalised Alexander polynomial; blind to mirror images",
    "determinant": "|Delta(-1)| = |V(-1)|; blind to mirror images",
    "signature": "knot signature; a mirror image has the opposite sign",
    "rho_1": "perturbed Alexander invariant rho_1 (knots); a mirror image has -rho_1",
    "homology": "homology of the double branched cover; blind to mirror images",
    "rho_1_hash": "rho_1 at two points modulo primes (knots, any size); a mirror image negates it",
}


@dataclass(frozen=True)
class Fingerprint:
    """Normalised invariants of one knot or link in one chirality.

    Attributes
    ----------
    components : int
    jones : Laurent or None
        None when the Jones polynomial was not computed (skipped for cost,
        see :mod:`knotsift.budget`); such a fingerprint matches no table key.
    alexander : Laurent or None
        None for links (the single-variable Alexander polynomial is computed
        for knots only).
    determinant : int
    signature : int
        In the convention where the right-handed trefoil has signature -2.
    rho_1 : Laurent or None
        The perturbed Alexander invariant (Bar-Natan and van der Veen 2024);
        None for links and for knot diagrams above :data:`RHO_1_UP_TO`
        crossings (left out for cost).
    homology : tuple of int
        Invariant factors of H_1 of the double branched cover (see
        :func:`knotsift.invariants.double_cover.double_cover_homology`).
    rho_1_hash : tuple or None
        rho_1 at the fixed points of
        :func:`knotsift.invariants.perturbed_alexander.rho_1_hash`, kept only
        when rho_1 itself was left out (otherwise derived from rho_1).
    """

    components: int
    jones: Laurent | None
    alexander: Laurent | None
    determinant: int
    signature: int
    rho_1: Laurent | None = None
    homology: tuple[int, ...] = ()
    rho_1_hash: tuple[int | None, ...] | None = None

    def mirror(self) -> "Fingerprint":
        """The fingerprint of the mirror image."""
        from .perturbed_alexander import mirror_hash

        jones = None if self.jones is None else self.jones.mirror()
        return Fingerprint(self.components, jones, self.alexander,
                           self.determinant, -self.signature,
                           None if self.rho_1 is None else -self.rho_1, self.homology,
                           None if self.rho_1_hash is None else mirror_hash(self.rho_1_hash))

    def is_mirror_blind(self) -> bool:
        """True when these invariants cannot tell this knot from its mirror image."""
        return self == self.mirror()

    def texts(self) -> dict[str, str]:
        """Each invariant in canonical text form (rho_1: "" when not computed).

        Worked out once per fingerprint (it is immutable); each call returns a
        fresh dict.
        """
        cached = self.__dict__.get("_texts")
        if cached is None:
            cached = self._texts_once()
            object.__setattr__(self, "_texts", cached)
        return dict(cached)

    def _texts_once(self) -> dict[str, str]:
        from .double_cover import homology_text
        from .perturbed_alexander import hash_text, rho_1_hash_of

        hashed = self.rho_1_hash
        if self.rho_1 is not None:
            hashed = rho_1_hash_of(self.rho_1, self.alexander)
        return {
            "components": str(self.components),
            "jones": "" if self.jones is None else str(self.jones),
            "alexander": "" if self.alexander is None else str(self.alexander),
            "determinant": str(self.determinant),
            "signature": str(self.signature),
            "rho_1": "" if self.rho_1 is None else str(self.rho_1),
            "homology": homology_text(self.homology),
            "rho_1_hash": hash_text(hashed),
        }

    def key(self) -> str:
        """Canonical text of the whole fingerprint (what the table stores)."""
        cached = self.__dict__.get("_key")
        if cached is None:
            t = self.texts()
            cached = (f"c={t['components']};V={t['jones']};A={t['alexander']};"
                      f"D={t['determinant']};s={t['signature']};r={t['rho_1']};"
                      f"H={t['homology']}")
            object.__setattr__(self, "_key", cached)
        return cached

    def unoriented_key(self) -> str:
        """The key shared by a knot and its mirror image (the smaller of the two keys)."""
        return min(self.key(), self.mirror().key())

    def __mul__(self, other: "Fingerprint") -> "Fingerprint":
        """The fingerprint of a connected sum (knots).

        Products of the polynomials and determinants, a sum of signatures, a
        direct sum of the homology groups, and
        ``rho_1 = Delta_2^2 rho_1' + Delta_1^2 rho_1''`` (the sum inside
        rho_1 adds up over the two halves of a long knot; checked against
        direct computation in the tests).
        """
        from .double_cover import homology_sum

        if self.components != 1 or other.components != 1:
            raise ValueError("connected sums of fingerprints are defined here for knots only")
        rho = None
        if self.rho_1 is not None and other.rho_1 is not None:
            rho = (other.alexander * other.alexander * self.rho_1
                   + self.alexander * self.alexander * other.rho_1)
        jones = None if self.jones is None or other.jones is None else self.jones * other.jones
        return Fingerprint(1, jones, self.alexander * other.alexander,
                           self.determinant * other.determinant,
                           self.signature + other.signature, rho,
                           homology_sum(self.homology, other.homology))


def fingerprint(diagram: Diagram, simplified: bool = False) -> Fingerprint:
    """All invariants of a diagram, bundled.

    Parameters
    ----------
    diagram : Diagram
    simplified : bool
        Set when ``diagram`` is already simplified; otherwise it is simplified
        first (Reidemeister I/II and nugatory moves), which changes nothing but
        the cost.

    Examples
    --------
    >>> trefoil = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])
    >>> fingerprint(trefoil).key()
    'c=1;V=t + t^3 - t^4;A=t^-1 - 1 + t;D=3;s=-2;r=-t^-2 + 2t^-1 - 2 + 2t - t^2;H=Z/3'
    """
    from ..simplify import simplify
    from .alexander import alexander_polynomial
    from .double_cover import double_cover_homology
    from .jones import jones_polynomial
    from .perturbed_alexander import perturbed_alexander, rho_1_hash
    from .signature import knot_signature

    d = diagram if simplified else simplify(diagram)
    jones = jones_polynomial(d)
    components = d.number_of_components()
    alexander = rho = hashed = None
    if components == 1:
        if d.number_of_crossings() <= RHO_1_UP_TO:
            # Delta comes from the same matrix as rho_1 (and equals alexander_polynomial)
            both = perturbed_alexander(d)
            alexander, rho = both.alexander, both.rho_1
        else:
            alexander = alexander_polynomial(d)
            hashed = rho_1_hash(d)
    if alexander is not None:
        det = abs(alexander.evaluate(-1))
    else:
        from .determinant import determinant

        det = determinant(d)
    return Fingerprint(components, jones, alexander, det, knot_signature(d), rho,
                       double_cover_homology(d), hashed)
