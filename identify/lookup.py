"""Looking up table knots by invariant values a user already has (typed as text)."""

from __future__ import annotations

from .invariants.alexander import normalise_alexander
from .errors import PolynomialError
from .laurent import Laurent
from .table import ReferenceTable

__all__ = ["lookup_invariants", "lookup_text"]


def lookup_invariants(table: ReferenceTable, jones: str | None = None,
                      alexander: str | None = None, determinant: int | None = None,
                      signature: int | None = None) -> dict:
    """Table forms agreeing with every given value.

    The Alexander polynomial may be typed in any normalisation (it is shifted
    and signed to the symmetric form with Delta(1) = 1); the Jones polynomial
    is matched as given and as its mirror V(1/t), and each hit says which.
    Text is parsed, never evaluated.

    Raises
    ------
    PolynomialError
        For malformed polynomial text, or when no value is given.
    """
    if jones is None and alexander is None and determinant is None and signature is None:
        raise PolynomialError("give at least one invariant value to look up")
    for name, text in (("--jones", jones), ("--alexander", alexander)):
        if text is not None:
            _check_typed(text, name)
    query: dict[str, str] = {}
    if alexander is not None:
        a = normalise_alexander(Laurent.parse(alexander))
        if not a.has_integer_exponents() or a.evaluate(1) != 1 or not a.is_symmetric():
            raise PolynomialError(f"{alexander!r} is not an Alexander polynomial of a knot "
                                  "(after normalising, Delta(1) must be 1 and Delta symmetric)",
                                  value=alexander)
        query["alexander"] = str(a)
    v = Laurent.parse(jones) if jones is not None else None
    hits = []
    for form in table.all_forms():
        if "alexander" in query and form.alexander != query["alexander"]:
            continue
        if determinant is not None and form.determinant != determinant:
            continue
        if signature is not None and form.signature != signature:
            continue
        if v is not None and form.jones != str(v):
            continue
        hits.append({"label": form.label, "name": form.name,
                     "reference": form.is_reference, "jones": form.jones,
                     "alexander": form.alexander, "determinant": form.determinant,
                     "signature": form.signature})
    if v is not None:
        query["jones"] = str(v)
    if determinant is not None:
        query["determinant"] = str(determinant)
    if signature is not None:
        query["signature"] = str(signature)
    return {"query": query, "matches": hits, "count": len(hits)}


def _check_typed(text: str, name: str) -> None:
    """Bound a typed polynomial's size before any dense arithmetic (see knotsift.limits)."""
    from .limits import check_at_most, check_text
    from .polynomial_text import parse_laurent_terms

    check_text(text, f"the polynomial of {name}")
    terms = parse_laurent_terms(text)
    check_at_most("poly_terms", len(terms), f"the number of terms of {name}")
    if terms:
        check_at_most("poly_degree", int(max(abs(e) for e in terms)),
                      f"the largest |exponent| of {name}")


def lookup_text(found: dict) -> str:
    q = ", ".join(f"{k} = {v}" for k, v in found["query"].items())
    if not found["matches"]:
        return f"no table entry has {q}"
    lines = [f"{found['count']} table entr{'y' if found['count'] == 1 else 'ies'} with {q}:"]
    for h in found["matches"][:60]:
        lines.append(f"  {h['label']:<14} V = {h['jones']}   signature {h['signature']}")
    if found["count"] > 60:
        lines.append(f"  ... and {found['count'] - 60} more")
    return "\n".join(lines)
