"""Retrieval-matched negatives: the slices of a long document that BM25 ranks highest for a question, where the
answer is not.

The app reads the top BM25 passages of a folder and answers from the best of them, so its false answers come
from passages that match the question's words but hold no answer. Random slices of a contract (``features.
slice_long_example``) are mostly easy negatives; these are the hard ones the app actually meets. For each
question, the document is cut into slices of ``features.SLICE_CHARS`` characters every ``SLICE_CHARS // 2``, the
slices overlapping any gold span are dropped, and the ``per_question`` best by BM25 Okapi
(``engine.bm25.Bm25Index``) become unanswerable pairs (a zero score never qualifies).
"""

from __future__ import annotations

import random
from typing import Sequence

import numpy as np

from engine.bm25 import Bm25Index
from engine.squad_data import SquadExample
from engine.text_tokens import tokenize_for_search
from engine.training.features import LONG_CONTEXT_CHARS, SLICE_CHARS

DEV_CHECK_QUESTIONS = 400  # CUAD-dev questions in the dev check; a sample size with no source, about +-2.5 points


def document_slices(context: str, size: int = SLICE_CHARS, step: int = SLICE_CHARS // 2) -> list[tuple[int, int]]:
    """Half-open character ranges [lo, hi) every ``step`` characters; the last one ends at the end of the text."""
    if size < 1 or not 1 <= step <= size:
        raise ValueError(f"need size >= 1 and 1 <= step <= size (got size={size}, step={step})")
    if len(context) <= size:
        return [(0, len(context))]
    starts = list(range(0, len(context) - size, step)) + [len(context) - size]
    return [(lo, lo + size) for lo in starts]


def retrieved_negatives(examples: Sequence[SquadExample], per_question: int = 1) -> list[SquadExample]:
    """For each example with a long context, its ``per_question`` best BM25 slices that overlap no gold span,
    labelled unanswerable (qid suffix ``#r<k>``). Short contexts give none: they are read whole."""
    if per_question < 0:
        raise ValueError(f"per_question must be >= 0 (got {per_question})")
    out: list[SquadExample] = []
    indexes: dict[str, tuple[list[tuple[int, int]], Bm25Index]] = {}  # one index per document
    for ex in examples:
        if per_question == 0 or len(ex.context) <= LONG_CONTEXT_CHARS:
            continue
        if ex.context not in indexes:
            slices = document_slices(ex.context)
            indexes[ex.context] = (slices, Bm25Index.build([tokenize_for_search(ex.context[lo:hi])
                                                            for lo, hi in slices]))
        slices, index = indexes[ex.context]
        gold = [(a.start, a.start + len(a.text)) for a in ex.answers]
        free = [pos for pos, (lo, hi) in enumerate(slices) if all(e <= lo or s >= hi for s, e in gold)]
        if not free:
            continue
        hits = index.top_k(tokenize_for_search(ex.question), per_question, candidate_ids=np.array(free))
        for k, (pos, _) in enumerate(hits):
            lo, hi = slices[pos]
            out.append(SquadExample(f"{ex.qid}#r{k}", ex.title, ex.question, ex.context[lo:hi], (), True))
    return out


def dev_check_negatives(cuad_dev: Sequence[SquadExample], seed: int = 7,
                        questions: int = DEV_CHECK_QUESTIONS) -> list[SquadExample]:
    """The retrieved negatives of ``questions`` CUAD-dev questions drawn by ``random.Random(seed).sample``: the
    contract-abstention measure the dev rules compare (scripts/dev_negatives_check.py, split_threshold_check.py)."""
    return retrieved_negatives(random.Random(seed).sample(list(cuad_dev), questions))
