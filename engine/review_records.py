"""The records the review store holds and hands out, with the checks and row conversions they need.

``HistoryEntry``, ``StoredAnswer`` and ``SweepCell`` are frozen snapshots of database rows; ``log_row`` turns one
into a row of the answer log (keys: ``LOG_COLUMNS`` plus the passage).
"""

from __future__ import annotations

import hashlib
import sqlite3
from dataclasses import dataclass
from datetime import datetime, timezone

DECISIONS = ("accepted", "rejected", "corrected")

# The documented keys of a ``log_rows()`` row, in export column order.
LOG_COLUMNS = ("source", "question", "label", "answer", "corrected_text", "confidence", "low_confidence",
               "below_threshold", "file", "page", "locator", "start", "end", "decision", "note", "asked_at",
               "decided_at")


@dataclass(frozen=True)
class HistoryEntry:
    question_id: int
    question: str
    scope: str | None
    asked_at: str  # ISO-8601 UTC
    n_answers: int
    abstained: bool


@dataclass(frozen=True)
class StoredAnswer:
    answer_id: int
    question_id: int
    rank: int  # 1 = best
    text: str
    score: float
    low_confidence: bool
    file: str
    page: int | None
    locator: str
    start: int
    end: int
    passage: str
    passage_start: int
    decision: str | None  # None | "accepted" | "rejected" | "corrected"
    corrected_text: str | None
    note: str | None
    decided_at: str | None
    below_threshold: bool = False  # a closest span shown after the question abstained, not an answer


@dataclass(frozen=True)
class SweepCell:
    cell_id: int
    checklist: str
    doc_path: str
    doc_sha256: str
    label: str
    question: str
    question_hash: str
    answer: str | None
    score: float | None
    low_confidence: bool
    page: int | None
    locator: str | None
    start: int | None
    end: int | None
    passage: str | None
    passage_start: int | None
    abstained: bool
    decision: str | None
    corrected_text: str | None
    note: str | None
    decided_at: str | None
    swept_at: str

    @property
    def below_threshold(self) -> bool:
        """The cell abstained, and ``answer`` is the closest span the reader found, not an answer."""
        return self.abstained and self.answer is not None


def question_hash(question: str) -> str:
    """sha256 hex digest of the question text (UTF-8), exactly as given."""
    return hashlib.sha256(question.encode("utf-8")).hexdigest()


def utc_now() -> str:
    return datetime.now(timezone.utc).isoformat(timespec="seconds")


def check_decision(decision: str | None, corrected_text: str | None) -> str | None:
    """Validate a decision; returns the corrected text to store (None unless decision is "corrected")."""
    if decision is not None and decision not in DECISIONS:
        raise ValueError(f"decision must be one of {', '.join(DECISIONS)} or None (got {decision!r})")
    text = corrected_text if corrected_text is not None and corrected_text.strip() else None
    if decision == "corrected" and text is None:
        raise ValueError(f"a 'corrected' decision needs a non-empty corrected_text (got {corrected_text!r})")
    if decision != "corrected" and text is not None:
        raise ValueError(f"corrected_text is only kept with decision 'corrected' (got decision {decision!r})")
    return text


def clean_note(note: str | None) -> str | None:
    return note if note is not None and note.strip() else None


def require_text(name: str, value: object) -> str:
    if not isinstance(value, str) or not value.strip():
        raise ValueError(f"{name} must be a non-empty string (got {value!r})")
    return value


def log_row(base: dict, item: StoredAnswer | SweepCell | None, file: str | None = None) -> dict:
    def get(name: str):
        return None if item is None else getattr(item, name)

    text = get("text") if isinstance(item, StoredAnswer) else get("answer")
    score = get("score")
    return {
        "source": base["source"], "question": base["question"], "label": base["label"], "answer": text,
        "corrected_text": get("corrected_text"), "confidence": None if score is None else round(score, 4),
        "low_confidence": bool(get("low_confidence")), "below_threshold": bool(getattr(item, "below_threshold", False)),
        "file": file if file is not None else get("file"),
        "page": get("page"), "locator": get("locator"), "start": get("start"), "end": get("end"),
        "decision": get("decision"), "note": get("note"), "asked_at": base["asked_at"],
        "decided_at": get("decided_at"), "passage": get("passage"), "passage_start": get("passage_start"),
    }


def stored_answer_from_row(r: sqlite3.Row) -> StoredAnswer:
    return StoredAnswer(r["answer_id"], r["question_id"], r["rank"], r["text"], r["score"], bool(r["low_confidence"]),
                        r["file"], r["page"], r["locator"], r["start"], r["end"], r["passage"], r["passage_start"],
                        r["decision"], r["corrected_text"], r["note"], r["decided_at"], bool(r["below_threshold"]))


def sweep_cell_from_row(r: sqlite3.Row) -> SweepCell:
    return SweepCell(r["cell_id"], r["checklist"], r["doc_path"], r["doc_sha256"], r["label"], r["question"],
                     r["question_hash"], r["answer"], r["score"], bool(r["low_confidence"]), r["page"], r["locator"],
                     r["start"], r["end"], r["passage"], r["passage_start"], bool(r["abstained"]), r["decision"],
                     r["corrected_text"], r["note"], r["decided_at"], r["swept_at"])
