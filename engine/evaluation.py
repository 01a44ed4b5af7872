"""Score a reader on SQuAD-format data with the official metric (see ``engine.metrics``)."""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path
from typing import Sequence

from engine.metrics import SquadScores, score_v1, score_v2
from engine.reader.interface import SpanReader
from engine.squad_data import SquadExample, load_examples


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
    """Best span per question; with a threshold, the prediction is "" when null - best > threshold."""
    out: dict[str, Prediction] = {}
    for lo in range(0, len(examples), batch):
        part = examples[lo: lo + batch]
        readings = reader.read_pairs([(e.question, e.context) for e in part], n_best=1)
        for example, reading in zip(part, readings):
            best = reading.spans[0] if reading.spans else None
            text = best.text if best else ""
            best_score = best.score if best else float("-inf")
            if threshold is not None and reading.null_score - best_score > threshold:
                text = ""
            out[example.qid] = Prediction(text, best.text if best else "", best_score, reading.null_score)
    return out


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
