"""Whole contracts read the app's way (dev tool of rule contract30): split, replay, scores, fit and judge."""

from __future__ import annotations

import hashlib
import math

import pytest

from engine.evaluation import Prediction
from engine.squad_data import GoldAnswer, SquadExample
from engine.training.document_threshold import (
    contract_half, contract_passages, document_path_predictions, document_path_predictions_by_k, document_path_scores,
    fit_and_judge)
from tests.fakes import FAKE_CALIBRATION, FakeReader


def example(qid: str, title: str, context: str, answer: str | None, question: str = "q") -> SquadExample:
    golds = (GoldAnswer(answer, context.find(answer)),) if answer else ()
    return SquadExample(qid, title, question, context, golds, not golds)


def test_halves_follow_the_first_hex_digit_of_the_title_sha1():
    # FIPS 180-2 appendix A.1: SHA-1("abc") = a9993e36... -> first digit a (10), even -> fit
    assert hashlib.sha1(b"abc").hexdigest().startswith("a9993e36")
    assert contract_half("abc") == "fit"
    # SHA-1("") = da39a3ee... (FIPS 180 test vector, from memory; the assert checks it) -> d (13), odd -> judge
    assert hashlib.sha1(b"").hexdigest().startswith("da39a3ee")
    assert contract_half("") == "judge"


def test_scores_count_abstentions_and_zero_f1_for_abstained_answers():
    # hand-made: two answerable questions (F1 1.0 and 0.5), two unanswerable; abstain when null_margin > t
    examples = [example("a1", "t", "pay ten dollars now", "ten dollars"),
                example("a2", "t", "the term is five years long", "five years long"),
                example("n1", "t", "nothing here", None), example("n2", "t", "nothing there", None)]
    predictions = {"a1": Prediction("ten dollars", "ten dollars", 3.0, 0.0),  # null_margin -3
                   "a2": Prediction("five years", "five years", 1.0, 0.0),  # null_margin -1; F1 = 2*1*(2/3)/(5/3)
                   "n1": Prediction("x", "x", 2.0, 0.0),  # -2
                   "n2": Prediction("y", "y", -4.0, 0.0)}  # +4
    f1_a2 = 2 * 1.0 * (2 / 3) / (1.0 + 2 / 3)
    at_zero = document_path_scores(predictions, examples, 0.0)  # abstains on n2 only
    assert at_zero["no_answer_abstained"] == 50.0
    assert at_zero["answerable_f1"] == pytest.approx(100 * (1 + f1_a2) / 2, abs=0.01)
    strict = document_path_scores(predictions, examples, -1.5)  # abstains on a2, n2 (null_margin > -1.5)
    assert strict["answerable_f1"] == 50.0 and strict["answerable_f1_all"] == pytest.approx(at_zero["answerable_f1"])
    assert strict["no_answer_abstained"] == 50.0
    with pytest.raises(ValueError, match="got 2 and 0"):
        document_path_scores(predictions, examples[:2], 0.0)


def test_fit_uses_only_the_fit_half_and_judges_the_other():
    fit_title, judge_title = "abc", ""  # halves shown in the test above
    examples = [example("f1", fit_title, "alpha beta", "alpha"), example("f2", fit_title, "gamma", None),
                example("j1", judge_title, "delta epsilon", "delta"), example("j2", judge_title, "zeta", None)]
    predictions = {"f1": Prediction("alpha", "alpha", 2.0, 0.0), "f2": Prediction("gamma", "gamma", 0.0, 0.0),
                   "j1": Prediction("delta", "delta", 0.5, 0.0), "j2": Prediction("zeta", "zeta", -1.0, 0.0)}
    report = fit_and_judge(predictions, examples, shared_threshold=5.0, budget=4.0)
    # fit half: answerable margin -2 keeps F1 100 at any t >= -2, so the lowest such candidate is -2
    assert report["fit_half"]["threshold"] == -2.0 and report["contracts"] == {"fit": 1, "judge": 1}
    # judge half, never seen by the fit: j2 (null_margin 1) and j1 (-0.5) are both above -2, so both abstain
    assert report["judge_at_fitted"]["no_answer_abstained"] == 100.0
    assert report["judge_at_fitted"]["answerable_f1"] == 0.0
    assert report["judge_at_shared"] == {**report["judge_at_shared"], "no_answer_abstained": 0.0,
                                         "answerable_f1": 100.0, "threshold": 5.0}


def test_replaying_the_app_path_reads_the_top_passages_of_the_questions_own_contract():
    clause = "The Supplier shall give ninety days notice of termination to the Customer in writing."
    filler = " ".join(f"In section {i} the Supplier covers matters of delivery and invoices." for i in range(60))
    context = filler + " " + clause + " " + filler
    examples = [example("q1", "c", context, "ninety days", "How much notice of termination shall the Supplier give?"),
                example("q2", "c", context, None, "zzz qqq")]  # no word in the contract: no passage, no answer
    reader = FakeReader()
    predictions = document_path_predictions(reader, FAKE_CALIBRATION, examples, top_k=2)
    assert len(contract_passages("c", context)) > 2  # the contract is cut, and only two passages are read
    assert reader.windows_read == 2
    assert predictions["q1"].span_text in clause and predictions["q1"].null_margin < 0
    assert predictions["q2"].span_text == "" and math.isinf(predictions["q2"].null_margin)
    by_k = document_path_predictions_by_k(FakeReader(), FAKE_CALIBRATION, examples, (1, 2, 4))
    assert by_k[2] == predictions  # one reading of the top 4, ranked on its first k passages
    assert by_k[4]["q1"].null_margin <= by_k[1]["q1"].null_margin  # more passages: a best margin at least as high
    with pytest.raises(ValueError, match=r"got \[0\]"):
        document_path_predictions(reader, FAKE_CALIBRATION, examples, top_k=0)

