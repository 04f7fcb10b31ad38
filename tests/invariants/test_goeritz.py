"""Tests of knotsift.invariants.goeritz: the colouring and the local rules."""

from __future__ import annotations

from hypothesis import given, settings
from hypothesis import strategies as st

from knotsift.invariants.goeritz import checkerboard_colouring, diagram_pieces, goeritz_forms
from tests.knots import HOPF, TREFOIL
from tests.strategies import braid_closure, link_diagrams, plat_diagrams

FAST = settings(max_examples=60, deadline=None)


@FAST
@given(st.one_of(link_diagrams(), plat_diagrams()))
def test_checkerboard_colouring_is_proper(diagram):
    """Faces meeting across an edge differ in colour; opposite corners agree (common practice)."""
    faces, colours = checkerboard_colouring(diagram)
    colour = {corner: colours[f] for f, face in enumerate(faces) for corner in face}
    for i in range(diagram.number_of_crossings()):
        assert colour[(i, 0)] == colour[(i, 2)] != colour[(i, 1)] == colour[(i, 3)]
    # Euler's formula per piece: v + 2 faces
    assert len(faces) == diagram.number_of_crossings() + 2 * len(diagram_pieces(diagram))


@FAST
@given(st.one_of(link_diagrams(), plat_diagrams()), st.sampled_from((0, 1)))
def test_goeritz_forms_symmetric_and_sized(diagram, shaded):
    """Each reduced matrix is symmetric, one smaller than that piece's unshaded regions."""
    faces, colours = checkerboard_colouring(diagram)
    forms = goeritz_forms(diagram, shaded)
    assert len(forms) == len(diagram_pieces(diagram))
    for form in forms:
        m = form.matrix
        assert all(m[i][j] == m[j][i] for i in range(len(m)) for j in range(len(m)))
        piece = set(form.crossings)
        regions = {f for f, face in enumerate(faces)
                   if colours[f] != shaded and face[0][0] in piece}
        assert len(m) == len(regions) - 1


def test_goeritz_forms_trefoil_both_surfaces():
    """Right-handed trefoil: the Seifert-like surface has G = [[-2, 1], [1, -2]] and no
    correction; the three-half-twisted band has G = [3] and mu = 3 (Gordon and
    Litherland 1978, Invent. Math. 47: sigma = sign G - mu = -2 either way)."""
    forms = sorted((f.matrix, f.correction) for s in (0, 1) for f in goeritz_forms(TREFOIL, s))
    assert forms == [(((-2, 1), (1, -2)), 0), (((3,),), 3)]


def test_goeritz_forms_hopf_link():
    """Positive Hopf link: both surfaces are annuli; G = [-2] with mu = 0 or [2] with mu = 2."""
    forms = sorted((f.matrix, f.correction) for s in (0, 1) for f in goeritz_forms(HOPF, s))
    assert forms == [(((-2,),), 0), (((2,),), 2)]


def test_goeritz_forms_split_diagram_has_one_form_per_piece():
    """A split braid closure is handled one connected piece at a time."""
    forms = goeritz_forms(braid_closure([1, 1, 1, 3, 3], 4))
    assert len(forms) == 2
    assert sorted(len(f.crossings) for f in forms) == [2, 3]
