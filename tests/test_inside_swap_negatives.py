"""Inside-swap unanswerable questions: a name or number of the question swapped for another of its own paragraph.

The kind follows SQuAD 2.0's "entity swap" and "impossible condition" categories, whose questions use the paragraph's
own words (Rajpurkar et al., 2018, table 2, from memory). The paragraphs below are invented for these checks; the
expected swaps are worked by hand from the module's rule. The last test runs the rule over a real training file.
"""

import random

import pytest

from engine.squad_data import GoldAnswer, SquadExample, load_examples
from engine.training.inside_swap_negatives import (
    MAX_REST_OVERLAP,
    QID_SUFFIX,
    inside_swap_negatives,
    paragraph_phrases,
    supported_elsewhere,
)
from engine.training.swap_negatives import swappable_phrases
from tests.shared_data import shared_file

PARAGRAPH = ("The mill was founded in Dunmore in 1871. Its owners moved the looms to Carrick in 1902. "
             "A flood in 1936 closed the weaving hall for a year.")


def example(question: str, answer: str, context: str = PARAGRAPH) -> SquadExample:
    return SquadExample("q", "Mill", question, context, (GoldAnswer(answer, context.index(answer)),), False)


def test_paragraph_phrases_by_kind_skip_a_lines_first_word_and_question_words():
    found = paragraph_phrases("Where the river bends, Dunmore grew.\nCarrick lies east of Dunmore since 1871.")
    assert found == {"name": ["Dunmore"], "number": ["1871"]}  # "Where" and the line-opening "Carrick" are left out


def test_a_year_is_swapped_for_the_one_year_no_sentence_ties_to_the_question():
    # "When did the mill move the looms to Carrick?" -> swap "Carrick" for "Dunmore": the sentence holding Dunmore
    # also holds "mill" and "founded" but of the other tokens {mill, move, loom} only "mill": 1/3 < 0.5, so it is kept.
    ex = example("When did the owners move the looms to Carrick?", "1902")
    (neg,) = inside_swap_negatives([ex], random.Random(0), rate=1.0)
    assert neg.question == "When did the owners move the looms to Dunmore?"
    assert neg.qid == "q" + QID_SUFFIX and neg.is_impossible and neg.answers == () and neg.context == ex.context


def test_a_swap_that_another_sentence_could_answer_is_refused():
    # Both years sit in sentences about the flood, so "How long was the hall closed after the flood in 1936?" with
    # 1921 would be answerable from the second sentence: no negative is made.
    context = "A flood in 1936 closed the weaving hall for a year. A flood in 1921 closed the weaving hall for a month."
    ex = example("How long did the flood in 1936 close the weaving hall?", "a year", context)
    assert supported_elsewhere(ex, "1936", "1921", [context[:52], context[53:]])
    assert inside_swap_negatives([ex], random.Random(0), rate=1.0) == []


def test_a_number_is_only_swapped_for_one_with_as_many_digits_and_never_for_the_answer():
    context = "The hall held 40 looms in 1902 and 400 looms in 1936. It had 12 doors."
    ex = example("How many looms did the hall hold in 1936?", "400", context)
    outs = {n.question for seed in range(20) for n in inside_swap_negatives([ex], random.Random(seed), rate=1.0)}
    assert outs <= {"How many looms did the hall hold in 1902?"}  # never "in 12" (two digits) or "in 400" (the answer)


def test_rate_bounds_and_zero_rate():
    ex = example("When did the owners move the looms to Carrick?", "1902")
    assert inside_swap_negatives([ex], random.Random(0), rate=0.0) == []
    with pytest.raises(ValueError, match=r"got 1.2"):
        inside_swap_negatives([ex], random.Random(0), rate=1.2)


def test_inside_swaps_on_a_real_training_file_keep_their_invariants():
    from engine.sentences import split_sentences
    from engine.text_tokens import tokenize_for_search

    items = load_examples(shared_file("train/tydiqa_goldp_en_train.json.gz"), limit=1500)
    by_id = {e.qid: e for e in items}
    negatives = inside_swap_negatives(items, random.Random(3), rate=0.5)
    assert len(negatives) > 100
    for neg in negatives:
        source = by_id[neg.qid.removesuffix(QID_SUFFIX)]
        assert neg.context == source.context and neg.question != source.question and neg.is_impossible
        old, new = swapped_pair(source.question, neg.question)
        assert old in source.context and new in neg.context and new.casefold() not in source.question.casefold()
        assert not any(new.casefold() in a.text.casefold() for a in source.answers)
        rest = set(tokenize_for_search(source.question)) - set(tokenize_for_search(old))
        for s, e in split_sentences(neg.context):
            if new in neg.context[s:e]:
                assert len(rest & set(tokenize_for_search(neg.context[s:e]))) < MAX_REST_OVERLAP * len(rest)


def swapped_pair(before: str, after: str) -> tuple[str, str]:
    """The phrase of ``before`` that was replaced and the phrase of ``after`` that replaced it."""
    head = next(i for i, (a, b) in enumerate(zip(before, after)) if a != b)
    back = next(i for i, (a, b) in enumerate(zip(before[::-1], after[::-1])) if a != b)
    old, at = next((p, at) for _, p, at in swappable_phrases(before) if at <= head and at + len(p) >= len(before) - back)
    return old, after[at: len(after) - (len(before) - at - len(old))]
