"""Retrieval-matched negatives: the best BM25 slice of a long document that holds no answer, as unanswerable pairs.

Reference: rank-bm25's BM25Okapi (the library our BM25 is checked against) ranks the same slices independently.
"""

from __future__ import annotations

import pytest
from rank_bm25 import BM25Okapi

from engine.squad_data import GoldAnswer, SquadExample
from engine.text_tokens import tokenize_for_search
from engine.training.features import LONG_CONTEXT_CHARS, SLICE_CHARS
from engine.training.retrieved_negatives import document_slices, retrieved_negatives

FILLER = "The parties shall cooperate in good faith on ordinary matters of administration. "


def contract() -> tuple[str, int]:
    """A long invented contract: filler, a non-compete clause, filler, a clause that repeats its words, filler."""
    clause = "Section 9. Non-compete. The Supplier shall not compete with the Buyer for two (2) years. "
    echo = "Section 14. Any compete or non-compete question goes to the Buyer's counsel. "
    text = FILLER * 20 + clause + FILLER * 20 + echo + FILLER * 20
    return text, text.index("two (2) years")


def test_slices_cover_the_text_and_bad_sizes_raise():
    text = "x" * 2500
    slices = document_slices(text, size=1000, step=500)
    assert slices[0] == (0, 1000) and slices[-1] == (1500, 2500)
    assert all(hi - lo == 1000 for lo, hi in slices)
    assert all(b[0] <= a[1] for a, b in zip(slices, slices[1:]))  # consecutive slices overlap or touch: no gap
    assert document_slices("short", size=1000, step=500) == [(0, 5)]
    with pytest.raises(ValueError, match=r"\(got size=10, step=20\)"):
        document_slices(text, size=10, step=20)


def test_the_best_free_slice_by_bm25_becomes_an_unanswerable_pair():
    text, at = contract()
    question = "Is there a non-compete clause restricting the Supplier from competing with the Buyer?"
    answered = SquadExample("q1", "c", question, text, (GoldAnswer("two (2) years", at),), False)
    negatives = retrieved_negatives([answered])
    assert len(negatives) == 1
    neg = negatives[0]
    assert neg.qid == "q1#r0" and neg.is_impossible and neg.answers == () and neg.question == question
    assert "two (2) years" not in neg.context and len(neg.context) == SLICE_CHARS
    # Reference ranking: rank-bm25 over the slices that overlap no gold span.
    slices = document_slices(text)
    free = [(lo, hi) for lo, hi in slices if hi <= at or lo >= at + len("two (2) years")]
    scores = BM25Okapi([tokenize_for_search(text[lo:hi]) for lo, hi in free]).get_scores(tokenize_for_search(question))
    best = max(range(len(free)), key=lambda i: (scores[i], -i))
    assert neg.context == text[free[best][0]:free[best][1]]
    assert "Section 14" in neg.context  # the echo clause: the hard negative, not filler


def test_short_contexts_and_zero_per_question_give_nothing():
    text, at = contract()
    short = SquadExample("s", "t", "Who competes?", "The Buyer competes.", (), True)
    assert len(short.context) <= LONG_CONTEXT_CHARS and retrieved_negatives([short]) == []
    long = SquadExample("l", "t", "Who competes?", text, (), True)
    assert retrieved_negatives([long], per_question=0) == []
    assert [n.qid for n in retrieved_negatives([long], per_question=2)] == ["l#r0", "l#r1"]
    with pytest.raises(ValueError, match=r"\(got -1\)"):
        retrieved_negatives([long], per_question=-1)
