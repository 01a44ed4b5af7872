"""Unanswerable questions made by swapping a name or number of the question for another one *from its own paragraph*.

``swap_negatives`` brings in a phrase the paragraph lacks, so a reader can learn the shortcut "a question word is
missing from the paragraph, so abstain". SQuAD 2.0's crowd-written unanswerable questions mostly use the paragraph's
own words, with a plausible answer in it (Rajpurkar et al., 2018, section 3 and table 2: entity swap, impossible
condition). Here the new phrase does occur in the paragraph, so every word of the question is present and the only
cue is that the paragraph never ties the new phrase to the rest of the question.

Rule for a question q with a name or number P that occurs in its paragraph:
- a replacement R is a phrase of the same kind found in the paragraph (numbers: same count of digits; names: not a
  line's first word, not a question word), not in q, not overlapping any gold answer, not holding P, and not sharing
  P's first four letters;
- R is used only if no sentence of the paragraph that holds R also holds at least ``MAX_REST_OVERLAP`` of q's other
  search tokens (its words without P). Such a sentence could answer the swapped question, so the label would be
  wrong (a noise filter with no source: our choice).
"""

from __future__ import annotations

import random
from typing import Sequence

from engine.sentences import split_sentences
from engine.squad_data import SquadExample
from engine.text_tokens import tokenize_for_search
from engine.training.features import drawn_answerable
from engine.training.swap_negatives import NAME_PATTERN, NUMBER_PATTERN, swappable_phrases

QUESTION_WORDS = frozenset({"what", "who", "when", "where", "which", "why", "how", "the", "this", "that", "there"})
MAX_REST_OVERLAP = 0.5  # share of the question's other tokens a sentence holding R may contain (no source)
QID_SUFFIX = "#i"


def paragraph_phrases(context: str) -> dict[str, list[str]]:
    """Distinct names and numbers of a paragraph by kind, in order of first appearance."""
    out: dict[str, list[str]] = {"name": [], "number": []}
    for kind, pattern in (("name", NAME_PATTERN), ("number", NUMBER_PATTERN)):
        for m in pattern.finditer(context):
            phrase = m.group(0)
            opens_line = m.start() == 0 or context[m.start() - 1] == "\n"
            if kind == "name" and (len(phrase) <= 2 or opens_line or phrase.casefold() in QUESTION_WORDS):
                continue
            if phrase not in out[kind]:
                out[kind].append(phrase)
    return out


def digit_count(phrase: str) -> int:
    return sum(ch.isdigit() for ch in phrase)


def fits(example: SquadExample, kind: str, old: str, new: str) -> bool:
    """True when ``new`` may replace ``old`` (see the module rule, apart from the sentence check)."""
    new_folded, old_folded = new.casefold(), old.casefold()
    if new_folded in example.question.casefold() or new_folded[:4] == old_folded[:4] or old_folded in new_folded:
        return False
    if kind == "number" and digit_count(new) != digit_count(old):
        return False
    for answer in example.answers:
        text = answer.text.casefold()
        if new_folded in text or text in new_folded:
            return False
    return True


def supported_elsewhere(example: SquadExample, old: str, new: str, sentences: list[str]) -> bool:
    """True when some sentence holding ``new`` also holds >= MAX_REST_OVERLAP of the question's other tokens."""
    rest = set(tokenize_for_search(example.question)) - set(tokenize_for_search(old))
    if not rest:
        return True
    for sentence in sentences:
        if new in sentence and len(rest & set(tokenize_for_search(sentence))) >= MAX_REST_OVERLAP * len(rest):
            return True
    return False


def inside_swap_negatives(
    examples: Sequence[SquadExample], rng: random.Random, rate: float
) -> list[SquadExample]:
    """About ``rate`` of the answerable short-context questions get one twin with a phrase swapped inside the paragraph.

    Invariants of every result: the phrase put in occurs in the context, the phrase taken out occurs in the
    context, the context is unchanged, and the example is impossible with no answers.
    """
    out: list[SquadExample] = []
    for ex in drawn_answerable(examples, rng, rate):
        candidates = [c for c in swappable_phrases(ex.question) if c[1] in ex.context]
        if not candidates:
            continue
        kind, old, at = rng.choice(candidates)
        options = [p for p in paragraph_phrases(ex.context)[kind] if fits(ex, kind, old, p)]
        rng.shuffle(options)
        sentences = [ex.context[s:e] for s, e in split_sentences(ex.context)]
        for new in options[:5]:
            if not supported_elsewhere(ex, old, new, sentences):
                question = ex.question[:at] + new + ex.question[at + len(old):]
                out.append(SquadExample(ex.qid + QID_SUFFIX, ex.title, question, ex.context, (), True))
                break
    return out
