"""Hypothesis profiles for the whole suite.

Timing deadlines are off everywhere: the machines that run the suite are
shared, and a slow example says nothing about correctness (speed is measured
in bench/, never asserted in tests).  Under CI (``CI`` set), examples are
drawn from a fixed seed so that a run is repeatable; locally they are drawn
afresh each time, which is how new counterexamples are found.
"""

import os

from hypothesis import settings

settings.register_profile("local", deadline=None)
settings.register_profile("ci", deadline=None, derandomize=True)
settings.load_profile("ci" if os.environ.get("CI") else "local")
