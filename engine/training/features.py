"""Training windows with start/end labels.

Labelling (SQuAD 2.0 convention, Devlin et al., 2019): a window that holds the whole answer is labelled with the
first and last token of the answer; any other window, and every unanswerable question, points at [CLS] (index 0).
Long contexts (whole contracts, papers) are first cut into character slices around the answers, plus randomly
placed negative slices, so that a 30,000-character contract does not become 60 windows per question.
"""

from __future__ import annotations

import random
from dataclasses import dataclass
from typing import Iterator, Sequence

from engine import defaults
from engine.reader.windows import truncate_question
from engine.squad_data import GoldAnswer, SquadExample

LONG_CONTEXT_CHARS = 2000
SLICE_CHARS = 1100


@dataclass(frozen=True)
class TrainWindow:
    input_ids: tuple[int, ...]
    token_type_ids: tuple[int, ...]
    start_position: int
    end_position: int
    loss_weight: float = 1.0  # weight of this window in engine.training.loss.weighted_span_loss


def drawn_answerable(examples: Sequence[SquadExample], rng: random.Random, rate: float) -> Iterator[SquadExample]:
    """The answerable examples with a short context (<= LONG_CONTEXT_CHARS), each kept with probability ``rate``.

    One ``rng.random()`` per such example, drawn lazily, so a caller's own draws between items keep their order.
    A rate outside [0, 1] raises at once."""
    if not 0.0 <= rate <= 1.0:
        raise ValueError(f"rate must be in [0, 1] (got {rate})")
    return (ex for ex in examples if rate > 0.0 and not ex.is_impossible and ex.answers
            and len(ex.context) <= LONG_CONTEXT_CHARS and rng.random() < rate)


def slice_long_example(
    example: SquadExample, rng: random.Random, negatives_per_example: float, max_answer_chars: int
) -> list[SquadExample]:
    """Cut a long context into short slices: one around each kept answer, and sampled negative slices.

    ``negatives_per_example`` may be fractional: 0.3 adds one negative slice with probability 0.3.
    """
    context = example.context
    out: list[SquadExample] = []
    for k, answer in enumerate(example.answers):
        if len(answer.text) > max_answer_chars:
            continue
        slack = max(0, SLICE_CHARS - len(answer.text))
        lo = max(0, answer.start - rng.randint(0, slack))
        hi = min(len(context), lo + SLICE_CHARS)
        piece = context[lo:hi]
        if piece[answer.start - lo: answer.start - lo + len(answer.text)] != answer.text:
            continue
        out.append(SquadExample(f"{example.qid}#a{k}", example.title, example.question, piece,
                                (GoldAnswer(answer.text, answer.start - lo),), False))
    n_neg = int(negatives_per_example) + (rng.random() < negatives_per_example % 1)
    spans = [(a.start, a.start + len(a.text)) for a in example.answers]
    for k in range(n_neg):
        for _ in range(10):
            lo = rng.randint(0, max(0, len(context) - SLICE_CHARS))
            hi = lo + SLICE_CHARS
            if all(e <= lo or s >= hi for s, e in spans):
                out.append(SquadExample(f"{example.qid}#n{k}", example.title, example.question,
                                        context[lo:hi], (), True))
                break
    return out


def expand_examples(
    examples: Sequence[SquadExample], rng: random.Random, negatives_per_example: float = 0.3,
    max_answer_chars: int = 300,
) -> list[SquadExample]:
    """Short contexts pass through; long ones are sliced (see ``slice_long_example``)."""
    out: list[SquadExample] = []
    for ex in examples:
        if len(ex.context) <= LONG_CONTEXT_CHARS:
            out.append(ex)
        else:
            out.extend(slice_long_example(ex, rng, negatives_per_example, max_answer_chars))
    return out


def same_title_negatives(
    examples: Sequence[SquadExample], rng: random.Random, rate: float
) -> list[SquadExample]:
    """Unanswerable pairs: a question put with another paragraph of the same article (same title).

    About ``rate`` of the answerable questions get one. A paragraph that contains any gold answer text
    (case-folded) is never used, so the pair has no answer; the topic still matches, which makes these harder
    than random negatives (the idea behind SQuAD 2.0's unanswerable questions, Rajpurkar et al., 2018).
    """
    if not 0.0 <= rate <= 1.0:
        raise ValueError(f"rate must be in [0, 1] (got {rate})")
    by_title: dict[str, list[str]] = {}
    for ex in examples:
        contexts = by_title.setdefault(ex.title, [])
        if not contexts or contexts[-1] != ex.context:
            contexts.append(ex.context)
    out: list[SquadExample] = []
    for ex in examples:
        if ex.is_impossible or not ex.answers or rng.random() >= rate:
            continue
        others = [c for c in by_title.get(ex.title, ()) if c != ex.context and len(c) <= LONG_CONTEXT_CHARS]
        rng.shuffle(others)
        golds = [a.text.casefold() for a in ex.answers]
        for other in others[:5]:
            folded = other.casefold()
            if not any(g in folded for g in golds):
                out.append(SquadExample(f"{ex.qid}#t", ex.title, ex.question, other, (), True))
                break
    return out


def build_train_windows(
    tokenizer,
    examples: Sequence[SquadExample],
    *,
    max_length: int = defaults.MAX_SEQ_LENGTH,
    stride: int = defaults.DOC_STRIDE,
    max_query_length: int = defaults.MAX_QUERY_LENGTH,
    chunk: int = 1000,
    loss_weights: Sequence[float] | None = None,
) -> list[TrainWindow]:
    """Tokenise with overflow and label each window (answer tokens, or [CLS] = 0).

    ``loss_weights`` holds one weight per example (default 1.0), copied to every window of that example.
    """
    if loss_weights is not None and len(loss_weights) != len(examples):
        raise ValueError(f"loss_weights must hold one weight per example (got {len(loss_weights)} for "
                         f"{len(examples)} examples)")
    windows: list[TrainWindow] = []
    for lo in range(0, len(examples), chunk):
        part = examples[lo: lo + chunk]
        questions = [truncate_question(tokenizer, ex.question, max_query_length) for ex in part]
        enc = tokenizer(questions, [ex.context for ex in part], truncation="only_second",
                        max_length=max_length, stride=stride, return_overflowing_tokens=True,
                        return_offsets_mapping=True, padding=False)
        for w, sample in enumerate(enc["overflow_to_sample_mapping"]):
            ex = part[sample]
            seq_ids = enc.sequence_ids(w)
            offsets = enc["offset_mapping"][w]
            start_pos = end_pos = 0
            if ex.answers:
                a_start = ex.answers[0].start
                a_end = a_start + len(ex.answers[0].text)
                ctx = [i for i, s in enumerate(seq_ids) if s == 1]
                if ctx and offsets[ctx[0]][0] <= a_start and offsets[ctx[-1]][1] >= a_end:
                    start_pos = next(i for i in ctx if offsets[i][1] > a_start)
                    end_pos = max(i for i in ctx if offsets[i][0] < a_end)
                    if end_pos < start_pos:
                        start_pos = end_pos = 0
            types = enc["token_type_ids"][w] if "token_type_ids" in enc else [0] * len(seq_ids)
            weight = 1.0 if loss_weights is None else float(loss_weights[lo + sample])
            windows.append(TrainWindow(tuple(enc["input_ids"][w]), tuple(types), start_pos, end_pos, weight))
    return windows
