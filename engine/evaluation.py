"""Score a reader on SQuAD-format data with the official metric (see ``engine.metrics``)."""

from __future__ import annotations

from dataclasses import dataclass, replace
from pathlib import Path
from typing import Sequence

import numpy as np

from engine.answering import ScoredPassage
from engine.calibration import abstains
from engine.metrics import SquadScores, f1_v1, score_v1, score_v2
from engine.reader.interface import Reading, SpanReader
from engine.squad_data import SquadExample, load_examples
from engine.types import Passage


@dataclass(frozen=True)
class Prediction:
    text: str  # the prediction after the no-answer rule ("" = abstained)
    span_text: str  # the best span, whatever the rule said
    best_score: float  # best span score (start + end logit); -inf when no span
    null_score: float  # s[CLS] + e[CLS]

    @property
    def null_margin(self) -> float:
        """How much the null answer beats the best span: ``null - best``. Abstain when it exceeds a threshold."""
        return self.null_score - self.best_score


def predict_examples(
    reader: SpanReader, examples: Sequence[SquadExample], threshold: float | None, batch: int = 64
) -> dict[str, Prediction]:
    """The reader's answer per question (``Reading.spans[0]``); with a threshold, the prediction is "" when
    null - best score > threshold."""
    out: dict[str, Prediction] = {}
    for lo in range(0, len(examples), batch):
        part = examples[lo: lo + batch]
        readings = reader.read_pairs([(e.question, e.context) for e in part], n_best=1)
        for example, reading in zip(part, readings):
            out[example.qid] = prediction_from_reading(reading, threshold)
    return out


def prediction_from_reading(reading: Reading, threshold: float | None) -> Prediction:
    """A reading's answer (``spans[0]``); with a threshold, "" where ``calibration.abstains``."""
    span_text = reading.spans[0].text if reading.spans else ""
    prediction = Prediction(span_text, span_text, reading.best_score, reading.null_score)
    if threshold is not None and abstains(prediction.null_margin, threshold):
        return replace(prediction, text="")
    return prediction


def open_corpus_passages(contexts: Sequence[str], hits: Sequence[tuple[int, float]]) -> list[ScoredPassage]:
    """(context index, BM25 score) hits over a corpus of plain paragraphs, as ``rank_answers`` takes them: each
    paragraph is its own document ``paragraph-<i>``, so citations of different paragraphs never overlap."""
    return [ScoredPassage(Passage(int(i), f"paragraph-{int(i)}", None, "whole", 0, len(contexts[i]), contexts[i]),
                          float(score)) for i, score in hits]


def has_unanswerable(examples: Sequence[SquadExample]) -> bool:
    return any(e.is_impossible for e in examples)


def evaluate_file(
    reader: SpanReader, path: Path | str, limit: int | None = None, threshold: float | None = None
) -> tuple[SquadScores, dict[str, Prediction]]:
    """v1.1 metric for data without unanswerable questions, else v2.0 (HasAns/NoAns split)."""
    examples = load_examples(path, limit)
    golds = {e.qid: [a.text for a in e.answers] for e in examples}
    v2 = has_unanswerable(examples)
    predictions = predict_examples(reader, examples, threshold if v2 else None)
    texts = {k: v.text for k, v in predictions.items()}
    return (score_v2(texts, golds) if v2 else score_v1(texts, golds)), predictions


def per_question_f1(predictions: dict[str, Prediction], examples: Sequence[SquadExample]) -> dict[str, float]:
    """Official v1.1 token F1 of each question's best span (max over its gold answers), in 0..1."""
    return {e.qid: max(f1_v1(predictions[e.qid].span_text, a.text) for a in e.answers) for e in examples if e.answers}


def cites_gold(answer, question: dict, min_f1: float = 0.5) -> bool:
    """Whole-folder hit: the answer cites the question's gold ``file`` and ``page`` and its token F1 with the gold
    ``answer`` text is at least ``min_f1`` (the rule behind the demo-folder counts in MODEL_CARD.md and the tests)."""
    return (answer.citation.file == question["file"] and answer.citation.page == question["page"]
            and f1_v1(answer.text, question["answer"]) >= min_f1)


def folder_hit_counts(results) -> dict[str, int]:
    """Counts over (question, AskResult) pairs: hits at rank 1, hits anywhere in the listed answers, abstentions,
    and abstentions whose closest spans (shown below the threshold) hold a hit."""
    results = list(results)
    return {"questions": len(results),
            "top1": sum(bool(r.answers) and cites_gold(r.answers[0], q) for q, r in results),
            "listed": sum(any(cites_gold(a, q) for a in r.answers) for q, r in results),
            "abstained": sum(r.abstained for q, r in results),
            "abstained_hit_below_threshold": sum(r.abstained and any(cites_gold(a, q) for a in r.below_threshold)
                                                 for q, r in results)}


def paired_bootstrap(
    scores_a: Sequence[float], scores_b: Sequence[float], resamples: int = 2000, seed: int = 0
) -> tuple[float, float, float]:
    """Mean of b - a over paired questions, with a 95 % percentile interval from resampling the questions.

    The paired bootstrap (Efron and Tibshirani, 1993; Koehn, 2004): draw n question indices with replacement,
    take the mean difference, repeat; the 2.5th and 97.5th percentiles bound the interval.
    """
    return stratified_paired_bootstrap([(scores_a, scores_b)], resamples, seed)


def stratified_paired_bootstrap(
    strata: Sequence[tuple[Sequence[float], Sequence[float]]], resamples: int = 2000, seed: int = 0
) -> tuple[float, float, float]:
    """The paired bootstrap of ``(1/S) * sum over strata of mean(b - a)``: each dev set counts equally.

    Questions are resampled within their own stratum (set), so a small set keeps its size in every resample
    (the stratified bootstrap, Efron and Tibshirani, 1993, section 6.8). With one stratum it is ``paired_bootstrap``.
    """
    if not strata:
        raise ValueError("need at least one stratum (got 0)")
    if resamples < 1:
        raise ValueError(f"resamples must be >= 1 (got {resamples})")
    rng = np.random.default_rng(seed)
    total_mean, total_draws = 0.0, np.zeros(resamples)
    for scores_a, scores_b in strata:
        a = np.asarray(scores_a, dtype=np.float64)
        b = np.asarray(scores_b, dtype=np.float64)
        if a.shape != b.shape or a.ndim != 1 or a.size == 0:
            raise ValueError(f"need two paired, non-empty 1-D score lists (got {a.shape} and {b.shape})")
        diff = b - a
        total_mean += diff.mean()
        total_draws += diff[rng.integers(0, diff.size, size=(resamples, diff.size))].mean(axis=1)
    n = len(strata)
    low, high = np.percentile(total_draws / n, [2.5, 97.5])
    return float(total_mean / n), float(low), float(high)
