"""Frozen view records: what the screens pass around (the engine's records stay the source of truth)."""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path


@dataclass(frozen=True)
class Scope:
    """Where the next question looks: the whole folder, one document or one subfolder (never both)."""

    doc: str | None = None
    subfolder: str | None = None

    def __post_init__(self) -> None:
        if self.doc is not None and self.subfolder is not None:
            raise ValueError(f"a scope is a document or a subfolder, not both (got {self.doc!r}, {self.subfolder!r})")

    @property
    def is_whole(self) -> bool:
        return self.doc is None and self.subfolder is None

    @property
    def label(self) -> str:
        if self.doc is not None:
            return f"document {self.doc}"
        if self.subfolder is not None:
            return f"subfolder {self.subfolder}/"
        return "whole folder"


@dataclass(frozen=True)
class SourceSpan:
    """A cited span. ``start``/``end`` index the page text; ``passage`` starts at ``passage_start`` of it."""

    file: str
    page: int | None
    locator: str
    start: int
    end: int
    passage: str
    passage_start: int
    answer: str

    @property
    def local(self) -> tuple[int, int]:
        """The span's offsets inside ``passage``."""
        return self.start - self.passage_start, self.end - self.passage_start


def span_of_answer(a) -> SourceSpan:
    """From a review_store.StoredAnswer."""
    return SourceSpan(a.file, a.page, a.locator, a.start, a.end, a.passage, a.passage_start, a.text)


def span_of_cell(c) -> SourceSpan | None:
    """From a review_store.SweepCell (None when the cell has no span: nothing found, or no citation). The closest
    span of an abstained cell is shown like an answer; the grid says it is below the threshold."""
    if c.answer is None or c.start is None or c.passage is None or c.passage_start is None:
        return None
    return SourceSpan(c.doc_path, c.page, c.locator or "", c.start, c.end, c.passage, c.passage_start, c.answer)


@dataclass(frozen=True)
class ExportRequest:
    fmt: str  # "csv" | "jsonl" | "md" | "xlsx"
    path: Path
