"""Span decoding with hand-made logits.

The span score s[i] + e[j], the constraints i <= j and j - i + 1 <= max length, and the null score at [CLS]
follow Devlin et al. (2019), "BERT", section 4.2/4.3 (SQuAD v1.1 and v2.0 fine-tuning).
"""

import numpy as np
import pytest

from engine.reader.decode import decode_spans, token_span_to_chars
from engine.types import SpanCandidate

# [CLS] q q [SEP] c c c c [SEP]
MASK = np.array([0, 0, 0, 0, 1, 1, 1, 1, 0], dtype=bool)


def test_best_span_is_argmax_of_start_plus_end():
    start = np.array([0.0, 9, 9, 0, 1, 5, 0, 0, 9])  # question tokens and [SEP] are never chosen
    end = np.array([0.0, 9, 9, 0, 0, 1, 4, 2, 9])
    spans, null = decode_spans(start, end, MASK, max_answer_tokens=4, n_best=3)
    # Hand-computed: best start 5 (5.0) + best end at or after it 6 (4.0) = 9.0.
    assert spans[0] == SpanCandidate(5, 6, 9.0)
    assert null == 0.0
    assert [s.score for s in spans] == sorted((s.score for s in spans), reverse=True)


def test_end_before_start_is_never_returned():
    start = np.array([0.0, 0, 0, 0, 0, 0, 0, 10, 0])
    end = np.array([0.0, 0, 0, 0, 10, 0, 0, 0, 0])
    spans, _ = decode_spans(start, end, MASK, max_answer_tokens=4, n_best=20)
    assert all(s.end_token >= s.start_token for s in spans)
    # (4,4) scores 0+10 and (7,7) scores 10+0: equal; the earlier start wins the tie.
    assert spans[0] == SpanCandidate(4, 4, 10.0)
    assert spans[1] == SpanCandidate(7, 7, 10.0)


def test_max_answer_length_limits_spans():
    start = np.array([0.0, 0, 0, 0, 8, 0, 0, 0, 0])
    end = np.array([0.0, 0, 0, 0, 0, 0, 0, 8, 0])
    spans, _ = decode_spans(start, end, MASK, max_answer_tokens=3, n_best=50)
    assert all(s.end_token - s.start_token + 1 <= 3 for s in spans)
    assert SpanCandidate(4, 7, 16.0) not in spans
    spans4, _ = decode_spans(start, end, MASK, max_answer_tokens=4, n_best=1)
    assert spans4 == [SpanCandidate(4, 7, 16.0)]


def test_null_score_is_cls_start_plus_end():
    start = np.array([3.5, 0, 0, 0, 1, 0, 0, 0, 0])
    end = np.array([2.5, 0, 0, 0, 1, 0, 0, 0, 0])
    spans, null = decode_spans(start, end, MASK)
    assert null == 6.0
    assert spans[0].score == 2.0  # null wins by 4.0: a caller abstains if its margin threshold is < 4.0


def test_n_best_counts_and_context_only():
    rng = np.random.default_rng(0)
    start, end = rng.normal(size=9), rng.normal(size=9)
    spans, _ = decode_spans(start, end, MASK, max_answer_tokens=30, n_best=100)
    assert len(spans) == 10  # 4 context tokens: 4 + 3 + 2 + 1 valid spans
    assert all(MASK[s.start_token] and MASK[s.end_token] for s in spans)
    assert len({(s.start_token, s.end_token) for s in spans}) == 10


def test_empty_context_returns_no_spans():
    spans, null = decode_spans(np.ones(4), np.ones(4), np.zeros(4, dtype=bool))
    assert spans == [] and null == 2.0


@pytest.mark.parametrize("kwargs", [{"max_answer_tokens": 0}, {"n_best": 0}, {"cls_index": 99}])
def test_bad_arguments_raise(kwargs):
    with pytest.raises(ValueError, match=r"\(got"):
        decode_spans(np.zeros(9), np.zeros(9), MASK, **kwargs)


def test_shape_mismatch_raises():
    with pytest.raises(ValueError, match=r"\(got"):
        decode_spans(np.zeros(9), np.zeros(8), MASK)


def test_token_offsets_map_to_characters():
    offsets = [(0, 0), (0, 4), (5, 9), (0, 0), (0, 3), (4, 10), (11, 13)]
    assert token_span_to_chars(SpanCandidate(4, 5, 1.0), offsets) == (0, 10)
    with pytest.raises(ValueError):
        token_span_to_chars(SpanCandidate(5, 9, 1.0), offsets)
