"""Unanswerable pairs made by deleting the answer's sentence from the question's own paragraph.

The paragraph keeps its topic, its names and most of the question's words, so the cue that the answer is missing is
the missing sentence itself, not a change of subject. This is the idea behind SQuAD 2.0's unanswerable questions
(Rajpurkar et al., 2018: plausible paragraph, no supported answer), applied to the paragraph instead of the question.

Invariants of every result: no gold answer text occurs in the new context (case-folded), the new context keeps at
least ``MIN_KEPT_SENTENCES`` of the paragraph's sentences in their order, and the example is impossible.
"""

from __future__ import annotations

import random
from typing import Sequence

from engine.sentences import split_sentences
from engine.squad_data import SquadExample
from engine.training.features import drawn_answerable

MIN_KEPT_SENTENCES = 2  # fewer left would make the pair too easy (no source: our choice)


def without_answer_sentences(example: SquadExample) -> str | None:
    """The context with every sentence that overlaps a gold answer removed, or None when no fair negative exists."""
    spans = split_sentences(example.context)
    answers = [(a.start, a.start + len(a.text)) for a in example.answers]
    kept = [(s, e) for s, e in spans if all(e <= a_start or s >= a_end for a_start, a_end in answers)]
    if len(kept) < MIN_KEPT_SENTENCES or len(kept) == len(spans):
        return None
    context = " ".join(example.context[s:e] for s, e in kept)
    folded = context.casefold()
    if any(a.text.casefold() in folded for a in example.answers):
        return None
    return context


def removed_sentence_negatives(
    examples: Sequence[SquadExample], rng: random.Random, rate: float
) -> list[SquadExample]:
    """About ``rate`` of the answerable short-context questions get one twin whose paragraph lacks the answer."""
    out: list[SquadExample] = []
    for ex in drawn_answerable(examples, rng, rate):
        context = without_answer_sentences(ex)
        if context is not None:
            out.append(SquadExample(f"{ex.qid}#r", ex.title, ex.question, context, (), True))
    return out
