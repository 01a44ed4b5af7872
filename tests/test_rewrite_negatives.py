"""Negated and antonym unanswerable questions, the two commonest rewrite kinds after entity swaps in SQuAD 2.0
(Rajpurkar et al., 2018, "Know What You Don't Know", table 2: negation, antonym). The sentences below are written
for these tests; the expected rewrites follow the module's stated rules, worked by hand.
"""

import random

import pytest

from engine.squad_data import GoldAnswer, SquadExample, load_examples
from engine.training.rewrite_negatives import ANTONYMS, antonym_question, negated_question, rewritten_negatives
from tests.shared_data import shared_file


@pytest.mark.parametrize("question, expected", [
    ("What did the army capture in 1066?", "What didn't the army capture in 1066?"),
    ("When was the bridge finished?", "When wasn't the bridge finished?"),
    ("How many people were living in the town?", "How many people weren't living in the town?"),
    ("Which river does the canal join?", "Which river doesn't the canal join?"),
    ("Who founded the guild?", "Who never founded the guild?"),
    ("In which year did the mill close?", None),  # no leading wh-phrase: left alone
    ("Name the largest lake.", None),
])
def test_negated_question(question, expected):
    assert negated_question(question) == expected


def test_antonym_question_picks_a_word_the_context_never_uses():
    context = "The largest lake in the region is Lake Orrin, which lies north of the old mill."
    assert antonym_question("What is the largest lake?", context, random.Random(0)) == "What is the smallest lake?"
    # "north" has its pair "south" absent from the context, "largest" too: both are candidates, one is taken.
    rewritten = antonym_question("What is the largest lake north of the mill?", context, random.Random(1))
    assert rewritten in {"What is the smallest lake north of the mill?", "What is the largest lake south of the mill?"}
    # When the antonym already occurs in the context, the rewrite could be answerable, so none is made.
    both = context + " The smallest is Lake Ebb."
    assert antonym_question("What is the largest lake?", both, random.Random(0)) is None
    assert antonym_question("First the largest lake?", context, random.Random(0)) in {
        "Last the largest lake?", "First the smallest lake?"}


def test_antonyms_pair_both_ways():
    assert ANTONYMS["first"] == "last" and ANTONYMS["last"] == "first"
    assert all(ANTONYMS.get(ANTONYMS[word]) is not None for word in ANTONYMS if " " not in ANTONYMS[word])


def test_rewritten_negatives_skip_answers_near_a_negation():
    plain = "The guild was founded by Aldous Wren in 1410 and met in the east hall."
    negated = "The guild was not founded by the crown; Aldous Wren founded it in 1410."
    items = [
        SquadExample("q1", "Guild", "Who founded the guild?", plain, (GoldAnswer("Aldous Wren", plain.index("Aldous")),),
                     False),
        SquadExample("q2", "Guild", "Who founded the guild?", negated,
                     (GoldAnswer("Aldous Wren", negated.index("Aldous")),), False),
    ]
    out = {n.qid: n for n in rewritten_negatives(items, random.Random(0), rate=1.0)}
    assert out["q1#g"].question == "Who never founded the guild?"
    assert out["q1#g"].is_impossible and out["q1#g"].answers == () and out["q1#g"].context == plain
    assert not any(qid.startswith("q2") for qid in out)  # "not" near the answer; no antonym in the question
    assert rewritten_negatives(items, random.Random(0), rate=0.0) == []
    with pytest.raises(ValueError, match=r"got 1.5"):
        rewritten_negatives(items, random.Random(0), rate=1.5)


def test_rewrites_on_a_real_training_file_keep_their_invariants():
    items = load_examples(shared_file("train/tydiqa_goldp_en_train.json.gz"), limit=1500)
    by_id = {e.qid: e for e in items}
    negatives = rewritten_negatives(items, random.Random(5), rate=0.5)
    kinds = {n.qid[-2:] for n in negatives}
    assert kinds == {"#g", "#a"} and len(negatives) > 100
    for neg in negatives:
        source = by_id[neg.qid[:-2]]
        assert neg.context == source.context and neg.question != source.question
        assert neg.is_impossible and neg.answers == ()
        if neg.qid.endswith("#a"):
            changed = set(neg.question.lower().split()) - set(source.question.lower().split())
            assert all(word.strip("?,.") not in source.context.casefold().split() for word in changed)
