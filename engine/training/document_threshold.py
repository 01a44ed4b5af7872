"""Whole contracts read the way the app reads them, to fit and judge a no-answer threshold on (dev tool).

The shared threshold (``calibrate.budget_threshold`` on the dev mix) is fitted on paragraphs and slices. The app
instead asks a folder: it cuts each contract into passages, ranks them with BM25, reads the top
``TOP_K_PASSAGES`` and abstains when the best margin over all of them is below ``-threshold``
(``answering.rank_answers``). Over a whole contract the best margin is a maximum over more spans than in one slice;
how far that makes missing clauses look answerable is what this measures. This module replays that path on
SQuAD-format examples whose context is a whole contract (CUAD) and fits a threshold on it (rule contract30 in
``docs/decision_rules.md``: the shared threshold was kept):

- ``contract_half``: contracts split by the parity of the first hex digit of the SHA-1 of their title;
- ``document_path_predictions``: per question, the first answer of ``rank_answers`` with no threshold and the
  best margin m, as an ``evaluation.Prediction`` with ``null_margin = -m``;
- ``document_path_scores``: at a threshold t, no-answer abstention (share of unanswerable questions with
  ``-m > t``) and answerable F1 (mean official v1.1 F1 of the first answer, 0 when abstained).
"""

from __future__ import annotations

import hashlib
from dataclasses import replace
from typing import Sequence

from engine import defaults
from engine.answering import ScoredPassage, rank_answers
from engine.bm25 import Bm25Index
from engine.calibration import Calibration, abstains
from engine.evaluation import Prediction
from engine.metrics import f1_v1
from engine.passages import split_passages
from engine.reader.interface import SpanReader
from engine.squad_data import SquadExample
from engine.text_tokens import tokenize_for_search
from engine.training.calibrate import budget_threshold
from engine.types import Document, Page, Passage


def contract_half(title: str) -> str:
    """"fit" when the first hex digit of the SHA-1 of the UTF-8 title is even, else "judge": a split by contract,
    never by question. (The whole hash is even for every CUAD-dev title, since the data's own split is by SHA-1.)"""
    return "fit" if int(hashlib.sha1(title.encode("utf-8")).hexdigest()[0], 16) % 2 == 0 else "judge"


def contract_passages(title: str, context: str) -> list[Passage]:
    """The app's passages of one contract held as a single text page."""
    page = Page(None, context, "whole file")
    doc = Document(f"{title}.txt", "txt", (page,), len(context), 0, "")
    return split_passages(doc)


def document_path_predictions(reader: SpanReader, calibration: Calibration, examples: Sequence[SquadExample],
                              top_k: int = defaults.TOP_K_PASSAGES, log=None) -> dict[str, Prediction]:
    """Each question asked of its own contract as the app asks it, with no threshold: ``best_score`` is the best
    margin m over the top-k passages' spans and ``null_score`` 0, so ``null_margin = -m``; ``span_text`` is the
    first answer in fused order ("" when no passage matched the question's words)."""
    return document_path_predictions_by_k(reader, calibration, examples, (top_k,), log)[top_k]


def document_path_predictions_by_k(reader: SpanReader, calibration: Calibration, examples: Sequence[SquadExample],
                                   ks: Sequence[int], log=None) -> dict[int, dict[str, Prediction]]:
    """``document_path_predictions`` for several k at once: the top max(ks) passages are read once, and each k
    ranks the first k of them."""
    if not ks or min(ks) < 1:
        raise ValueError(f"every k must be >= 1 (got {list(ks)})")
    open_calibration = replace(calibration, null_margin_threshold=float("inf"))
    indexes: dict[str, tuple[list[Passage], Bm25Index]] = {}
    out: dict[int, dict[str, Prediction]] = {k: {} for k in ks}
    for n, ex in enumerate(examples):
        if ex.context not in indexes:
            passages = contract_passages(ex.title, ex.context)
            indexes[ex.context] = (passages, Bm25Index.build([tokenize_for_search(p.text) for p in passages]))
        passages, index = indexes[ex.context]
        hits = index.top_k(tokenize_for_search(ex.question), max(ks))
        scored = [ScoredPassage(passages[i], float(s)) for i, s in hits]
        readings = reader.read_pairs([(ex.question, sp.passage.text) for sp in scored], n_best=5) if scored else []
        for k in ks:
            result = rank_answers(ex.question, scored[:k], readings[:k], open_calibration, top_n=1)
            first = result.answers[0].text if result.answers else ""
            best = max((r.margin(i) for r in readings[:k] for i in range(len(r.spans))), default=float("-inf"))
            out[k][ex.qid] = Prediction(first, first, float(best), 0.0)
        if log is not None and (n + 1) % 100 == 0:
            log(f"{n + 1}/{len(examples)} questions read")
    return out


def document_path_scores(predictions: dict[str, Prediction], examples: Sequence[SquadExample],
                         threshold: float) -> dict:
    """No-answer abstention (%) and answerable F1 (official v1.1 F1 of the first answer, 0 when abstained) at
    ``threshold``; ``answerable_f1_all`` is the same F1 with no threshold."""
    answerable = [e for e in examples if e.answers]
    unanswerable = [e for e in examples if not e.answers]
    if not answerable or not unanswerable:
        raise ValueError(f"need answerable and unanswerable questions (got {len(answerable)} and "
                         f"{len(unanswerable)})")
    f1 = {e.qid: max(f1_v1(predictions[e.qid].span_text, a.text) for a in e.answers) for e in answerable}
    kept = [f1[e.qid] for e in answerable if not abstains(predictions[e.qid].null_margin, threshold)]
    caught = sum(1 for e in unanswerable if abstains(predictions[e.qid].null_margin, threshold))
    return {"threshold": round(float(threshold), 3), "answerable": len(answerable),
            "unanswerable": len(unanswerable),
            "answerable_f1_all": round(100.0 * sum(f1.values()) / len(answerable), 2),
            "answerable_f1": round(100.0 * sum(kept) / len(answerable), 2),
            "no_answer_abstained": round(100.0 * caught / len(unanswerable), 2)}


def fit_and_judge(predictions: dict[str, Prediction], examples: Sequence[SquadExample], shared_threshold: float,
                  budget: float) -> dict:
    """Fit the documents' threshold on the "fit" half (``calibrate.budget_threshold``: the lowest threshold whose
    answerable F1 stays within ``budget`` of no threshold) and score it and ``shared_threshold`` on the "judge"
    half, which the fit never saw."""
    fit = [e for e in examples if contract_half(e.title) == "fit"]
    judge = [e for e in examples if contract_half(e.title) == "judge"]
    fitted = budget_threshold(predictions, fit, budget)
    return {"contracts": {"fit": len({e.title for e in fit}), "judge": len({e.title for e in judge})},
            "fit_half": fitted,
            "judge_at_fitted": document_path_scores(predictions, judge, fitted["threshold"]),
            "judge_at_shared": document_path_scores(predictions, judge, shared_threshold)}

