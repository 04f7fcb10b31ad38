"""Tests of the label partition (union-find) shared by the diagram operations."""

import random

from knotsift.partition import Partition


def test_partition_matches_connected_components():
    """Classes equal the connected components of the join graph, checked against networkx
    (a general-purpose reference library), on a seeded random graph."""
    import networkx as nx

    rng = random.Random(9)
    edges = [(rng.randrange(60), rng.randrange(60)) for _ in range(45)]
    p = Partition(range(60))
    for u, v in edges:
        p.join(u, v)
    g = nx.Graph()
    g.add_nodes_from(range(60))
    g.add_edges_from(edges)
    expected = sorted(sorted(c) for c in nx.connected_components(g))
    assert sorted(sorted(c) for c in p.classes().values()) == expected


def test_representatives():
    """join keeps the second class's representative, or the smallest with to_smaller."""
    p = Partition()
    p.join(5, 7)
    assert p.find(5) == 7
    q = Partition()
    q.join(5, 7, to_smaller=True)
    q.join(9, 7, to_smaller=True)
    assert q.find(9) == 5 and 9 in q and 4 not in q
