"""Ask a folder a question: retrieve passages with BM25, read them, fuse, merge, calibrate, maybe abstain.

Pipeline for one question:
1. the top ``k`` passages by BM25 (optionally scoped to one document or subfolder);
2. the reader's spans and null score for each passage (its answer first: the expected-F1 choice);
3. each span's margin m = span score - passage null score (the passage's answer carries its best score,
   ``Reading.margin``); fused rank score
   ``(1 - mu) * bm25 / bm25_max + mu * m`` (BERTserini-style linear interpolation);
4. identical answers (same normalised text) merge into the best-ranked one, keeping the other citations; a
   different span that overlaps a better-ranked one on the same page (say "ninety (90) days" inside "ninety (90)
   days' prior written notice") is the same clause read twice, and is dropped (non-maximum suppression);
5. abstain (no answers) when the best span's null margin exceeds the calibrated threshold; the closest spans are
   then kept apart, at most ``defaults.TOP_N_BELOW_THRESHOLD`` and all marked low confidence, so that a reviewer
   can still read a right clause the reader doubted (an abstention does not prove a clause is absent);
6. confidence = the calibrated logistic of m, in [0, 1].

Answers are listed in fused order, the order that ``calibrate`` chose mu for, so a lower-confidence answer from a
passage that matches the question much better can come first. (Listing the five best by confidence instead gave
first-answer F1 55.6 against 57.9 in fused order on the TyDi-en dev open corpus: scripts/folder_checks.py.)
"""

from __future__ import annotations

import time
from dataclasses import dataclass, replace
from typing import Sequence

from engine import defaults
from engine.calibration import Calibration, abstains
from engine.metrics import normalize_answer
from engine.reader.interface import Reading, SpanReader
from engine.types import Answer, AskResult, Citation, Passage


@dataclass(frozen=True)
class ScoredPassage:
    passage: Passage
    bm25: float


def rank_answers(
    question: str,
    passages: Sequence[ScoredPassage],
    readings: Sequence[Reading],
    calibration: Calibration,
    top_n: int = defaults.TOP_N_ANSWERS,
    low_confidence_below: float = defaults.LOW_CONFIDENCE_BELOW,
    top_n_below_threshold: int = defaults.TOP_N_BELOW_THRESHOLD,
) -> AskResult:
    """Pure ranking step (no model, no index): turns passage readings into an ``AskResult``, answers in fused order."""
    if top_n < 1:
        raise ValueError(f"top_n must be >= 1 (got {top_n})")
    if top_n_below_threshold < 0:
        raise ValueError(f"top_n_below_threshold must be >= 0 (got {top_n_below_threshold})")
    if len(passages) != len(readings):
        raise ValueError(f"one reading per passage is needed (got {len(passages)} and {len(readings)})")
    bm25_max = max((p.bm25 for p in passages), default=0.0)
    bm25_max = bm25_max if bm25_max > 0 else float("inf")  # no positive BM25 score: retrieval adds nothing
    candidates = []
    for scored, reading in zip(passages, readings):
        for i, span in enumerate(reading.spans):
            margin = reading.margin(i)
            fused = calibration.fused(scored.bm25 / bm25_max, margin)
            candidates.append((fused, margin, scored, span))
    if not candidates:
        return AskResult(question, (), True)
    candidates.sort(key=lambda c: -c[0])  # stable: ties keep BM25 order, then the reader's order (its answer first)
    best_margin = max(c[1] for c in candidates)
    if abstains(-best_margin, calibration.null_margin_threshold):
        # every closest span is low confidence, whatever its score: no confidence is below infinity
        closest = merged_answers(candidates, top_n_below_threshold, calibration, low_confidence_below=float("inf"))
        return AskResult(question, (), True, below_threshold=closest)
    return AskResult(question, merged_answers(candidates, top_n, calibration, low_confidence_below), False)


def merged_answers(candidates: list[tuple], top_n: int, calibration: Calibration,
                   low_confidence_below: float) -> tuple[Answer, ...]:
    """The first ``top_n`` distinct answers of (fused, margin, scored passage, span) candidates in fused order:
    equal normalised texts merge (keeping the other citations), overlapping different spans are dropped."""
    merged: dict[str, tuple] = {}  # key -> (margin, scored passage, span, citation, other citations)
    order: list[str] = []
    cited: list[Citation] = []
    for _, margin, scored, span in candidates:
        key = normalize_answer(span.text) or span.text.strip()
        if not key:
            continue
        p = scored.passage
        citation = Citation(p.doc_path, p.page_number, p.locator, p.start + span.start, p.start + span.end)
        if key not in merged and any(overlaps(citation, c) for c in cited):
            continue
        cited.append(citation)
        if key not in merged:
            merged[key] = (margin, scored, span, citation, [])
            order.append(key)
        elif citation != merged[key][3] and citation not in merged[key][4]:
            merged[key][4].append(citation)
    answers = []
    for key in order[:top_n]:
        margin, scored, span, citation, others = merged[key]
        confidence = calibration.confidence(margin)
        answers.append(Answer(
            text=span.text, score=round(confidence, 6), citation=citation,
            passage=scored.passage.text, passage_start=scored.passage.start,
            low_confidence=confidence < low_confidence_below, reader_logit=margin,
            retrieval_score=scored.bm25, also_found=tuple(others),
        ))
    return tuple(answers)


def overlaps(a: Citation, b: Citation) -> bool:
    """True when two citations share at least one character of the same page: a.start < b.end and b.start < a.end."""
    same_page = (a.file, a.page, a.locator) == (b.file, b.page, b.locator)
    return same_page and a.start < b.end and b.start < a.end


class Answerer:
    """Binds an open index, a reader and a calibration. The reader is loaded once and reused."""

    def __init__(self, index, reader: SpanReader, calibration: Calibration,
                 top_k: int = defaults.TOP_K_PASSAGES) -> None:
        if top_k < 1:
            raise ValueError(f"top_k must be >= 1 (got {top_k})")
        self.index = index
        self.reader = reader
        self.calibration = calibration
        self.top_k = top_k

    def retrieve(self, question: str, doc: str | None = None, subfolder: str | None = None,
                 k: int | None = None) -> list[ScoredPassage]:
        hits = self.index.search(question, k or self.top_k, doc=doc, subfolder=subfolder)
        return [ScoredPassage(passage, float(score)) for passage, score in hits]

    def ask(self, question: str, *, top_n: int = defaults.TOP_N_ANSWERS, doc: str | None = None,
            subfolder: str | None = None) -> AskResult:
        question = question.strip()
        if not question:
            raise ValueError(f"the question is empty (got {question!r})")
        started = time.perf_counter()
        passages = self.retrieve(question, doc, subfolder)
        readings = self.reader.read_pairs([(question, sp.passage.text) for sp in passages], n_best=5)
        result = rank_answers(question, passages, readings, self.calibration, top_n)
        scope = f"document {doc}" if doc else (f"folder {subfolder}" if subfolder else None)
        return replace(result, seconds=round(time.perf_counter() - started, 4), scope=scope)
