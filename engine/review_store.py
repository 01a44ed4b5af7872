"""The reviewer's persistent record: asked questions with their answers, checklist sweep cells, and decisions.

One SQLite database at ``FOLDER/.excerptor/review.sqlite3`` (WAL, foreign keys, ``synchronous=FULL``).

Invariants:
- a decision is committed (WAL fsynced) before ``set_decision`` / ``set_cell_decision`` return;
- every multi-row write is one transaction (``BEGIN IMMEDIATE`` ... ``COMMIT``);
- every use of the connection holds one ``threading.RLock`` (the UI calls from worker threads);
- a sweep cell is keyed by ``(checklist, doc_path, label)``; a re-sweep keeps its decision unless the source
  changed: a different ``doc_sha256``, ``question_hash`` (sha256 of the question text) or answer span clears
  decision, corrected text and decision time (the reviewer's note is kept);
- timestamps are ISO-8601 UTC strings (``2026-01-31T09:15:00+00:00``).
"""

from __future__ import annotations

import sqlite3
import threading
from collections.abc import Callable, Iterable, Iterator
from contextlib import contextmanager
from pathlib import Path

from engine import defaults
from engine.review_records import (  # noqa: F401 - re-exported: the store's public vocabulary
    DECISIONS, LOG_COLUMNS, HistoryEntry, StoredAnswer, SweepCell, check_decision, clean_note, log_row,
    question_hash, require_text, stored_answer_from_row, sweep_cell_from_row, utc_now,
)
from engine.types import Answer, AskResult

SCHEMA_VERSION = "1"
REVIEW_DB_NAME = "review.sqlite3"

_SCHEMA = """
CREATE TABLE IF NOT EXISTS meta (key TEXT PRIMARY KEY, value TEXT NOT NULL);
CREATE TABLE IF NOT EXISTS questions (
    question_id INTEGER PRIMARY KEY AUTOINCREMENT,
    question TEXT NOT NULL, scope TEXT, asked_at TEXT NOT NULL, abstained INTEGER NOT NULL,
    seconds REAL NOT NULL DEFAULT 0
);
CREATE TABLE IF NOT EXISTS answers (
    answer_id INTEGER PRIMARY KEY AUTOINCREMENT,
    question_id INTEGER NOT NULL REFERENCES questions(question_id) ON DELETE CASCADE,
    rank INTEGER NOT NULL, text TEXT NOT NULL, score REAL NOT NULL, low_confidence INTEGER NOT NULL,
    file TEXT NOT NULL, page INTEGER, locator TEXT NOT NULL, start INTEGER NOT NULL, "end" INTEGER NOT NULL,
    passage TEXT NOT NULL, passage_start INTEGER NOT NULL,
    decision TEXT, corrected_text TEXT, note TEXT, decided_at TEXT,
    UNIQUE (question_id, rank)
);
CREATE TABLE IF NOT EXISTS cells (
    cell_id INTEGER PRIMARY KEY AUTOINCREMENT,
    checklist TEXT NOT NULL, doc_path TEXT NOT NULL, doc_sha256 TEXT NOT NULL, label TEXT NOT NULL,
    question TEXT NOT NULL, question_hash TEXT NOT NULL,
    answer TEXT, score REAL, low_confidence INTEGER NOT NULL, page INTEGER, locator TEXT,
    start INTEGER, "end" INTEGER, passage TEXT, passage_start INTEGER, abstained INTEGER NOT NULL,
    decision TEXT, corrected_text TEXT, note TEXT, decided_at TEXT, swept_at TEXT NOT NULL,
    UNIQUE (checklist, doc_path, label)
);
"""

# An answer stored under an abstained question is one of its closest spans below the threshold (AskResult.shown).
_ANSWER_COLS = ('answer_id, question_id, rank, text, score, low_confidence, file, page, locator, start, "end", '
                'passage, passage_start, decision, corrected_text, note, decided_at, '
                '(SELECT q.abstained FROM questions q WHERE q.question_id = answers.question_id) AS below_threshold')
_CELL_COLS = ('cell_id, checklist, doc_path, doc_sha256, label, question, question_hash, answer, score, '
              'low_confidence, page, locator, start, "end", passage, passage_start, abstained, decision, '
              'corrected_text, note, decided_at, swept_at')
# Cells: by document, then by the first time each label was seen in the checklist, then insertion.
_CELL_ORDER = ("c.doc_path, (SELECT MIN(c2.cell_id) FROM cells c2 WHERE c2.checklist = c.checklist"
               " AND c2.label = c.label), c.cell_id")


def review_db_path(folder: Path | str) -> Path:
    return Path(folder) / defaults.INDEX_DIR_NAME / REVIEW_DB_NAME


class ReviewStore:
    """The review record of one folder. Thread-safe: every call holds one lock."""

    def __init__(self, folder: Path | str, clock: Callable[[], str] = utc_now) -> None:
        folder = Path(folder)
        if not folder.is_dir():
            raise ValueError(f"not a folder: {folder} (got a path that is not a directory)")
        self.db_path = review_db_path(folder)
        self.db_path.parent.mkdir(exist_ok=True)
        self._clock = clock
        self._lock = threading.RLock()
        self._conn = sqlite3.connect(self.db_path, check_same_thread=False, isolation_level=None, timeout=10.0)
        self._conn.row_factory = sqlite3.Row
        try:
            with self._lock:
                self._conn.execute("PRAGMA journal_mode=WAL")
                self._conn.execute("PRAGMA foreign_keys=ON")
                self._conn.execute("PRAGMA synchronous=FULL")
                with self._tx() as c:
                    for statement in _SCHEMA.split(";"):
                        if statement.strip():
                            c.execute(statement)
                    c.execute("INSERT OR IGNORE INTO meta(key, value) VALUES ('schema_version', ?)", (SCHEMA_VERSION,))
                version = self._conn.execute("SELECT value FROM meta WHERE key = 'schema_version'").fetchone()[0]
            if version != SCHEMA_VERSION:
                raise ValueError(f"review schema version {SCHEMA_VERSION} expected (got {version}) in {self.db_path}")
        except BaseException:
            self._conn.close()
            raise

    # -- lifecycle -------------------------------------------------------------------------------------
    def close(self) -> None:
        with self._lock:
            self._conn.close()

    def __enter__(self) -> ReviewStore:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()

    @contextmanager
    def _tx(self) -> Iterator[sqlite3.Connection]:
        """One write transaction under the lock; committed (durably) on success, rolled back on error."""
        with self._lock:
            self._conn.execute("BEGIN IMMEDIATE")
            try:
                yield self._conn
            except BaseException:
                self._conn.execute("ROLLBACK")
                raise
            self._conn.execute("COMMIT")

    # -- asked questions -------------------------------------------------------------------------------
    def record_question(self, result: AskResult) -> int:
        """Store a question, its scope and all its answers (rank 1 = first) in one transaction; for an abstained
        question, the closest spans below the threshold take the answers' place."""
        if not isinstance(result, AskResult):
            raise ValueError(f"an AskResult is needed (got {type(result).__name__})")
        require_text("question", result.question)
        with self._tx() as c:
            cur = c.execute("INSERT INTO questions(question, scope, asked_at, abstained, seconds)"
                            " VALUES (?, ?, ?, ?, ?)",
                            (result.question, result.scope, self._clock(), int(result.abstained),
                             float(result.seconds)))
            qid = int(cur.lastrowid)
            c.executemany(
                'INSERT INTO answers(question_id, rank, text, score, low_confidence, file, page, locator, start, "end",'
                " passage, passage_start) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)",
                [(qid, rank, a.text, float(a.score), int(a.low_confidence), a.citation.file, a.citation.page,
                  a.citation.locator, a.citation.start, a.citation.end, a.passage, a.passage_start)
                 for rank, a in enumerate(result.shown, 1)])
        return qid

    def history(self) -> list[HistoryEntry]:
        """Every asked question, newest first."""
        with self._lock:
            rows = self._conn.execute(
                "SELECT q.*, (SELECT COUNT(*) FROM answers a WHERE a.question_id = q.question_id) AS n"
                " FROM questions q ORDER BY q.question_id DESC").fetchall()
        return [self._entry(r) for r in rows]

    def load_question(self, question_id: int) -> tuple[HistoryEntry, list[StoredAnswer]]:
        with self._lock:
            row = self._conn.execute(
                "SELECT q.*, (SELECT COUNT(*) FROM answers a WHERE a.question_id = q.question_id) AS n"
                " FROM questions q WHERE q.question_id = ?", (question_id,)).fetchone()
            if row is None:
                raise ValueError(f"no stored question with this id (got {question_id!r})")
            answers = self._conn.execute(f"SELECT {_ANSWER_COLS} FROM answers WHERE question_id = ? ORDER BY rank",
                                         (question_id,)).fetchall()
        return self._entry(row), [stored_answer_from_row(a) for a in answers]

    def delete_question(self, question_id: int) -> None:
        """Remove a question and its answers (one transaction)."""
        with self._tx() as c:
            c.execute("DELETE FROM questions WHERE question_id = ?", (question_id,))

    def answer(self, answer_id: int) -> StoredAnswer:
        with self._lock:
            row = self._conn.execute(f"SELECT {_ANSWER_COLS} FROM answers WHERE answer_id = ?", (answer_id,)).fetchone()
        if row is None:
            raise ValueError(f"no stored answer with this id (got {answer_id!r})")
        return stored_answer_from_row(row)

    def set_decision(self, answer_id: int, decision: str | None, corrected_text: str | None = None,
                     note: str | None = None) -> StoredAnswer:
        """Record (or clear, with ``decision=None``) a decision; durable before returning.

        ``note=None`` keeps the current note; a string replaces it (blank clears it).
        """
        self._decide("answers", "answer_id", self.answer, answer_id, decision, corrected_text, note)
        return self.answer(answer_id)

    def set_note(self, answer_id: int, note: str | None) -> StoredAnswer:
        """Replace an answer's note (None or blank clears it); durable before returning."""
        self._annotate("answers", "answer_id", self.answer, answer_id, note)
        return self.answer(answer_id)

    def _decide(self, table: str, key: str, get: Callable, item_id: int, decision: str | None,
                corrected_text: str | None, note: str | None) -> None:
        text = check_decision(decision, corrected_text)
        decided_at = self._clock() if decision is not None else None
        with self._tx() as c:
            get(item_id)  # raises ValueError for an unknown id
            c.execute(f"UPDATE {table} SET decision = ?, corrected_text = ?, decided_at = ? WHERE {key} = ?",
                      (decision, text, decided_at, item_id))
            if note is not None:
                c.execute(f"UPDATE {table} SET note = ? WHERE {key} = ?", (clean_note(note), item_id))

    def _annotate(self, table: str, key: str, get: Callable, item_id: int, note: str | None) -> None:
        with self._tx() as c:
            get(item_id)
            c.execute(f"UPDATE {table} SET note = ? WHERE {key} = ?", (clean_note(note), item_id))

    def _entry(self, r: sqlite3.Row) -> HistoryEntry:
        return HistoryEntry(r["question_id"], r["question"], r["scope"], r["asked_at"], r["n"], bool(r["abstained"]))

    # -- checklist sweep cells -------------------------------------------------------------------------
    def upsert_cell(self, checklist: str, doc_path: str, doc_sha256: str, label: str, question: str,
                    answer: Answer | None, abstained: bool) -> SweepCell:
        """Insert or refresh one cell (one transaction). See the module docstring for when decisions are kept.

        With ``abstained``, ``answer`` is the closest span below the threshold, or None where the reader found none.
        """
        for name, value in (("checklist", checklist), ("doc_path", doc_path), ("doc_sha256", doc_sha256),
                            ("label", label), ("question", question)):
            require_text(name, value)
        if answer is not None and abstained and not answer.low_confidence:
            raise ValueError(f"the closest span of an abstained cell is low confidence (got {answer.text!r} "
                             f"at {answer.score:.2f} not marked low)")
        if answer is not None and answer.citation.file != doc_path:
            raise ValueError(f"the answer must cite {doc_path!r} (got {answer.citation.file!r})")
        qhash = question_hash(question)
        if answer is None:
            values = (None, None, 0, None, None, None, None, None, None)
        else:
            cit = answer.citation
            values = (answer.text, float(answer.score), int(answer.low_confidence), cit.page, cit.locator,
                      cit.start, cit.end, answer.passage, answer.passage_start)
        with self._tx() as c:
            old = c.execute('SELECT cell_id, doc_sha256, question_hash, answer, page, start, "end" FROM cells'
                            " WHERE checklist = ? AND doc_path = ? AND label = ?",
                            (checklist, doc_path, label)).fetchone()
            if old is None:
                cur = c.execute(
                    "INSERT INTO cells(checklist, doc_path, doc_sha256, label, question, question_hash, answer, score,"
                    ' low_confidence, page, locator, start, "end", passage, passage_start, abstained, swept_at)'
                    " VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)",
                    (checklist, doc_path, doc_sha256, label, question, qhash, *values, int(abstained), self._clock()))
                cell_id = int(cur.lastrowid)
            else:
                cell_id = old["cell_id"]
                changed = (old["doc_sha256"] != doc_sha256 or old["question_hash"] != qhash
                           or (old["answer"], old["page"], old["start"], old["end"])
                           != (values[0], values[3], values[5], values[6]))
                c.execute(
                    "UPDATE cells SET doc_sha256 = ?, question = ?, question_hash = ?, answer = ?, score = ?,"
                    ' low_confidence = ?, page = ?, locator = ?, start = ?, "end" = ?, passage = ?, passage_start = ?,'
                    " abstained = ?, swept_at = ? WHERE cell_id = ?",
                    (doc_sha256, question, qhash, *values, int(abstained), self._clock(), cell_id))
                if changed:
                    c.execute("UPDATE cells SET decision = NULL, corrected_text = NULL, decided_at = NULL"
                              " WHERE cell_id = ?", (cell_id,))
        return self.cell(cell_id)

    def cells(self, checklist: str) -> list[SweepCell]:
        """A checklist's cells by document, then by label in the order labels were first stored."""
        with self._lock:
            rows = self._conn.execute(f"SELECT {_CELL_COLS} FROM cells c WHERE c.checklist = ? ORDER BY {_CELL_ORDER}",
                                      (checklist,)).fetchall()
        return [sweep_cell_from_row(r) for r in rows]

    def cell(self, cell_id: int) -> SweepCell:
        with self._lock:
            row = self._conn.execute(f"SELECT {_CELL_COLS} FROM cells WHERE cell_id = ?", (cell_id,)).fetchone()
        if row is None:
            raise ValueError(f"no sweep cell with this id (got {cell_id!r})")
        return sweep_cell_from_row(row)

    def checklists(self) -> list[str]:
        """Names of the checklists that have stored cells, sorted."""
        with self._lock:
            rows = self._conn.execute("SELECT DISTINCT checklist FROM cells ORDER BY checklist").fetchall()
        return [r[0] for r in rows]

    def done_keys(self, checklist: str) -> dict[tuple[str, str], tuple[str, str]]:
        """``(doc_path, label) -> (doc_sha256, question_hash)`` for every stored cell, to resume a sweep."""
        with self._lock:
            rows = self._conn.execute("SELECT doc_path, label, doc_sha256, question_hash FROM cells"
                                      " WHERE checklist = ?", (checklist,)).fetchall()
        return {(r[0], r[1]): (r[2], r[3]) for r in rows}

    def delete_cells_not_in(self, checklist: str, keys: Iterable[tuple[str, str]]) -> int:
        """Delete the checklist's cells whose ``(doc_path, label)`` is not in ``keys`` (one transaction)."""
        keep = {(str(d), str(label)) for d, label in keys}
        with self._tx() as c:
            rows = c.execute("SELECT cell_id, doc_path, label FROM cells WHERE checklist = ?", (checklist,)).fetchall()
            gone = [(r[0],) for r in rows if (r[1], r[2]) not in keep]
            c.executemany("DELETE FROM cells WHERE cell_id = ?", gone)
        return len(gone)

    def set_cell_decision(self, cell_id: int, decision: str | None, corrected_text: str | None = None,
                          note: str | None = None) -> SweepCell:
        """Same rules as ``set_decision``, for a sweep cell."""
        self._decide("cells", "cell_id", self.cell, cell_id, decision, corrected_text, note)
        return self.cell(cell_id)

    def set_cell_note(self, cell_id: int, note: str | None) -> SweepCell:
        self._annotate("cells", "cell_id", self.cell, cell_id, note)
        return self.cell(cell_id)

    # -- export ----------------------------------------------------------------------------------------
    def log_rows(self) -> list[dict]:
        """Rows for export: asked questions (oldest first, answers by rank), then sweeps by checklist name.

        One row per stored answer, one per asked question with no answers (``answer`` None), one per sweep
        cell. Keys: ``LOG_COLUMNS`` plus ``passage`` and ``passage_start`` (for citation sheets);
        ``confidence = round(score, 4)``.
        """
        rows: list[dict] = []
        with self._lock:
            questions = self._conn.execute("SELECT * FROM questions ORDER BY question_id").fetchall()
            answers = self._conn.execute(f"SELECT {_ANSWER_COLS} FROM answers ORDER BY question_id, rank").fetchall()
            cells = self._conn.execute(
                f"SELECT {_CELL_COLS} FROM cells c ORDER BY c.checklist, {_CELL_ORDER}").fetchall()
        by_question: dict[int, list[StoredAnswer]] = {}
        for a in answers:
            by_question.setdefault(a["question_id"], []).append(stored_answer_from_row(a))
        for q in questions:
            base = {"source": "ask", "question": q["question"], "label": None, "asked_at": q["asked_at"]}
            stored = by_question.get(q["question_id"], [])
            if not stored:
                rows.append(log_row(base, None))
            for a in stored:
                rows.append(log_row(base, a))
        for r in cells:
            cell = sweep_cell_from_row(r)
            base = {"source": f"sweep:{cell.checklist}", "question": cell.question, "label": cell.label,
                    "asked_at": cell.swept_at}
            rows.append(log_row(base, cell, file=cell.doc_path))
        return rows
