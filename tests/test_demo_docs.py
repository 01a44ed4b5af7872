"""Checks on the invented demo folder (demo_docs/), its question set and the commercial checklist.

Every answer is checked against text read back by independent reference readers: pypdf for PDFs
(page by page), python-docx for .docx (paragraphs and table cells), plain UTF-8 decoding for .txt.
"""

from __future__ import annotations

import json
import re
import subprocess
import sys
from functools import lru_cache
from pathlib import Path

import docx
import pytest
from pypdf import PdfReader

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "demo_docs"
SCRIPT = ROOT / "scripts" / "make_demo_docs.py"
QUESTIONS = ROOT / "tests" / "data" / "demo_questions.jsonl"
CHECKLIST = ROOT / "checklists" / "commercial.checklist"

# Page-count ranges requested in the project brief for the multi-page PDFs (project brief, no source).
PDF_PAGE_RANGES = {
    "land_lease.pdf": (4, 6),
    "vendors/equipment_supply_agreement.pdf": (4, 5),
    "power_purchase_agreement.pdf": (4, 6),
}
EXPECTED_FILES = sorted([*PDF_PAGE_RANGES, "vendors/om_agreement.docx", "mutual_nda_larchpoint.txt"])
LABEL_RE = re.compile(r"^[a-z0-9]+(-[a-z0-9]+)*$")


def _variants(text: str) -> set[str]:
    """Whitespace-normalised forms: runs of whitespace collapsed; a hyphen at a line break kept or removed."""

    def collapse(s: str) -> str:
        return re.sub(r"\s+", " ", s).strip()

    return {
        collapse(text),
        collapse(re.sub(r"-\s*\n\s*", "-", text)),
        collapse(re.sub(r"-\s*\n\s*", "", text)),
    }


def _contains(text: str, answer: str) -> bool:
    needle = re.sub(r"\s+", " ", answer).strip()
    return any(needle in v for v in _variants(text))


def _pdf_pages(path: Path) -> list[str]:
    return [page.extract_text() or "" for page in PdfReader(str(path)).pages]


def _docx_text(path: Path) -> str:
    document = docx.Document(str(path))
    parts = [p.text for p in document.paragraphs]
    parts += [cell.text for table in document.tables for row in table.rows for cell in row.cells]
    return "\n".join(parts)


def _file_texts(path: Path) -> list[str]:
    """One string per PDF page, or a single string for .docx / .txt."""
    if path.suffix == ".pdf":
        return _pdf_pages(path)
    if path.suffix == ".docx":
        return [_docx_text(path)]
    return [path.read_text(encoding="utf-8")]


@lru_cache(maxsize=None)
def _committed(rel: str) -> tuple[str, ...]:
    return tuple(_file_texts(DEMO / rel))


def _load_questions() -> list[dict]:
    return [json.loads(line) for line in QUESTIONS.read_text(encoding="utf-8").splitlines() if line.strip()]


QUESTION_RECORDS = _load_questions()


def _checklist_questions() -> list[tuple[str | None, str]]:
    out = []
    for raw in CHECKLIST.read_text(encoding="utf-8").splitlines():
        line = raw.strip()
        if not line or line.startswith("#"):
            continue
        if "::" in line:
            label, question = (part.strip() for part in line.split("::", 1))
            out.append((label, question))
        else:
            out.append((None, line))
    return out


def test_demo_folder_has_expected_files():
    # Source: the file list in the project brief (five documents, two in a subfolder) (project brief, no source).
    found = sorted(rel for rel in (p.relative_to(DEMO).as_posix() for p in DEMO.rglob("*") if p.is_file())
                   if not rel.startswith(".excerptor/"))  # the index `make demo` writes is not demo data
    assert found == EXPECTED_FILES
    assert any("/" in rel for rel in found)  # subfolder scoping can be shown


@pytest.mark.parametrize("rel", sorted(PDF_PAGE_RANGES))
def test_pdf_page_counts_and_size(rel):
    # Source: pypdf (reference PDF reader) page count; ranges from the project brief (no source).
    low, high = PDF_PAGE_RANGES[rel]
    assert low <= len(_committed(rel)) <= high
    assert (DEMO / rel).stat().st_size < 100_000  # "a few KB to tens of KB" (project brief, no source)


def test_question_file_shape():
    # Source: the JSONL record format in the project brief (project brief, no source).
    assert len(QUESTION_RECORDS) >= 20
    ids = [r["id"] for r in QUESTION_RECORDS]
    assert len(set(ids)) == len(ids)
    for r in QUESTION_RECORDS:
        assert set(r) == {"id", "question", "answer", "file", "page"}
        assert r["file"] in EXPECTED_FILES
        assert r["question"].endswith("?") and r["answer"].strip() == r["answer"] and r["answer"]
        assert len(r["answer"].split()) <= 10  # short span (project brief, no source)
        if r["file"].endswith(".pdf"):
            assert isinstance(r["page"], int) and r["page"] >= 1
        else:
            assert r["page"] is None
    assert {r["file"] for r in QUESTION_RECORDS} == set(EXPECTED_FILES)  # every document is covered


@pytest.mark.parametrize("record", QUESTION_RECORDS, ids=[r["id"] for r in QUESTION_RECORDS])
def test_answer_is_on_recorded_page(record):
    # Source: pypdf (reference PDF reader) per-page text extraction; python-docx paragraphs + table cells;
    # UTF-8 decoding for .txt. Page numbers are 1-based.
    texts = _committed(record["file"])
    if record["page"] is None:
        assert _contains(texts[0], record["answer"]), record
    else:
        assert record["page"] <= len(texts), record
        assert _contains(texts[record["page"] - 1], record["answer"]), record


def test_demo_text_is_latin1_with_straight_quotes():
    # Source: PDF core (Type 1 standard) fonts cover latin-1 only (from memory); straight quotes per brief.
    for rel in EXPECTED_FILES:
        for text in _committed(rel):
            text.encode("latin-1")
            assert not re.search("[\u2018\u2019\u201c\u201d]", text), rel


def test_checklist_format_and_size():
    # Source: the checklist format documented in the file's header (project format, no source); 12-20 per brief.
    questions = _checklist_questions()
    assert 12 <= len(questions) <= 20
    labels = [label for label, _ in questions if label is not None]
    assert len(set(labels)) == len(labels)
    for label, question in questions:
        assert label is None or LABEL_RE.match(label), label
        assert question.endswith("?") and len(question) <= 200
    CHECKLIST.read_bytes().decode("utf-8")


def test_generator_is_deterministic(tmp_path):
    # Source: pypdf / python-docx read-back of a fresh run compared with the committed folder (text, not bytes).
    subprocess.run([sys.executable, str(SCRIPT), "--out", str(tmp_path)], check=True, capture_output=True)
    fresh = sorted(p.relative_to(tmp_path).as_posix() for p in tmp_path.rglob("*") if p.is_file())
    assert fresh == EXPECTED_FILES
    for rel in EXPECTED_FILES:
        assert tuple(_file_texts(tmp_path / rel)) == _committed(rel), rel
    # The .txt has no embedded metadata, so its bytes must match exactly.
    nda = "mutual_nda_larchpoint.txt"
    assert (tmp_path / nda).read_bytes() == (DEMO / nda).read_bytes()
