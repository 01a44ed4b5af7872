"""Review store: round-trips, decision rules, durability (reopen and a killed process), sweep cells, log rows."""

from __future__ import annotations

import hashlib
import sqlite3
import subprocess
import sys
import threading
from datetime import datetime, timedelta
from pathlib import Path

import pytest

from engine.review_store import LOG_COLUMNS, ReviewStore, question_hash, review_db_path
from engine.types import Answer, AskResult, Citation

REPO = Path(__file__).resolve().parents[1]


def _answer(text: str = "thirty (30) days", score: float = 0.912345, file: str = "leases/unit-4.txt",
            page: int | None = 2, start: int = 40, low: bool = False) -> Answer:
    passage = "Either party may end this lease by giving thirty (30) days written notice to the other party."
    local = passage.find(text) if text in passage else 0
    return Answer(text, score, Citation(file, page, f"p. {page}" if page else "whole file", start, start + len(text)),
                  passage, start - local, low_confidence=low)


def _result(question: str = "How much notice ends the lease?", n: int = 2, scope: str | None = None) -> AskResult:
    answers = tuple(_answer(score=0.9 - 0.3 * i, start=40 + i, low=i > 0) for i in range(n))
    return AskResult(question, answers, abstained=n == 0, seconds=0.25, scope=scope)


def test_pragmas_and_schema_version(tmp_path):
    # SQLite documentation, sqlite.org/pragma.html: journal_mode reports 'wal'; synchronous FULL is 2;
    # foreign_keys ON is 1.
    with ReviewStore(tmp_path) as store:
        conn = store._conn
        assert conn.execute("PRAGMA journal_mode").fetchone()[0] == "wal"
        assert conn.execute("PRAGMA synchronous").fetchone()[0] == 2
        assert conn.execute("PRAGMA foreign_keys").fetchone()[0] == 1
        assert conn.execute("SELECT value FROM meta WHERE key = 'schema_version'").fetchone()[0] == "1"
    assert review_db_path(tmp_path) == tmp_path / ".excerptor" / "review.sqlite3"
    assert review_db_path(tmp_path).is_file()


def test_newer_schema_is_refused(tmp_path):
    ReviewStore(tmp_path).close()
    with sqlite3.connect(review_db_path(tmp_path)) as conn:
        conn.execute("UPDATE meta SET value = '99' WHERE key = 'schema_version'")
    with pytest.raises(ValueError, match="got 99"):
        ReviewStore(tmp_path)


def test_folder_must_exist(tmp_path):
    with pytest.raises(ValueError, match="not a folder"):
        ReviewStore(tmp_path / "missing")


def test_question_hash_is_sha256():
    # FIPS 180-2, Appendix B.1: SHA-256("abc") = ba7816bf 8f01cfea 414140de 5dae2223 b00361a3 96177a9c b410ff61 f20015ad
    assert question_hash("abc") == "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
    # Python's hashlib as the reference for UTF-8 text.
    assert question_hash("Notice — days?") == hashlib.sha256("Notice — days?".encode("utf-8")).hexdigest()


def test_record_and_load_round_trip(tmp_path):
    result = _result(scope="document leases/unit-4.txt", n=3)
    with ReviewStore(tmp_path) as store:
        qid = store.record_question(result)
        entry, answers = store.load_question(qid)
    assert (entry.question_id, entry.question, entry.scope, entry.n_answers, entry.abstained) == (
        qid, result.question, "document leases/unit-4.txt", 3, False)
    # ISO-8601 UTC: Python's datetime.fromisoformat parses it and the offset is zero (Python docs).
    assert datetime.fromisoformat(entry.asked_at).utcoffset() == timedelta(0)
    assert [a.rank for a in answers] == [1, 2, 3]
    for stored, original in zip(answers, result.answers):
        assert stored.question_id == qid
        assert (stored.text, stored.score, stored.low_confidence) == (original.text, original.score,
                                                                      original.low_confidence)
        c = original.citation
        assert (stored.file, stored.page, stored.locator, stored.start, stored.end) == (c.file, c.page, c.locator,
                                                                                       c.start, c.end)
        assert (stored.passage, stored.passage_start) == (original.passage, original.passage_start)
        assert stored.decision is stored.corrected_text is stored.note is stored.decided_at is None


def test_history_newest_first_and_abstained(tmp_path):
    with ReviewStore(tmp_path) as store:
        first = store.record_question(_result("What is the rent?"))
        second = store.record_question(AskResult("Who repairs the roof?", (), True))
        history = store.history()
        assert [h.question_id for h in history] == [second, first]
        assert (history[0].n_answers, history[0].abstained) == (0, True)
        assert store.load_question(second)[1] == []


def test_closest_spans_of_an_abstained_question_are_stored_as_below_threshold(tmp_path):
    closest = (_answer(score=0.31, low=True), _answer("the other party", 0.22, start=80, low=True))
    with ReviewStore(tmp_path) as store:
        answered = store.record_question(_result("What is the rent?", n=1))
        doubted = store.record_question(AskResult("Who repairs the roof?", (), True, below_threshold=closest))
        entry, stored = store.load_question(doubted)
        assert entry.abstained and entry.n_answers == 2
        assert [(a.rank, a.text, a.below_threshold, a.low_confidence) for a in stored] == [
            (1, "thirty (30) days", True, True), (2, "the other party", True, True)]
        assert not store.load_question(answered)[1][0].below_threshold
        # A closest span can be reviewed like an answer; the decision keeps the flag.
        assert store.set_decision(stored[0].answer_id, "accepted").below_threshold
        rows = [r for r in store.log_rows() if r["question"] == "Who repairs the roof?"]
        assert [(r["answer"], r["below_threshold"], r["decision"]) for r in rows] == [
            ("thirty (30) days", True, "accepted"), ("the other party", True, None)]


def test_failed_write_rolls_back_whole_question(tmp_path):
    unbindable = Answer(object(), 0.5, Citation("a.txt", 1, "p. 1", 0, 3), "abc", 0)  # type: ignore[arg-type]
    bad = AskResult("What is the rent?", (_answer(), unbindable), False)
    with ReviewStore(tmp_path) as store:
        with pytest.raises(sqlite3.Error):
            store.record_question(bad)
        assert store.history() == []
        with store._lock:
            assert store._conn.execute("SELECT COUNT(*) FROM answers").fetchone()[0] == 0


def test_decision_rules(tmp_path):
    with ReviewStore(tmp_path) as store:
        answer_id = store.load_question(store.record_question(_result()))[1][0].answer_id
        with pytest.raises(ValueError, match=r"\(got 'maybe'\)"):
            store.set_decision(answer_id, "maybe")
        with pytest.raises(ValueError, match="corrected_text"):
            store.set_decision(answer_id, "corrected")
        with pytest.raises(ValueError, match="corrected_text"):
            store.set_decision(answer_id, "corrected", corrected_text="   ")
        with pytest.raises(ValueError, match="corrected_text"):
            store.set_decision(answer_id, "accepted", corrected_text="sixty days")
        with pytest.raises(ValueError, match=r"got 9999"):
            store.set_decision(9999, "accepted")

        a = store.set_decision(answer_id, "corrected", corrected_text="sixty (60) days", note="see clause 12")
        assert (a.decision, a.corrected_text, a.note) == ("corrected", "sixty (60) days", "see clause 12")
        assert a.decided_at is not None
        a = store.set_decision(answer_id, "accepted")  # note=None keeps the note
        assert (a.decision, a.corrected_text, a.note) == ("accepted", None, "see clause 12")
        a = store.set_decision(answer_id, None)
        assert (a.decision, a.corrected_text, a.decided_at, a.note) == (None, None, None, "see clause 12")
        assert store.set_note(answer_id, "checked twice").note == "checked twice"
        assert store.set_note(answer_id, "  ").note is None


def test_decisions_survive_close_and_reopen(tmp_path):
    with ReviewStore(tmp_path) as store:
        answers = store.load_question(store.record_question(_result()))[1]
        store.set_decision(answers[0].answer_id, "rejected", note="wrong clause")
        store.set_decision(answers[1].answer_id, "corrected", corrected_text="30 days")
    with ReviewStore(tmp_path) as store:
        again = store.load_question(answers[0].question_id)[1]
    assert [(a.decision, a.corrected_text, a.note) for a in again] == [
        ("rejected", None, "wrong clause"), ("corrected", "30 days", None)]


CHILD = """
import os, sys
from pathlib import Path
sys.path.insert(0, {repo!r})
from engine.review_store import ReviewStore
store = ReviewStore(Path({folder!r}))
store.set_decision({answer_id}, "corrected", corrected_text="ninety days", note="from the amendment")
print("ok", flush=True)
os._exit(0)  # no close(), no commit hooks, no atexit
"""


def test_decision_survives_killed_process(tmp_path):
    with ReviewStore(tmp_path) as store:
        answer_id = store.load_question(store.record_question(_result()))[1][0].answer_id
    code = CHILD.format(repo=str(REPO), folder=str(tmp_path), answer_id=answer_id)
    child = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=60)
    assert child.returncode == 0, child.stderr
    assert child.stdout.strip() == "ok"
    with ReviewStore(tmp_path) as store:
        a = store.answer(answer_id)
    assert (a.decision, a.corrected_text, a.note) == ("corrected", "ninety days", "from the amendment")


def test_concurrent_decisions_from_threads(tmp_path):
    with ReviewStore(tmp_path) as store:
        ids = [a.answer_id for a in store.load_question(store.record_question(_result(n=4)))[1]]
        errors: list[BaseException] = []

        def decide(answer_id: int) -> None:
            try:
                for i in range(5):
                    store.set_decision(answer_id, "accepted" if i % 2 else "rejected", note=f"pass {i}")
            except BaseException as error:  # pragma: no cover - reported below
                errors.append(error)

        threads = [threading.Thread(target=decide, args=(i,)) for i in ids]
        for t in threads:
            t.start()
        for t in threads:
            t.join()
        assert errors == []
        final = {(store.answer(i).decision, store.answer(i).note) for i in ids}
        assert final == {("rejected", "pass 4")}  # the last pass, i = 4, is even


# -- sweep cells ---------------------------------------------------------------------------------------------
DOC = "leases/unit-4.txt"
Q = "How much notice ends the lease?"


def test_cell_round_trip_and_abstained(tmp_path):
    with ReviewStore(tmp_path) as store:
        answer = _answer(file=DOC)
        cell = store.upsert_cell("leases", DOC, "sha-1", "Notice", Q, answer, False)
        assert (cell.answer, cell.score, cell.page, cell.locator, cell.start, cell.end) == (
            answer.text, answer.score, 2, "p. 2", answer.citation.start, answer.citation.end)
        assert (cell.passage, cell.passage_start, cell.abstained) == (answer.passage, answer.passage_start, False)
        assert cell.question_hash == question_hash(Q)
        empty = store.upsert_cell("leases", DOC, "sha-1", "Roof", "Who repairs the roof?", None, True)
        assert (empty.answer, empty.score, empty.start, empty.abstained) == (None, None, None, True)
        assert store.cell(cell.cell_id) == cell
        with pytest.raises(ValueError, match="abstained"):  # a confident span is not a closest span
            store.upsert_cell("leases", DOC, "sha-1", "Rent", Q, answer, True)
        closest = store.upsert_cell("leases", DOC, "sha-1", "Rent", Q, _answer(file=DOC, low=True), True)
        assert closest.abstained and closest.below_threshold and closest.answer == "thirty (30) days"
        assert not cell.below_threshold and not empty.below_threshold
        with pytest.raises(ValueError, match="must cite"):
            store.upsert_cell("leases", "other.txt", "sha-1", "Rent", Q, answer, False)
        with pytest.raises(ValueError, match="label"):
            store.upsert_cell("leases", DOC, "sha-1", " ", Q, answer, False)


def _decided(store: ReviewStore, sha: str = "sha-1", question: str = Q) -> int:
    cell = store.upsert_cell("leases", DOC, sha, "Notice", question, _answer(file=DOC), False)
    store.set_cell_decision(cell.cell_id, "corrected", corrected_text="30 days", note="keep this note")
    return cell.cell_id


def test_resweep_keeps_decision_when_unchanged(tmp_path):
    with ReviewStore(tmp_path) as store:
        cell_id = _decided(store)
        again = store.upsert_cell("leases", DOC, "sha-1", "Notice", Q, _answer(file=DOC), False)
        assert again.cell_id == cell_id
        assert (again.decision, again.corrected_text, again.note) == ("corrected", "30 days", "keep this note")


@pytest.mark.parametrize("change", ["doc_sha256", "question", "answer"])
def test_resweep_clears_decision_when_source_changed(tmp_path, change):
    with ReviewStore(tmp_path) as store:
        cell_id = _decided(store)
        sha = "sha-2" if change == "doc_sha256" else "sha-1"
        question = "What notice period applies?" if change == "question" else Q
        answer = _answer(file=DOC, start=55) if change == "answer" else _answer(file=DOC)
        again = store.upsert_cell("leases", DOC, sha, "Notice", question, answer, False)
        assert again.cell_id == cell_id
        assert (again.decision, again.corrected_text, again.decided_at) == (None, None, None)
        assert again.note == "keep this note"
        assert (again.doc_sha256, again.question_hash) == (sha, question_hash(question))


def test_cells_order_done_keys_and_delete(tmp_path):
    with ReviewStore(tmp_path) as store:
        for doc in ("b.txt", "a.txt"):
            for label in ("Term", "Rent", "Notice"):
                store.upsert_cell("leases", doc, f"sha-{doc}", label, f"What is the {label}?", None, True)
        store.upsert_cell("other", "a.txt", "sha-a.txt", "Term", "What is the Term?", None, True)
        cells = store.cells("leases")
        assert [(c.doc_path, c.label) for c in cells] == [
            ("a.txt", "Term"), ("a.txt", "Rent"), ("a.txt", "Notice"),
            ("b.txt", "Term"), ("b.txt", "Rent"), ("b.txt", "Notice")]
        assert store.checklists() == ["leases", "other"]
        done = store.done_keys("leases")
        assert len(done) == 6
        assert done[("a.txt", "Rent")] == ("sha-a.txt", question_hash("What is the Rent?"))
        removed = store.delete_cells_not_in("leases", [("a.txt", "Term"), ("b.txt", "Term")])
        assert removed == 4
        assert [(c.doc_path, c.label) for c in store.cells("leases")] == [("a.txt", "Term"), ("b.txt", "Term")]
        assert len(store.cells("other")) == 1


def test_cell_decision_rules_and_reopen(tmp_path):
    with ReviewStore(tmp_path) as store:
        cell = store.upsert_cell("leases", DOC, "sha-1", "Notice", Q, _answer(file=DOC), False)
        with pytest.raises(ValueError, match=r"\(got 'ok'\)"):
            store.set_cell_decision(cell.cell_id, "ok")
        with pytest.raises(ValueError, match="corrected_text"):
            store.set_cell_decision(cell.cell_id, "corrected")
        store.set_cell_decision(cell.cell_id, "accepted", note="matches schedule A")
    with ReviewStore(tmp_path) as store:
        again = store.cell(cell.cell_id)
        assert (again.decision, again.note) == ("accepted", "matches schedule A")
        assert store.set_cell_note(cell.cell_id, None).note is None


def test_log_rows(tmp_path):
    with ReviewStore(tmp_path) as store:
        qid = store.record_question(_result(n=2))
        store.record_question(AskResult("Who repairs the roof?", (), True))
        first = store.load_question(qid)[1][0]
        store.set_decision(first.answer_id, "accepted", note="ok")
        store.upsert_cell("leases", DOC, "sha-1", "Notice", Q, _answer(file=DOC), False)
        store.upsert_cell("leases", DOC, "sha-1", "Roof", "Who repairs the roof?", None, True)
        rows = store.log_rows()
    assert [r["source"] for r in rows] == ["ask", "ask", "ask", "sweep:leases", "sweep:leases"]
    for row in rows:
        assert set(LOG_COLUMNS) <= set(row)
    top = rows[0]
    # Rounding to 4 places: Python's round() is the reference (Python docs, built-in round).
    assert top["confidence"] == round(first.score, 4) == 0.9
    assert (top["answer"], top["decision"], top["note"], top["label"]) == (first.text, "accepted", "ok", None)
    assert rows[1]["low_confidence"] is True
    assert (rows[2]["question"], rows[2]["answer"], rows[2]["confidence"]) == ("Who repairs the roof?", None, None)
    assert (rows[3]["label"], rows[3]["file"], rows[3]["page"]) == ("Notice", DOC, 2)
    assert (rows[4]["label"], rows[4]["file"], rows[4]["answer"]) == ("Roof", DOC, None)
