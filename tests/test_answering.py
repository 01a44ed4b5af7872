"""Ranking, merging, abstaining and confidence, on hand-made readings (no model).

Fusion follows the linear interpolation of Yang et al. (2019), "End-to-End Open-Domain Question Answering with
BERTserini": S = (1 - mu) * S_bm25 + mu * S_reader. The values below are computed by hand from that formula.
"""

import math

import pytest

from engine.answering import ScoredPassage, rank_answers
from engine.calibration import Calibration, fit_logistic
from engine.reader.interface import Reading, ReadSpan
from engine.types import Passage

P1 = Passage(1, "lease.pdf", 3, "p. 3", 100, 160, "Either party may terminate on ninety (90) days' notice.")
P2 = Passage(2, "supply.pdf", 2, "p. 2", 40, 95, "Termination requires ninety (90) days' notice in writing.")
CAL = Calibration(null_margin_threshold=2.0, fusion_weight=0.5, confidence_slope=1.0, confidence_intercept=0.0)


def span(passage: Passage, text: str, score: float) -> ReadSpan:
    start = passage.text.index(text)
    return ReadSpan(start, start + len(text), text, score)


def test_fused_ranking_and_citation_offsets():
    readings = [Reading((span(P1, "ninety (90) days", 6.0),), 2.0, 1),
                Reading((span(P2, "in writing", 7.0),), 1.0, 1)]
    result = rank_answers("notice?", [ScoredPassage(P1, 10.0), ScoredPassage(P2, 5.0)], readings, CAL)
    # P1: 0.5 * 10/10 + 0.5 * (6 - 2) = 2.5 ; P2: 0.5 * 5/10 + 0.5 * (7 - 1) = 3.25 -> "in writing" ranks first;
    # its confidence is sigmoid(margin) = sigmoid(6).
    assert [a.text for a in result.answers] == ["in writing", "ninety (90) days"]
    top = result.answers[0]
    assert top.score == pytest.approx(1 / (1 + math.exp(-6.0)), abs=1e-6)
    assert top.citation.file == "supply.pdf" and top.citation.page == 2
    # Citation offsets index the page text: passage offset + span offset.
    assert top.citation.start == 40 + P2.text.index("in writing")
    assert not result.abstained


def test_answers_are_listed_in_fused_order_not_by_confidence():
    # P1: 0.5 * 10/10 + 0.5 * (6 - 2) = 2.5 ; P2: 0.5 * 1/10 + 0.5 * (5.5 - 1) = 2.3 -> P1's answer is listed first
    # although its confidence sigmoid(4) = 0.982 is below P2's sigmoid(4.5) = 0.989.
    readings = [Reading((span(P1, "ninety (90) days", 6.0),), 2.0, 1),
                Reading((span(P2, "in writing", 5.5),), 1.0, 1)]
    result = rank_answers("notice?", [ScoredPassage(P1, 10.0), ScoredPassage(P2, 1.0)], readings, CAL)
    assert [a.text for a in result.answers] == ["ninety (90) days", "in writing"]
    assert [a.score for a in result.answers] == pytest.approx([1 / (1 + math.exp(-4.0)), 1 / (1 + math.exp(-4.5))],
                                                              abs=1e-6)


def test_identical_answers_merge_and_keep_other_citations():
    readings = [Reading((span(P1, "ninety (90) days", 6.0),), 1.0, 1),
                Reading((span(P2, "ninety (90) days", 5.0),), 1.0, 1)]
    result = rank_answers("notice?", [ScoredPassage(P1, 8.0), ScoredPassage(P2, 6.0)], readings, CAL)
    assert len(result.answers) == 1
    answer = result.answers[0]
    assert answer.citation.file == "lease.pdf"
    assert [c.file for c in answer.also_found] == ["supply.pdf"]


def test_abstains_when_null_wins_by_more_than_threshold():
    readings = [Reading((span(P1, "ninety (90) days", 1.0),), 4.0, 1)]  # null - best = 3.0 > 2.0
    result = rank_answers("Who is the guarantor?", [ScoredPassage(P1, 3.0)], readings, CAL)
    assert result.abstained and result.answers == ()
    readings = [Reading((span(P1, "ninety (90) days", 2.5),), 4.0, 1)]  # 1.5 <= 2.0: answer, low confidence
    result = rank_answers("notice?", [ScoredPassage(P1, 3.0)], readings, CAL)
    assert not result.abstained and result.answers[0].low_confidence and result.below_threshold == ()


def test_an_abstention_keeps_the_closest_spans_below_the_threshold():
    # Both passages' best spans lose to null by more than 2.0 (margins 1 - 4 = -3 and 0.5 - 3 = -2.5): abstain.
    # The closest spans stay, in fused order: P1 0.5 * 10/10 + 0.5 * -3 = -1.0 ; P2 0.5 * 5/10 + 0.5 * -2.5 = -1.0;
    # a tie keeps BM25 order. Confidence sigmoid(-3) = 0.047 would not be LOW under a line of 0.04, but every
    # closest span is marked low confidence, whatever its score.
    readings = [Reading((span(P1, "ninety (90) days", 1.0),), 4.0, 1),
                Reading((span(P2, "in writing", 0.5),), 3.0, 1)]
    passages = [ScoredPassage(P1, 10.0), ScoredPassage(P2, 5.0)]
    result = rank_answers("Who is the guarantor?", passages, readings, CAL, low_confidence_below=0.04)
    assert result.abstained and result.answers == ()
    assert [a.text for a in result.below_threshold] == ["ninety (90) days", "in writing"]
    assert result.shown == result.below_threshold
    assert [a.score for a in result.below_threshold] == pytest.approx(
        [1 / (1 + math.exp(3.0)), 1 / (1 + math.exp(2.5))], abs=1e-6)
    assert all(a.low_confidence for a in result.below_threshold)
    capped = rank_answers("Who is the guarantor?", passages, readings, CAL, top_n_below_threshold=1)
    assert [a.text for a in capped.below_threshold] == ["ninety (90) days"]
    assert rank_answers("q", passages, readings, CAL, top_n_below_threshold=0).below_threshold == ()
    with pytest.raises(ValueError, match=r"\(got -1\)"):
        rank_answers("q", passages, readings, CAL, top_n_below_threshold=-1)


def test_ask_result_keeps_answers_and_below_threshold_spans_apart():
    from engine.types import AskResult

    answer = rank_answers("notice?", [ScoredPassage(P1, 3.0)], [Reading((span(P1, "ninety (90) days", 6.0),), 1.0, 1)],
                          CAL).answers[0]
    with pytest.raises(ValueError, match=r"\(got 1\)"):
        AskResult("q", (answer,), True)
    with pytest.raises(ValueError, match=r"\(got 1\)"):
        AskResult("q", (), False, below_threshold=(answer,))
    assert AskResult("q", (answer,), False).shown == (answer,)


def test_no_passages_means_abstention_and_bad_arguments_raise():
    assert rank_answers("q", [], [], CAL).abstained
    with pytest.raises(ValueError, match=r"\(got"):
        rank_answers("q", [ScoredPassage(P1, 1.0)], [], CAL)
    with pytest.raises(ValueError, match=r"\(got"):
        rank_answers("q", [], [], CAL, top_n=0)


def test_logistic_fit_recovers_a_known_curve():
    # Data drawn from p = sigmoid(2x - 1) (a textbook logistic model); the maximum-likelihood fit should be close.
    import numpy as np

    rng = np.random.default_rng(0)
    x = rng.normal(size=4000)
    y = (rng.random(4000) < 1 / (1 + np.exp(-(2 * x - 1)))).astype(float)
    a, b = fit_logistic(x, y)
    assert a == pytest.approx(2.0, abs=0.2) and b == pytest.approx(-1.0, abs=0.15)


def test_overlapping_spans_of_one_clause_are_one_answer():
    long_notice = "ninety (90) days' notice"
    readings = [Reading((span(P1, "ninety (90) days", 6.0), span(P1, long_notice, 5.0)), 1.0, 2),
                Reading((span(P2, "ninety (90) days' notice in writing", 4.0),), 1.0, 1)]
    result = rank_answers("notice?", [ScoredPassage(P1, 8.0), ScoredPassage(P2, 6.0)], readings, CAL)
    # The longer span in P1 covers the better-ranked one on the same page: dropped. P2 is another file: kept.
    assert [a.text for a in result.answers] == ["ninety (90) days", "ninety (90) days' notice in writing"]
    # Touching but not overlapping spans on one page stay apart (half-open character ranges).
    readings = [Reading((span(P1, "Either party", 6.0), span(P1, " may terminate", 5.0)), 1.0, 2)]
    result = rank_answers("who?", [ScoredPassage(P1, 8.0)], readings, CAL)
    assert [a.text for a in result.answers] == ["Either party", " may terminate"]


def test_a_passage_answers_with_its_chosen_span_at_its_best_margin():
    # The reader put the expected-F1 choice first although a shorter span inside it scored higher. The passage's
    # answer is the chosen span, ranked and calibrated at the best margin 6 - 1 = 5 (confidence sigmoid(5) with
    # slope 1 and intercept 0); the higher-scored span overlaps it on the same page and is dropped.
    long_notice = "ninety (90) days' notice"
    readings = [Reading((span(P1, long_notice, 5.0), span(P1, "ninety (90) days", 6.0)), 1.0, 2)]
    result = rank_answers("notice?", [ScoredPassage(P1, 8.0)], readings, CAL)
    assert [a.text for a in result.answers] == [long_notice]
    assert result.answers[0].reader_logit == 5.0
    assert result.answers[0].score == pytest.approx(1 / (1 + math.exp(-5.0)), abs=1e-6)


def test_folder_hit_counts_use_file_page_and_token_f1():
    from engine.evaluation import cites_gold, folder_hit_counts

    readings = [Reading((span(P1, "ninety (90) days", 6.0),), 1.0, 1),
                Reading((span(P2, "in writing", 5.0),), 1.0, 1)]
    result = rank_answers("notice?", [ScoredPassage(P1, 8.0), ScoredPassage(P2, 6.0)], readings, CAL)
    first, second = result.answers
    lease = {"file": "lease.pdf", "page": 3, "answer": "ninety (90) days' notice"}
    # Official token F1, by hand: "ninety 90 days" vs "ninety 90 days notice" -> P = 1, R = 3/4, F1 = 6/7 >= 0.5.
    assert cites_gold(first, lease) and not cites_gold(second, lease)
    assert not cites_gold(first, dict(lease, page=4))  # right text, wrong page
    supply = {"file": "supply.pdf", "page": 2, "answer": "ninety (90) days"}  # right place, F1 0 for "in writing"
    abstained = rank_answers("guarantor?", [], [], CAL)
    # An abstention whose closest span (null - best = 4 - 1 = 3 > 2.0) cites the gold counts apart from the hits.
    doubted = rank_answers("notice?", [ScoredPassage(P1, 8.0)], [Reading((span(P1, "ninety (90) days", 1.0),), 4.0, 1)],
                           CAL)
    assert doubted.abstained and cites_gold(doubted.below_threshold[0], lease)
    counts = folder_hit_counts([(lease, result), (supply, result), (lease, abstained), (lease, doubted)])
    assert counts == {"questions": 4, "top1": 1, "listed": 1, "abstained": 2, "abstained_hit_below_threshold": 1}


def test_open_corpus_paragraphs_are_separate_documents():
    # Two paragraphs whose answers sit at the same offsets: as separate documents neither answer hides the other
    # (with one shared document and locator, the overlap rule would drop the second).
    from engine.evaluation import open_corpus_passages

    contexts = ["Rent is due monthly.", "Rent is due weekly."]
    passages = open_corpus_passages(contexts, [(1, 2.0), (0, 1.0)])
    assert [(p.passage.doc_path, p.passage.text, p.bm25) for p in passages] == [
        ("paragraph-1", contexts[1], 2.0), ("paragraph-0", contexts[0], 1.0)]
    readings = [Reading((ReadSpan(12, 18, "weekly", 5.0),), 1.0, 1),
                Reading((ReadSpan(12, 19, "monthly", 5.0),), 1.0, 1)]
    result = rank_answers("When is rent due?", passages, readings, CAL)
    assert [a.text for a in result.answers] == ["weekly", "monthly"]


def test_ties_keep_bm25_order_then_the_readers_order():
    # With mu = 0 every span of a passage has the fused score bm25 / bm25_max, so all of P1's spans tie: the
    # reader's answer (spans[0], "ninety (90) days") stays first although "Either party" starts earlier.
    bm25_only = Calibration(null_margin_threshold=2.0, fusion_weight=0.0, confidence_slope=1.0,
                            confidence_intercept=0.0)
    readings = [Reading((span(P1, "ninety (90) days", 4.0), span(P1, "Either party", 6.0)), 1.0, 1)]
    result = rank_answers("notice?", [ScoredPassage(P1, 3.0)], readings, bm25_only)
    assert [a.text for a in result.answers] == ["ninety (90) days", "Either party"]
