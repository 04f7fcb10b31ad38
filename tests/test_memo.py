"""Bounded memos: what is kept, what is dropped, and what is never kept."""

from collections import OrderedDict

import pytest

from knotsift.memo import recall


def test_keeps_answers_and_drops_the_least_recently_used():
    memo, calls = OrderedDict(), []

    def compute(k):
        calls.append(k)
        return k * 10

    assert [recall(memo, k, 2, lambda k=k: compute(k)) for k in (1, 2, 1, 3)] == [10, 20, 10, 30]
    assert calls == [1, 2, 3]          # 1 was answered from the memo the second time
    assert list(memo) == [1, 3]        # 2 was the least recently used when 3 came
    assert recall(memo, 2, 2, lambda: compute(2)) == 20 and calls == [1, 2, 3, 2]


def test_none_is_an_answer_and_failures_are_not_kept():
    memo, calls = OrderedDict(), []

    def nothing():
        calls.append(1)

    assert recall(memo, "k", 4, nothing) is None
    assert recall(memo, "k", 4, nothing) is None and calls == [1]

    def fails():
        raise TimeoutError("out of time")

    with pytest.raises(TimeoutError):
        recall(memo, "late", 4, fails)
    assert "late" not in memo
