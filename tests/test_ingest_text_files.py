""".txt/.md ingest: encodings, BOMs, NUL bytes, binary data, form feeds."""

from __future__ import annotations

import codecs

import pytest

from engine.ingest.parse import parse_file

BODY = "The Licensee shall pay a fee of 500 per quarter.\nThe licence ends on 31 December.\n"


def _parse(tmp_path, name: str, data: bytes):
    path = tmp_path / name
    path.write_bytes(data)
    return parse_file(path, name)


def test_utf8(tmp_path):
    doc, problems = _parse(tmp_path, "a.txt", ("Café terms — " + BODY).encode("utf-8"))
    assert problems == [] and doc.warnings == ()
    assert doc.kind == "txt"
    assert len(doc.pages) == 1
    page = doc.pages[0]
    assert page.number is None and page.locator == "whole file"
    assert page.text == ("Café terms — " + BODY).strip()


def test_utf8_bom_stripped(tmp_path):
    # The UTF-8 BOM is EF BB BF (Unicode standard, section 23.8; codecs.BOM_UTF8).
    assert codecs.BOM_UTF8 == b"\xef\xbb\xbf"
    doc, problems = _parse(tmp_path, "b.md", codecs.BOM_UTF8 + BODY.encode("utf-8"))
    assert problems == [] and doc.kind == "md"
    assert doc.pages[0].text.startswith("The Licensee")


def test_utf16_with_bom(tmp_path):
    doc, problems = _parse(tmp_path, "w.txt", BODY.encode("utf-16"))  # Python's codec writes a BOM
    assert problems == [] and doc.pages[0].text == BODY.strip()


def test_latin1_fallback_warns(tmp_path):
    # 0xE9 is "é" in both ISO/IEC 8859-1 and Windows-1252 (the published code page tables).
    doc, problems = _parse(tmp_path, "c.txt", ("Caf\u00e9 " + BODY).encode("latin-1"))
    assert doc.pages[0].text.startswith("Café ")
    assert doc.warnings == ("not UTF-8: decoded as cp1252",)
    assert [(p.reason, p.fatal) for p in problems] == [("not UTF-8: decoded as cp1252", False)]


def test_latin1_when_cp1252_fails(tmp_path):
    # 0x81 is undefined in Windows-1252 (Microsoft's cp1252 table), so latin-1 is the last resort.
    doc, problems = _parse(tmp_path, "d.txt", b"Fee \x81 due. " + BODY.encode("ascii"))
    assert doc.warnings == ("not UTF-8: decoded as latin-1",)
    assert "\x81" not in doc.pages[0].text  # C1 control removed by the repair step


def test_isolated_nuls_removed_with_warning(tmp_path):
    data = (BODY * 20).encode("ascii")
    data = data[:100] + b"\x00" + data[100:200] + b"\x00" + data[200:]
    doc, problems = _parse(tmp_path, "e.txt", data)
    assert doc is not None and "\x00" not in doc.pages[0].text
    assert doc.warnings == ("removed 2 NUL bytes from the text",)
    assert problems[0].fatal is False


@pytest.mark.parametrize(
    "data",
    [
        b"\x00\x01\x02binary" * 500,  # many NUL bytes (> 1% of the first 8 KB; threshold: common practice)
        bytes(range(1, 256)) * 40,  # no NULs but ~25% control characters
    ],
)
def test_binary_rejected(tmp_path, data):
    doc, problems = _parse(tmp_path, "f.txt", data)
    assert doc is None and problems == [problems[0]]
    assert problems[0].fatal and problems[0].reason == "binary data in a .txt file"


def test_form_feeds_make_parts(tmp_path):
    doc, _ = _parse(tmp_path, "g.txt", b"Part one text.\fPart two text.\f")
    assert [p.locator for p in doc.pages] == ["part 1", "part 2", "part 3"]
    assert [p.text for p in doc.pages] == ["Part one text.", "Part two text.", ""]
    assert all(p.number is None for p in doc.pages)


def test_zero_bytes_and_whitespace_only(tmp_path):
    doc, problems = _parse(tmp_path, "h.txt", b"")
    assert doc is None and problems[0].reason == "empty file (0 bytes)" and problems[0].fatal
    doc, problems = _parse(tmp_path, "i.md", b"  \n\n ")
    assert doc is not None and doc.warnings == ("the file contains no text",)


def test_crlf_normalised(tmp_path):
    doc, _ = _parse(tmp_path, "j.txt", b"Line one.\r\nLine two.\r\n")
    assert doc.pages[0].text == "Line one.\nLine two."


def test_bad_bytes_after_utf8_bom_are_replaced(tmp_path):
    # 0xFF never occurs in UTF-8 (RFC 3629, section 1), so it is replaced by U+FFFD.
    doc, problems = _parse(tmp_path, "k.txt", codecs.BOM_UTF8 + BODY.encode("ascii") + b"\xff")
    assert doc.pages[0].text.endswith("\ufffd")
    assert doc.warnings == ("some bytes are not valid UTF-8 (replaced by \ufffd)",)
