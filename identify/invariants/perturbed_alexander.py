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
from .elimination import _permutation_sign

#: Up to this many crossings rho_1's points are evaluated one by one in pure
#: Python rather than with numpy and FLINT (about as fast here, and their
#: imports cost more than the whole computation).
SMALL_RHO = 4

__all__ = [
    "LongKnot",
    "PerturbedAlexander",
    "long_knot",
    "perturbed_alexander",
    "rho_1",
    "rho_1_hash",
    "rho_1_hash_of",
    "hash_text",
    "mirror_hash",
    "mirror_hash_text",
    "HASH_POINTS",
]

#: (prime, point) pairs of the modular hash; the primes are the largest below 2^31.
HASH_POINTS: tuple[tuple[int, int], ...] = ()  # filled at the end of the module


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
class _Plan:
    """The lane-independent part of evaluating rho_1 at points modulo primes.

    With ``B`` the bidiagonal part of ``A`` (``A = B - P Q^T``, one rank-one
    term per crossing), ``B^-1`` has monomial entries ``x^(E[b] - E[a])``
    and the Woodbury identity reduces ``A^-1`` to the inverse of an ``n x n``
    matrix.  Rows and columns of that matrix are ordered so that the sums of
    its inverse over the quadrants that make up ``g[a, b]`` are themselves
    the entries of the inverse of a sparse matrix ``M`` (differences of rows
    and columns), so one inverse modulo ``p`` gives every ``g`` needed.
    """

    def __init__(self, lk: LongKnot):
        n = len(lk.crossings)
        size = lk.size
        self.n = n
        signs = [s for s, _, _ in lk.crossings]
        over = [i - 1 for _, i, _ in lk.crossings]   # I_c: row of the over-edge
        under_out = [j for _, _, j in lk.crossings]  # J_c: index of edge j + 1
        step = [0] * size
        for s, row in zip(signs, over, strict=True):
            step[row] = s
        expo = [0] * size
        for a in range(1, size):
            expo[a] = expo[a - 1] + step[a - 1]
        order_r = sorted(range(n), key=lambda c: -over[c])
        order_c = sorted(range(n), key=lambda c: under_out[c])
        pos_r = {c: v for v, c in enumerate(order_r)}
        pos_c = {c: u for u, c in enumerate(order_c)}
        # h(u): how many crossings d have I_d >= J of the crossing in row u
        over_sorted = sorted(over, reverse=True)
        h = []
        for u in range(n):
            jv = under_out[order_c[u]]
            h.append(sum(1 for iv in over_sorted if iv >= jv))
        fixed: dict[tuple[int, int], int] = {}
        for u in range(n):
            if h[u]:
                fixed[(u, h[u] - 1)] = fixed.get((u, h[u] - 1), 0) - 1
            if u + 1 < n and h[u + 1]:
                fixed[(u, h[u + 1] - 1)] = fixed.get((u, h[u + 1] - 1), 0) + 1
        self.fixed = [(u * n + v, c) for (u, v), c in fixed.items() if c]
        # each diagonal term Delta_c lands on four cells with signs
        self.diagonal = []
        for c in range(n):
            u, v = pos_c[c], pos_r[c]
            cells = [(u, v, 1)]
            if v:
                cells.append((u, v - 1, -1))
            if u:
                cells.append((u - 1, v, -1))
            if u and v:
                cells.append((u - 1, v - 1, 1))
            self.diagonal.append([(a * n + b, s) for a, b, s in cells])
        self.sign = _permutation_sign(order_c) * _permutation_sign(order_r)
        self.signs = signs
        self.dexp = [expo[under_out[c]] - expo[over[c]] for c in range(n)]
        count_over = [sum(1 for iv in over if iv >= a) for a in range(size + 1)]
        count_under = [sum(1 for jv in under_out if jv <= b) for b in range(size)]

        def cell(a: int, b: int) -> tuple[int, int, int, int]:
            return (count_over[a], count_under[b], 1 if a <= b else 0, expo[b] - expo[a])

        self.terms = []
        for s, i, j in lk.crossings:
            i0, j0 = i - 1, j - 1
            self.terms.append((s, cell(j0, i0), cell(j0 + 1, j0), cell(j0, j0 + 1),
                               cell(i0, j0), cell(i0, i0)))
        self.edges = [(phik, cell(k, k)) for k, phik in enumerate(lk.rotation) if phik]
        self.low = min(expo) - max(expo)
        self.high = max(expo) - min(expo)
        self.spread = max(-self.low, self.high, max((abs(d) for d in self.dexp), default=0))
        self.shift = sum(lk.rotation) + sum(signs)
        self._base: dict[int, tuple] = {}

    def evaluate(self, x: int, p: int) -> tuple[int, int] | None:
        """``(det A(x), rho_1(x))`` modulo ``p``, or None where ``A(x)`` is singular."""
        n = self.n
        if n <= SMALL_RHO:  # the same residues without loading FLINT
            from .small_matrices import MatrixModP as nmod_mat
        else:
            from flint import nmod_mat
        xinv = pow(x, -1, p)
        powers = {0: 1}
        for k in range(1, self.spread + 1):
            powers[k] = powers[k - 1] * x % p
            powers[-k] = powers[-k + 1] * xinv % p
        # the x-independent part of M is built once per prime; each point then
        # overwrites only the cells its diagonal terms touch
        cached = self._base.get(p)
        if cached is None:
            flat = [0] * (n * n)
            for index, c in self.fixed:
                flat[index] = c % p
            cached = self._base[p] = (nmod_mat(n, n, flat, p), flat)
        m, flat = cached
        cells: dict[int, int] = {}
        scale = 1
        for c in range(n):
            xs = x if self.signs[c] > 0 else xinv
            one_minus = (1 - xs) % p
            if one_minus == 0:
                return None
            delta = powers[self.dexp[c]] * pow(one_minus, -1, p) % p
            scale = scale * powers[-self.dexp[c]] % p * one_minus % p
            for index, s in self.diagonal[c]:
                cells[index] = cells.get(index, flat[index]) + s * delta
        for index, value in cells.items():
            m[index // n, index % n] = value % p
        det_m = int(m.det())
        if det_m == 0:
            return None
        det = det_m * scale % p
        if self.sign < 0:
            det = (-det) % p
        q = m.inv()

        def g(cell: tuple[int, int, int, int]) -> int:
            t, u, below, e = cell
            inner = below + (int(q[t - 1, u - 1]) if t and u else 0)
            return powers[e] * inner % p

        half = (p + 1) // 2
        total = 0
        for s, ji, j1j, jj1, ij, ii in self.terms:
            gjj1 = g(jj1)
            gii = g(ii)
            r = g(ji) * (g(j1j) + gjj1 - g(ij)) - gii * (gjj1 - 1) - half
            total += r if s > 0 else -r
        for phik, kk in self.edges:
            total -= phik * (g(kk) - half)
        # rho_1(x) = x^(-phi - w) det^2 total
        shift = -self.shift
        factor = pow(x, shift, p) if shift >= 0 else pow(xinv, -shift, p)
        return det, factor * det % p * det % p * (total % p) % p


    def evaluate_batch(self, xs, qs):
        """``(det A, rho_1, ok)`` in many lanes at once (numpy; primes below 2^31).

        ``xs`` and ``qs`` are int64 arrays of points and primes; ``ok`` is False
        in lanes where the matrix is singular.  Gauss-Jordan elimination of
        all lanes together, with a pivot of its own in each lane.
        """
        import numpy as np

        n = self.n
        k_lanes = len(xs)
        q1 = qs[:, None]
        xinv = _inverse_mod(xs, qs)
        inv_1mx = _inverse_mod((1 - xs) % qs, qs)
        spread = self.spread + 1
        pw = np.ones((k_lanes, 2 * spread + 1), dtype=np.int64)
        for k in range(1, spread + 1):
            pw[:, spread + k] = pw[:, spread + k - 1] * xs % qs
            pw[:, spread - k] = pw[:, spread - k + 1] * xinv % qs
        signs = np.array(self.signs, dtype=np.int64)
        xs_c = np.where(signs[None, :] > 0, xs[:, None], xinv[:, None])
        one_minus = (1 - xs_c) % q1
        ok = (one_minus != 0).all(axis=1)
        dexp = np.array(self.dexp, dtype=np.int64)
        # 1 / (1 - x^-1) = -x / (1 - x)
        inv_om = np.where(signs[None, :] > 0, inv_1mx[:, None],
                          ((qs - xs) % qs * inv_1mx % qs)[:, None])
        delta = pw[:, spread + dexp] * inv_om % q1
        scale = np.ones(k_lanes, dtype=np.int64)
        factor = pw[:, spread - dexp] * one_minus % q1
        for c in range(n):
            scale = scale * factor[:, c] % qs
        flat = np.zeros((k_lanes, n * n), dtype=np.int64)
        for index, c in self.fixed:
            flat[:, index] += c
        for c, cells in enumerate(self.diagonal):
            for index, s in cells:
                flat[:, index] += s * delta[:, c]
        aug = np.zeros((k_lanes, n, 2 * n), dtype=np.int64)
        aug[:, :, :n] = flat.reshape(k_lanes, n, n) % qs[:, None, None]
        aug[:, np.arange(n), n + np.arange(n)] = 1
        # division-free Gauss-Jordan: every other row is multiplied by the pivot,
        # and all divisions wait for one batched inversion at the end
        sign = np.ones(k_lanes, dtype=np.int64)
        pivot_product = np.ones(k_lanes, dtype=np.int64)
        lanes = np.arange(k_lanes)
        q3 = qs[:, None, None]
        for k in range(n):
            nz = aug[:, k:, k] != 0
            ok &= nz.any(axis=1)
            piv = nz.argmax(axis=1) + k
            swap = piv != k
            if swap.any():
                rows_k = aug[lanes, k].copy()
                aug[lanes, k] = aug[lanes, piv]
                aug[lanes, piv] = rows_k
                sign = np.where(swap, -sign, sign)
            pv = np.where(ok, aug[:, k, k], 1)
            pivot_row = aug[:, k, :].copy()
            f = aug[:, :, k].copy()
            aug = (aug * pv[:, None, None] - f[:, :, None] * pivot_row[:, None, :]) % q3
            aug[:, k, :] = pivot_row
            pivot_product = pivot_product * pv % qs
        # every other row was multiplied by each pivot: (prod pv)^(n - 1) in all
        pivots = np.ones(k_lanes, dtype=np.int64)
        base, e = pivot_product, n - 1
        while e:
            if e & 1:
                pivots = pivots * base % qs
            base = base * base % qs
            e >>= 1
        diag = np.where(ok[:, None], aug[:, np.arange(n), np.arange(n)], 1)
        # batched inversion of diag[:, i] and of pivots (one modular power per lane)
        prefix = np.ones((k_lanes, n + 1), dtype=np.int64)
        for i in range(n):
            prefix[:, i + 1] = prefix[:, i] * diag[:, i] % qs
        total_inv = _inverse_mod(prefix[:, n] * pivots % qs, qs)
        inv_pivots = total_inv * prefix[:, n] % qs
        running = total_inv * pivots % qs          # 1 / prod(diag)
        inv_diag = np.empty((k_lanes, n), dtype=np.int64)
        for i in range(n - 1, -1, -1):
            inv_diag[:, i] = running * prefix[:, i] % qs
            running = running * diag[:, i] % qs
        det = prefix[:, n] * inv_pivots % qs
        det = np.where(sign < 0, (qs - det) % qs, det)
        det = det * scale % qs
        if self.sign < 0:
            det = (qs - det) % qs
        det = np.where(ok, det, 0)
        inverse = aug[:, :, n:] * inv_diag[:, :, None] % q3
        cells = self._cell_arrays()
        t, u, below, e = cells
        inner = np.where((t > 0) & (u > 0),
                         inverse[:, np.maximum(t - 1, 0), np.maximum(u - 1, 0)], 0)
        g = pw[:, spread + e] * ((inner + below) % q1) % q1
        m = len(self.terms)
        half = (qs + 1) // 2
        total = np.zeros(k_lanes, dtype=np.int64)
        if m:
            ji, j1j, jj1, ij, ii = (g[:, k * m:(k + 1) * m] for k in range(5))
            r = (ji * ((j1j + jj1 - ij) % q1) % q1 - ii * ((jj1 - 1) % q1) % q1
                 - half[:, None]) % q1
            s = np.array([t[0] for t in self.terms], dtype=np.int64)
            total = (r * s[None, :]).sum(axis=1) % qs
        if self.edges:
            kk = g[:, 5 * m:]
            phis = np.array([ph for ph, _ in self.edges], dtype=np.int64)
            weighted = ((kk - half[:, None]) % q1) * (phis[None, :] % q1) % q1
            total = (total - weighted.sum(axis=1)) % qs
        shift = -self.shift
        fac = pw[:, spread + shift] if abs(shift) <= spread else np.array(
            [pow(int(x), shift, int(q)) for x, q in zip(xs, qs, strict=True)], dtype=np.int64)
        rho = fac * det % qs * det % qs * total % qs
        return det, rho, ok & (det != 0)

    def _cell_arrays(self):
        import numpy as np

        if getattr(self, "_cells", None) is None:
            cells = [term[k] for k in range(1, 6) for term in self.terms] + [
                cell for _, cell in self.edges]
            self._cells = tuple(np.array([c[k] for c in cells], dtype=np.int64).reshape(-1)
                                for k in range(4))
        return self._cells


def _inverse_mod(values, qs):
    """Element-wise inverse of an int64 array modulo primes broadcast from ``qs`` (0 stays 0)."""
    import numpy as np

    primes = np.broadcast_to(qs, values.shape).ravel().tolist()
    flat = [pow(v, -1, q) if v else 0 for v, q in zip(values.ravel().tolist(), primes,
                                                                  strict=True)]
    return np.array(flat, dtype=np.int64).reshape(values.shape)


def _value_at_dense(lk: LongKnot, x: int, p: int) -> tuple[int, int] | None:
    """``(det A(x), rho_1(x))`` modulo ``p`` straight from the formulas (dense inverse).

    The reference implementation that :class:`_Plan` is tested against.
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
    shift = -(sum(lk.rotation) + sum(s for s, _, _ in lk.crossings))
    factor = pow(x, shift, p) if shift >= 0 else pow(xinv, -shift, p)
    return det, factor * det % p * det % p * (total % p) % p


# -- primes, bounds, interpolation ---------------------------------------------
def _coefficient_bound(lk: LongKnot) -> int:
    """A bound on |coefficients| of ``P`` and of ``T^(n_-) det A`` (Hadamard type).

    On the unit circle an entry of ``A`` is at most the sum of the absolute
    values of its coefficients; Hadamard's inequality bounds ``det A`` and
    every cofactor by ``H``, the product of the row norms, so ``|P| <= (11 n +
    3 sum |phi_k|) H^2`` there, and a coefficient is at most the maximum on the
    circle.
    """
    size = lk.size
    rows: list[dict[int, dict[int, int]]] = [{k: {0: 1}} for k in range(size)]
    for s, i, j in lk.crossings:
        over, under = rows[i - 1], rows[j - 1]
        for row, col, exponent, coeff in ((over, i, s, -1), (over, j, 0, -1), (over, j, s, 1),
                                          (under, j, 0, -1)):
            entry = row.setdefault(col, {})
            entry[exponent] = entry.get(exponent, 0) + coeff
    h2 = 1
    for row in rows:
        h2 *= max(1, sum(sum(abs(v) for v in entry.values()) ** 2 for entry in row.values()))
    return h2 * (11 * len(lk.crossings) + 3 * sum(abs(f) for f in lk.rotation))


def _interpolate(points: list[int], values: list[int], p: int) -> list[int]:
    """Coefficients (constant first) of the polynomial through the points, modulo p."""
    n = len(points)
    c = list(values)
    inverses: dict[int, int] = {}
    for k in range(1, n):
        for m in range(n - 1, k - 1, -1):
            diff = points[m] - points[m - k]
            inv = inverses.get(diff)
            if inv is None:
                inv = inverses[diff] = pow(diff, -1, p)
            c[m] = (c[m] - c[m - 1]) * inv % p
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
    from .elimination import _crt_symmetric, _crt_weights

    modulus, weights = _crt_weights(primes)
    return [_crt_symmetric(list(column), modulus, weights)
            for column in zip(*residues, strict=True)]


# -- public functions -----------------------------------------------------------
#: Up to this many crossings the default is the certified computation.
CERTIFIED_UP_TO = 16
#: New points (and one new prime) that must leave the interpolant unchanged.
_CONFIRMATIONS = 3


def _point_sequence(p: int):
    """Pseudo-random evaluation points in [2, p - 2], reproducible per prime."""
    import random

    rng = random.Random(p)
    while True:
        yield rng.randrange(2, p - 1)


def _certified(lk: LongKnot, plan: _Plan) -> tuple[list[int], list[int]]:
    """Coefficients of ``P = 2 T^(phi + w + 2 n_-) rho_1`` and ``T^(n_-) det A``, proven."""
    from .elimination import primes_below_2_31

    n = len(lk.crossings)
    negatives = sum(1 for s, _, _ in lk.crossings if s < 0)
    bound = _coefficient_bound(lk)
    count = 1
    while math.prod(primes_below_2_31(count)) <= 2 * bound + 1:
        count += 1
    primes = primes_below_2_31(count)
    npts = 2 * n + 3
    e = plan.shift + 2 * negatives
    chosen: dict[int, list[tuple[int, int, int]]] = {p: [] for p in primes}
    start = 2
    while any(len(v) < npts for v in chosen.values()):
        todo = [p for p in primes if len(chosen[p]) < npts]
        width = npts + 4
        need = {q: npts - len(chosen[q]) for q in todo}
        for x, q, d, r, good in _lanes(plan, need, start, width):
            if good and len(chosen[q]) < npts:
                scale = pow(x, e, q) if e >= 0 else pow(pow(x, -1, q), -e, q)
                chosen[q].append((x, d * pow(x, negatives, q) % q, 2 * scale * r % q))
        start += width
    p_res, d_res = [], []
    for p in primes:
        xs_list = [x for x, _, _ in chosen[p]]
        p_res.append(_interpolate(xs_list, [v for _, _, v in chosen[p]], p))
        d_res.append(_interpolate(xs_list[:n + 1], [d for _, d, _ in chosen[p]][:n + 1], p))
    return _crt(p_res, primes), _crt(d_res, primes)


def _lanes(plan: _Plan, need: dict[int, int], start: int, width: int):
    """``(x, q, det, rho, ok)`` at the points ``start .. start + width - 1`` modulo each prime.

    One numpy batch, or in pure Python for small diagrams point by point
    until ``need[q]`` good points are found (the same residues, without
    loading numpy; the caller takes the first ``need[q]`` good points).
    """
    if plan.n <= SMALL_RHO:
        for q, left in need.items():
            for x in range(start, start + width):
                if left <= 0:
                    break
                got = plan.evaluate(x, q)
                if got is not None:
                    left -= 1
                    yield x, q, got[0], got[1], True
        return
    import numpy as np

    primes = list(need)
    xs = np.tile(np.arange(start, start + width, dtype=np.int64), len(primes))
    qs = np.repeat(np.array(primes, dtype=np.int64), width)
    det, rho, ok = plan.evaluate_batch(xs, qs)
    yield from zip(xs.tolist(), qs.tolist(), det.tolist(), rho.tolist(), ok.tolist(),
                   strict=True)


_PRIMES_62: list[int] = []


def _primes_below_2_62(count: int) -> list[int]:
    """The ``count`` largest primes below 2^62, decreasing (FLINT's primality test)."""
    from flint import fmpz

    candidate = _PRIMES_62[-1] - 2 if _PRIMES_62 else (1 << 62) - 1
    while len(_PRIMES_62) < count:
        if fmpz(candidate).is_prime():
            _PRIMES_62.append(candidate)
        candidate -= 2
    return _PRIMES_62[:count]


def _early_terminated(lk: LongKnot, plan: _Plan) -> Laurent | None:
    """rho_1 by interpolation in ``u = T + 1/T`` with early termination, or None.

    rho_1 is symmetric, so it is a polynomial ``F(u)`` of degree ``e`` (its
    highest exponent).  Modulo the first prime (below 2^62), points are added
    until ``_CONFIRMATIONS`` successive new points leave ``F`` unchanged;
    further primes take ``e + 1`` points each, until the Chinese remainder
    lift agrees with rho_1 at two points modulo a prime not used yet.  None
    when the degree cap ``n + 1`` or a prime count beyond the Hadamard-type
    bound is reached first (the caller then runs the certified computation).
    """
    n = len(lk.crossings)
    cap = n + 1 + _CONFIRMATIONS + 1
    bound = _coefficient_bound(lk)
    limit = 4 * bound * 4 ** (n + 2) + 1
    residues: list[list[int]] = []
    primes: list[int] = []
    degree = None
    for count in range(1, 10_000):
        p = _primes_below_2_62(count)[-1]
        us: list[int] = []
        newton: list[int] = []
        quiet = 0
        points = _point_sequence(p)
        while (quiet < _CONFIRMATIONS) if degree is None else (len(us) < degree + 1):
            if len(us) >= cap:
                return None
            x = next(points)
            got = plan.evaluate(x, p)
            if got is None:
                continue
            u = (x + pow(x, -1, p)) % p
            if u in us:
                continue
            v = got[1]
            for k, uk in enumerate(us):
                v = (v - newton[k]) * pow(u - uk, -1, p) % p
            us.append(u)
            newton.append(v)
            quiet = quiet + 1 if v == 0 else 0
        if degree is None:
            degree = len(newton) - _CONFIRMATIONS - 1
        residues.append(_newton_to_monomial(us[:degree + 1], newton[:degree + 1], p))
        primes.append(p)
        width = max(len(r) for r in residues)
        lifted = _crt([r + [0] * (width - len(r)) for r in residues], primes)
        if _agrees_elsewhere(lifted, plan, _primes_below_2_62(count + 1)[-1]):
            break
        if math.prod(primes) > limit:
            return None
    rho = Laurent.constant(0)
    u_poly = Laurent({-1: 1, 1: 1})
    power = Laurent.constant(1)
    for c in lifted:
        if c:
            rho = rho + power * c
        power = power * u_poly
    return rho


def _agrees_elsewhere(coefficients: list[int], plan: _Plan, p: int) -> bool:
    """Whether F(x + 1/x) = rho_1(x) modulo ``p`` at two pseudo-random points."""
    checked = 0
    points = _point_sequence(p)
    while checked < 2:
        x = next(points)
        got = plan.evaluate(x, p)
        if got is None:
            continue
        u = (x + pow(x, -1, p)) % p
        value = 0
        for c in reversed(coefficients):
            value = (value * u + c) % p
        if value != got[1]:
            return False
        checked += 1
    return True


def _newton_to_monomial(points: list[int], newton: list[int], p: int) -> list[int]:
    """Monomial coefficients (constant first) of a Newton-form polynomial modulo p."""
    if not newton:
        return []
    coef = [newton[-1]]
    for k in range(len(newton) - 2, -1, -1):
        xk = points[k]
        new = [0] * (len(coef) + 1)
        for e, c in enumerate(coef):
            new[e + 1] = (new[e + 1] + c) % p
            new[e] = (new[e] - xk * c) % p
        new[0] = (new[0] + newton[k]) % p
        coef = new
    while coef and coef[-1] == 0:
        coef.pop()
    return coef


def perturbed_alexander(diagram: Diagram, outer_face: int | None = None,
                        cut_edge: int | None = None,
                        certified: bool | None = None) -> PerturbedAlexander:
    """The Alexander polynomial and the perturbed Alexander invariant rho_1 of a knot.

    Parameters
    ----------
    diagram : Diagram
        A knot diagram (one component).
    outer_face, cut_edge : int, optional
        Where to cut (see :func:`long_knot`); the result does not depend on them.
    certified : bool, optional
        True: interpolate at the proven number of points modulo the proven
        number of primes.  False: stop early (see Notes).  Default: certified
        up to :data:`CERTIFIED_UP_TO` crossings.

    Returns
    -------
    PerturbedAlexander
        ``alexander``: Conway-normalised Delta(T) (None-free; computed only
        when certified, otherwise taken from
        :func:`knotsift.invariants.alexander.alexander_polynomial`);
        ``rho_1``: a Laurent polynomial with rho_1(1/T) = rho_1(T), negated by
        a mirror image.

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
    Each evaluation modulo a prime below 2^31 inverts one ``n x n`` matrix
    (Woodbury reduction of ``A``; FLINT ``nmod_mat``), ``O(n^3)``.

    *Certified*: ``P(T) = 2 T^(phi + w + 2 n_-) rho_1`` is a polynomial of
    degree at most ``2n + 2`` and ``T^(n_-) det A`` one of degree at most
    ``n`` (rows of negative crossings times ``T`` have entries of degree at
    most one); both are interpolated from ``2n + 3`` points modulo enough
    primes to exceed twice a Hadamard-type coefficient bound, then lifted by
    the Chinese remainder theorem.  ``O(n^4)`` and proven exact.

    *Early termination*: rho_1 is interpolated as a polynomial in
    ``T + 1/T`` at pseudo-random points modulo primes below 2^62 until three
    new points change nothing, and primes are added until the lift agrees
    with rho_1 at two points modulo a further prime.  A wrong stop needs a
    non-zero polynomial of degree at most ``2n + 2`` to vanish at three
    pseudo-random points of a field of size about 2^62 and the lift to pass
    the final check (probability far below ``(2n/2^62)^3``); it costs
    ``O(e n^3)`` for rho_1 of degree ``e``.  The identities
    Delta(1) = 1 and rho_1(1/T) = rho_1(T) are checked on certified results.

    References
    ----------
    D. Bar-Natan and R. van der Veen, "A perturbed-Alexander invariant",
    Quantum Topology (2024); arXiv 2206.12298.
    """
    _check_knot(diagram)
    if diagram.number_of_crossings() == 0:
        return PerturbedAlexander(Laurent.constant(1), Laurent.constant(0))
    lk = long_knot(diagram, outer_face, cut_edge)
    if certified is None:
        certified = len(lk.crossings) <= CERTIFIED_UP_TO
    if not certified:
        rho = _early_terminated(lk, _Plan(lk))
        if rho is not None:
            from .alexander import alexander_polynomial

            return PerturbedAlexander(alexander_polynomial(diagram), rho)
    return _from_long_knot(lk)


def _from_long_knot(lk: LongKnot) -> PerturbedAlexander:
    """The certified computation on a long knot (any valid rotation numbers)."""
    plan = _Plan(lk)
    negatives = sum(1 for s, _, _ in lk.crossings if s < 0)
    big_p, det_poly = _certified(lk, plan)
    if any(c % 2 for c in big_p):
        raise RuntimeError("internal error: 2 rho_1 has an odd coefficient")
    shift2 = -plan.shift - 2 * negatives
    if shift2 % 2:
        raise RuntimeError("internal error: phi + writhe is odd")
    # Delta = T^((-phi - w)/2 - n_-) (T^(n_-) det A)
    delta = Laurent.from_coefficients(shift2 // 2, det_poly)
    if delta.evaluate(1) != 1 or not delta.is_symmetric():
        raise RuntimeError(f"internal error: Delta = {delta} is not Conway-normalised")
    rho = Laurent.from_coefficients(shift2, [c // 2 for c in big_p])
    if rho != rho.substitute_power(-1):
        raise RuntimeError(f"internal error: rho_1 = {rho} is not symmetric under T -> 1/T")
    return PerturbedAlexander(delta, rho)


def rho_1(diagram: Diagram, certified: bool | None = None) -> Laurent:
    """The perturbed Alexander invariant rho_1 of a knot (see :func:`perturbed_alexander`).

    Examples
    --------
    >>> figure_eight = Diagram([(4, 2, 5, 1), (8, 6, 1, 5), (6, 3, 7, 4), (2, 7, 3, 8)])
    >>> str(rho_1(figure_eight))
    '0'
    """
    return perturbed_alexander(diagram, certified=certified).rho_1


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
        ``rho_1(x) mod p`` for each pair, in ``[0, p)``; None where ``A(x)``
        is singular modulo ``p`` (Delta(x) = 0 mod p, or x a root of unity of
        order 1), which depends on the knot only.  Equal knots give equal
        tuples; different tuples prove different knots (or mirror images).

    Notes
    -----
    One ``n x n`` inverse modulo a prime below 2^31 per point: ``O(n^3)``.
    :func:`rho_1_hash_of` gives the same values from exact polynomials.
    """
    _check_knot(diagram)
    if not 1 <= points <= len(HASH_POINTS):
        raise ValueError(f"points must be 1..{len(HASH_POINTS)}, got {points!r}")
    if diagram.number_of_crossings() == 0:
        return (0,) * points
    plan = _Plan(long_knot(diagram))
    out: list[int | None] = []
    for p, x in HASH_POINTS[:points]:
        got = plan.evaluate(x, p)
        out.append(None if got is None else got[1])
    return tuple(out)



def rho_1_hash_of(rho: Laurent, delta: Laurent, points: int = 2) -> tuple[int | None, ...]:
    """The value :func:`rho_1_hash` gives, from an exact rho_1 and Alexander polynomial.

    Examples
    --------
    >>> trefoil = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])
    >>> both = perturbed_alexander(trefoil)
    >>> rho_1_hash_of(both.rho_1, both.alexander) == rho_1_hash(trefoil)
    True
    """
    out: list[int | None] = []
    for p, x in HASH_POINTS[:points]:
        if _laurent_mod(delta, x, p) == 0:
            out.append(None)
        else:
            out.append(_laurent_mod(rho, x, p))
    return tuple(out)


def _laurent_mod(poly: Laurent, x: int, p: int) -> int:
    xinv = pow(x, -1, p)
    total = 0
    for e, c in poly.terms():
        k = int(e)
        total += c * (pow(x, k, p) if k >= 0 else pow(xinv, -k, p))
    return total % p


def hash_text(values: tuple[int | None, ...] | None) -> str:
    """Canonical text of a hash: the values joined by commas, "-" where undefined."""
    if values is None:
        return ""
    return ",".join("-" if v is None else str(v) for v in values)


def mirror_hash(values: tuple[int | None, ...]) -> tuple[int | None, ...]:
    """The hash of the mirror image (rho_1 changes sign)."""
    return tuple(None if v is None else (p - v) % p
                 for v, (p, _) in zip(values, HASH_POINTS, strict=False))


def mirror_hash_text(text: str) -> str:
    """:func:`hash_text` of the mirror image, from the text itself ("" stays "")."""
    if not text:
        return ""
    values = tuple(None if v == "-" else int(v) for v in text.split(","))
    return hash_text(mirror_hash(values))


def _hash_points() -> tuple[tuple[int, int], ...]:
    from .elimination import primes_below_2_31

    first, second = primes_below_2_31(2)
    # two points per prime: the x-independent part of the matrix is built once per prime
    return ((first, 3), (first, 5), (second, 7), (second, 11))


HASH_POINTS = _hash_points()
