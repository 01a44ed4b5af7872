"""Which of a passage's candidate spans to answer with: the one with the highest expected F1.

With candidate spans c_1..c_n scored s_j (start logit + end logit), the reader's belief that c_j is the answer is
p_j = softmax(s_j / T) over the n candidates, and the expected F1 of answering c_i is

    E[F1](c_i) = sum_j p_j * F1(c_i, c_j)          (F1: the SQuAD v1.1 token F1, ``engine.metrics.f1_v1``)

Answering argmax_i E[F1](c_i) is the minimum-Bayes-risk choice for the F1 metric (Kumar and Byrne, 2004,
"Minimum Bayes-risk decoding for statistical machine translation", cited from memory, applied here to spans). It
differs from the top-scored span when the probability mass sits on several overlapping spans that agree on most
of their words, such as "ninety (90) days" and "ninety (90) days' prior written notice".
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from engine import defaults
from engine.metrics import normalize_answer


def expected_f1(texts: Sequence[str], scores: Sequence[float],
                temperature: float = defaults.SPAN_CHOICE_TEMPERATURE) -> np.ndarray:
    """E[F1](c_i) for every candidate i (see the module docstring); an empty input gives an empty array."""
    if temperature <= 0:
        raise ValueError(f"temperature must be > 0 (got {temperature})")
    if len(texts) != len(scores):
        raise ValueError(f"one score per text is needed (got {len(texts)} and {len(scores)})")
    if not texts:
        return np.zeros(0)
    s = np.asarray(scores, dtype=np.float64) / temperature
    if not np.all(np.isfinite(s)):
        raise ValueError(f"scores must be finite (got {list(scores)})")
    p = np.exp(s - s.max())
    p /= p.sum()
    return pairwise_token_f1(texts) @ p


def pairwise_token_f1(texts: Sequence[str]) -> np.ndarray:
    """The matrix F1(texts[i], texts[j]) of the SQuAD v1.1 token F1, from word counts: with overlap
    o = sum_w min(count_i(w), count_j(w)) and lengths l_i, l_j, 2PR / (P + R) = 2o / (l_i + l_j); 0 when o = 0."""
    tokens = [normalize_answer(t).split() for t in texts]
    vocabulary = {w: k for k, w in enumerate(sorted({w for ts in tokens for w in ts}))}
    counts = np.zeros((len(texts), len(vocabulary)))
    for i, ts in enumerate(tokens):
        for w in ts:
            counts[i, vocabulary[w]] += 1
    overlap = np.minimum(counts[:, None, :], counts[None, :, :]).sum(axis=2)
    lengths = counts.sum(axis=1)
    total = lengths[:, None] + lengths[None, :]
    return np.divide(2 * overlap, total, out=np.zeros_like(overlap), where=overlap > 0)


def choose_span(texts: Sequence[str], scores: Sequence[float],
                temperature: float = defaults.SPAN_CHOICE_TEMPERATURE) -> int:
    """Index of the candidate with the highest expected F1; ties go to the earlier (higher-scored) candidate."""
    if not texts:
        raise ValueError("no candidate spans to choose from (got 0)")
    return int(np.argmax(expected_f1(texts, scores, temperature)))
