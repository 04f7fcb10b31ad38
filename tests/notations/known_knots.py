"""Reference values shared by the notation tests; the source is named beside each table.

Imported by the test modules of this folder (pytest puts a test folder
without ``__init__.py`` on ``sys.path``).
"""

from knotsift.laurent import Laurent

NAMES = ["3_1", "4_1", "5_1", "5_2", "6_1", "6_2", "6_3",
         "7_1", "7_2", "7_3", "7_4", "7_5", "7_6", "7_7"]

# Dowker-Thistlethwaite codes of the prime knots in Rolfsen's numbering
# (Dowker and Thistlethwaite 1983 "Classification of knot projections"; codes from memory).
DT_CODES = {
    "3_1": "4 6 2",
    "4_1": "4 6 8 2",
    "5_1": "6 8 10 2 4",
    "5_2": "4 8 10 2 6",
    "6_1": "4 8 12 10 2 6",
    "6_2": "4 8 10 12 2 6",
    "6_3": "4 8 10 2 12 6",
    "7_1": "8 10 12 14 2 4 6",
    "7_2": "4 10 14 12 2 8 6",
    "7_3": "6 10 12 14 2 4 8",
    "7_4": "6 10 12 14 4 2 8",
    "7_5": "4 10 12 14 2 8 6",
    "7_6": "4 8 12 2 14 6 10",
    "7_7": "4 8 10 12 2 14 6",
}

# Conway notation of the rational knots (Rolfsen 1976 "Knots and Links", Appendix C;
# from memory).
CONWAY = {
    "3_1": "3",
    "4_1": "2 2",
    "5_1": "5",
    "5_2": "3 2",
    "6_1": "4 2",
    "6_2": "3 1 2",
    "6_3": "2 1 1 2",
    "7_1": "7",
    "7_2": "5 2",
    "7_3": "4 3",
    "7_4": "3 1 3",
    "7_5": "3 2 2",
    "7_6": "2 2 1 2",
    "7_7": "2 1 1 1 2",
}

# Braid words (from memory; sigma_i positive, S_i = sigma_i^-1).
BRAIDS = {
    "3_1": "s1^3",
    "4_1": "(s1 S2)^2",
    "5_1": "s1^5",
    "5_2": "s1^3 s2 S1 s2",
    "6_1": "s1^2 s2 S1 S3 s2 S3",
    "6_2": "s1^3 S2 s1 S2",
    "6_3": "s1^2 S2 s1 S2^2",
    "7_1": "s1^7",
}

# Jones polynomials, one chirality each (from memory).  For 3_1, 5_1 and 5_2 the
# positive (right-handed) knot.  7_5, 7_6 and 7_7 are left out: they are checked
# through the determinant and the agreement of DT code and Conway notation.
JONES = {
    "3_1": "t + t^3 - t^4",
    "4_1": "t^-2 - t^-1 + 1 - t + t^2",
    "5_1": "-t^7 + t^6 - t^5 + t^4 + t^2",
    "5_2": "-t^6 + t^5 - t^4 + 2t^3 - t^2 + t",
    "6_1": "t^-4 - t^-3 + t^-2 - 2t^-1 + 2 - t + t^2",
    "6_2": "t^-1 - 1 + 2t - 2t^2 + 2t^3 - 2t^4 + t^5",
    "6_3": "-t^3 + 2t^2 - 2t + 3 - 2t^-1 + 2t^-2 - t^-3",
    "7_1": "t^3 + t^5 - t^6 + t^7 - t^8 + t^9 - t^10",
    "7_2": "-t^-8 + t^-7 - t^-6 + 2t^-5 - 2t^-4 + 2t^-3 - t^-2 + t^-1",
    "7_3": "t^2 - t^3 + 2t^4 - 2t^5 + 3t^6 - 2t^7 + t^8 - t^9",
    "7_4": "t - 2t^2 + 3t^3 - 2t^4 + 3t^5 - 2t^6 + t^7 - t^8",
}

# Determinants |V(-1)| (Rolfsen 1976 "Knots and Links", Appendix C table; from memory).
DETERMINANTS = {
    "3_1": 3, "4_1": 5, "5_1": 5, "5_2": 7, "6_1": 9, "6_2": 11, "6_3": 13,
    "7_1": 7, "7_2": 11, "7_3": 13, "7_4": 15, "7_5": 17, "7_6": 19, "7_7": 21,
}

RIGHT_TREFOIL = Laurent.parse("t + t^3 - t^4")  # common practice (CONVENTIONS.md)
FIGURE_EIGHT = Laurent.parse("t^-2 - t^-1 + 1 - t + t^2")  # common practice
POSITIVE_HOPF = Laurent.parse("-t^(1/2) - t^(5/2)")  # common practice
UNLINK2 = Laurent.parse("-t^(-1/2) - t^(1/2)")  # common practice: the loop value


def jones(diagram) -> Laurent:
    from knotsift.invariants.jones import jones_polynomial

    return jones_polynomial(diagram)


def expected_jones(name: str) -> Laurent:
    return Laurent.parse(JONES[name])


def same_up_to_mirror(a: Laurent, b: Laurent) -> bool:
    return a == b or a == b.mirror()


def determinant(diagram) -> int:
    """|V(-1)| (common practice: the determinant of a knot)."""
    value = jones(diagram).evaluate(-1)
    return abs(round(value.real if isinstance(value, complex) else value))
