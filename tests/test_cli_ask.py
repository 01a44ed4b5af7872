"""The CLI contract: ``index`` and ``ask`` output schemas, with a fake reader (no model)."""

import json
import shutil
from pathlib import Path

import pytest

import engine.workspace
from engine.cli import main
from tests.fakes import FAKE_CALIBRATION, FakeReader

DEMO = Path(__file__).resolve().parents[1] / "demo_docs"
ANSWER_KEYS = {"text": str, "score": float, "file": str, "start": int, "end": int, "passage": str}


@pytest.fixture()
def folder(tmp_path, monkeypatch):
    target = tmp_path / "docs"
    shutil.copytree(DEMO, target, ignore=shutil.ignore_patterns(".excerptor"))  # a user's own index stays out
    monkeypatch.setattr(engine.workspace, "load_default_reader", lambda quantize=None: (FakeReader(), FAKE_CALIBRATION))
    return target


def check_answer_schema(obj: dict) -> None:
    assert set(obj) >= {"question", "answers", "abstained"}
    assert isinstance(obj["abstained"], bool)
    for a in obj["answers"]:
        for key, kind in ANSWER_KEYS.items():
            assert isinstance(a[key], kind), key
        assert a["page"] is None or isinstance(a["page"], int)
        assert 0.0 <= a["score"] <= 1.0
        assert a["end"] > a["start"]


def test_index_json_summary(folder, capsys):
    assert main(["index", str(folder), "--json"]) == 0
    report = json.loads(capsys.readouterr().out)
    assert len(report["indexed"]) == 5 and report["failed"] == []


def test_ask_json_schema_and_offsets_index_page_text(folder, capsys):
    assert main(["ask", str(folder), "What is the governing law of the lease?", "--json"]) == 0
    obj = json.loads(capsys.readouterr().out)
    check_answer_schema(obj)
    assert obj["answers"], "the fake reader always finds overlapping words in the demo folder"
    from engine.indexer import open_index

    with open_index(folder) as index:
        for a in obj["answers"]:
            page_text = index.store.get_page_text(a["file"], a["page"], a["locator"])
            assert page_text[a["start"]: a["end"]] == a["text"]


def test_ask_scoped_to_one_document(folder, capsys):
    assert main(["ask", str(folder), "notice period", "--doc", "land_lease.pdf", "--json"]) == 0
    obj = json.loads(capsys.readouterr().out)
    assert {a["file"] for a in obj["answers"]} <= {"land_lease.pdf"}


def test_ask_many_questions_jsonl(folder, tmp_path, capsys):
    qfile = tmp_path / "q.jsonl"
    qfile.write_text('{"id": "a", "question": "Who is the tenant?"}\n{"id": "b", "question": "renewal term"}\n')
    assert main(["ask", str(folder), "--questions", str(qfile), "--json"]) == 0
    lines = [json.loads(line) for line in capsys.readouterr().out.splitlines()]
    assert [line["id"] for line in lines] == ["a", "b"]
    for line in lines:
        check_answer_schema(line)
        assert isinstance(line["seconds"], float)


def test_bad_question_file_is_a_clear_error(folder, tmp_path, capsys):
    qfile = tmp_path / "q.jsonl"
    qfile.write_text('{"id": "a"}\n')
    assert main(["ask", str(folder), "--questions", str(qfile), "--json"]) == 2
    assert "line 1" in capsys.readouterr().err


def test_readable_answer_stays_on_one_line_and_keeps_its_exact_offsets(capsys):
    from engine.cli import print_readable, quoted_span
    from engine.types import Answer, AskResult, Citation

    page = "Tenant may renew for one (1) additional period of ten (10)\nyears on notice."
    start = page.index("one (1)")
    end = page.index(" on notice")
    answer = Answer(page[start:end], 0.8, Citation("lease.pdf", 2, "p. 2", start, end), page, 0)
    print_readable(AskResult("How long is the renewal?", (answer,), False))
    out = capsys.readouterr().out
    assert " 1. 'one (1) additional period of ten (10) years'  confidence 0.80\n" in out
    assert f"lease.pdf, p. 2, characters {start}-{end}" in out
    assert quoted_span("a\n\n  b") == "'a b'"


def test_an_abstention_prints_its_closest_spans_marked_below_the_threshold(capsys):
    from engine.cli import BELOW_THRESHOLD_NOTE, answer_json, print_readable
    from engine.types import Answer, AskResult, Citation

    page = "The Tenant shall insure the premises for two million dollars ($2,000,000) per occurrence."
    start = page.index("two million")
    end = page.index(" per occurrence")
    closest = Answer(page[start:end], 0.31, Citation("lease.pdf", 4, "p. 4", start, end), page, 0,
                     low_confidence=True)
    result = AskResult("What insurance limit applies?", (), True, below_threshold=(closest,))
    print_readable(result)
    out = capsys.readouterr().out
    assert "does not seem to answer" in out and BELOW_THRESHOLD_NOTE in out
    assert " 1. 'two million dollars ($2,000,000)'  confidence 0.31  [BELOW THRESHOLD]\n" in out
    obj = answer_json(result, Path("."))
    assert obj["abstained"] and obj["answers"] == []
    assert [(a["text"], a["start"], a["end"], a["low_confidence"]) for a in obj["below_threshold"]] == [
        (page[start:end], start, end, True)]
