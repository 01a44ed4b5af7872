"""Unanswerable questions made by swapping one name or number in an answerable question.

SQuAD 2.0's unanswerable questions were written against their own paragraph; the commonest kind swaps an entity or a
number so the question looks answerable but asks about something the paragraph never mentions (Rajpurkar et al.,
2018, table 2: "entity swap"). Our training files have no such questions, so this module makes them:

- find a capitalised phrase (not the question's first word) or a number in the question that occurs in the context;
- replace it with a phrase of the same kind taken from another question about the same title when one fits (a more
  plausible swap), else from any question of the file; the new phrase must not occur in the context (case-folded);
- the new question, paired with the same context, has no answer.
"""

from __future__ import annotations

import random
import re
from typing import Sequence

from engine.squad_data import SquadExample
from engine.training.features import LONG_CONTEXT_CHARS

NAME_PATTERN = re.compile(r"(?<![.?!] )\b[A-Z][a-z]+(?:\s+(?:of\s+|the\s+|de\s+)?[A-Z][a-z]+)*\b")
NUMBER_PATTERN = re.compile(r"\b\d[\d,.]*\d\b|\b\d\b")


def swappable_phrases(question: str) -> list[tuple[str, str, int]]:
    """(kind, phrase, start) triples in a question: kind is "name" or "number". The first word is never a name."""
    found = [("name", m.group(0), m.start()) for m in NAME_PATTERN.finditer(question)
             if m.start() > 0 and len(m.group(0)) > 2]
    found += [("number", m.group(0), m.start()) for m in NUMBER_PATTERN.finditer(question)]
    return found


def swapped_entity_negatives(
    examples: Sequence[SquadExample], rng: random.Random, rate: float
) -> list[SquadExample]:
    """About ``rate`` of the answerable short-context questions get one swapped, unanswerable twin.

    Invariants of every result: the inserted phrase does not occur in the context (case-folded), the phrase it
    replaced does, and the example is marked impossible with no answers.
    """
    if not 0.0 <= rate <= 1.0:
        raise ValueError(f"rate must be in [0, 1] (got {rate})")
    if rate == 0.0:
        return []
    pool: dict[str, list[str]] = {"name": [], "number": []}
    by_title: dict[tuple[str, str], list[str]] = {}
    for ex in examples:
        for kind, phrase, _ in swappable_phrases(ex.question):
            pool[kind].append(phrase)
            by_title.setdefault((ex.title, kind), []).append(phrase)
    out: list[SquadExample] = []
    for ex in examples:
        if ex.is_impossible or len(ex.context) > LONG_CONTEXT_CHARS or rng.random() >= rate:
            continue
        candidates = [c for c in swappable_phrases(ex.question) if c[1] in ex.context]
        if not candidates:
            continue
        kind, old, at = rng.choice(candidates)
        folded = ex.context.casefold()
        near = by_title.get((ex.title, kind), [])
        for attempt in range(30):
            source = near if attempt < 10 and len(near) > 1 else pool[kind]
            if not source:
                break
            new = rng.choice(source)
            if new.casefold()[:4] != old.casefold()[:4] and new.casefold() not in folded:
                question = ex.question[:at] + new + ex.question[at + len(old):]
                out.append(SquadExample(f"{ex.qid}#s", ex.title, question, ex.context, (), True))
                break
    return out
