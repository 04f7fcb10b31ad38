"""Factoring an Alexander polynomial into those of table knots (a composite hint)."""

from __future__ import annotations

from .laurent import Laurent

__all__ = ["alexander_factors", "composite_hint", "normalise_alexander"]


def normalise_alexander(p: Laurent) -> Laurent:
    """Shift and sign a polynomial to the symmetric form with Delta(1) = +1 when possible."""
    if p.is_zero():
        return p
    lo, hi = p.min_exponent, p.max_exponent
    centred = p.shift(-(lo + hi) / 2)
    if sum(c for _, c in centred.terms()) < 0:
        centred = -centred
    return centred


def alexander_factors(p: Laurent) -> list[Laurent]:
    """Irreducible factors over the integers (sympy), each normalised; units dropped."""
    import sympy

    t = sympy.Symbol("t")
    lo = p.min_exponent
    poly = sympy.Poly(sum(c * t ** int(e - lo) for e, c in p.terms()), t)
    _, factors = sympy.factor_list(poly.as_expr())
    out = []
    for f, mult in factors:
        fp = sympy.Poly(f, t)
        coeffs = [int(c) for c in reversed(fp.all_coeffs())]
        q = normalise_alexander(Laurent.from_coefficients(0, coeffs))
        if q.span() == 0:
            continue
        out.extend([q] * mult)
    return out


def composite_hint(alexander: Laurent, table) -> str | None:
    """A note when Delta factors into Alexander polynomials of table prime knots."""
    factors = alexander_factors(alexander)
    if len(factors) < 2:
        return None
    names = []
    for f in factors:
        sharing = sorted({form.name for form in table.by_invariant("alexander", str(f))
                          if "#" not in form.name})
        if not sharing:
            return (f"the Alexander polynomial factors into {len(factors)} factors, not all of "
                    "them those of table prime knots")
        names.append("/".join(sharing[:3]) + ("/..." if len(sharing) > 3 else ""))
    return ("the Alexander polynomial factors as those of " + " and ".join(names) +
            ": consistent with a connected sum (Alexander is multiplicative), not a proof")
