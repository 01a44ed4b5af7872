"""Read a .docx with python-docx: body paragraphs and table rows in body order, grouped into blocks.

Units: each non-empty body paragraph is one unit; each non-empty table row is one unit, its non-empty cells
joined by " | ". Content controls (w:sdt) are read through. Units are numbered 1..N in body order (empty
paragraphs are not counted), and every ``BLOCK_UNITS`` units form one ``Page(number=None,
locator="¶ a-b")`` whose text is the units joined by a blank line, so each paragraph ends a sentence.
Headers, footers, footnotes and comments are not read.
"""

from __future__ import annotations

import io
import zipfile
from typing import Any, Iterator

from engine import defaults
from engine.ingest import UnreadableFile
from engine.ingest.text_repair import repair_text
from engine.types import Page

BLOCK_UNITS = 30
_OLE_MAGIC = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"  # Compound File Binary header ([MS-CFB] 2.2)


def _check_package(data: bytes, max_unpacked: int) -> None:
    if data.startswith(_OLE_MAGIC):
        raise UnreadableFile(
            "not a .docx package (a password-protected or old-format .doc Word file)"
        )
    try:
        with zipfile.ZipFile(io.BytesIO(data)) as zf:
            names = set(zf.namelist())
            unpacked = sum(info.file_size for info in zf.infolist())
    except (zipfile.BadZipFile, zipfile.LargeZipFile, EOFError, ValueError):
        raise UnreadableFile("not a Word document (the .docx is not a valid zip package)") from None
    if "[Content_Types].xml" not in names or "word/document.xml" not in names:
        raise UnreadableFile("not a Word document (the zip package has no Word document part)")
    if unpacked > max_unpacked:
        mb, limit = unpacked // 1_000_000, max_unpacked // 1_000_000
        raise UnreadableFile(f"too large when unpacked ({mb} MB; the limit is {limit} MB)")


def _row_text(tr: Any, table: Any) -> str:
    from docx.table import _Cell

    cells = []
    for tc in tr.tc_lst:
        text = " ".join(_Cell(tc, table).text.split())
        if text:
            cells.append(text)
    return " | ".join(cells)


def _units(container: Any, parent: Any) -> Iterator[str]:
    """Texts of paragraphs and table rows directly inside ``container`` (a body or sdtContent element)."""
    from docx.oxml.ns import qn
    from docx.table import Table
    from docx.text.paragraph import Paragraph

    for child in container.iterchildren():
        if child.tag == qn("w:p"):
            yield Paragraph(child, parent).text
        elif child.tag == qn("w:tbl"):
            table = Table(child, parent)
            for tr in child.tr_lst:
                yield _row_text(tr, table)
        elif child.tag == qn("w:sdt"):
            content = child.find(qn("w:sdtContent"))
            if content is not None:
                yield from _units(content, parent)


def read_docx(
    data: bytes, max_unpacked: int = defaults.MAX_FILE_BYTES
) -> tuple[tuple[Page, ...], list[str]]:
    """Pages (paragraph blocks) and warnings of a .docx's bytes (see module docstring)."""
    _check_package(data, max_unpacked)
    try:
        import docx

        document = docx.Document(io.BytesIO(data))
        body = document.element.body
        texts = [repair_text(t, join_hyphens=False).text for t in _units(body, document._body)]
    except UnreadableFile:
        raise
    except Exception:  # python-docx / lxml raise many types for damaged packages
        raise UnreadableFile("not a valid Word document (damaged or not a .docx)") from None
    units = [t for t in texts if t]
    pages: list[Page] = []
    for k in range(0, len(units), BLOCK_UNITS):
        block = units[k : k + BLOCK_UNITS]
        first, last = k + 1, k + len(block)
        locator = f"¶ {first}" if first == last else f"¶ {first}-{last}"
        pages.append(Page(number=None, text="\n\n".join(block), locator=locator))
    warnings: list[str] = []
    if not pages:
        warnings.append("the document contains no text")
    return tuple(pages), warnings
