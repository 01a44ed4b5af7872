"""The short-contract-answer dev set builder (engine.training.short_contract_questions).

The contract below is invented for this test. The CUAD question template it imitates is the one of CUAD v1
(Hendrycks et al., 2021), as it appears in ``dev/cuad_dev.json.gz``.
"""

import random

import pytest

from engine.squad_data import GoldAnswer, SquadExample
from engine.training.short_contract_questions import SHORT_ANSWER_QUESTIONS, cuad_kind, short_contract_questions
from tests.shared_data import shared_file

TEMPLATE = 'Highlight the parts (if any) of this contract related to "{}" that should be reviewed by a lawyer.'
PREAMBLE = ("TOOLING SUPPLY AGREEMENT\n\nThis Tooling Supply Agreement is made on March 4, 2025 between Quillfeather "
            "Tooling Ltd. (\"Supplier\") and Brambleworth Mills LLC (\"Buyer\"). ")
FILLER = "The Supplier shall deliver the tooling in good order. " * 60
LAW = "This Agreement is governed by the laws of the State of Vermont, without regard to its conflict of laws rules."
CONTRACT = PREAMBLE + FILLER + LAW


def gold(text: str, after: int = 0) -> GoldAnswer:
    return GoldAnswer(text, CONTRACT.index(text, after))


def cuad(kind: str, *answers: GoldAnswer) -> SquadExample:
    return SquadExample(f"q-{kind}", "tooling", TEMPLATE.format(kind), CONTRACT, answers, not answers)


def test_kind_is_read_from_the_template():
    assert cuad_kind(TEMPLATE.format("Agreement Date")) == "Agreement Date"
    assert cuad_kind("Who signed it?") is None


def test_short_kinds_become_plain_questions_over_one_slice_with_every_gold_inside():
    far_supplier = gold("Supplier", len(PREAMBLE) + 2000)  # a gold span outside the slice of the first one
    examples = [
        cuad("Parties", gold("Brambleworth Mills LLC"), gold("Quillfeather Tooling Ltd."), far_supplier),
        cuad("Agreement Date", gold("March 4, 2025")),
        cuad("Governing Law", gold(LAW)),  # not a short-answer kind
        cuad("Document Name"),  # no gold span
        cuad("Effective Date", gold(PREAMBLE[:120])),  # gold longer than 10 words
    ]
    out = short_contract_questions(examples, random.Random(3))
    assert [e.question for e in out] == [SHORT_ANSWER_QUESTIONS["Parties"], SHORT_ANSWER_QUESTIONS["Agreement Date"]]
    parties, date = out
    # The slice holds the first gold span (by position) and keeps every gold span lying wholly inside it.
    assert [a.text for a in parties.answers] == ["Quillfeather Tooling Ltd.", "Brambleworth Mills LLC"]
    assert len(parties.context) <= 1100 and far_supplier.start >= 1100
    assert [a.text for a in date.answers] == ["March 4, 2025"]
    for example in out:
        assert not example.is_impossible and example.qid.endswith("#short")
        for answer in example.answers:
            assert example.context[answer.start: answer.start + len(answer.text)] == answer.text


def test_slices_place_the_answer_at_varied_offsets_and_are_reproducible():
    example = cuad("Parties", gold("Supplier", len(PREAMBLE) + 2000))  # deep in the contract, room on both sides
    starts = {short_contract_questions([example], random.Random(seed))[0].answers[0].start for seed in range(20)}
    assert len(starts) > 10
    again = short_contract_questions([example], random.Random(5))
    assert short_contract_questions([example], random.Random(5)) == again


def test_bad_arguments_raise():
    with pytest.raises(ValueError, match=r"got 0, 1100"):
        short_contract_questions([], random.Random(0), max_answer_words=0)


def test_the_dev_set_built_from_cuad_dev_is_sound():
    # The real CUAD v1 dev split (Hendrycks et al., 2021) in ../shared: 183 questions of the four kinds, each with
    # gold spans that sit at their offsets; calibrate's quantisation rule scores this set as its third stratum.
    from engine.training.calibrate import dev_answer_sets

    path = shared_file("dev/cuad_dev.json.gz")
    sets = dev_answer_sets(path.parents[1], random.Random(7))
    assert [len(s) for s in sets.values()] == [440, 918, 183]
    short = sets["short_contract_dev_f1"]
    assert {e.question for e in short} == set(SHORT_ANSWER_QUESTIONS.values())
    assert all(e.answers and all(e.context[a.start: a.start + len(a.text)] == a.text and len(a.text.split()) <= 10
                                 for a in e.answers) for e in short)


def test_training_mix_adds_plain_question_copies_of_cuad_train(tmp_path):
    # The training command's CUAD branch (engine.training.train.assemble_examples) with two copies: each eligible
    # question comes back twice as a plain question, each copy over its own slice; other kinds add nothing.
    import gzip
    import json

    from engine.training.train import TrainConfig, assemble_examples

    def qa(kind, answer):
        return {"id": f"q-{kind}", "question": TEMPLATE.format(kind),
                "answers": [{"text": answer, "answer_start": CONTRACT.index(answer)}]}

    raw = {"data": [{"title": "tooling", "paragraphs": [{"context": CONTRACT, "qas": [
        qa("Agreement Date", "March 4, 2025"), qa("Governing Law", LAW)]}]}]}
    (tmp_path / "train").mkdir()
    with gzip.open(tmp_path / "train" / "cuad_train.json.gz", "wt", encoding="utf-8") as handle:
        json.dump(raw, handle)
    config = TrainConfig(data_dir=str(tmp_path), train_files=("train/cuad_train.json.gz",), synthetic_windows=0,
                         cuad_plain_question_copies=2)
    examples, counts, weights = assemble_examples(config, random.Random(0))
    plain = [e for e in examples if e.question == SHORT_ANSWER_QUESTIONS["Agreement Date"]]
    assert len(plain) == 2 and counts["train/cuad_train.json.gz plain short-answer questions"] == 2
    assert all(e.answers[0].text == "March 4, 2025" for e in plain)
    assert weights == [1.0] * len(examples)  # no loss weights asked for
    without, _, _ = assemble_examples(TrainConfig(data_dir=str(tmp_path), train_files=("train/cuad_train.json.gz",),
                                               synthetic_windows=0), random.Random(0))
    assert not any(e.question in SHORT_ANSWER_QUESTIONS.values() for e in without)
    # Contract negatives take their own loss weight: here the retrieved slices (qid suffix #r), not the answers.
    weighted, counts, weights = assemble_examples(
        TrainConfig(data_dir=str(tmp_path), train_files=("train/cuad_train.json.gz",), synthetic_windows=0,
                    cuad_retrieved_negatives=2, contract_negative_loss_weight=0.5), random.Random(0))
    retrieved = [w for e, w in zip(weighted, weights) if "#r" in e.qid]
    assert len(retrieved) == counts["train/cuad_train.json.gz retrieved negatives"] >= 1
    assert set(retrieved) == {0.5}
    assert all(w == 1.0 for e, w in zip(weighted, weights) if not e.is_impossible)
