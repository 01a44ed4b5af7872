"""Frozen records that flow through the engine.

Invariants:
- page numbers are 1-based; ``None`` means the format has no pages (a locator is used instead);
- character offsets are half-open ``[start, end)`` and index the *page text* exactly as stored in the index,
  so ``page.text[start:end]`` is the highlighted characters.
"""

from __future__ import annotations

from dataclasses import dataclass, field


@dataclass(frozen=True)
class Page:
    """One page (PDF) or one locator unit (a paragraph block of a .docx, the whole of a .txt)."""

    number: int | None  # 1-based PDF page number, or None where the format has no pages
    text: str  # repaired text; offsets in citations index this string
    locator: str  # what a user can follow: "p. 3", "¶ 12-18", "whole file"
    has_text_layer: bool = True  # False for a scanned PDF page with no text


@dataclass(frozen=True)
class Document:
    """A parsed file. ``path`` is relative to the indexed folder, with '/' separators."""

    path: str
    kind: str  # "pdf" | "txt" | "md" | "docx"
    pages: tuple[Page, ...]
    size: int
    mtime_ns: int
    sha256: str
    warnings: tuple[str, ...] = ()


@dataclass(frozen=True)
class IngestProblem:
    """A file that could not be read, or read only in part. ``reason`` is one plain-language line."""

    path: str
    reason: str
    fatal: bool = True  # False: the file was indexed but something in it was skipped


@dataclass(frozen=True)
class Passage:
    """A retrieval unit: contiguous sentences from one page of one document.

    ``text == page.text[start:end]`` for the page it comes from.
    """

    passage_id: int
    doc_path: str
    page_number: int | None
    locator: str
    start: int
    end: int
    text: str


@dataclass(frozen=True)
class Citation:
    """Where an answer sits: file, page and characters of the page text."""

    file: str
    page: int | None
    locator: str
    start: int
    end: int


@dataclass(frozen=True)
class SpanCandidate:
    """A span decoded from one window's logits. Token indices are inclusive; ``score = start + end logit``."""

    start_token: int
    end_token: int
    score: float


@dataclass(frozen=True)
class Answer:
    """An extracted answer. ``score`` is a probability-like confidence in [0, 1], comparable across questions."""

    text: str
    score: float
    citation: Citation
    passage: str  # the passage text the answer was read from
    passage_start: int  # offset of ``passage`` in the page text
    low_confidence: bool = False
    reader_logit: float = 0.0  # best span score minus its passage's null score
    retrieval_score: float = 0.0  # BM25 score of the passage
    also_found: tuple[Citation, ...] = ()  # the same answer text found elsewhere, merged into this one


@dataclass(frozen=True)
class AskResult:
    """The answers to one question, best first. ``abstained`` is True when the folder does not seem to answer.

    Invariant: an abstained result has no ``answers``, and may list in ``below_threshold`` the closest spans the
    reader found (best first, each marked low confidence), so that a reviewer can still read them; a result that
    answers has no ``below_threshold`` spans.
    """

    question: str
    answers: tuple[Answer, ...]
    abstained: bool
    seconds: float = 0.0
    scope: str | None = None
    notes: tuple[str, ...] = field(default_factory=tuple)
    below_threshold: tuple[Answer, ...] = ()

    def __post_init__(self) -> None:
        if self.abstained and self.answers:
            raise ValueError(f"an abstained result has no answers (got {len(self.answers)})")
        if not self.abstained and self.below_threshold:
            raise ValueError(f"below-threshold spans belong to an abstained result (got {len(self.below_threshold)})")

    @property
    def shown(self) -> tuple[Answer, ...]:
        """What a reviewer sees: the answers, or, after an abstention, the closest spans below the threshold."""
        return self.below_threshold if self.abstained else self.answers
