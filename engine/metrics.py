"""The official SQuAD metrics, re-implemented.

v1.1 (Rajpurkar et al., 2016, ``evaluate-v1.1.py``): normalise by lowercasing, removing punctuation, removing the
articles a/an/the and collapsing whitespace; EM = 1 if the normalised strings are equal; F1 = harmonic mean of
token precision and recall over the bag of normalised tokens; each question takes the maximum over its gold
answers; totals are means × 100.

v2.0 (Rajpurkar et al., 2018, ``evaluate-v2.0.py``): an unanswerable question has the single gold answer ``""``;
a prediction of ``""`` then scores EM = F1 = 1, any other prediction 0. Where v1.1 compares two empty token lists,
F1 is 0 (division by zero guarded); v2.0 scores two empty answers as F1 = 1. Results are split into HasAns and
NoAns.
"""

from __future__ import annotations

import collections
import re
import string
from dataclasses import dataclass
from typing import Mapping, Sequence

_ARTICLES = re.compile(r"\b(a|an|the)\b", re.UNICODE)
_PUNCT = set(string.punctuation)


def normalize_answer(text: str) -> str:
    """Lower, drop punctuation, drop articles, collapse whitespace (v1.1 and v2.0 agree on this)."""
    text = text.lower()
    text = "".join(ch for ch in text if ch not in _PUNCT)
    text = _ARTICLES.sub(" ", text)
    return " ".join(text.split())


def exact_match(prediction: str, gold: str) -> float:
    return float(normalize_answer(prediction) == normalize_answer(gold))


def f1_v1(prediction: str, gold: str) -> float:
    """v1.1 token F1: 0 when there is no common token, including when both are empty."""
    pred_tokens = normalize_answer(prediction).split()
    gold_tokens = normalize_answer(gold).split()
    common = collections.Counter(pred_tokens) & collections.Counter(gold_tokens)
    overlap = sum(common.values())
    if overlap == 0:
        return 0.0
    precision = overlap / len(pred_tokens)
    recall = overlap / len(gold_tokens)
    return 2 * precision * recall / (precision + recall)


def f1_v2(prediction: str, gold: str) -> float:
    """v2.0 token F1: if either side is empty, F1 = 1 when both are empty, else 0."""
    pred_tokens = normalize_answer(prediction).split()
    gold_tokens = normalize_answer(gold).split()
    if not pred_tokens or not gold_tokens:
        return float(pred_tokens == gold_tokens)
    return f1_v1(prediction, gold)


@dataclass(frozen=True)
class SquadScores:
    exact: float
    f1: float
    total: int
    has_ans_exact: float | None = None
    has_ans_f1: float | None = None
    has_ans_total: int = 0
    no_ans_exact: float | None = None
    no_ans_f1: float | None = None
    no_ans_total: int = 0

    def as_dict(self) -> dict:
        return {k: (round(v, 4) if isinstance(v, float) else v) for k, v in self.__dict__.items()}


def score_v1(predictions: Mapping[str, str], golds: Mapping[str, Sequence[str]]) -> SquadScores:
    """Official v1.1 totals. A question with no prediction scores 0 (as the official script does)."""
    if not golds:
        raise ValueError(f"no gold answers to score (got {len(golds)})")
    em = f1 = 0.0
    for qid, answers in golds.items():
        if not answers:
            raise ValueError(f"v1.1 needs at least one gold answer per question (got none for {qid})")
        pred = predictions.get(qid, "")
        em += max(exact_match(pred, g) for g in answers)
        f1 += max(f1_v1(pred, g) for g in answers)
    n = len(golds)
    return SquadScores(100 * em / n, 100 * f1 / n, n)


def score_v2(predictions: Mapping[str, str], golds: Mapping[str, Sequence[str]]) -> SquadScores:
    """Official v2.0 totals: an empty gold list means unanswerable (gold = [""])."""
    if not golds:
        raise ValueError(f"no gold answers to score (got {len(golds)})")
    em_has = f1_has = em_no = f1_no = 0.0
    n_has = n_no = 0
    for qid, answers in golds.items():
        gold_list = [a for a in answers if normalize_answer(a)] or [""]
        pred = predictions.get(qid, "")
        em = max(exact_match(pred, g) for g in gold_list)
        f1 = max(f1_v2(pred, g) for g in gold_list)
        if gold_list == [""]:
            n_no += 1
            em_no += em
            f1_no += f1
        else:
            n_has += 1
            em_has += em
            f1_has += f1
    n = n_has + n_no
    return SquadScores(
        100 * (em_has + em_no) / n, 100 * (f1_has + f1_no) / n, n,
        100 * em_has / n_has if n_has else None, 100 * f1_has / n_has if n_has else None, n_has,
        100 * em_no / n_no if n_no else None, 100 * f1_no / n_no if n_no else None, n_no,
    )
