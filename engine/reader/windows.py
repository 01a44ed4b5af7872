"""Tokenised windows: the question followed by a stretch of context, with stride, as a BERT pair input.

Each window is ``[CLS] question [SEP] context-slice [SEP]``; consecutive slices of one context overlap by
``stride`` tokens. ``offsets[i]`` is the character span of token i in its context, ``(0, 0)`` outside it.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

import numpy as np

from engine import defaults


@dataclass(frozen=True)
class Window:
    pair_index: int  # which (question, context) pair this window belongs to
    input_ids: tuple[int, ...]
    token_type_ids: tuple[int, ...]
    offsets: tuple[tuple[int, int], ...]
    context_mask: tuple[bool, ...]


def truncate_question(tokenizer, question: str, max_query_length: int) -> str:
    """Cut an over-long question to ``max_query_length`` word-piece tokens (keeps its beginning)."""
    ids = tokenizer(question, add_special_tokens=False)["input_ids"]
    if len(ids) <= max_query_length:
        return question
    return tokenizer.decode(ids[:max_query_length])


def build_windows(
    tokenizer,
    pairs: Sequence[tuple[str, str]],
    *,
    max_length: int = defaults.MAX_SEQ_LENGTH,
    stride: int = defaults.DOC_STRIDE,
    max_query_length: int = defaults.MAX_QUERY_LENGTH,
) -> list[Window]:
    """Tokenise pairs into windows with the fast tokenizer's offsets; every pair yields at least one window."""
    if max_length < 32:
        raise ValueError(f"max_length must be >= 32 (got {max_length})")
    if not 0 <= stride < max_length // 2:
        raise ValueError(f"stride must be in [0, max_length/2) (got {stride})")
    if not pairs:
        return []
    questions = [truncate_question(tokenizer, q, max_query_length) for q, _ in pairs]
    contexts = [c for _, c in pairs]
    enc = tokenizer(
        questions,
        contexts,
        truncation="only_second",
        max_length=max_length,
        stride=stride,
        return_overflowing_tokens=True,
        return_offsets_mapping=True,
        padding=False,
    )
    windows: list[Window] = []
    for w, pair_index in enumerate(enc["overflow_to_sample_mapping"]):
        seq_ids = enc.sequence_ids(w)
        offsets = tuple(
            (int(a), int(b)) if sid == 1 else (0, 0) for (a, b), sid in zip(enc["offset_mapping"][w], seq_ids)
        )
        mask = tuple(sid == 1 for sid in seq_ids)
        windows.append(
            Window(
                int(pair_index),
                tuple(enc["input_ids"][w]),
                tuple(enc["token_type_ids"][w]) if "token_type_ids" in enc else tuple([0] * len(seq_ids)),
                offsets,
                mask,
            )
        )
    return windows


def pad_batch(windows: Sequence[Window], pad_id: int = 0) -> dict[str, np.ndarray]:
    """Pad a batch to its longest window (dynamic padding)."""
    width = max(len(w.input_ids) for w in windows)
    ids = np.full((len(windows), width), pad_id, dtype=np.int64)
    types = np.zeros((len(windows), width), dtype=np.int64)
    attn = np.zeros((len(windows), width), dtype=np.int64)
    for row, w in enumerate(windows):
        n = len(w.input_ids)
        ids[row, :n] = w.input_ids
        types[row, :n] = w.token_type_ids
        attn[row, :n] = 1
    return {"input_ids": ids, "token_type_ids": types, "attention_mask": attn}
