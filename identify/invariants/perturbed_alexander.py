"""The perturbed Alexander invariant rho_1 of a knot, exactly and as a modular hash.

A knot diagram is cut at an edge of its outer face into an upright long knot
with edges ``1 .. 2n + 1`` numbered along the strand.  A crossing is a triple
``(s, i, j)``: its sign, the incoming over-edge and the incoming under-edge
(the outgoing edges are ``i + 1`` and ``j + 1``).  Every edge ``k`` carries a
rotation number ``phi_k``, its net counter-clockwise turning in full turns
from "up" at its start to "up" at its end.  With

* ``A = I - sum_c [T^s E(i, i+1) + (1 - T^s) E(i, j+1) + E(j, j+1)]``,
* ``Delta = T^((-phi - w)/2) det A`` (``phi = sum phi_k``, ``w`` the writhe),
* ``g = A^-1`` and
  ``R1(c) = s (g[j,i] (g[j+1,j] + g[j,j+1] - g[i,j]) - g[i,i] (g[j,j+1] - 1) - 1/2)``,

the invariant is ``rho_1 = Delta^2 (sum_c R1(c) - sum_k phi_k (g[k,k] - 1/2))``,
a Laurent polynomial in ``T`` with integer coefficients (Bar-Natan and van der
Veen 2024).  ``Delta`` is the Conway-normalised Alexander polynomial.

Rotation numbers come from the faces of the PD code: with every crossing
upright, its four corners sit at 45, 135, 225 and 315 degrees, and walking
round a face the turning adds up to one full turn (clockwise for a bounded
face with the face on the right, anticlockwise for the outer face).  That is
one integer equation per face, a flow problem on the dual graph, solved on a
spanning tree.  Cutting the outer-face edge ``e0`` adds one turn to it, with
the sign given by the side the outer face lies on.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..diagram import Diagram
from ..errors import InvariantError
from ..laurent import Laurent

__all__ = [
    "LongKnot",
    "PerturbedAlexander",
    "long_knot",
    "perturbed_alexander",
    "rho_1",
    "rho_1_hash",
    "HASH_POINTS",
]

#: (prime, point) pairs of the modular hash; the primes are the largest below 2^62.
HASH_POINTS: tuple[tuple[int, int], ...] = ()  # filled below


@dataclass(frozen=True)
class LongKnot:
    """An upright long knot: crossings ``(s, i, j)`` and rotation numbers of edges 1..2n+1.

    Attributes
    ----------
    crossings : tuple of (int, int, int)
        ``(sign, incoming over-edge, incoming under-edge)``, edges numbered 1..2n+1.
    rotation : tuple of int
        ``rotation[k - 1]`` is ``phi_k``.
    """

    crossings: tuple[tuple[int, int, int], ...]
    rotation: tuple[int, ...]

    @property
    def size(self) -> int:
        return 2 * len(self.crossings) + 1


@dataclass(frozen=True)
class PerturbedAlexander:
    """The Alexander polynomial and rho_1 of a knot, from the same matrix."""

    alexander: Laurent
    rho_1: Laurent


# -- rotation numbers ---------------------------------------------------------
def _dart_angle(sign: int, position: int) -> int:
    """Angle in degrees of a PD entry once its crossing is drawn upright.

    A positive crossing has its incoming under-strand (entry 0) at 315 degrees
    and its incoming over-strand (entry 3) at 225; a negative one has entry 0
    at 225 and its incoming over-strand (entry 1) at 315.  Entries follow
    counter-clockwise in steps of 90 degrees.
    """
    return ((315 if sign > 0 else 225) + 90 * position) % 360


def _face_walks(diagram: Diagram):
    """Each face as a list of (edge label, +1 forward / -1 backward, turning base in degrees).

    Faces are walked with the face on the right (the order of
    :meth:`Diagram.faces`).  The turning of a walked segment is its base plus
    360 times (+-) the rotation number of its edge.
    """
    xs = diagram.crossings
    signs = diagram.signs()
    walks = []
    for face in diagram.faces():
        segments = []
        for i, p in face:
            leave = (p + 1) % 4
            j, q = diagram.other_end(i, leave)
            a = _dart_angle(signs[i], leave)
            b = _dart_angle(signs[j], q)
            base = (b + 180 - a + 180) % 360 - 180
            forward = 1 if not diagram.is_incoming(i, leave) else -1
            segments.append((xs[i][leave], forward, base))
        walks.append(segments)
    return walks


def _rotation_numbers(diagram: Diagram, walks, outer: int) -> dict[int, int]:
    """A rotation number for every edge label, solving the face equations on a spanning tree."""
    demand = []
    plus: dict[int, int] = {}
    minus: dict[int, int] = {}
    for f, segments in enumerate(walks):
        target = 360 if f == outer else -360
        total = target + 90 * len(segments) - sum(base for _, _, base in segments)
        if total % 360:
            raise RuntimeError(f"internal error: face {f} has a turning equation with "
                               f"non-integral right-hand side {total}/360")
        demand.append(total // 360)
        for e, forward, _ in segments:
            (plus if forward > 0 else minus)[e] = f
    if sum(demand) != 0:
        raise RuntimeError("internal error: the face equations of rotation numbers are "
                           f"inconsistent (total demand {sum(demand)})")
    adjacent: dict[int, list[tuple[int, int]]] = {f: [] for f in range(len(walks))}
    for e, f in plus.items():
        g = minus[e]
        if f != g:
            adjacent[f].append((e, g))
            adjacent[g].append((e, f))
    parent_edge: dict[int, int] = {}
    order = [outer]
    seen = {outer}
    for f in order:
        for e, g in adjacent[f]:
            if g not in seen:
                seen.add(g)
                parent_edge[g] = e
                order.append(g)
    phi = {e: 0 for e in plus}
    acc = [0] * len(walks)
    for f in reversed(order[1:]):
        e = parent_edge[f]
        side = 1 if plus[e] == f else -1
        phi[e] = side * (demand[f] - acc[f])
        acc[f] += side * phi[e]
        other = minus[e] if side > 0 else plus[e]
        acc[other] += (-side) * phi[e]
    if acc[outer] != demand[outer]:
        raise RuntimeError("internal error: the rotation numbers do not balance at the outer face")
    return phi


def long_knot(diagram: Diagram, outer_face: int | None = None,
              cut_edge: int | None = None) -> LongKnot:
    """Cut a knot diagram into an upright long knot with rotation numbers.

    Parameters
    ----------
    diagram : Diagram
        A knot diagram with at least one crossing.
    outer_face : int, optional
        Index into :meth:`Diagram.faces` of the face drawn outside; default
        the face with the most corners (the first such).
    cut_edge : int, optional
        Label of the edge to cut; it must lie on the outer face.  Default: the
        first edge met walking round the outer face.

    Returns
    -------
    LongKnot

    Raises
    ------
    InvariantError
        For a link, a diagram without crossings, or a cut edge off the outer face.
    """
    _check_knot(diagram)
    if diagram.number_of_crossings() == 0:
        raise InvariantError("a long knot needs a diagram with at least one crossing",
                             value=diagram)
    walks = _face_walks(diagram)
    if outer_face is None:
        outer_face = max(range(len(walks)), key=lambda f: (len(walks[f]), -f))
    if not 0 <= outer_face < len(walks):
        raise InvariantError(f"outer_face must be 0..{len(walks) - 1}, got {outer_face}",
                             value=outer_face)
    phi = _rotation_numbers(diagram, walks, outer_face)
    on_outer = {e: forward for e, forward, _ in walks[outer_face]}
    if cut_edge is None:
        cut_edge = walks[outer_face][0][0]
    if cut_edge not in on_outer:
        raise InvariantError(f"edge {cut_edge} does not lie on the outer face {outer_face}",
                             value=cut_edge)
    comp = list(diagram.components()[0])
    k = comp.index(cut_edge)
    comp = comp[k:] + comp[:k]
    index = {e: m + 1 for m, e in enumerate(comp)}
    xs = diagram.crossings
    crossings = []
    for c, sign in enumerate(diagram.signs()):
        over_in = xs[c][3] if sign > 0 else xs[c][1]
        crossings.append((sign, index[over_in], index[xs[c][0]]))
    size = 2 * len(xs) + 1
    rotation = [0] * size
    for e, m in index.items():
        if e != cut_edge:
            rotation[m - 1] = phi[e]
    # the outer face on the right of e0 (walked forward) takes a turn off, on its left adds one
    rotation[size - 1] = phi[cut_edge] + (-1 if on_outer[cut_edge] > 0 else 1)
    return LongKnot(tuple(crossings), tuple(rotation))


def _check_knot(diagram: Diagram) -> None:
    k = diagram.number_of_components()
    if k != 1:
        raise InvariantError(
            f"rho_1 is computed for knots only, got a diagram with {k} components",
            value=diagram)


# -- evaluation modulo a prime ------------------------------------------------
def _value_at(lk: LongKnot, x: int, p: int) -> tuple[int, int] | None:
    """``(det A(x), P(x))`` modulo ``p``, or None when ``A(x)`` is singular there.

    ``P(T) = 2 T^(2 n_-) det(A)^2 (sum R1 - sum phi_k (g_kk - 1/2))`` is a
    polynomial of degree at most ``2n + 2`` (``n_-`` negative crossings), and
    ``2 T^(phi + w + 2 n_-) rho_1 = P``.
    """
    from flint import nmod_mat

    size = lk.size
    flat = [0] * (size * size)
    for k in range(size):
        flat[k * size + k] = 1
    xinv = pow(x, -1, p)
    for s, i, j in lk.crossings:
        ts = x if s > 0 else xinv
        flat[(i - 1) * size + i] = (flat[(i - 1) * size + i] - ts) % p
        flat[(i - 1) * size + j] = (flat[(i - 1) * size + j] - 1 + ts) % p
        flat[(j - 1) * size + j] = (flat[(j - 1) * size + j] - 1) % p
    a = nmod_mat(size, size, flat, p)
    det = int(a.det())
    if det == 0:
        return None
    g = a.inv()
    half = (p + 1) // 2
    total = 0
    for s, i, j in lk.crossings:
        i0, j0 = i - 1, j - 1
        r = (int(g[j0, i0]) * (int(g[j0 + 1, j0]) + int(g[j0, j0 + 1]) - int(g[i0, j0]))
             - int(g[i0, i0]) * (int(g[j0, j0 + 1]) - 1) - half)
        total += r if s > 0 else -r
    for k, phik in enumerate(lk.rotation):
        if phik:
            total -= phik * (int(g[k, k]) - half)
    negatives = sum(1 for s, _, _ in lk.crossings if s < 0)
    value = 2 * pow(x, 2 * negatives, p) * det * det % p * (total % p) % p
    return det, value


# -- primes, bounds, interpolation ---------------------------------------------
def _is_prime_64(n: int) -> bool:
    """Deterministic Miller-Rabin below 3.3e24 (the first twelve prime bases)."""
    if n < 2:
        return False
    bases = (2, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37)
    for b in bases:
        if n % b == 0:
            return n == b
    d, s = n - 1, 0
    while d % 2 == 0:
        d //= 2
        s += 1
    for b in bases:
        y = pow(b, d, n)
        if y in (1, n - 1):
            continue
        for _ in range(s - 1):
            y = y * y % n
            if y == n - 1:
                break
        else:
            return False
    return True


_PRIMES: list[int] = []


def _primes(count: int) -> list[int]:
    """The ``count`` largest primes below 2^62, decreasing."""
    candidate = _PRIMES[-1] - 2 if _PRIMES else (1 << 62) - 1
    while len(_PRIMES) < count:
        if _is_prime_64(candidate):
            _PRIMES.append(candidate)
        candidate -= 2
    return _PRIMES[:count]


def _coefficient_bound(lk: LongKnot) -> int:
    """A bound on |coefficients| of ``P`` and of ``T^(n_-) det A`` (Hadamard type).

    On the unit circle an entry of ``A`` is at most the sum of the absolute
    values of its coefficients; Hadamard's inequality bounds ``det A`` and
    every cofactor by ``H``, the product of the row norms, so ``|P| <= (11 n +
    3 sum |phi_k|) H^2`` there, and a coefficient is at most the maximum on the
    circle.
    """
    size = lk.size
    rows: list[dict[int, dict[int, int]]] = [dict() for _ in range(size)]

    def add(r: int, c: int, exponent: int, coeff: int) -> None:
        entry = rows[r].setdefault(c, {})
        entry[exponent] = entry.get(exponent, 0) + coeff

    for k in range(size):
        add(k, k, 0, 1)
    for s, i, j in lk.crossings:
        add(i - 1, i, s, -1)
        add(i - 1, j, 0, -1)
        add(i - 1, j, s, 1)
        add(j - 1, j, 0, -1)
    h2 = 1
    for row in rows:
        h2 *= max(1, sum(sum(abs(v) for v in entry.values()) ** 2 for entry in row.values()))
    return h2 * (11 * len(lk.crossings) + 3 * sum(abs(f) for f in lk.rotation))


def _interpolate(points: list[int], values: list[int], p: int) -> list[int]:
    """Coefficients (constant first) of the polynomial through the points, modulo p."""
    n = len(points)
    c = list(values)
    for k in range(1, n):
        for m in range(n - 1, k - 1, -1):
            c[m] = (c[m] - c[m - 1]) * pow(points[m] - points[m - k], -1, p) % p
    coef = [0] * n
    coef[0] = c[n - 1]
    degree = 0
    for k in range(n - 2, -1, -1):
        xk = points[k]
        new = [0] * n
        for e in range(degree + 1):
            new[e + 1] = (new[e + 1] + coef[e]) % p
            new[e] = (new[e] - xk * coef[e]) % p
        new[0] = (new[0] + c[k]) % p
        coef = new
        degree += 1
    return coef


def _crt(residues: list[list[int]], primes: list[int]) -> list[int]:
    """Symmetric CRT of coefficient lists, one list per prime."""
    modulus = math.prod(primes)
    weights = []
    for p in primes:
        rest = modulus // p
        weights.append(rest * pow(rest % p, -1, p))
    out = []
    for column in zip(*residues, strict=True):
        v = sum(r * w for r, w in zip(column, weights, strict=True)) % modulus
        out.append(v - modulus if 2 * v > modulus else v)
    return out


# -- public functions -----------------------------------------------------------
def perturbed_alexander(diagram: Diagram, outer_face: int | None = None,
                        cut_edge: int | None = None) -> PerturbedAlexander:
    """The Alexander polynomial and the perturbed Alexander invariant rho_1 of a knot.

    Parameters
    ----------
    diagram : Diagram
        A knot diagram (one component).
    outer_face, cut_edge : int, optional
        Where to cut (see :func:`long_knot`); the result does not depend on them.

    Returns
    -------
    PerturbedAlexander
        ``alexander``: Conway-normalised Delta(T); ``rho_1``: a Laurent
        polynomial with rho_1(1/T) = rho_1(T), negated by a mirror image.

    Raises
    ------
    InvariantError
        For a link.

    Examples
    --------
    >>> trefoil = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])
    >>> str(perturbed_alexander(trefoil).rho_1)
    '-t^-2 + 2t^-1 - 2 + 2t - t^2'

    Notes
    -----
    ``P(T) = 2 T^(phi + w + 2 n_-) rho_1`` is a polynomial of degree at most
    ``2n + 2`` and ``T^(n_-) det A`` one of degree at most ``n`` (rows of
    negative crossings times ``T`` have entries of degree at most one).  Both
    are evaluated at ``2n + 3`` points modulo enough primes below 2^62 to
    exceed twice a Hadamard-type coefficient bound, by a dense inverse over
    Z/p (FLINT), then interpolated and combined by the Chinese remainder
    theorem.  Exact; about ``O(n^4)`` word operations.  The Alexander
    polynomial is checked against Delta(1) = 1 and the symmetry of rho_1.

    References
    ----------
    D. Bar-Natan and R. van der Veen, "A perturbed-Alexander invariant",
    Quantum Topology (2024); arXiv 2206.12298.
    """
    _check_knot(diagram)
    if diagram.number_of_crossings() == 0:
        return PerturbedAlexander(Laurent.constant(1), Laurent.constant(0))
    lk = long_knot(diagram, outer_face, cut_edge)
    n = len(lk.crossings)
    negatives = sum(1 for s, _, _ in lk.crossings if s < 0)
    writhe = sum(s for s, _, _ in lk.crossings)
    phi = sum(lk.rotation)
    bound = _coefficient_bound(lk)
    count = 1
    while math.prod(_primes(count)) <= 2 * bound + 1:
        count += 1
    primes = _primes(count)
    npts = 2 * n + 3
    p_res, d_res = [], []
    for p in primes:
        xs, pv, dv = [], [], []
        x = 2
        while len(xs) < npts:
            got = _value_at(lk, x, p)
            if got is not None:
                xs.append(x)
                dv.append(got[0] * pow(x, negatives, p) % p)
                pv.append(got[1])
            x += 1
        p_res.append(_interpolate(xs, pv, p))
        d_res.append(_interpolate(xs[:n + 1], dv[:n + 1], p))
    big_p = _crt(p_res, primes)
    det_poly = _crt(d_res, primes)
    if any(c % 2 for c in big_p):
        raise RuntimeError("internal error: 2 rho_1 has an odd coefficient")
    shift2 = -phi - writhe - 2 * negatives
    if shift2 % 2:
        raise RuntimeError("internal error: phi + writhe is odd")
    # Delta = T^((-phi - w)/2 - n_-) (T^(n_-) det A)
    delta = Laurent.from_coefficients(shift2 // 2, det_poly)
    if delta.evaluate(1) == -1:
        raise RuntimeError("internal error: det A(1) = -1, the normalisation is off")
    if delta.evaluate(1) != 1 or not delta.is_symmetric():
        raise RuntimeError(f"internal error: Delta = {delta} is not Conway-normalised")
    rho = Laurent.from_coefficients(shift2, [c // 2 for c in big_p])
    if rho != rho.substitute_power(-1):
        raise RuntimeError(f"internal error: rho_1 = {rho} is not symmetric under T -> 1/T")
    return PerturbedAlexander(delta, rho)


def rho_1(diagram: Diagram) -> Laurent:
    """The perturbed Alexander invariant rho_1 of a knot (see :func:`perturbed_alexander`).

    Examples
    --------
    >>> figure_eight = Diagram([(4, 2, 5, 1), (8, 6, 1, 5), (6, 3, 7, 4), (2, 7, 3, 8)])
    >>> str(rho_1(figure_eight))
    '0'
    """
    return perturbed_alexander(diagram).rho_1


def rho_1_hash(diagram: Diagram, points: int = 2) -> tuple[int | None, ...]:
    """rho_1 evaluated at fixed points modulo large primes: a cheap key for big diagrams.

    Parameters
    ----------
    diagram : Diagram
        A knot diagram.
    points : int
        How many (prime, point) pairs of :data:`HASH_POINTS` to use (1 to 4).

    Returns
    -------
    tuple of int or None
        ``rho_1(x) mod p`` for each pair, as an integer in ``[0, p)``; None
        where ``Delta(x) = 0 mod p`` (the matrix cannot be inverted there),
        which depends on the knot only.  Equal knots give equal tuples;
        different values prove different knots (or mirror images).

    Notes
    -----
    One dense inverse modulo a 62-bit prime per point: ``O(n^3)``.
    """
    _check_knot(diagram)
    if not 1 <= points <= len(HASH_POINTS):
        raise ValueError(f"points must be 1..{len(HASH_POINTS)}, got {points!r}")
    if diagram.number_of_crossings() == 0:
        return (0,) * points
    lk = long_knot(diagram)
    writhe = sum(s for s, _, _ in lk.crossings)
    negatives = sum(1 for s, _, _ in lk.crossings if s < 0)
    shift = sum(lk.rotation) + writhe + 2 * negatives
    out: list[int | None] = []
    for p, x in HASH_POINTS[:points]:
        got = _value_at(lk, x, p)
        if got is None:
            out.append(None)
            continue
        # rho_1(x) = P(x) / (2 x^shift)
        scale = pow(2 * pow(x, shift, p) % p, -1, p) if shift >= 0 else \
            pow(x, -shift, p) * pow(2, -1, p) % p
        out.append(got[1] * scale % p)
    return tuple(out)


HASH_POINTS = tuple(zip(_primes(4), (3, 5, 7, 11)))
