"""Connected sums from invariants: every multiset of table primes whose invariants multiply out.

Under connected sum the Jones and Alexander polynomials and the determinant
multiply and the signature adds (common practice).  Given the invariants of
a knot, :func:`factorisations` finds every multiset of prime knots of the
reference table, each in a definite chirality, whose invariants combine to
exactly those values.  Only the invariants that were computed take part (the
Jones polynomial may have been skipped for cost), and the answer says which.

The search is a depth-first walk over the distinct prime invariant values,
in a fixed order with repetition (so each multiset is met once); a factor is
tried only when its determinant divides what is left, its polynomials are not
wider than what is left, and they divide it exactly in Z[t, 1/t].  Every
non-trivial knot of the table has an Alexander polynomial of positive span,
so each step shortens the remainder and the walk ends.

A factorisation found here is consistent evidence for a connected sum, not a
proof: a prime knot beyond the table may share all these invariants.
"""

from __future__ import annotations

import weakref
from dataclasses import dataclass, field
from fractions import Fraction

from .budget import check_deadline
from .laurent import Laurent
from .memo import memo_for, recall

__all__ = [
    "Factor",
    "Factorisation",
    "FactorSearch",
    "factorisations",
    "alexander_groupings",
    "exact_quotient",
    "composite_label",
]

#: At most this many factorisations (or groupings) are listed; the search says when it stopped.
MAX_SOLUTIONS = 200
#: At most this many steps of the search; past them it stops and says it is incomplete.
MAX_STEPS = 20000

#: Connected-sum answers remembered per table (least recently used dropped first).
MEMO_SIZE = 4096
_groupings_memos: weakref.WeakKeyDictionary = weakref.WeakKeyDictionary()
_factorisation_memos: weakref.WeakKeyDictionary = weakref.WeakKeyDictionary()

#: Integer points where a divisor's value must divide the remainder's (a cheap filter
#: before exact division: P = Q R in Z[s] gives Q(k) | P(k), with s = t^(1/2)).
_POINTS = (2, 3, 5, 7)
_HALF = Fraction(1, 2)


@dataclass(frozen=True)
class _Poly:
    """A Laurent polynomial with what the search filters on: twice its span, its values."""

    p: Laurent
    span2: int
    values: tuple

    @classmethod
    def of(cls, p: Laurent) -> "_Poly":
        coeffs = p._coeffs
        values = []
        for k in _POINTS:
            v = 0
            for c in reversed(coeffs):
                v = v * k + c
            values.append(v)
        return cls(p, len(coeffs) - 1, tuple(values))

    def may_divide(self, other: "_Poly") -> bool:
        """False when self certainly does not divide other (span or values)."""
        if self.span2 > other.span2:
            return False
        for q, v in zip(self.values, other.values):
            if (v != 0) if q == 0 else (v % q):
                return False
        return True

    def quotient(self, other: "_Poly") -> "_Poly | None":
        """other / self when exact."""
        if not self.may_divide(other):
            return None
        q = exact_quotient(other.p, self.p)
        return None if q is None else _Poly.of(q)

    def is_unit(self) -> bool:
        return self.span2 == 0 and abs(self.values[0]) == 1


def exact_quotient(p: Laurent, q: Laurent) -> Laurent | None:
    """p / q when it lies in Z[t^(1/2), t^(-1/2)] exactly, else None.

    Examples
    --------
    >>> a = Laurent.parse("t^-1 - 1 + t")
    >>> str(exact_quotient(a * a, a))
    't^-1 - 1 + t'
    >>> exact_quotient(a, Laurent.parse("2")) is None
    True
    """
    if q.is_zero():
        raise ZeroDivisionError("division by the zero polynomial")
    if p.is_zero():
        return p
    num = p._coeffs  # dense in steps of t^(1/2), read directly on this hot path
    den = q._coeffs
    if len(den) > len(num):
        return None
    lead = den[-1]
    rem = list(num)
    out = [0] * (len(num) - len(den) + 1)
    for k in range(len(out) - 1, -1, -1):
        c = rem[k + len(den) - 1]
        if c % lead:
            return None
        c //= lead
        out[k] = c
        if c:
            for j, d in enumerate(den):
                rem[k + j] -= c * d
    if any(rem[:len(den) - 1]):
        return None
    return Laurent._new(p._low2 - q._low2, out)


@dataclass(frozen=True)
class Factor:
    """One prime summand: a table knot in one chirality (or both, when undetermined)."""

    name: str
    label: str
    chirality: str
    crossing_number: int
    alternating: bool

    def to_dict(self) -> dict:
        return {"name": self.name, "label": self.label, "chirality": self.chirality}

    @property
    def shown(self) -> str:
        return self.label if self.chirality in ("same", "mirror") else self.name


def _factor_order(f: Factor) -> tuple:
    return (f.crossing_number, _name_order(f.name), f.chirality == "mirror")


def composite_label(factors) -> str:
    """The label of a connected sum, factors in table order: ``3_1#3_1*#5_2``."""
    return "#".join(f.shown for f in sorted(factors, key=_factor_order))


@dataclass(frozen=True)
class Factorisation:
    """One multiset of table primes consistent with the invariants."""

    factors: tuple[Factor, ...]

    @property
    def label(self) -> str:
        return composite_label(self.factors)

    @property
    def name(self) -> str:
        """The label without chirality marks."""
        return "#".join(f.name for f in sorted(self.factors, key=_factor_order))

    @property
    def crossing_sum(self) -> int:
        """Sum of the factors' crossing numbers: an upper bound for the sum's crossing number."""
        return sum(f.crossing_number for f in self.factors)

    @property
    def all_alternating(self) -> bool:
        return all(f.alternating for f in self.factors)


@dataclass
class FactorSearch:
    """What :func:`factorisations` found.

    Attributes
    ----------
    solutions : list of Factorisation
        Every factorisation (at most :data:`MAX_SOLUTIONS`), fewest factors first.
    used : list of str
        The invariants that took part ("jones", "alexander", "determinant", "signature").
    complete : bool
        False when the list was cut at :data:`MAX_SOLUTIONS`.
    partial : list of (Factorisation, dict)
        When there is no full factorisation and Jones took part: the largest
        multisets of table primes that divide the invariants, each with the
        remainder's invariants (``jones``, ``alexander``, ``determinant``,
        ``signature`` as Laurent / int).
    """

    solutions: list[Factorisation] = field(default_factory=list)
    used: list[str] = field(default_factory=list)
    complete: bool = True
    partial: list = field(default_factory=list)


@dataclass
class _Class:
    """Prime forms sharing every invariant that takes part."""

    alexander: Laurent
    determinant: int
    signature: int | None
    jones: Laurent | None
    forms: list = field(default_factory=list)
    span: int = 0
    a: _Poly | None = None
    v: _Poly | None = None


def _prime_forms(table) -> list[dict]:
    cache = getattr(table, "_prime_forms_cache", None)
    if cache is not None:
        return cache
    knots = {k["name"]: k for k in table.knots()}
    out = []
    for f in table.all_forms():
        k = knots.get(f.name)
        if k is None or k["kind"] != "prime" or f.components != 1:
            continue
        out.append({"name": f.name, "label": f.label, "is_reference": f.is_reference,
                    "amphichiral": bool(k["amphichiral"]), "crossing_number":
                    k["crossing_number"], "alternating": bool(k["alternating"]),
                    "jones": Laurent.parse(f.jones), "alexander": Laurent.parse(f.alexander),
                    "determinant": f.determinant, "signature": f.signature})
    table._prime_forms_cache = out
    return out


def _classes(table, with_jones: bool, with_signature: bool) -> list[_Class]:
    key = ("_factor_classes", with_jones, with_signature)
    cache = getattr(table, "_factor_classes_cache", None)
    if cache is None:
        cache = table._factor_classes_cache = {}
    if key in cache:
        return cache[key]
    by: dict[tuple, _Class] = {}
    for f in _prime_forms(table):
        k = (f["alexander"], f["determinant"], f["signature"] if with_signature else None,
             f["jones"] if with_jones else None)
        c = by.get(k)
        if c is None:
            c = by[k] = _Class(*k)
            c.span = int(f["alexander"].span())
        c.forms.append(f)
    # every class must shorten what is left: Alexander of positive span (true of every
    # non-trivial knot through 10 crossings), or Jones of positive span
    out = [c for c in by.values()
           if c.span > 0 or (c.jones is not None and c.jones.span() > 0)]
    for c in out:
        c.a = _Poly.of(c.alexander)
        c.v = None if c.jones is None else _Poly.of(c.jones)
    out.sort(key=lambda c: (-c.span, c.determinant, str(c.alexander), c.signature or 0,
                            str(c.jones)))
    cache[key] = out
    return out


def _class_factors(c: _Class, with_jones: bool) -> list[Factor]:
    """The distinct summands a class stands for (one per knot name)."""
    by_name: dict[str, list] = {}
    for f in c.forms:
        by_name.setdefault(f["name"], []).append(f)
    out = []
    for name, forms in sorted(by_name.items()):
        f = forms[0]
        if f["amphichiral"]:
            chir, label = "amphichiral", name
        elif len(forms) == 2 or not with_jones and c.signature is None:
            chir, label = "undetermined", name
        else:
            chir = "same" if f["is_reference"] else "mirror"
            label = f["label"]
        out.append(Factor(name, label, chir, f["crossing_number"], f["alternating"]))
    return out


def _expand(chosen: list[_Class], with_jones: bool, limit: int) -> list[Factorisation]:
    """Every way to pick one summand per chosen class."""
    combos: list[tuple[Factor, ...]] = [()]
    for c in chosen:
        options = _class_factors(c, with_jones)
        combos = [prev + (f,) for prev in combos for f in options][:limit]
    seen = set()
    out = []
    for combo in combos:
        fz = Factorisation(tuple(sorted(combo, key=_factor_order)))
        if fz.label not in seen:
            seen.add(fz.label)
            out.append(fz)
    return out


def _is_unit(p: Laurent) -> bool:
    return len(p.terms()) == 1 and abs(p.terms()[0][1]) == 1


def factorisations(table, alexander: Laurent, determinant: int | None = None,
                   signature: int | None = None, jones: Laurent | None = None,
                   limit: int = MAX_SOLUTIONS, partial: bool = False,
                   max_steps: int = MAX_STEPS) -> FactorSearch:
    """Every multiset of table prime knots, with chirality, matching the given invariants.

    Parameters
    ----------
    table : ReferenceTable
    alexander : Laurent
        Always required: it bounds the search.
    determinant, signature, jones : optional
        Those computed; None leaves an invariant out (Jones when skipped for
        cost, the signature to group by the Alexander polynomial alone).
    limit : int
        Most solutions listed.
    partial : bool
        When nothing factors completely, also find the largest divisors made of
        table primes and the remainders (only worth it with Jones).
    max_steps : int
        Stop after this many steps (``complete`` is then False).  Remainders
        known to lead nowhere are remembered, so each is explored once.

    Returns
    -------
    FactorSearch
        One-factor solutions are single table primes; callers that looked the
        knot up in the table already may drop them.

    Examples
    --------
    >>> from knotsift.table import open_table
    >>> t = open_table()
    >>> v = Laurent.parse("t + t^3 - t^4")
    >>> a = Laurent.parse("t^-1 - 1 + t")
    >>> [s.label for s in factorisations(t, a * a, 9, -4, v * v).solutions]
    ['3_1#3_1']

    Notes
    -----
    Answers are remembered per table for the last :data:`MEMO_SIZE`
    questions (each call gets its own copy); a search cut short by the
    wall-time budget is not remembered.
    """
    key = (alexander, determinant, signature, jones, limit, partial, max_steps)
    found = recall(memo_for(_factorisation_memos, table), key, MEMO_SIZE,
                   lambda: _factorisations(table, alexander, determinant, signature, jones,
                                           limit, partial, max_steps))
    return FactorSearch(list(found.solutions), list(found.used), found.complete,
                        [(fz, dict(rest)) for fz, rest in found.partial])


def _factorisations(table, alexander: Laurent, determinant: int | None,
                    signature: int | None, jones: Laurent | None, limit: int, partial: bool,
                    max_steps: int) -> FactorSearch:
    with_jones = jones is not None
    with_sig = signature is not None
    classes = _classes(table, with_jones, with_sig)
    det = determinant if determinant is not None else abs(alexander.evaluate(-1))
    used = ["alexander", "determinant"] + (["signature"] if with_sig else []) + \
        (["jones"] if with_jones else [])
    search = FactorSearch(used=used)
    found: list[list[_Class]] = []
    leaves: list[tuple[list[_Class], Laurent, int, int | None, Laurent | None]] = []
    nodes = [0]

    def divides(c: _Class, a_rem: _Poly, d_rem: int, v_rem: _Poly | None):
        if d_rem % c.determinant or not c.a.may_divide(a_rem):
            return None
        if with_jones and not c.v.may_divide(v_rem):
            return None
        qa = c.a.quotient(a_rem)
        if qa is None:
            return None
        qv = None
        if with_jones:
            qv = c.v.quotient(v_rem)
            if qv is None:
                return None
        return qa, qv

    dead: set = set()

    def walk(start: int, a_rem: _Poly, d_rem: int, s_rem: int | None, v_rem, chosen):
        nodes[0] += 1
        if nodes[0] % 256 == 0:
            check_deadline("the connected-sum search")
        if len(found) >= limit or nodes[0] > max_steps:
            search.complete = False
            return
        key = None
        if not partial:
            key = (start, a_rem.p, s_rem, None if v_rem is None else v_rem.p)
            if key in dead:
                return
        before = len(found)
        _walk_children(start, a_rem, d_rem, s_rem, v_rem, chosen)
        if key is not None and len(found) == before and search.complete:
            dead.add(key)

    def _walk_children(start, a_rem, d_rem, s_rem, v_rem, chosen):
        if a_rem.is_unit() and d_rem == 1 and (not with_jones or v_rem.p == 1):
            if chosen and (not with_sig or s_rem == 0):
                found.append(list(chosen))
            elif chosen and partial:
                leaves.append((list(chosen), a_rem, d_rem, s_rem, v_rem))
            return
        went = False
        for i in range(start, len(classes)):
            c = classes[i]
            q = divides(c, a_rem, d_rem, v_rem)
            if q is None:
                continue
            went = True
            chosen.append(c)
            walk(i, q[0], d_rem // c.determinant,
                 None if s_rem is None else s_rem - c.signature, q[1], chosen)
            chosen.pop()
            if len(found) >= limit:
                return
        if partial and chosen and not went and not any(
                divides(c, a_rem, d_rem, v_rem) for c in classes[:start]):
            leaves.append((list(chosen), a_rem, d_rem, s_rem, v_rem))

    walk(0, _Poly.of(alexander), det, signature, None if jones is None else _Poly.of(jones),
         [])
    for chosen in found:
        for fz in _expand(chosen, with_jones, limit):
            if len(search.solutions) >= limit:
                search.complete = False
                break
            search.solutions.append(fz)
    search.solutions.sort(key=lambda s: (len(s.factors), s.crossing_sum, s.label))
    if partial and not search.solutions:
        for chosen, a_rem, d_rem, s_rem, v_rem in leaves[:limit]:
            for fz in _expand(chosen, with_jones, limit)[:limit]:
                search.partial.append((fz, {"alexander": a_rem.p, "determinant": d_rem,
                                            "signature": s_rem,
                                            "jones": None if v_rem is None else v_rem.p}))
        search.partial.sort(key=lambda p: (-len(p[0].factors), p[0].label))
    return search


def alexander_groupings(table, alexander: Laurent, limit: int = MAX_SOLUTIONS
                        ) -> tuple[list[list[str]], bool]:
    """Ways to write Delta as a product of table primes' Alexander polynomials.

    Mirror images share the Alexander polynomial, and so may different knots:
    each factor is shown as the table knots having it (``6_1/9_46``).

    Returns
    -------
    groupings : list of list of str
        Each grouping lists its factors, fewest factors first.
    complete : bool
        False when cut at ``limit``.

    Notes
    -----
    Answers are remembered per table for the last :data:`MEMO_SIZE`
    polynomials asked about (the same values recur across the frames of a
    run); a search cut short by the wall-time budget is not remembered.
    """
    groups, complete = recall(memo_for(_groupings_memos, table), (alexander, limit), MEMO_SIZE,
                              lambda: _groupings(table, alexander, limit))
    return [list(g) for g in groups], complete


def _groupings(table, alexander: Laurent, limit: int) -> tuple[list[list[str]], bool]:
    classes = _classes(table, False, False)
    found: list[list[_Class]] = []
    complete = [True]
    nodes = [0]

    dead: set = set()

    def walk(start: int, rem: _Poly, chosen: list[_Class]):
        nodes[0] += 1
        if nodes[0] % 256 == 0:
            check_deadline("the Alexander grouping")
        if len(found) >= limit or nodes[0] > MAX_STEPS:
            complete[0] = False
            return
        if (start, rem.p) in dead:
            return
        before = len(found)
        _children(start, rem, chosen)
        if len(found) == before and complete[0]:
            dead.add((start, rem.p))

    def _children(start: int, rem: _Poly, chosen: list[_Class]):
        if rem.is_unit():
            if chosen:
                found.append(list(chosen))
            return
        for i in range(start, len(classes)):
            c = classes[i]
            q = c.a.quotient(rem)
            if q is not None:
                chosen.append(c)
                walk(i, q, chosen)
                chosen.pop()

    walk(0, _Poly.of(alexander), [])
    out = []
    for chosen in found:
        names = []
        for c in chosen:
            knots = sorted({f["name"] for f in c.forms}, key=_name_order)
            names.append("/".join(knots[:3]) + ("/..." if len(knots) > 3 else ""))
        out.append(sorted(names, key=lambda s: _name_order(s.split("/")[0])))
    out.sort(key=lambda g: (len(g), g))
    return out, complete[0]


def _name_order(name: str) -> tuple:
    head, _, tail = name.partition("_")
    try:
        return (int(head), int(tail), name)
    except ValueError:
        return (999, 0, name)
