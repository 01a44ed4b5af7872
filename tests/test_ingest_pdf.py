"""PDF ingest: PDFs written in-test by fpdf2 (reference writer) with known page text, read back via pypdf."""

from __future__ import annotations

import hashlib
from pathlib import Path

import pytest
from fpdf import FPDF

from engine.ingest.parse import parse_file
from engine.passages import split_passages

PAGE1 = "The Tenant shall pay rent monthly in advance. Late payment incurs interest at 2% per month."
PAGE3 = "Either party may end this lease on 60 days written notice. The deposit is returned within 30 days."


def _pdf(path: Path, pages: list[str | None], **encrypt: str) -> Path:
    pdf = FPDF()
    pdf.set_font("Helvetica", size=11)  # core font: latin-1 text only (fpdf2 documentation)
    for text in pages:
        pdf.add_page()
        if text:
            pdf.multi_cell(0, 7, text)
    if encrypt:
        pdf.set_encryption(**encrypt)
    pdf.output(str(path))
    return path


def test_pages_numbers_and_text(tmp_path):
    path = _pdf(tmp_path / "lease.pdf", [PAGE1, None, PAGE3])
    doc, problems = parse_file(path, "lease.pdf")
    assert doc is not None and doc.kind == "pdf"
    # Page-tree order (ISO 32000-1, 7.7.3), numbered from 1 (engine/types.py).
    assert [p.number for p in doc.pages] == [1, 2, 3]
    assert [p.locator for p in doc.pages] == ["p. 1", "p. 2", "p. 3"]
    assert doc.pages[0].text == PAGE1 and doc.pages[2].text == PAGE3  # the text fpdf2 wrote
    assert doc.pages[1].has_text_layer is False and doc.pages[1].text == ""
    assert doc.warnings == ("page 2 has no text layer (scanned image?)",)
    assert problems and all(not p.fatal for p in problems)
    assert [p.reason for p in problems] == list(doc.warnings)
    data = path.read_bytes()
    assert doc.size == len(data)
    assert doc.sha256 == hashlib.sha256(data).hexdigest()  # FIPS 180-4 via Python's hashlib
    assert doc.mtime_ns == path.stat().st_mtime_ns


def test_expected_sentences_land_on_expected_page(tmp_path):
    path = _pdf(tmp_path / "lease.pdf", [PAGE1, None, PAGE3])
    doc, _ = parse_file(path, "lease.pdf")
    passages = split_passages(doc)
    where = {p.page_number for p in passages if "60 days written notice" in p.text}
    assert where == {3}
    where = {p.page_number for p in passages if "interest at 2% per month" in p.text}
    assert where == {1}
    for p in passages:
        page = doc.pages[p.page_number - 1]
        assert page.text[p.start : p.end] == p.text


def test_line_end_hyphenation_repaired(tmp_path):
    path = _pdf(tmp_path / "h.pdf", ["Notice of termi-\nnation must be in writing."])
    doc, _ = parse_file(path, "h.pdf")
    assert doc.pages[0].text == "Notice of termination must be in writing."


def test_all_pages_without_text(tmp_path):
    path = _pdf(tmp_path / "scan.pdf", [None, None])
    doc, problems = parse_file(path, "scan.pdf")
    assert doc is not None
    assert all(not p.has_text_layer for p in doc.pages)
    assert doc.warnings == ("no text layer on any page (scanned document?)",)
    assert len(problems) == 1 and not problems[0].fatal


def test_encrypted_pdf(tmp_path):
    # fpdf2 default encryption is RC4 (fpdf2 documentation, "Encryption"); pypdf reads RC4 without extras.
    path = _pdf(tmp_path / "locked.pdf", [PAGE1], owner_password="own", user_password="secret")
    doc, problems = parse_file(path, "locked.pdf")
    assert doc is None
    assert problems == [problems[0]] and problems[0].fatal
    assert problems[0].reason == "encrypted PDF (needs a password)"


def test_empty_user_password_is_opened(tmp_path):
    path = _pdf(tmp_path / "open.pdf", [PAGE1], owner_password="own")
    doc, _ = parse_file(path, "open.pdf")
    assert doc is not None and doc.pages[0].text == PAGE1


@pytest.mark.parametrize("cut", [0.5, 0.1])
def test_truncated_pdf(tmp_path, cut):
    data = _pdf(tmp_path / "full.pdf", [PAGE1, PAGE3]).read_bytes()
    bad = tmp_path / "bad.pdf"
    bad.write_bytes(data[: int(len(data) * cut)])
    doc, problems = parse_file(bad, "bad.pdf")
    assert doc is None and problems[0].fatal
    assert problems[0].reason.startswith("not a valid PDF")


def test_not_a_pdf_and_empty(tmp_path):
    (tmp_path / "x.pdf").write_bytes(b"hello, I am plain text")
    doc, problems = parse_file(tmp_path / "x.pdf", "x.pdf")
    assert doc is None and problems[0].reason.startswith("not a valid PDF")
    (tmp_path / "z.PDF").write_bytes(b"")
    doc, problems = parse_file(tmp_path / "z.PDF", "z.PDF")
    assert doc is None and problems[0].reason == "empty file (0 bytes)"


def test_limits(tmp_path):
    path = _pdf(tmp_path / "three.pdf", [PAGE1, PAGE1, PAGE1])
    doc, problems = parse_file(path, "three.pdf", max_pdf_pages=2)
    assert doc is None and problems[0].reason == "too many pages (3; the limit is 2)"
    doc, problems = parse_file(path, "three.pdf", max_bytes=100)
    assert doc is None and problems[0].reason.startswith("file too large")
    assert "limit" in problems[0].reason


def test_missing_file_and_unsupported_type(tmp_path):
    doc, problems = parse_file(tmp_path / "gone.pdf", "gone.pdf")
    assert doc is None and problems[0].reason == "file not found (moved or deleted?)"
    (tmp_path / "a.csv").write_text("a,b")
    doc, problems = parse_file(tmp_path / "a.csv", "a.csv")
    assert doc is None and problems[0].fatal and "unsupported" in problems[0].reason
