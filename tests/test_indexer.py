"""Incremental folder indexing and scoped search, with small stand-ins for the ingest helpers."""

from __future__ import annotations

import hashlib
import os
import re
from pathlib import Path

import numpy as np
import pytest
from rank_bm25 import BM25Okapi

from engine import bm25_file, defaults, indexer
from engine.bm25 import Bm25Index
from engine.indexer import IndexProgress, open_index, refresh_index
from engine.text_tokens import document_title, path_search_tokens, tokenize_for_search
from engine.types import Document, IngestProblem, Page, Passage


class FakeIngest:
    """Walker: *.txt files (sorted, not under .excerptor); parser: whole file = one page, 'BAD' files fail;
    splitter: one passage per blank-line-separated block."""

    def __init__(self) -> None:
        self.parsed: list[str] = []

    def walk(self, root: Path, problems: list[IngestProblem]):
        for p in sorted(Path(root).rglob("*.txt")):
            rel = p.relative_to(root).as_posix()
            if not rel.startswith("."):
                yield p, rel

    def parse(self, abs_path: Path, rel: str):
        self.parsed.append(rel)
        data = abs_path.read_bytes()
        if data.startswith(b"BAD"):
            return None, [IngestProblem(rel, "the file is damaged")]
        if data.startswith(b"BOOM"):
            raise RuntimeError("parser bug")
        st = abs_path.stat()
        text = data.decode("utf-8")
        warnings = ("odd characters",) if "\ufffd" in text else ()
        doc = Document(rel, "txt", (Page(None, text, "whole file"),), st.st_size, st.st_mtime_ns,
                       hashlib.sha256(data).hexdigest(), warnings)
        return doc, []

    def split(self, doc: Document):
        page = doc.pages[0]
        return [
            Passage(i, doc.path, None, page.locator, m.start(), m.end(), m.group())
            for i, m in enumerate(re.finditer(r"\S(?:.|\n(?!\n))*", page.text))
        ]


@pytest.fixture
def fake(monkeypatch):
    f = FakeIngest()
    monkeypatch.setattr(indexer, "_walk", f.walk)
    monkeypatch.setattr(indexer, "_parse", f.parse)
    monkeypatch.setattr(indexer, "_split", f.split)
    return f


def _write(path: Path, text: str) -> None:
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text(text, encoding="utf-8")


@pytest.fixture
def folder(tmp_path):
    _write(tmp_path / "leases" / "office.txt",
           "The tenant shall pay rent monthly.\n\nEither party may terminate on 90 days notice.")
    _write(tmp_path / "leases" / "warehouse.txt",
           "Rent is due quarterly.\n\nThe landlord may terminate for non-payment after 30 days.")
    _write(tmp_path / "supply" / "parts.txt",
           "The supplier warrants the parts for 12 months.\n\nLiability is capped at $200,000.")
    _write(tmp_path / "supply" / "office.txt", "Office supplies are delivered weekly.")
    return tmp_path


def test_first_refresh_indexes_everything(fake, folder):
    seen: list[IndexProgress] = []
    report = refresh_index(folder, progress=seen.append)
    assert sorted(report.indexed) == ["leases/office.txt", "leases/warehouse.txt", "supply/office.txt",
                                      "supply/parts.txt"]
    assert report.unchanged == () and report.removed == () and report.failed == () and not report.stopped
    assert report.n_passages == 7
    assert seen[0] == IndexProgress(0, 4, "leases/office.txt") and seen[-1] == IndexProgress(4, 4, "")
    idir = folder / defaults.INDEX_DIR_NAME
    assert (idir / defaults.INDEX_DB_NAME).is_file()
    assert [p.name for p in idir.glob("*.npz")] == ["bm25-000001.npz"]


def test_search_scores_equal_rank_bm25(fake, folder):
    # Reference library: rank_bm25.BM25Okapi over the stored token lists, each followed by its document's path
    # and title tokens (rank-bm25 0.2.2).
    _write(folder / "notes" / "memo.txt", "RENEWAL MEMO\nRenewals run for one year after 30 days.")
    refresh_index(folder)
    with open_index(folder) as idx:
        rows = list(idx.store.iter_passage_tokens())
        firsts = idx.store.first_passage_texts()
        assert document_title(firsts["notes/memo.txt"]) == "RENEWAL MEMO"
        extra = {doc: path_search_tokens(doc) + tokenize_for_search(document_title(text)) for doc, text in firsts.items()}
        ref = BM25Okapi([toks + extra[doc] for _, doc, toks in rows]).get_scores(tokenize_for_search("terminate after 30 days"))
        hits = idx.search("terminate after 30 days", k=3)
        assert hits and hits[0][0].doc_path == "leases/warehouse.txt"
        by_id = {pid: s for (pid, _, _), s in zip(rows, ref)}
        for passage, score in hits:
            assert score == pytest.approx(by_id[passage.passage_id], abs=1e-9)
            page = idx.store.get_page_text(passage.doc_path, None, passage.locator)
            assert page[passage.start : passage.end] == passage.text  # invariant from engine/types.py


def test_touch_same_content_is_unchanged(fake, folder):
    refresh_index(folder)
    target = folder / "supply" / "parts.txt"
    st = target.stat()
    os.utime(target, ns=(st.st_atime_ns, st.st_mtime_ns + 5_000_000_000))
    fake.parsed.clear()
    report = refresh_index(folder)
    assert fake.parsed == [] and report.indexed == () and len(report.unchanged) == 4
    assert [p.name for p in (folder / ".excerptor").glob("*.npz")] == ["bm25-000001.npz"]  # no rebuild
    with open_index(folder) as idx:
        stored = {d.path: d for d in idx.store.list_documents()}
        assert stored["supply/parts.txt"].mtime_ns == st.st_mtime_ns + 5_000_000_000


def test_edit_reindexes_and_keeps_other_ids(fake, folder):
    refresh_index(folder)
    with open_index(folder) as idx:
        before = {pid: path for pid, path, _ in idx.store.iter_passage_tokens()}
    _write(folder / "leases" / "office.txt", "The tenant may sublet with consent.")
    fake.parsed.clear()
    report = refresh_index(folder)
    assert report.indexed == ("leases/office.txt",) and fake.parsed == ["leases/office.txt"]
    with open_index(folder) as idx:
        after = {pid: path for pid, path, _ in idx.store.iter_passage_tokens()}
        assert {p for p, d in before.items() if d != "leases/office.txt"} <= set(after)
        assert idx.search("sublet", 5)[0][0].doc_path == "leases/office.txt"
        assert idx.generation == 2 and not idx.stale


def test_delete_removes(fake, folder):
    refresh_index(folder)
    (folder / "supply" / "parts.txt").unlink()
    report = refresh_index(folder)
    assert report.removed == ("supply/parts.txt",) and report.n_passages == 5
    with open_index(folder) as idx:
        assert idx.search("liability capped", 5) == []
        assert "supply/parts.txt" not in idx.doc_names


def test_scoped_search(fake, folder):
    refresh_index(folder)
    with open_index(folder) as idx:
        assert {p.doc_path for p, _ in idx.search("terminate", 10)} == {"leases/office.txt", "leases/warehouse.txt"}
        assert [p.doc_path for p, _ in idx.search("terminate", 10, doc="leases/warehouse.txt")] == [
            "leases/warehouse.txt"
        ]
        assert [p.doc_path for p, _ in idx.search("terminate", 10, doc="WAREHOUSE.txt")] == ["leases/warehouse.txt"]
        assert idx.search("rent", 10, subfolder="supply") == []
        assert {p.doc_path for p, _ in idx.search("office", 10, subfolder="supply/")} == {"supply/office.txt"}
        # the scoped result equals filtering the unscoped ranking (invariant, no source)
        full = [(p.passage_id, s) for p, s in idx.search("rent terminate days", 10)]
        scoped = [(p.passage_id, s) for p, s in idx.search("rent terminate days", 10, subfolder="leases")]
        assert scoped == full
        with pytest.raises(ValueError):
            idx.search("rent", 5, doc="office.txt")  # two documents have this name
        with pytest.raises(ValueError):
            idx.search("rent", 5, doc="missing.txt")
        with pytest.raises(ValueError):
            idx.search("rent", 5, subfolder="nowhere")


def test_bad_files_are_recorded_and_not_retried(fake, folder):
    _write(folder / "broken.txt", "BAD bytes")
    _write(folder / "crash.txt", "BOOM")
    report = refresh_index(folder)
    assert {p.path for p in report.failed} == {"broken.txt", "crash.txt"}
    assert len(report.indexed) == 4
    with open_index(folder) as idx:
        problems = {sp.problem.path: sp.problem for sp in idx.store.list_problems()}
        assert problems["broken.txt"] == IngestProblem("broken.txt", "the file is damaged", True)
        assert "RuntimeError" in problems["crash.txt"].reason
    fake.parsed.clear()
    report = refresh_index(folder)
    assert fake.parsed == [] and {p.path for p in report.failed} == {"broken.txt", "crash.txt"}
    _write(folder / "broken.txt", "Now a readable notice clause.")
    (folder / "crash.txt").unlink()
    report = refresh_index(folder)
    assert report.indexed == ("broken.txt",) and report.failed == ()
    with open_index(folder) as idx:
        assert idx.store.list_problems() == []


def test_warnings_reported(fake, folder):
    _write(folder / "odd.txt", "Payment \ufffd terms apply.")
    report = refresh_index(folder)
    assert report.warnings == (IngestProblem("odd.txt", "odd characters", False),)


def test_should_stop_between_files(fake, folder):
    calls = []

    def stop() -> bool:
        calls.append(1)
        return len(calls) > 2

    report = refresh_index(folder, should_stop=stop)
    assert report.stopped and len(report.indexed) == 2
    with open_index(folder) as idx:
        assert idx.bm25.n_passages == report.n_passages == 4 and not idx.stale
    report = refresh_index(folder)
    assert len(report.indexed) == 2 and len(report.unchanged) == 2


def test_interrupted_rebuild_leaves_previous_index_usable(fake, folder, monkeypatch):
    refresh_index(folder)
    with open_index(folder) as idx:
        before = idx.search("terminate", 10)
    (folder / "leases" / "warehouse.txt").unlink()
    _write(folder / "new.txt", "Arbitration takes place in the capital.")

    def crash(self, path, extra=None):
        raise KeyboardInterrupt

    monkeypatch.setattr(Bm25Index, "to_npz", crash)
    with pytest.raises(KeyboardInterrupt):
        refresh_index(folder)
    monkeypatch.undo()
    monkeypatch.setattr(indexer, "_walk", fake.walk)
    monkeypatch.setattr(indexer, "_parse", fake.parse)
    monkeypatch.setattr(indexer, "_split", fake.split)
    with open_index(folder) as idx:  # the interrupted refresh left the store complete: BM25 is rebuilt on open
        assert not idx.stale and idx.generation == 2
        hits = idx.search("terminate", 10)  # the deleted document's passages are gone
        assert [p for p, _ in hits] == [p for p, _ in before if p.doc_path != "leases/warehouse.txt"]
        assert idx.search("arbitration", 3)[0][0].doc_path == "new.txt"
    report = refresh_index(folder)
    assert report.indexed == () and report.removed == ()  # the store already had the changes
    with open_index(folder) as idx:
        assert not idx.stale and idx.search("arbitration", 3)[0][0].doc_path == "new.txt"


def test_open_index_rebuilds_missing_bm25_and_needs_an_index(fake, folder, tmp_path_factory):
    refresh_index(folder)
    for p in (folder / ".excerptor").glob("*.npz"):
        p.unlink()
    with open_index(folder) as idx:
        assert idx.search("liability", 3)[0][0].doc_path == "supply/parts.txt"
        assert np.all(np.diff(idx.passage_ids) > 0)  # positions follow passage_id order
    with pytest.raises(FileNotFoundError):
        open_index(tmp_path_factory.mktemp("empty"))
    with pytest.raises(ValueError):
        refresh_index(folder / "no-such-folder")


def test_a_question_naming_the_file_finds_that_file(fake, folder):
    # The word "office" is only in the text of supply/office.txt; the office lease says so only in its path.
    # Without path tokens the first hit is supply/office.txt (checked by disabling path_search_tokens).
    refresh_index(folder)
    with open_index(folder) as idx:
        assert idx.search("How is office lease rent paid?", k=1)[0][0].doc_path == "leases/office.txt"
        assert idx.search("When is warehouse rent due?", k=1)[0][0].text == "Rent is due quarterly."


def test_a_question_naming_the_title_finds_that_document(fake, folder):
    # A scanned contract's file name says nothing; its first line is its title, and its rent clause (a later
    # passage) never says "equipment". Without title tokens supply/crane.txt ranks first (checked by making
    # document_title return "").
    _write(folder / "scan_0042.txt", "EQUIPMENT LEASE\n\n1. Term. One year.\n\n2. The lessee pays rent monthly.")
    _write(folder / "supply" / "crane.txt", "Equipment rent for the crane is billed monthly.")
    refresh_index(folder)
    with open_index(folder) as idx:
        top = idx.search("What monthly rent applies under the equipment lease?", k=1)[0][0]
        assert (top.doc_path, top.text) == ("scan_0042.txt", "2. The lessee pays rent monthly.")


def test_an_index_built_without_path_tokens_is_rebuilt(fake, folder):
    refresh_index(folder)
    idir = folder / defaults.INDEX_DIR_NAME
    with open_index(folder) as idx:
        idx.store.set_meta({"bm25_fields": "passage text + document path"})  # as an index from before title tokens
    with open_index(folder) as idx:
        assert idx.store.get_meta("bm25_fields") == bm25_file.BM25_FIELDS
        assert [p.name for p in idir.glob("*.npz")] == ["bm25-000002.npz"]
        assert idx.search("warehouse rent", k=1)[0][0].doc_path == "leases/warehouse.txt"
    assert refresh_index(folder).indexed == ()  # documents themselves are not parsed again


def test_real_ingest_if_available(folder):
    # Uses the real walker, parser and splitter once they exist.
    pytest.importorskip("engine.ingest.parse")
    (folder / "junk.pdf").write_bytes(b"this is not a PDF")
    report = refresh_index(folder)
    assert len(report.indexed) == 4 and [p.path for p in report.failed] == ["junk.pdf"]
    assert refresh_index(folder).unchanged == report.indexed
    with open_index(folder) as idx:
        assert idx.search("liability capped", 3)[0][0].doc_path == "supply/parts.txt"
        # (not "terminate": with one passage per file it is in exactly half the passages, so its
        # idf log((4 - 2 + 0.5) / (2 + 0.5)) is 0 — Robertson & Zaragoza (2009) IDF as in rank-bm25)
        assert idx.search("landlord terminate", 5, doc="warehouse.txt")[0][0].doc_path == "leases/warehouse.txt"
        assert idx.search("landlord", 5, subfolder="supply") == []


def test_a_second_refresh_waits_for_the_first(fake, folder):
    """Two refreshes of one folder never write BM25 generations at the same time: the lock serialises them."""
    import threading

    from engine.indexer import refresh_lock

    idir = folder / defaults.INDEX_DIR_NAME
    idir.mkdir()
    reports = []
    with refresh_lock(idir):  # stands in for a refresh already running in another process
        worker = threading.Thread(target=lambda: reports.append(refresh_index(folder)))
        worker.start()
        worker.join(timeout=0.5)
        assert worker.is_alive() and reports == []
    worker.join(timeout=30)
    assert len(reports) == 1 and len(reports[0].indexed) == 4
    assert [p.name for p in idir.glob("*.npz")] == ["bm25-000001.npz"]


def test_a_stopped_refresh_under_new_limits_leaves_old_failures_to_retry(fake, folder, monkeypatch):
    """The ingest-limits key is stored only by a refresh that saw every file (indexer docstring), so failures that a
    stopped run never reached are still retried by the next run under the new limits."""
    _write(folder / "a_bad.txt", "BAD bytes")
    _write(folder / "z_bad.txt", "BAD bytes")
    assert {p.path for p in refresh_index(folder).failed} == {"a_bad.txt", "z_bad.txt"}
    monkeypatch.setattr(defaults, "MAX_FILE_BYTES", defaults.MAX_FILE_BYTES + 1)  # new limits
    fake.parsed.clear()
    calls = []
    stopped = refresh_index(folder, should_stop=lambda: calls.append(1) or len(calls) > 1)
    assert stopped.stopped and fake.parsed == ["a_bad.txt"]  # the walk is sorted: z_bad.txt was never reached
    fake.parsed.clear()
    report = refresh_index(folder)
    assert "z_bad.txt" in fake.parsed and {p.path for p in report.failed} == {"a_bad.txt", "z_bad.txt"}
    fake.parsed.clear()
    refresh_index(folder)  # limits unchanged since a full run: nothing is parsed again
    assert fake.parsed == []
