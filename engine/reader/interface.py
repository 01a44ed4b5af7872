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
    """The reader's view of one (question, context) pair: spans best first and the null score.

    ``null_score`` is the minimum over the pair's windows of ``s[CLS] + e[CLS]`` (SQuAD 2.0 convention).
    """

    spans: tuple[ReadSpan, ...]
    null_score: float
    n_windows: int


class SpanReader(Protocol):
    """Anything that can read spans. Implementations: ``TransformerReader`` and test fakes."""

    name: str

    def read_pairs(self, pairs: Sequence[tuple[str, str]], n_best: int = 5) -> list[Reading]:
        """One ``Reading`` per (question, context) pair, in input order."""
        ...
