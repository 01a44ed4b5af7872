"""Contract term questions with short answers: durations and end dates, cut from CUAD's clause spans.

CUAD (Hendrycks et al., 2021) marks whole clauses for "Expiration Date", "Renewal Term", "Notice Period To Terminate
Renewal" and "Warranty Duration". A reviewer asks for the few words inside them: "five (5) years", "ninety (90)
days", "December 31, 2025". This module finds those words in the gold clause (``DURATION`` or ``CALENDAR_DATE``),
asks the plain question of that kind (``TERM_QUESTIONS``), and cuts the contract to one slice around the first match.
Every match of the same type inside the gold clauses and inside the slice is a gold answer (the SQuAD metric takes
the best). The set measures the confusion between a term and the agreement's own date (a date answered for a
duration, or the signing date for an end date), which CUAD's template questions and the title/party/date set do not.

Invariant: every returned example has at least one gold answer, and ``context[start:start + len(text)] == text``
for each of them.
"""

from __future__ import annotations

import random
import re
from collections.abc import Sequence

from engine.squad_data import GoldAnswer, SquadExample
from engine.training.features import SLICE_CHARS
from engine.training.short_contract_questions import cuad_kind

_NUMBER_WORDS = ("one|two|three|four|five|six|seven|eight|nine|ten|eleven|twelve|thirteen|fourteen|fifteen|sixteen|"
                 "seventeen|eighteen|nineteen|twenty|thirty|forty|forty-five|fifty|sixty|seventy|eighty|ninety|"
                 "one hundred(?: and)?(?: twenty| eighty)?|hundred")
DURATION = re.compile(
    rf"\b(?:(?:{_NUMBER_WORDS})(?:\s*\(\d+\))?|\d+)(?:\s+|-)(?:\(\d+\)\s+)?(?:calendar\s+|business\s+|consecutive\s+)?"
    r"(?:day|week|month|year)s?\b", re.IGNORECASE)
_MONTHS = "January|February|March|April|May|June|July|August|September|October|November|December"
CALENDAR_DATE = re.compile(rf"\b(?:(?:{_MONTHS})\s+\d{{1,2}}(?:st|nd|rd|th)?,?\s+\d{{4}}|\d{{1,2}}(?:st|nd|rd|th)?"
                           rf"\s+(?:day\s+of\s+)?(?:{_MONTHS}),?\s+\d{{4}})\b")

# Per CUAD kind: (answer pattern, question), tried in order; the first pattern found in a gold clause decides.
TERM_QUESTIONS: dict[str, tuple[tuple[re.Pattern, str], ...]] = {
    "Expiration Date": ((CALENDAR_DATE, "On what date does this agreement expire?"),
                        (DURATION, "How long is the initial term of this agreement?")),
    "Renewal Term": ((DURATION, "How long is each renewal term?"),),
    "Notice Period To Terminate Renewal": ((DURATION, "How much notice must be given to stop this agreement from "
                                                      "renewing?"),),
    "Warranty Duration": ((DURATION, "How long is the warranty period?"),),
}


def term_matches(example: SquadExample) -> tuple[str, list[GoldAnswer]] | None:
    """The question and the matches (in the contract's coordinates) of the first pattern of the example's kind that
    occurs in any of its gold clauses; None for other kinds or when nothing matches."""
    for pattern, question in TERM_QUESTIONS.get(cuad_kind(example.question) or "", ()):
        found = sorted({(answer.start + m.start(), m.group(0)) for answer in example.answers
                        for m in pattern.finditer(answer.text)})
        if found:
            return question, [GoldAnswer(text, start) for start, text in found]
    return None


def _matched(examples: Sequence[SquadExample], slice_chars: int):
    """(example, question, golds) for each example that ``term_matches``; checks ``slice_chars`` first."""
    if slice_chars < 1:
        raise ValueError(f"slice_chars must be >= 1 (got {slice_chars})")
    for example in examples:
        matched = term_matches(example)
        if matched is not None:
            yield example, *matched


def term_questions(examples: Sequence[SquadExample], rng: random.Random,
                   slice_chars: int = SLICE_CHARS) -> list[SquadExample]:
    """One sliced, reworded example per CUAD question of a term kind whose gold clause holds a duration or date.

    The slice starts a random 0..(slice_chars - answer length) characters before the first match, as in
    ``short_contract_questions``, so the answer is not always at the slice's start.
    """
    out: list[SquadExample] = []
    for example, question, golds in _matched(examples, slice_chars):
        first = golds[0]
        lo = max(0, first.start - rng.randint(0, max(0, slice_chars - len(first.text))))
        hi = min(len(example.context), lo + slice_chars)
        kept = tuple(GoldAnswer(g.text, g.start - lo) for g in golds if g.start >= lo and g.start + len(g.text) <= hi)
        if kept:  # empty only when a match is longer than the slice
            out.append(SquadExample(f"{example.qid}#term", example.title, question, example.context[lo:hi], kept,
                                    False))
    return out


def opening_slice_negatives(examples: Sequence[SquadExample], slice_chars: int = SLICE_CHARS) -> list[SquadExample]:
    """For each CUAD question of a term kind whose first match lies past the contract's opening slice, the same plain
    question against that opening slice (title, parties and the agreement's own date) as an unanswerable pair;
    skipped where the opening slice holds one of the matched texts. The qid ends in ``#opening``."""
    out: list[SquadExample] = []
    for example, question, golds in _matched(examples, slice_chars):
        opening = example.context[:slice_chars]
        if golds[0].start < slice_chars or any(g.text.casefold() in opening.casefold() for g in golds):
            continue
        out.append(SquadExample(f"{example.qid}#opening", example.title, question, opening, (), True))
    return out
