"""Span decoding from start/end logits: a pure numpy function (no model, no tokenizer).

For a window of L tokens with start logits s and end logits e, the score of span (i, j) is ``s[i] + e[j]``
(Devlin et al., 2019, section 4.2). Valid spans have ``i <= j``, ``j - i + 1 <= max_answer_tokens`` and both
ends on context tokens. The null (no-answer) score is ``s[cls] + e[cls]``, the SQuAD 2.0 convention.
"""

from __future__ import annotations

import numpy as np

from engine import defaults
from engine.types import SpanCandidate


def decode_spans(
    start_logits: np.ndarray,
    end_logits: np.ndarray,
    context_mask: np.ndarray,
    *,
    max_answer_tokens: int = defaults.MAX_ANSWER_TOKENS,
    n_best: int = defaults.N_BEST,
    cls_index: int = 0,
) -> tuple[list[SpanCandidate], float]:
    """Return the ``n_best`` valid spans, best first, and the null score at ``cls_index``.

    Ties are broken by earlier start, then earlier end, so the result is deterministic.
    """
    start = np.asarray(start_logits, dtype=np.float64)
    end = np.asarray(end_logits, dtype=np.float64)
    mask = np.asarray(context_mask, dtype=bool)
    if start.ndim != 1 or start.shape != end.shape or start.shape != mask.shape:
        raise ValueError(
            f"logits and mask must be 1-D of one length (got {start.shape}, {end.shape}, {mask.shape})"
        )
    if max_answer_tokens < 1:
        raise ValueError(f"max_answer_tokens must be >= 1 (got {max_answer_tokens})")
    if n_best < 1:
        raise ValueError(f"n_best must be >= 1 (got {n_best})")
    if not 0 <= cls_index < start.shape[0]:
        raise ValueError(f"cls_index must index the window (got {cls_index})")
    null_score = float(start[cls_index] + end[cls_index])
    positions = np.flatnonzero(mask)
    if positions.size == 0:
        return [], null_score
    # score[a, b] for context positions a (start) and b (end).
    scores = start[positions][:, None] + end[positions][None, :]
    length = positions[None, :] - positions[:, None] + 1
    valid = (length >= 1) & (length <= max_answer_tokens)
    flat_scores = np.where(valid, scores, -np.inf).ravel()
    n_valid = int(valid.sum())
    if n_valid == 0:
        return [], null_score
    k = min(n_best, n_valid)
    # Stable sort on (-score) keeps row-major order (earlier start, then earlier end) among ties.
    order = np.argsort(-flat_scores, kind="stable")[:k]
    rows, cols = np.divmod(order, positions.size)
    spans = [
        SpanCandidate(int(positions[r]), int(positions[c]), float(flat_scores[o]))
        for r, c, o in zip(rows, cols, order)
    ]
    return spans, null_score


def token_span_to_chars(
    candidate: SpanCandidate, offsets: np.ndarray | list[tuple[int, int]]
) -> tuple[int, int]:
    """Map inclusive token indices to a half-open character span using the tokenizer's offset mapping."""
    offsets = np.asarray(offsets)
    if not (0 <= candidate.start_token <= candidate.end_token < len(offsets)):
        raise ValueError(f"token span outside the window (got {candidate.start_token}..{candidate.end_token})")
    return int(offsets[candidate.start_token][0]), int(offsets[candidate.end_token][1])
