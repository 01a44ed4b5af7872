"""The contract term question builder (engine.training.term_questions).

The contract below is invented for this test. The CUAD question template it imitates is the one of CUAD v1
(Hendrycks et al., 2021), as it appears in ``dev/cuad_dev.json.gz``; the answer shapes ("five (5) years", "ninety
(90) days", "December 31, 2029") are the drafting styles the CUAD clauses use.
"""

import random

import pytest

from engine.squad_data import GoldAnswer, SquadExample
from engine.training.features import SLICE_CHARS
from engine.training.term_questions import (
    CALENDAR_DATE,
    DURATION,
    TERM_QUESTIONS,
    opening_slice_negatives,
    term_questions,
)
from tests.shared_data import shared_file

TEMPLATE = 'Highlight the parts (if any) of this contract related to "{}" that should be reviewed by a lawyer.'
PREAMBLE = ("KILN SERVICES AGREEMENT\n\nThis Kiln Services Agreement is made on March 4, 2025 between Quillfeather "
            "Tooling Ltd. and Brambleworth Mills LLC. ")
FILLER = "The Supplier shall keep the kilns in good repair. " * 40
TERM = "This Agreement continues for five (5) years from the Effective Date. "
RENEWAL = ("It then renews for successive one (1) year periods unless either party gives ninety (90) days' notice "
           "of non-renewal. ")
EXPIRY = "In any event this Agreement expires on December 31, 2039. "
WARRANTY = "The kilns are warranted against defects in workmanship. "  # a term kind with no duration in it
CONTRACT = PREAMBLE + FILLER + TERM + RENEWAL + EXPIRY + WARRANTY


def cuad(kind: str, clause: str) -> SquadExample:
    return SquadExample(f"q-{kind}", "kilns", TEMPLATE.format(kind), CONTRACT,
                        (GoldAnswer(clause, CONTRACT.index(clause)),), False)


@pytest.mark.parametrize("text", ["five (5) years", "ninety (90) days", "30 days", "one (1) year", "twelve months",
                                  "sixty (60) calendar days", "two-year"])
def test_duration_pattern_finds_the_drafting_styles(text):
    assert DURATION.fullmatch(text)


@pytest.mark.parametrize("text", ["December 31, 2039", "March 4 2025", "1st day of June, 2024", "4 March 2025"])
def test_date_pattern_finds_calendar_dates(text):
    assert CALENDAR_DATE.fullmatch(text)


def test_term_kinds_become_plain_questions_with_the_matched_words_as_gold():
    examples = [cuad("Expiration Date", TERM), cuad("Renewal Term", RENEWAL), cuad("Expiration Date", EXPIRY),
                cuad("Governing Law", TERM), cuad("Warranty Duration", WARRANTY)]
    out = term_questions(examples, random.Random(3))
    assert [e.question for e in out] == ["How long is the initial term of this agreement?",
                                         "How long is each renewal term?", "On what date does this agreement expire?"]
    term, renewal, expiry = out
    assert [a.text for a in term.answers] == ["five (5) years"]
    # Lenient gold: every duration inside the gold clause counts (the renewal clause also states the notice period).
    assert [a.text for a in renewal.answers] == ["one (1) year", "ninety (90) days"]
    assert [a.text for a in expiry.answers] == ["December 31, 2039"]  # a date wins over a duration for expiry
    for example in out:
        assert example.qid.endswith("#term") and not example.is_impossible and len(example.context) <= SLICE_CHARS
        for answer in example.answers:
            assert example.context[answer.start: answer.start + len(answer.text)] == answer.text


def test_opening_slice_negative_asks_the_same_question_of_the_preamble():
    examples = [cuad("Renewal Term", RENEWAL), cuad("Governing Law", TERM)]
    (negative,) = opening_slice_negatives(examples)
    assert negative.question == TERM_QUESTIONS["Renewal Term"][0][1]
    assert negative.context == CONTRACT[:SLICE_CHARS] and "March 4, 2025" in negative.context
    assert negative.answers == () and negative.is_impossible and negative.qid.endswith("#opening")


def test_no_opening_negative_when_the_answer_is_in_the_opening_slice():
    early = "renews for successive one (1) year periods"
    contract = PREAMBLE + early + FILLER
    example = SquadExample("q", "kilns", TEMPLATE.format("Renewal Term"), contract,
                           (GoldAnswer(early, contract.index(early)),), False)
    assert opening_slice_negatives([example]) == []
    with pytest.raises(ValueError, match="got 0"):
        opening_slice_negatives([example], slice_chars=0)


def test_cuad_dev_gives_a_term_set_whose_gold_lies_in_its_context():
    """Real CUAD dev (skips without ../shared): every gold answer is the text at its offset."""
    from engine.squad_data import load_examples

    examples = [e for e in load_examples(shared_file("dev/cuad_dev.json.gz")) if e.answers]
    out = term_questions(examples, random.Random(7))
    assert len(out) == 60  # measured when the set was built (2026-12-04); a change here changes the dev set
    assert len(opening_slice_negatives(examples)) == 54
    for example in out:
        assert example.answers
        for answer in example.answers:
            assert example.context[answer.start: answer.start + len(answer.text)] == answer.text


def test_training_mix_adds_term_questions_and_their_opening_negatives(tmp_path):
    # The training command's CUAD branch (engine.training.train.assemble_examples) with two copies: the term question
    # comes back twice over its own slice, its opening-slice negative twice, at the contract negative weight.
    import gzip
    import json

    from engine.training.train import TrainConfig, assemble_examples

    raw = {"data": [{"title": "kilns", "paragraphs": [{"context": CONTRACT, "qas": [
        {"id": "q-renewal", "question": TEMPLATE.format("Renewal Term"),
         "answers": [{"text": RENEWAL, "answer_start": CONTRACT.index(RENEWAL)}]}]}]}]}
    (tmp_path / "train").mkdir()
    with gzip.open(tmp_path / "train" / "cuad_train.json.gz", "wt", encoding="utf-8") as handle:
        json.dump(raw, handle)
    config = TrainConfig(data_dir=str(tmp_path), train_files=("train/cuad_train.json.gz",), synthetic_windows=0,
                         cuad_term_question_copies=2, contract_negative_loss_weight=0.5)
    examples, counts, weights = assemble_examples(config, random.Random(0))
    terms = [(e, w) for e, w in zip(examples, weights) if e.qid.endswith("#term")]
    openings = [(e, w) for e, w in zip(examples, weights) if e.qid.endswith("#opening")]
    assert len(terms) == counts["train/cuad_train.json.gz term questions"] == 2
    assert len(openings) == counts["train/cuad_train.json.gz opening-slice negatives"] == 2
    assert {w for _, w in terms} == {1.0} and {w for _, w in openings} == {0.5}
    assert all(e.answers[0].text == "one (1) year" for e, _ in terms)
    assert all(e.is_impossible and not e.answers for e, _ in openings)
    without, counts, _ = assemble_examples(TrainConfig(data_dir=str(tmp_path), train_files=(
        "train/cuad_train.json.gz",), synthetic_windows=0), random.Random(0))
    assert not any("#term" in e.qid or "#opening" in e.qid for e in without)
    assert not any("term questions" in key for key in counts)
