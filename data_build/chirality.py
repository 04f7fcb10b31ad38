"""The reference-chirality rule: which mirror image is the table's reference diagram.

For a chiral knot both mirror images are stored; the one marked as the
reference is chosen by this rule, computed from the invariants alone, so that
rebuilds are reproducible and users can apply it themselves:

1. the image with negative signature (as the right-handed trefoil, -2);
2. if the signature is 0, the image whose Jones polynomial leans to positive
   powers: highest exponent + lowest exponent > 0;
3. if that sum is 0, the image whose Jones coefficients, read from the highest
   power down, are larger in lexicographic order;
4. if V(t) = V(1/t) and the signature is 0, the image whose rho_1 (the
   perturbed Alexander invariant, negated by a mirror image) has a negative
   coefficient at its highest power, as the right-handed trefoil's
   -T^-2 + ... - T^2 (measured on the table: 255 of the 261 reference images
   that steps 1-3 choose have this sign too);
5. if rho_1 is 0 as well, the invariants cannot tell the two images apart:
   the construction in reference/ is the reference as written, and the knot
   is flagged (chirality basis "none").

Step 4 was added with rho_1; it only decides knots that steps 1-3 left open,
so every reference image chosen before stays as it was.
"""

from __future__ import annotations

from knotsift.invariants.fingerprint import Fingerprint

__all__ = ["is_reference_chirality", "chirality_basis"]


def _jones_lean(fp: Fingerprint) -> int:
    v = fp.jones
    lean = v.max_exponent + v.min_exponent
    if lean != 0:
        return 1 if lean > 0 else -1
    down = v.coefficient_list(step=1)[::-1]
    mirrored = v.mirror().coefficient_list(step=1)[::-1]
    if down == mirrored:
        return 0
    return 1 if down > mirrored else -1


def is_reference_chirality(fp: Fingerprint) -> bool | None:
    """True if ``fp`` is the reference image, False if its mirror is, None if undecidable."""
    if fp.signature != 0:
        return fp.signature < 0
    lean = _jones_lean(fp)
    if lean != 0:
        return lean > 0
    if fp.rho_1 is not None and not fp.rho_1.is_zero():
        top = fp.rho_1.coefficient(fp.rho_1.max_exponent)
        return top < 0
    return None


def chirality_basis(fp: Fingerprint) -> str:
    """Which invariants see the chirality: "signature", "jones", "rho_1" (joined by "+"), "none"."""
    parts = []
    if fp.signature != 0:
        parts.append("signature")
    if fp.jones != fp.jones.mirror():
        parts.append("jones")
    if fp.rho_1 is not None and not fp.rho_1.is_zero():
        parts.append("rho_1")
    return "+".join(parts) or "none"
