""".docx ingest: documents written in-test by python-docx (reference writer), plus broken packages."""

from __future__ import annotations

import io
import zipfile

import docx

from engine.ingest.parse import parse_file


def _save(document, path):
    document.save(str(path))
    return path


def test_paragraphs_and_table_in_body_order(tmp_path):
    d = docx.Document()
    d.add_heading("Supply Agreement", level=1)
    d.add_paragraph("The Supplier shall deliver the goods.")
    d.add_paragraph("")  # empty paragraphs are not counted
    table = d.add_table(rows=2, cols=3)
    cells = {(0, 0): "Item", (0, 1): "Price", (1, 0): "Widgets", (1, 1): "4.50", (1, 2): "each"}
    for (r, c), text in cells.items():
        table.cell(r, c).text = text
    d.add_paragraph("Payment is due within 30 days.")
    path = _save(d, tmp_path / "supply.docx")
    doc, problems = parse_file(path, "supply.docx")
    assert problems == [] and doc.kind == "docx"
    assert len(doc.pages) == 1
    page = doc.pages[0]
    assert page.number is None
    assert page.locator == "¶ 1-5"  # heading, paragraph, 2 table rows, paragraph
    assert page.text.split("\n\n") == [
        "Supply Agreement",
        "The Supplier shall deliver the goods.",
        "Item | Price",  # empty third cell left out
        "Widgets | 4.50 | each",
        "Payment is due within 30 days.",
    ]


def test_blocks_of_thirty_paragraphs(tmp_path):
    d = docx.Document()
    for k in range(1, 66):
        d.add_paragraph(f"Clause {k} applies.")
    doc, _ = parse_file(_save(d, tmp_path / "long.docx"), "long.docx")
    assert [p.locator for p in doc.pages] == ["¶ 1-30", "¶ 31-60", "¶ 61-65"]
    assert doc.pages[1].text.split("\n\n")[0] == "Clause 31 applies."
    assert doc.pages[2].text.split("\n\n")[-1] == "Clause 65 applies."


def test_junk_zip_named_docx(tmp_path):
    # "PK\x03\x04" is the ZIP local file header signature (PKWARE APPNOTE.TXT, 4.3.7); the rest is junk.
    path = tmp_path / "junk.docx"
    path.write_bytes(b"PK\x03\x04" + b"not really a zip" * 20)
    doc, problems = parse_file(path, "junk.docx")
    assert doc is None
    assert problems[0].fatal
    assert problems[0].reason == "not a Word document (the .docx is not a valid zip package)"


def test_zip_without_word_part(tmp_path):
    buf = io.BytesIO()
    with zipfile.ZipFile(buf, "w") as zf:
        zf.writestr("hello.txt", "hi")
    path = tmp_path / "z.docx"
    path.write_bytes(buf.getvalue())
    doc, problems = parse_file(path, "z.docx")
    assert doc is None and problems[0].reason.startswith("not a Word document")


def test_ole_file_named_docx(tmp_path):
    # D0 CF 11 E0 A1 B1 1A E1: Compound File Binary header signature ([MS-CFB] 2.2), used by .doc and by
    # password-protected Word files.
    path = tmp_path / "old.docx"
    path.write_bytes(bytes.fromhex("d0cf11e0a1b11ae1") + b"\x00" * 600)
    doc, problems = parse_file(path, "old.docx")
    assert doc is None and "password-protected or old-format" in problems[0].reason


def test_empty_document_warns(tmp_path):
    doc, problems = parse_file(_save(docx.Document(), tmp_path / "e.docx"), "e.docx")
    assert doc is not None and doc.pages == ()
    assert doc.warnings == ("the document contains no text",) and not problems[0].fatal
