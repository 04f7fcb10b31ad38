"""A safe parser for polynomials typed as text (nothing is ever evaluated)."""

from __future__ import annotations

from fractions import Fraction

from .errors import PolynomialError

__all__ = ["parse_laurent_terms"]


class _Scanner:
    def __init__(self, text: str):
        self.text = text
        self.pos = 0

    def skip_space(self) -> None:
        while self.pos < len(self.text) and self.text[self.pos].isspace():
            self.pos += 1

    def peek(self) -> str:
        self.skip_space()
        return self.text[self.pos] if self.pos < len(self.text) else ""

    def take(self, s: str) -> bool:
        self.skip_space()
        if self.text.startswith(s, self.pos):
            self.pos += len(s)
            return True
        return False

    def integer(self) -> int | None:
        self.skip_space()
        start = self.pos
        while self.pos < len(self.text) and self.text[self.pos] in "0123456789":
            self.pos += 1
        if start == self.pos:
            return None
        return int(self.text[start:self.pos])

    def fail(self, reason: str) -> PolynomialError:
        shown = self.text[self.pos] if self.pos < len(self.text) else "end of text"
        return PolynomialError(
            f"{reason} at position {self.pos + 1} (found {shown!r}) in {self.text!r}",
            value=self.text,
        )


def _signed_number(sc: _Scanner) -> Fraction:
    sign = 1
    while sc.peek() in "+-" and sc.peek():
        if sc.take("-"):
            sign = -sign
        else:
            sc.take("+")
    n = sc.integer()
    if n is None:
        raise sc.fail("expected an exponent")
    value = Fraction(n)
    if sc.take("/"):
        d = sc.integer()
        if d is None:
            raise sc.fail("expected a denominator")
        if d not in (1, 2):
            raise sc.fail("exponents must be integers or halves")
        value = Fraction(n, d)
    return sign * value


def _exponent(sc: _Scanner) -> Fraction:
    if not (sc.take("**") or sc.take("^")):
        return Fraction(1)
    if sc.take("("):
        e = _signed_number(sc)
        if not sc.take(")"):
            raise sc.fail("expected ')'")
        return e
    return _signed_number(sc)


def parse_laurent_terms(text: str, variable: str = "t") -> dict[Fraction, int]:
    """Parse ``text`` into {exponent: coefficient}.

    Raises
    ------
    PolynomialError
        If the text is empty or malformed; the message gives the position.
    """
    if not isinstance(text, str):
        raise PolynomialError(f"expected polynomial text, got {type(text).__name__}", value=text)
    sc = _Scanner(text)
    if not sc.peek():
        raise PolynomialError("empty polynomial text", value=text)
    terms: dict[Fraction, int] = {}
    first = True
    while True:
        sign = 1
        saw_sign = False
        while sc.peek() in ("+", "-") and sc.peek():
            saw_sign = True
            if sc.take("-"):
                sign = -sign
            else:
                sc.take("+")
        if not first and not saw_sign:
            raise sc.fail("expected '+' or '-' between terms")
        first = False
        coeff = sc.integer()
        exponent = Fraction(0)
        if coeff is not None and sc.peek() == "/":
            # "1/t" or "2/t^3"
            sc.take("/")
            if not sc.take(variable):
                raise sc.fail(f"expected {variable!r} after '/' (coefficients must be integers)")
            exponent = -_exponent(sc)
        else:
            sc.take("*") if coeff is not None else None
            if sc.take(variable):
                exponent = _exponent(sc)
            elif coeff is None:
                raise sc.fail(f"expected a coefficient or {variable!r}")
        if 2 * exponent != int(2 * exponent):
            raise sc.fail("exponents must be integers or halves")
        c = sign * (1 if coeff is None else coeff)
        terms[exponent] = terms.get(exponent, 0) + c
        if not sc.peek():
            break
        if sc.peek() not in "+-":
            raise sc.fail("unexpected character")
    return terms
