"""Homology of the double branched cover, from the Smith normal form of a Goeritz matrix."""

from __future__ import annotations

from typing import Iterable

from ..diagram import Diagram
from ..errors import InvariantError
from .goeritz import goeritz_forms

__all__ = ["double_cover_homology", "homology_text", "homology_sum", "parse_homology"]


def _invariant_factors(matrix: Iterable[Iterable[int]]) -> list[int]:
    """Diagonal of the Smith normal form (non-negative, each dividing the next; 0 last)."""
    from .small_matrices import SMALL, smith_diagonal

    rows = [list(r) for r in matrix]
    if not rows:
        return []
    if len(rows) <= SMALL:  # the same diagonal without loading FLINT
        return smith_diagonal(rows)
    from flint import fmpz_mat

    snf = fmpz_mat(rows).snf()
    return [abs(int(snf[k, k])) for k in range(min(snf.nrows(), snf.ncols()))]


def _normalise(factors: Iterable[int]) -> tuple[int, ...]:
    """Invariant factors without the 1s: torsion orders dividing each other, then 0s for Z."""
    fs = [f for f in factors if f != 1]
    torsion = [f for f in fs if f]
    if torsion:
        torsion = _invariant_factors([[f if i == j else 0 for j in range(len(torsion))]
                                      for i, f in enumerate(torsion)])
        torsion = [f for f in torsion if f != 1]
    return tuple(torsion) + (0,) * sum(1 for f in fs if f == 0)


def double_cover_homology(diagram: Diagram) -> tuple[int, ...]:
    """The first homology of the double cover of S^3 branched over the knot or link.

    Parameters
    ----------
    diagram : Diagram

    Returns
    -------
    tuple of int
        The invariant factors other than 1, each dividing the next: ``(3,)``
        is Z/3, ``(3, 3)`` is Z/3 + Z/3, ``()`` the trivial group; a 0 stands
        for a summand Z (split links).  For a knot the order, the product, is
        the determinant.

    Raises
    ------
    InvariantError
        For the empty diagram.

    Examples
    --------
    >>> double_cover_homology(Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)]))
    (3,)

    Notes
    -----
    A Goeritz matrix presents this group (Goeritz 1933; Gordon and
    Litherland 1978); a diagram in several pieces gives a connected sum of
    the pieces' covers and one S^1 x S^2 per extra piece or free loop.  The
    Smith normal form is FLINT's ``fmpz_mat.snf``, or pure Python for
    matrices of at most ``small_matrices.SMALL`` rows.

    References
    ----------
    L. Goeritz, "Knoten und quadratische Formen", Math. Z. 36 (1933).
    C. McA. Gordon and R. A. Litherland, "On the signature of a link",
    Invent. Math. 47 (1978).
    """
    components = diagram.number_of_components()
    if components == 0:
        raise InvariantError("the double cover needs at least one component, got an empty "
                             "diagram", value=diagram)
    forms = goeritz_forms(diagram) if diagram.number_of_crossings() else []
    factors: list[int] = []
    for form in forms:
        factors.extend(_invariant_factors(form.matrix))
    pieces = len(forms) + diagram.free_loops
    factors.extend([0] * (pieces - 1))
    return _normalise(factors)


def homology_sum(a: tuple[int, ...], b: tuple[int, ...]) -> tuple[int, ...]:
    """The group of a connected sum: the direct sum of the two groups."""
    return _normalise(list(a) + list(b))


def homology_text(factors: tuple[int, ...]) -> str:
    """Canonical text: ``Z/3+Z/3``, ``Z`` for a free summand, ``0`` for the trivial group."""
    if not factors:
        return "0"
    return "+".join("Z" if f == 0 else f"Z/{f}" for f in factors)


def parse_homology(text: str) -> tuple[int, ...]:
    """Inverse of :func:`homology_text` (a hand-written reader, no evaluation)."""
    text = text.strip()
    if text == "0":
        return ()
    out = []
    for part in text.split("+"):
        part = part.strip()
        if part == "Z":
            out.append(0)
        elif part.startswith("Z/") and part[2:].isdigit() and int(part[2:]) > 1:
            out.append(int(part[2:]))
        else:
            raise ValueError(f"not a summand Z or Z/n with n > 1: {part!r} in {text!r}")
    return tuple(out)
