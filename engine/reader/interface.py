"""The narrow reader interface that the answering pipeline, the sweep and the UI depend on.

A reader takes (question, context) pairs and returns, per pair, its best character spans with raw logit scores
and the pair's null score. It knows nothing of files, pages or retrieval.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Protocol, Sequence


@dataclass(frozen=True)
class ReadSpan:
    """A span of one context: ``context[start:end] == text``; ``score`` = start logit + end logit."""

    start: int
    end: int
    text: str
    score: float


@dataclass(frozen=True)
class Reading:
    """The reader's view of one (question, context) pair: its spans and the null score.

    ``spans[0]`` is the pair's answer: the expected-F1 choice among its best spans (``engine.reader.span_choice``);
    the others follow by score, best first. ``null_score`` is the minimum over the pair's windows of
    ``s[CLS] + e[CLS]`` (SQuAD 2.0 convention).
    """

    spans: tuple[ReadSpan, ...]
    null_score: float
    n_windows: int

    @property
    def best_score(self) -> float:
        """The highest span score of the pair (-inf without spans), whichever span is ``spans[0]``."""
        return max((s.score for s in self.spans), default=float("-inf"))

    def margin(self, i: int) -> float:
        """Span i's margin over "no answer": its score minus the null score. The answer (i = 0) carries the best
        score, so the pair's margin, which the no-answer threshold and the confidence were calibrated on, does not
        depend on which span is chosen to answer with."""
        if not 0 <= i < len(self.spans):
            raise ValueError(f"span index out of range (got {i} for {len(self.spans)} spans)")
        return (self.best_score if i == 0 else self.spans[i].score) - self.null_score


class SpanReader(Protocol):
    """Anything that can read spans. Implementations: ``TransformerReader`` and test fakes."""

    name: str

    def read_pairs(self, pairs: Sequence[tuple[str, str]], n_best: int = 5) -> list[Reading]:
        """One ``Reading`` per (question, context) pair, in input order."""
        ...
