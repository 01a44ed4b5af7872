"""SQLite index store: atomic document replacement, stable passage ids, problems, meta."""

from __future__ import annotations

import sqlite3

import pytest

from engine.index_store import IndexStore
from engine.types import Document, IngestProblem, Page, Passage


def _doc(path: str = "a/lease.txt", text: str = "Rent is due monthly. Notice takes 30 days.", sha: str = "h1") -> Document:
    pages = (Page(1, text, "p. 1"), Page(2, "Second page text.", "p. 2"))
    return Document(path, "pdf", pages, size=len(text), mtime_ns=111, sha256=sha, warnings=("page 3 blank",))


def _passages(doc: Document) -> list[Passage]:
    p1, p2 = doc.pages
    cut = p1.text.index(" Notice") + 1
    return [
        Passage(0, doc.path, 1, "p. 1", 0, cut - 1, p1.text[: cut - 1]),
        Passage(1, doc.path, 1, "p. 1", cut, len(p1.text), p1.text[cut:]),
        Passage(2, doc.path, 2, "p. 2", 0, len(p2.text), p2.text),
    ]


def _tokens(passages: list[Passage]) -> list[list[str]]:
    return [p.text.lower().split() for p in passages]


def test_pragmas(tmp_path):
    # SQLite documentation (sqlite.org/pragma.html): journal_mode returns 'wal'; synchronous NORMAL is 1;
    # foreign_keys ON is 1 (from memory).
    with IndexStore(tmp_path / "i.db") as store:
        conn = store._conn
        assert conn.execute("PRAGMA journal_mode").fetchone()[0] == "wal"
        assert conn.execute("PRAGMA foreign_keys").fetchone()[0] == 1
        assert conn.execute("PRAGMA synchronous").fetchone()[0] == 1


def test_upsert_and_read_back(tmp_path):
    # Invariant from engine/types.py: passage.text == page.text[start:end].
    doc = _doc()
    passages = _passages(doc)
    with IndexStore(tmp_path / "i.db") as store:
        ids = store.upsert_document(doc, passages, _tokens(passages), [IngestProblem(doc.path, "odd font", False)])
        assert ids == sorted(ids) and len(set(ids)) == 3
        got = store.get_passages(ids + [9999])
        assert set(got) == set(ids)
        for pid, original in zip(ids, passages):
            p = got[pid]
            assert (p.doc_path, p.page_number, p.locator, p.start, p.end, p.text) == (
                original.doc_path, original.page_number, original.locator, original.start, original.end, original.text
            )
            assert store.get_page_text(p.doc_path, p.page_number)[p.start : p.end] == p.text
        [stored] = store.list_documents()
        assert (stored.path, stored.size, stored.mtime_ns, stored.sha256, stored.n_pages) == (
            doc.path, doc.size, 111, "h1", 2
        )
        assert stored.warnings == ("page 3 blank",)
        assert [sp.problem for sp in store.list_problems()] == [IngestProblem(doc.path, "odd font", False)]
        assert [(pid, toks) for pid, _, toks in store.iter_passage_tokens()] == list(zip(ids, _tokens(passages)))
        assert store.count_passages() == 3
        assert [pg.text for pg in store.get_pages(doc.path)] == [pg.text for pg in doc.pages]


def test_page_text_by_locator_when_no_page_numbers(tmp_path):
    pages = (Page(None, "First block.", "¶ 1-4"), Page(None, "Second block.", "¶ 5-9"))
    doc = Document("memo.docx", "docx", pages, 10, 1, "h")
    passages = [Passage(0, "memo.docx", None, "¶ 5-9", 0, 6, "Second")]
    with IndexStore(tmp_path / "i.db") as store:
        store.upsert_document(doc, passages, [["second"]])
        assert store.get_page_text("memo.docx", None, "¶ 5-9") == "Second block."
        assert store.get_page_text("memo.docx", None, "¶ 77") is None
        with pytest.raises(ValueError):
            store.get_page_text("memo.docx", None)


def test_replace_gives_new_ids_and_never_reuses(tmp_path):
    # SQLite AUTOINCREMENT (sqlite.org/autoinc.html): ids are never reused, even after deletes (from memory).
    with IndexStore(tmp_path / "i.db") as store:
        a, b = _doc("a.pdf"), _doc("b.pdf")
        ids_a = store.upsert_document(a, _passages(a), _tokens(_passages(a)))
        ids_b = store.upsert_document(b, _passages(b), _tokens(_passages(b)))
        new_a = store.upsert_document(a, _passages(a), _tokens(_passages(a)))
        assert min(new_a) > max(ids_b)
        assert store.get_passages(ids_a) == {}
        assert set(store.get_passages(ids_b)) == set(ids_b)  # the other document keeps its ids
        store.delete_document("b.pdf")
        c = _doc("c.pdf")
        assert min(store.upsert_document(c, _passages(c), _tokens(_passages(c)))) > max(new_a)
        assert [d.path for d in store.list_documents()] == ["a.pdf", "c.pdf"]


def test_delete_cascades(tmp_path):
    with IndexStore(tmp_path / "i.db") as store:
        doc = _doc()
        store.upsert_document(doc, _passages(doc), _tokens(_passages(doc)), [IngestProblem(doc.path, "w", False)])
        store.delete_document(doc.path)
        assert store.list_documents() == [] and store.count_passages() == 0 and store.list_problems() == []
        assert store.get_page_text(doc.path, 1) is None


def test_failed_upsert_leaves_previous_version(tmp_path):
    # Invariant (no source): one document's replacement is all-or-nothing.
    with IndexStore(tmp_path / "i.db") as store:
        doc = _doc()
        ids = store.upsert_document(doc, _passages(doc), _tokens(_passages(doc)))
        bad = _passages(doc) + [Passage(9, "other.pdf", 1, "p. 1", 0, 4, "Rent")]
        with pytest.raises(ValueError):
            store.upsert_document(_doc(sha="h2"), bad, _tokens(bad))
        assert store.list_documents()[0].sha256 == "h1"
        assert set(store.get_passages(ids)) == set(ids)
        with pytest.raises(ValueError):
            store.upsert_document(doc, _passages(doc), [["x"]])


def test_problems_stat_and_meta_persist(tmp_path):
    db = tmp_path / "i.db"
    with IndexStore(db) as store:
        assert store.generation == 0
        store.record_problems("bad.pdf", [IngestProblem("bad.pdf", "password protected")], 10, 20)
        store.record_problems("bad.pdf", [IngestProblem("bad.pdf", "not a PDF")], 11, 21)  # replaces
        store.set_meta({"generation": "3", "bm25_file": "bm25-000003.npz"})
        doc = _doc()
        store.upsert_document(doc, [], [])
        store.update_stat(doc.path, 99, 1234)
    with IndexStore(db) as store:
        [sp] = store.list_problems()
        assert (sp.problem, sp.size, sp.mtime_ns) == (IngestProblem("bad.pdf", "not a PDF", True), 11, 21)
        assert store.generation == 3 and store.get_meta("bm25_file") == "bm25-000003.npz"
        [d] = store.list_documents()
        assert (d.size, d.mtime_ns, d.sha256) == (99, 1234, "h1")
        store.clear_problems(["bad.pdf"])
        assert store.list_problems() == []


def test_rejects_other_schema_version(tmp_path):
    db = tmp_path / "i.db"
    IndexStore(db).close()
    with sqlite3.connect(db) as conn:
        conn.execute("UPDATE meta SET value = '99' WHERE key = 'schema_version'")
    conn.close()
    with pytest.raises(ValueError):
        IndexStore(db)
