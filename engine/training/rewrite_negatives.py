"""Unanswerable questions made by negating a question or swapping one word for its antonym.

SQuAD 2.0's crowd workers wrote unanswerable questions against their own paragraph; beside entity swaps, the
common kinds insert a negation ("What did the army not capture?") or swap a word for its antonym ("largest" for
"smallest") so the question still overlaps the paragraph but asks something it never says (Rajpurkar et al., 2018,
"Know What You Don't Know", table 2: negation 9 %, antonym 20 %). Our training files have no such questions, so
this module writes them from answerable ones:

- negation: the first auxiliary verb right after the wh-phrase takes its contracted negative ("did" -> "didn't"),
  or "never" goes before a past-tense verb that directly follows "who"/"what" ("Who founded" -> "Who never
  founded"). Skipped when the sentence around the answer holds a negation cue, where the negated question could
  still be answered;
- antonym: one word of the question found in ANTONYMS is replaced by its pair; skipped when the pair already
  occurs in the context, so the rewritten question has no support there.
"""

from __future__ import annotations

import random
import re
from typing import Sequence

from engine.squad_data import SquadExample
from engine.training.features import drawn_answerable

# Word pairs in both directions. A hand-written list of everyday English opposites (common practice, no source).
_PAIRS = (
    ("first", "last"), ("largest", "smallest"), ("biggest", "smallest"), ("highest", "lowest"),
    ("most", "least"), ("longest", "shortest"), ("oldest", "youngest"), ("earliest", "latest"),
    ("before", "after"), ("increase", "decrease"), ("increased", "decreased"), ("north", "south"),
    ("northern", "southern"), ("east", "west"), ("eastern", "western"),
    ("maximum", "minimum"), ("best", "worst"), ("better", "worse"), ("larger", "smaller"), ("higher", "lower"),
    ("more", "less"), ("older", "younger"), ("early", "late"), ("beginning", "end"), ("start", "finish"),
    ("started", "ended"), ("began", "ended"), ("open", "closed"), ("opened", "closed"), ("rise", "fall"),
    ("rose", "fell"), ("accepted", "rejected"), ("allowed", "banned"), ("supported", "opposed"),
    ("upper", "lower"), ("inner", "outer"), ("major", "minor"), ("strongest", "weakest"),
    ("fastest", "slowest"), ("richest", "poorest"), ("cheapest", "most expensive"), ("private", "public"),
    ("internal", "external"), ("import", "export"), ("imported", "exported"),
    ("arrived", "departed"), ("male", "female"), ("men", "women"), ("positive", "negative"),
    ("success", "failure"), ("successful", "unsuccessful"), ("legal", "illegal"), ("common", "rare"),
    ("winter", "summer"), ("above", "below"), ("inside", "outside"), ("buy", "sell"), ("bought", "sold"),
)
ANTONYMS: dict[str, str] = {b: a for a, b in _PAIRS} | {a: b for a, b in _PAIRS}

_WH = r"(?:what|who|whom|which|when|where|why|how(?:\s+(?:much|many|long|far|old|often))?)"
_NEGATIVE_AUX = {
    "did": "didn't", "does": "doesn't", "do": "don't", "is": "isn't", "are": "aren't", "was": "wasn't",
    "were": "weren't", "can": "can't", "could": "couldn't", "would": "wouldn't", "should": "shouldn't",
    "has": "hasn't", "have": "haven't", "had": "hadn't", "will": "won't",
}
_AUX_PATTERN = re.compile(rf"^\s*{_WH}(?:\s+\w+){{0,3}}?\s+({'|'.join(_NEGATIVE_AUX)})\b", re.IGNORECASE)
_PAST_VERB_PATTERN = re.compile(r"^\s*(?:who|what)\s+([a-z]+ed)\b", re.IGNORECASE)
_NEGATION_CUE = re.compile(r"\b(?:not|never|no|none|nor|neither|without|cannot)\b|n't\b", re.IGNORECASE)
_ANSWER_NEIGHBOURHOOD = 200  # characters either side of the answer checked for negation cues


def negated_question(question: str) -> str | None:
    """The question with its first auxiliary negated, or "never" before a leading past-tense verb; else None."""
    match = _AUX_PATTERN.match(question)
    if match:
        aux = match.group(1)
        negative = _NEGATIVE_AUX[aux.lower()]
        if aux[0].isupper():
            negative = negative[0].upper() + negative[1:]
        return question[: match.start(1)] + negative + question[match.end(1):]
    match = _PAST_VERB_PATTERN.match(question)
    if match:
        return question[: match.start(1)] + "never " + question[match.start(1):]
    return None


def antonym_question(question: str, context: str, rng: random.Random) -> str | None:
    """The question with one word swapped for its antonym that the context never uses; else None."""
    folded = context.casefold()
    choices = []
    for match in re.finditer(r"[A-Za-z]+", question):
        other = ANTONYMS.get(match.group(0).lower())
        if other and not re.search(rf"\b{re.escape(other)}\b", folded):
            choices.append((match, other))
    if not choices:
        return None
    match, other = rng.choice(choices)
    if match.group(0)[0].isupper():
        other = other[0].upper() + other[1:]
    return question[: match.start()] + other + question[match.end():]


def _negation_near_answer(example: SquadExample) -> bool:
    for answer in example.answers:
        lo = max(0, answer.start - _ANSWER_NEIGHBOURHOOD)
        hi = answer.start + len(answer.text) + _ANSWER_NEIGHBOURHOOD
        if _NEGATION_CUE.search(example.context[lo:hi]):
            return True
    return False


def rewritten_negatives(examples: Sequence[SquadExample], rng: random.Random, rate: float) -> list[SquadExample]:
    """About ``rate`` of the answerable short-context questions get one negated or antonym twin, marked impossible.

    Qid suffixes: "#g" for a negation, "#a" for an antonym. Each picked question tries its kinds in random order
    and keeps the first that applies.
    """
    out: list[SquadExample] = []
    for ex in drawn_answerable(examples, rng, rate):
        kinds = ["negation", "antonym"]
        rng.shuffle(kinds)
        for kind in kinds:
            if kind == "negation":
                question = None if _negation_near_answer(ex) else negated_question(ex.question)
                suffix = "#g"
            else:
                question = antonym_question(ex.question, ex.context, rng)
                suffix = "#a"
            if question and question != ex.question:
                out.append(SquadExample(ex.qid + suffix, ex.title, question, ex.context, (), True))
                break
    return out
