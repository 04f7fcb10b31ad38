"""Exact Laurent polynomials in one variable with integer coefficients.

Exponents may be half-integers, as in the Jones polynomial of a link with an
even number of components.  A :class:`Laurent` is immutable and hashable; its
one canonical text form (``str``) is what the reference table stores and what
the tests compare.  Arithmetic is exact.
"""

from __future__ import annotations

from fractions import Fraction
from typing import Iterable, Mapping

from .errors import PolynomialError

__all__ = ["Laurent"]

Exponent = "int | Fraction"


def _strip(low2: int, coeffs: list[int] | tuple[int, ...]) -> tuple[int, tuple[int, ...]]:
    """Drop zero coefficients at both ends; the zero polynomial is (0, ())."""
    start = 0
    end = len(coeffs)
    while start < end and coeffs[start] == 0:
        start += 1
    while end > start and coeffs[end - 1] == 0:
        end -= 1
    if start == end:
        return 0, ()
    return low2 + start, tuple(coeffs[start:end])


def _exponent2(e: object) -> int:
    """Twice an exponent given as int or Fraction with denominator 1 or 2."""
    if isinstance(e, bool):
        raise PolynomialError(f"exponent must be an integer or half-integer, got {e!r}", value=e)
    if isinstance(e, int):
        return 2 * e
    if isinstance(e, Fraction):
        twice = 2 * e
        if twice.denominator == 1:
            return int(twice)
    raise PolynomialError(
        f"exponent must be an integer or half-integer, got {e!r}", value=e
    )


def _format_exponent2(e2: int) -> str:
    if e2 % 2 == 0:
        return str(e2 // 2)
    return f"({e2}/2)"


def _digits(text: str) -> bool:
    """True for a non-empty run of ASCII digits."""
    return text.isascii() and text.isdigit()


def _parse_canonical(text: str, variable: str) -> "Laurent | None":
    """The polynomial whose canonical text (:meth:`Laurent.to_text`) is ``text``, else None.

    The table and every result store polynomials in canonical text, and
    parsing them is frequent (the connected-sum search reads every table
    polynomial once per process).  Terms are split at " + " and " - " and read
    directly; the answer is kept only when its own canonical text is ``text``
    again, which proves it is what the general parser would give.  Any other
    text (spaces elsewhere, ``**``, ``1/t``, ...) returns None and goes to the
    general parser.
    """
    if not text or not variable:
        return None
    pieces = text.split(" ")
    signs = pieces[1::2]
    bodies = pieces[0::2]
    if len(bodies) != len(signs) + 1:
        return None
    terms: dict[int, int] = {}
    for k, body in enumerate(bodies):
        negative = k == 0 and body.startswith("-")
        if negative:
            body = body[1:]
        elif k and signs[k - 1] not in ("+", "-"):
            return None
        elif k:
            negative = signs[k - 1] == "-"
        head, var, power = body.partition(variable)
        if not var:
            if not _digits(head):
                return None
            c, e2 = int(head), 0
        else:
            if head and not _digits(head):
                return None
            c = int(head) if head else 1
            if not power:
                e2 = 2
            elif power.startswith("^(") and power.endswith("/2)"):
                num = power[2:-3]
                if not _digits(num.removeprefix("-")):
                    return None
                e2 = int(num)
            elif power.startswith("^") and _digits(power[1:].removeprefix("-")):
                e2 = 2 * int(power[1:])
            else:
                return None
        if e2 in terms:
            return None
        terms[e2] = -c if negative else c
    low = min(terms)
    dense = [0] * (max(terms) - low + 1)
    for e2, c in terms.items():
        dense[e2 - low] = c
    out = Laurent._new(low, dense)
    return out if out.to_text(variable) == text else None


class Laurent:
    """An exact Laurent polynomial in ``t`` with integer coefficients.

    Parameters
    ----------
    terms : mapping of exponent to coefficient, optional
        Exponents are ``int`` or ``Fraction`` with denominator 1 or 2;
        coefficients are ``int``.  Zero coefficients are dropped.

    Examples
    --------
    >>> trefoil = Laurent({1: 1, 3: 1, 4: -1})
    >>> str(trefoil)
    't + t^3 - t^4'
    >>> str(trefoil.mirror())
    '-t^-4 + t^-3 + t^-1'
    >>> Laurent.parse("t + t^3 - t^4") == trefoil
    True

    Notes
    -----
    Stored densely in steps of t^(1/2): the lowest exponent (doubled) and a
    tuple of coefficients.  ``Laurent._new`` is the trusted internal
    constructor used on hot paths; the public constructor validates.
    """

    __slots__ = ("_low2", "_coeffs", "_hash")

    def __init__(self, terms: Mapping[object, int] | None = None):
        terms = terms or {}
        items = []
        for e, c in terms.items():
            if isinstance(c, bool) or not isinstance(c, int):
                raise PolynomialError(f"coefficient must be an integer, got {c!r}", value=c)
            items.append((_exponent2(e), c))
        if not items:
            self._low2, self._coeffs = 0, ()
        else:
            low = min(e for e, _ in items)
            high = max(e for e, _ in items)
            dense = [0] * (high - low + 1)
            for e, c in items:
                dense[e - low] += c
            self._low2, self._coeffs = _strip(low, dense)
        self._hash = None

    # -- constructors -----------------------------------------------------
    @classmethod
    def _new(cls, low2: int, coeffs: Iterable[int]) -> "Laurent":
        """Trusted constructor: doubled lowest exponent and dense half-step coefficients."""
        self = object.__new__(cls)
        self._low2, self._coeffs = _strip(low2, list(coeffs))
        self._hash = None
        return self

    @classmethod
    def from_coefficients(cls, low_exponent: object, coeffs: Iterable[int], step: object = 1) -> "Laurent":
        """Build from the lowest exponent and coefficients in steps of ``step`` (1 or 1/2).

        >>> str(Laurent.from_coefficients(-1, [1, -1, 1]))
        't^-1 - 1 + t'
        """
        low2 = _exponent2(low_exponent)
        step2 = _exponent2(step)
        if step2 not in (1, 2):
            raise PolynomialError(f"step must be 1 or 1/2, got {step!r}", value=step)
        coeffs = list(coeffs)
        for c in coeffs:
            if isinstance(c, bool) or not isinstance(c, int):
                raise PolynomialError(f"coefficient must be an integer, got {c!r}", value=c)
        if step2 == 2:
            dense = [0] * (2 * len(coeffs) - 1) if coeffs else []
            dense[::2] = coeffs
        else:
            dense = coeffs
        return cls._new(low2, dense)

    @classmethod
    def constant(cls, c: int) -> "Laurent":
        return cls._new(0, (c,))

    @classmethod
    def monomial(cls, c: int, exponent: object) -> "Laurent":
        return cls._new(_exponent2(exponent), (c,))

    @classmethod
    def parse(cls, text: str, variable: str = "t") -> "Laurent":
        """Parse a polynomial written as text, without evaluating it.

        Accepts the canonical form and common variants: ``2t^3``, ``2*t**3``,
        ``t^(1/2)``, ``t^-1``, ``1/t``, spaces anywhere.

        Raises
        ------
        PolynomialError
            With the position and the reason when the text is malformed.
        """
        fast = _parse_canonical(text, variable) if isinstance(text, str) else None
        if fast is not None:
            return fast
        from .polynomial_text import parse_laurent_terms

        return cls(parse_laurent_terms(text, variable))

    # -- inspection -------------------------------------------------------
    def terms(self) -> list[tuple[Fraction, int]]:
        """(exponent, coefficient) pairs in increasing exponent, zeros left out."""
        return [
            (Fraction(self._low2 + i, 2), c) for i, c in enumerate(self._coeffs) if c != 0
        ]

    def coefficient(self, exponent: object) -> int:
        i = _exponent2(exponent) - self._low2
        if 0 <= i < len(self._coeffs):
            return self._coeffs[i]
        return 0

    def is_zero(self) -> bool:
        return not self._coeffs

    @property
    def min_exponent(self) -> Fraction:
        if not self._coeffs:
            raise PolynomialError("the zero polynomial has no lowest exponent")
        return Fraction(self._low2, 2)

    @property
    def max_exponent(self) -> Fraction:
        if not self._coeffs:
            raise PolynomialError("the zero polynomial has no highest exponent")
        return Fraction(self._low2 + len(self._coeffs) - 1, 2)

    def span(self) -> Fraction:
        """Highest minus lowest exponent (0 for a monomial)."""
        if not self._coeffs:
            raise PolynomialError("the zero polynomial has no highest exponent")
        return Fraction(len(self._coeffs) - 1, 2)

    def has_integer_exponents(self) -> bool:
        return all((self._low2 + i) % 2 == 0 for i, c in enumerate(self._coeffs) if c)

    def is_symmetric(self) -> bool:
        """True when p(t) = p(1/t)."""
        return self == self.mirror()

    def coefficient_list(self, step: object = 1) -> list[int]:
        """Dense coefficients from the lowest exponent upward in steps of ``step``."""
        step2 = _exponent2(step)
        if step2 == 1:
            return list(self._coeffs)
        out = list(self._coeffs[::2])
        if any(self._coeffs[1::2]):
            raise PolynomialError("polynomial has exponents between the requested steps")
        return out

    # -- transformations --------------------------------------------------
    def mirror(self) -> "Laurent":
        """The substitution t -> 1/t."""
        if not self._coeffs:
            return self
        high2 = self._low2 + len(self._coeffs) - 1
        return Laurent._new(-high2, self._coeffs[::-1])

    def shift(self, exponent: object) -> "Laurent":
        """Multiply by t^exponent."""
        return Laurent._new(self._low2 + _exponent2(exponent), self._coeffs)

    def substitute_power(self, k: int) -> "Laurent":
        """The substitution t -> t^k for a non-zero integer k."""
        if k == 0:
            raise PolynomialError("t -> t^0 is not a substitution")
        poly = self if k > 0 else self.mirror()
        k = abs(k)
        if not poly._coeffs:
            return poly
        dense = [0] * ((len(poly._coeffs) - 1) * k + 1)
        dense[::k] = poly._coeffs
        return Laurent._new(poly._low2 * k, dense)

    def evaluate(self, x):
        """Evaluate at a number; exact for integers and Fractions.

        Half-integer powers use the principal square root (complex result).
        """
        if not self._coeffs:
            return 0
        if self.has_integer_exponents():
            exact = isinstance(x, (int, Fraction)) and not isinstance(x, bool)
            base = Fraction(x) if exact else x
            total = 0
            for e, c in self.terms():
                total += c * base ** int(e)
            if exact and isinstance(total, Fraction) and total.denominator == 1:
                return int(total)
            return total
        import cmath

        root = cmath.sqrt(x)
        return sum(c * root ** int(2 * e) for e, c in self.terms())

    # -- arithmetic -------------------------------------------------------
    def _coerce(self, other) -> "Laurent":
        if isinstance(other, Laurent):
            return other
        if isinstance(other, int) and not isinstance(other, bool):
            return Laurent.constant(other)
        return NotImplemented

    def __add__(self, other):
        other = self._coerce(other)
        if other is NotImplemented:
            return other
        if not other._coeffs:
            return self
        if not self._coeffs:
            return other
        low = min(self._low2, other._low2)
        high = max(self._low2 + len(self._coeffs), other._low2 + len(other._coeffs))
        dense = [0] * (high - low)
        for i, c in enumerate(self._coeffs, self._low2 - low):
            dense[i] += c
        for i, c in enumerate(other._coeffs, other._low2 - low):
            dense[i] += c
        return Laurent._new(low, dense)

    __radd__ = __add__

    def __neg__(self):
        return Laurent._new(self._low2, [-c for c in self._coeffs])

    def __sub__(self, other):
        other = self._coerce(other)
        if other is NotImplemented:
            return other
        return self + (-other)

    def __rsub__(self, other):
        other = self._coerce(other)
        if other is NotImplemented:
            return other
        return other + (-self)

    def __mul__(self, other):
        other = self._coerce(other)
        if other is NotImplemented:
            return other
        if not self._coeffs or not other._coeffs:
            return Laurent._new(0, ())
        a, b = self._coeffs, other._coeffs
        dense = [0] * (len(a) + len(b) - 1)
        for i, ca in enumerate(a):
            if ca:
                for j, cb in enumerate(b):
                    dense[i + j] += ca * cb
        return Laurent._new(self._low2 + other._low2, dense)

    __rmul__ = __mul__

    def __pow__(self, k: int):
        if not isinstance(k, int) or k < 0:
            if isinstance(k, int) and len(self._coeffs) == 1 and abs(self._coeffs[0]) == 1:
                return Laurent._new(self._low2 * k, (self._coeffs[0] ** (-k),))
            raise PolynomialError(f"only monomials ±t^e may be raised to a negative power, got {k!r}")
        result = Laurent.constant(1)
        base = self
        while k:
            if k & 1:
                result = result * base
            base = base * base
            k >>= 1
        return result

    def __eq__(self, other):
        if isinstance(other, Laurent):
            return self._low2 == other._low2 and self._coeffs == other._coeffs
        if isinstance(other, int) and not isinstance(other, bool):
            return self == Laurent.constant(other)
        return NotImplemented

    def __hash__(self):
        if self._hash is None:
            self._hash = hash((self._low2, self._coeffs))
        return self._hash

    def sort_key(self) -> tuple:
        """A total order used to pick canonical representatives (lowest exponent, then coefficients)."""
        return (len(self._coeffs), self._low2, self._coeffs)

    # -- text -------------------------------------------------------------
    def to_text(self, variable: str = "t", descending: bool = False) -> str:
        """Readable text; ascending order is the canonical form."""
        if not self._coeffs:
            return "0"
        parts = []
        terms = [(self._low2 + i, c) for i, c in enumerate(self._coeffs) if c]
        if descending:
            terms.reverse()
        for k, (e2, c) in enumerate(terms):
            sign = "-" if c < 0 else "+"
            mag = abs(c)
            if e2 == 0:
                body = str(mag)
            else:
                power = variable if e2 == 2 else f"{variable}^{_format_exponent2(e2)}"
                body = power if mag == 1 else f"{mag}{power}"
            if k == 0:
                parts.append(body if sign == "+" else f"-{body}")
            else:
                parts.append(f" {sign} {body}")
        return "".join(parts)

    def latex(self, variable: str = "t") -> str:
        """LaTeX source, highest power first as printed in papers."""
        if not self._coeffs:
            return "0"
        out = []
        terms = [(self._low2 + i, c) for i, c in enumerate(self._coeffs) if c][::-1]
        for k, (e2, c) in enumerate(terms):
            sign = "-" if c < 0 else "+"
            mag = abs(c)
            if e2 == 0:
                body = str(mag)
            else:
                if e2 == 2:
                    power = variable
                elif e2 % 2 == 0:
                    power = f"{variable}^{{{e2 // 2}}}"
                else:
                    num = "-" if e2 < 0 else ""
                    power = f"{variable}^{{{num}{abs(e2)}/2}}"
                body = power if mag == 1 else f"{mag}{power}"
            if k == 0:
                out.append(body if sign == "+" else f"-{body}")
            else:
                out.append(f" {sign} {body}")
        return "".join(out)

    def __str__(self) -> str:
        return self.to_text()

    def __repr__(self) -> str:
        return f"Laurent.parse({self.to_text()!r})"
