"""A dev set of short contract answers: CUAD questions rewritten as the plain questions a reviewer types.

CUAD (Hendrycks et al., 2021) asks every question in one template ("Highlight the parts (if any) of this contract
related to "Parties" that should be reviewed by a lawyer. ...") and most of its gold spans are whole clauses. For
the kinds whose gold spans are a few words (the document's name, its parties, its dates), this module replaces the
template by one fixed natural question per kind and cuts the contract to one slice around the question's first
short gold span. Every short gold span lying wholly inside the slice counts as a gold answer (the SQuAD metric
takes the best of them).

Invariant: every returned example has at least one gold answer, and ``context[start:start + len(text)] == text``
for each of them.
"""

from __future__ import annotations

import random
import re
from collections.abc import Sequence

from engine.squad_data import GoldAnswer, SquadExample
from engine.training.features import SLICE_CHARS

SHORT_ANSWER_QUESTIONS = {
    "Document Name": "What is the title of this agreement?",
    "Parties": "Who are the parties to this agreement?",
    "Agreement Date": "What is the date of this agreement?",
    "Effective Date": "On what date does this agreement become effective?",
}
MAX_SHORT_ANSWER_WORDS = 10
CUAD_KIND = re.compile(r'related to "([^"]+)"')


def cuad_kind(question: str) -> str | None:
    """The clause kind named in a CUAD template question, or None for any other question."""
    match = CUAD_KIND.search(question)
    return match.group(1) if match else None


def short_contract_questions(
    examples: Sequence[SquadExample], rng: random.Random, max_answer_words: int = MAX_SHORT_ANSWER_WORDS,
    slice_chars: int = SLICE_CHARS,
) -> list[SquadExample]:
    """One sliced, reworded example per CUAD question of a short-answer kind (see the module docstring).

    The slice starts a random 0..(slice_chars - answer length) characters before the first short gold span, so
    the answer is not always at the slice's start. Questions of other kinds, or with no gold span of at most
    ``max_answer_words`` words, are skipped.
    """
    if max_answer_words < 1 or slice_chars < 1:
        raise ValueError(f"max_answer_words and slice_chars must be >= 1 (got {max_answer_words}, {slice_chars})")
    out: list[SquadExample] = []
    for example in examples:
        question = SHORT_ANSWER_QUESTIONS.get(cuad_kind(example.question) or "")
        short = sorted(
            (a for a in example.answers if 0 < len(a.text.split()) <= max_answer_words and len(a.text) <= slice_chars),
            key=lambda a: (a.start, len(a.text)),
        )
        if question is None or not short:
            continue
        first = short[0]
        lo = max(0, first.start - rng.randint(0, slice_chars - len(first.text)))
        hi = min(len(example.context), lo + slice_chars)
        context = example.context[lo:hi]
        golds = tuple(
            GoldAnswer(a.text, a.start - lo) for a in short
            if a.start >= lo and a.start + len(a.text) <= hi
        )
        out.append(SquadExample(f"{example.qid}#short", example.title, question, context, golds, False))
    return out
