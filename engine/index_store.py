"""SQLite store of documents, pages, passages (with their search tokens), ingest problems and index meta.

Invariants: every multi-row write is one transaction; deleting a document deletes its pages and passages
(foreign keys, ON DELETE CASCADE); passage ids come from AUTOINCREMENT, so they are never reused and an
unchanged document keeps its ids across refreshes. ``meta`` holds 'generation' (bumped on each BM25 rebuild),
'bm25_file' + 'bm25_sha256' (the statistics file beside the database) and 'dirty' ("1" when documents changed
after that file was built).
"""

from __future__ import annotations

import json
import sqlite3
import threading
import time
from collections.abc import Iterable, Iterator, Sequence
from dataclasses import dataclass
from pathlib import Path

from engine.types import Document, IngestProblem, Page, Passage

SCHEMA_VERSION = "1"

_SCHEMA = """
CREATE TABLE IF NOT EXISTS documents (
    path TEXT PRIMARY KEY,
    kind TEXT NOT NULL,
    size INTEGER NOT NULL,
    mtime_ns INTEGER NOT NULL,
    sha256 TEXT NOT NULL,
    n_pages INTEGER NOT NULL,
    warnings TEXT NOT NULL DEFAULT '[]',
    indexed_at REAL NOT NULL
);
CREATE TABLE IF NOT EXISTS pages (
    doc_path TEXT NOT NULL REFERENCES documents(path) ON DELETE CASCADE,
    page_index INTEGER NOT NULL,
    number INTEGER,
    locator TEXT NOT NULL,
    text TEXT NOT NULL,
    has_text_layer INTEGER NOT NULL,
    PRIMARY KEY (doc_path, page_index)
);
CREATE TABLE IF NOT EXISTS passages (
    passage_id INTEGER PRIMARY KEY AUTOINCREMENT,
    doc_path TEXT NOT NULL REFERENCES documents(path) ON DELETE CASCADE,
    page_index INTEGER,
    page_number INTEGER,
    locator TEXT NOT NULL,
    start INTEGER NOT NULL,
    "end" INTEGER NOT NULL,
    text TEXT NOT NULL,
    tokens TEXT NOT NULL
);
CREATE INDEX IF NOT EXISTS passages_doc ON passages(doc_path);
CREATE TABLE IF NOT EXISTS problems (
    path TEXT NOT NULL,
    reason TEXT NOT NULL,
    fatal INTEGER NOT NULL,
    seen_at REAL NOT NULL,
    size INTEGER,
    mtime_ns INTEGER
);
CREATE INDEX IF NOT EXISTS problems_path ON problems(path);
CREATE TABLE IF NOT EXISTS meta (key TEXT PRIMARY KEY, value TEXT NOT NULL);
"""


@dataclass(frozen=True)
class StoredDocument:
    """What the indexer needs to decide whether a file changed."""

    path: str
    kind: str
    size: int
    mtime_ns: int
    sha256: str
    n_pages: int
    warnings: tuple[str, ...]
    indexed_at: float


@dataclass(frozen=True)
class StoredProblem:
    problem: IngestProblem
    seen_at: float
    size: int | None  # file stat when the problem was seen (None: unknown), to skip unchanged bad files
    mtime_ns: int | None


def _page_index_for(pages: Sequence[Page], passage: Passage) -> int | None:
    """The page a passage was cut from: same number and locator, and its text at [start, end)."""
    for i, page in enumerate(pages):
        if page.number == passage.page_number and page.locator == passage.locator:
            if page.text[passage.start : passage.end] == passage.text:
                return i
    return None


class IndexStore:
    """One SQLite database (WAL). Safe to share between threads: calls are serialised by a lock."""

    def __init__(self, db_path: Path) -> None:
        self.db_path = Path(db_path)
        self._lock = threading.RLock()
        self._conn = sqlite3.connect(self.db_path, check_same_thread=False, isolation_level=None)
        self._conn.isolation_level = ""  # deferred transactions driven by `with conn:`
        self._conn.execute("PRAGMA journal_mode=WAL")
        self._conn.execute("PRAGMA foreign_keys=ON")
        self._conn.execute("PRAGMA synchronous=NORMAL")
        with self._lock:
            self._conn.executescript(_SCHEMA)
        with self._lock, self._conn:
            self._conn.execute(
                "INSERT OR IGNORE INTO meta(key, value) VALUES ('schema_version', ?), ('generation', '0')",
                (SCHEMA_VERSION,),
            )
        version = self.get_meta("schema_version")
        if version != SCHEMA_VERSION:
            self.close()
            raise ValueError(f"index schema version {SCHEMA_VERSION} expected (got {version}) in {db_path}")

    # -- lifecycle -------------------------------------------------------------------------------------
    def close(self) -> None:
        with self._lock:
            self._conn.close()

    def __enter__(self) -> IndexStore:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()

    # -- meta ------------------------------------------------------------------------------------------
    def get_meta(self, key: str) -> str | None:
        with self._lock:
            row = self._conn.execute("SELECT value FROM meta WHERE key = ?", (key,)).fetchone()
        return None if row is None else row[0]

    def set_meta(self, values: dict[str, str]) -> None:
        """Set several meta keys in one transaction."""
        with self._lock, self._conn:
            self._conn.executemany(
                "INSERT INTO meta(key, value) VALUES (?, ?) ON CONFLICT(key) DO UPDATE SET value = excluded.value",
                list(values.items()),
            )

    @property
    def generation(self) -> int:
        return int(self.get_meta("generation") or 0)

    # -- documents -------------------------------------------------------------------------------------
    def upsert_document(
        self,
        doc: Document,
        passages: Sequence[Passage],
        tokens: Sequence[list[str]],
        problems: Iterable[IngestProblem] = (),
    ) -> list[int]:
        """Replace ``doc`` with its pages, passages and non-fatal problems, atomically. Returns new passage ids.

        The ``passage_id`` of the given passages is ignored: the store assigns fresh ids.
        """
        if len(passages) != len(tokens):
            raise ValueError(f"one token list per passage needed (got {len(passages)} and {len(tokens)})")
        now = time.time()
        with self._lock, self._conn:
            c = self._conn
            self._delete_rows(doc.path)
            c.execute(
                "INSERT INTO documents(path, kind, size, mtime_ns, sha256, n_pages, warnings, indexed_at)"
                " VALUES (?, ?, ?, ?, ?, ?, ?, ?)",
                (doc.path, doc.kind, doc.size, doc.mtime_ns, doc.sha256, len(doc.pages),
                 json.dumps(list(doc.warnings)), now),
            )
            c.executemany(
                "INSERT INTO pages(doc_path, page_index, number, locator, text, has_text_layer)"
                " VALUES (?, ?, ?, ?, ?, ?)",
                [(doc.path, i, p.number, p.locator, p.text, int(p.has_text_layer)) for i, p in enumerate(doc.pages)],
            )
            ids = []
            for passage, toks in zip(passages, tokens):
                if passage.doc_path != doc.path:
                    raise ValueError(f"passage of {passage.doc_path!r} given for {doc.path!r}")
                cur = c.execute(
                    'INSERT INTO passages(doc_path, page_index, page_number, locator, start, "end", text, tokens)'
                    " VALUES (?, ?, ?, ?, ?, ?, ?, ?)",
                    (doc.path, _page_index_for(doc.pages, passage), passage.page_number, passage.locator,
                     passage.start, passage.end, passage.text, json.dumps(list(toks))),
                )
                ids.append(int(cur.lastrowid))
            c.executemany(
                "INSERT INTO problems(path, reason, fatal, seen_at, size, mtime_ns) VALUES (?, ?, ?, ?, ?, ?)",
                [(doc.path, p.reason, int(p.fatal), now, doc.size, doc.mtime_ns) for p in problems],
            )
        return ids

    def _delete_rows(self, path: str) -> None:
        c = self._conn
        c.execute("DELETE FROM passages WHERE doc_path = ?", (path,))
        c.execute("DELETE FROM pages WHERE doc_path = ?", (path,))
        c.execute("DELETE FROM documents WHERE path = ?", (path,))
        c.execute("DELETE FROM problems WHERE path = ?", (path,))

    def delete_document(self, path: str) -> None:
        """Remove a document, its pages, passages and problems (one transaction)."""
        with self._lock, self._conn:
            self._delete_rows(path)

    def update_stat(self, path: str, size: int, mtime_ns: int) -> None:
        """Record a new size/mtime for a document whose content hash did not change."""
        with self._lock, self._conn:
            self._conn.execute("UPDATE documents SET size = ?, mtime_ns = ? WHERE path = ?", (size, mtime_ns, path))
            self._conn.execute("UPDATE problems SET size = ?, mtime_ns = ? WHERE path = ?", (size, mtime_ns, path))

    def list_documents(self) -> list[StoredDocument]:
        with self._lock:
            rows = self._conn.execute(
                "SELECT path, kind, size, mtime_ns, sha256, n_pages, warnings, indexed_at FROM documents ORDER BY path"
            ).fetchall()
        return [StoredDocument(r[0], r[1], r[2], r[3], r[4], r[5], tuple(json.loads(r[6])), r[7]) for r in rows]

    # -- problems --------------------------------------------------------------------------------------
    def record_problems(
        self, path: str, problems: Iterable[IngestProblem], size: int | None = None, mtime_ns: int | None = None
    ) -> None:
        """Replace the problems recorded for ``path`` (one transaction)."""
        now = time.time()
        with self._lock, self._conn:
            self._conn.execute("DELETE FROM problems WHERE path = ?", (path,))
            self._conn.executemany(
                "INSERT INTO problems(path, reason, fatal, seen_at, size, mtime_ns) VALUES (?, ?, ?, ?, ?, ?)",
                [(p.path, p.reason, int(p.fatal), now, size, mtime_ns) for p in problems],
            )

    def clear_problems(self, paths: Iterable[str]) -> None:
        with self._lock, self._conn:
            self._conn.executemany("DELETE FROM problems WHERE path = ?", [(p,) for p in paths])

    def list_problems(self) -> list[StoredProblem]:
        with self._lock:
            rows = self._conn.execute(
                "SELECT path, reason, fatal, seen_at, size, mtime_ns FROM problems ORDER BY path, rowid"
            ).fetchall()
        return [StoredProblem(IngestProblem(r[0], r[1], bool(r[2])), r[3], r[4], r[5]) for r in rows]

    # -- passages and pages ----------------------------------------------------------------------------
    def get_passages(self, ids: Sequence[int]) -> dict[int, Passage]:
        """Passages by id (ids that no longer exist are absent from the result)."""
        out: dict[int, Passage] = {}
        ids = [int(i) for i in ids]
        with self._lock:
            for lo in range(0, len(ids), 500):
                chunk = ids[lo : lo + 500]
                rows = self._conn.execute(
                    'SELECT passage_id, doc_path, page_number, locator, start, "end", text FROM passages'
                    f" WHERE passage_id IN ({','.join('?' * len(chunk))})",
                    chunk,
                ).fetchall()
                for r in rows:
                    out[r[0]] = Passage(*r)
        return out

    def get_page_text(self, doc_path: str, page_number: int | None, locator: str | None = None) -> str | None:
        """Text of a document's page: by 1-based number, or (number None) by locator. None if not found."""
        with self._lock:
            if page_number is not None:
                row = self._conn.execute(
                    "SELECT text FROM pages WHERE doc_path = ? AND number = ? ORDER BY page_index LIMIT 1",
                    (doc_path, page_number),
                ).fetchone()
            elif locator is not None:
                row = self._conn.execute(
                    "SELECT text FROM pages WHERE doc_path = ? AND number IS NULL AND locator = ?"
                    " ORDER BY page_index LIMIT 1",
                    (doc_path, locator),
                ).fetchone()
            else:
                raise ValueError(f"need a page number or a locator (got neither for {doc_path!r})")
        return None if row is None else row[0]

    def get_pages(self, doc_path: str) -> list[Page]:
        """All pages of a document in order."""
        with self._lock:
            rows = self._conn.execute(
                "SELECT number, text, locator, has_text_layer FROM pages WHERE doc_path = ? ORDER BY page_index",
                (doc_path,),
            ).fetchall()
        return [Page(r[0], r[1], r[2], bool(r[3])) for r in rows]

    def count_passages(self) -> int:
        with self._lock:
            return int(self._conn.execute("SELECT COUNT(*) FROM passages").fetchone()[0])

    def first_passage_texts(self) -> dict[str, str]:
        """doc_path -> the text of its first passage (lowest passage_id), for every document with passages."""
        with self._lock:
            rows = self._conn.execute(
                "SELECT doc_path, text FROM passages WHERE passage_id IN "
                "(SELECT MIN(passage_id) FROM passages GROUP BY doc_path)").fetchall()
        return dict(rows)

    def iter_passage_tokens(self) -> Iterator[tuple[int, str, list[str]]]:
        """(passage_id, doc_path, tokens) for every passage, in passage_id order (a consistent snapshot)."""
        with self._lock:  # one statement: a consistent snapshot
            rows = self._conn.execute("SELECT passage_id, doc_path, tokens FROM passages ORDER BY passage_id").fetchall()
        for pid, path, toks in rows:
            yield pid, path, json.loads(toks)
