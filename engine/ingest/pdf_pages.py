"""Read a PDF's text layer page by page with pypdf.

One ``Page`` per PDF page: ``number`` 1-based, ``locator`` "p. N", ``text`` = repair_text(extracted).text.
A page whose text layer is empty (or that cannot be read) gets ``has_text_layer=False`` and ``text=""``;
consecutive such pages share one warning ("page 3 has no text layer (scanned image?)", "pages 4-9 have no
text layer (scanned images?)"). If no page has text, the single warning is
"no text layer on any page (scanned document?)". Reading stops, with a warning, when ``max_seconds`` have
passed (checked between pages, after page 1: one page that hangs inside pypdf is NOT interrupted).
"""

from __future__ import annotations

import io
import logging
import time
from typing import Any

from engine import defaults
from engine.ingest import UnreadableFile
from engine.ingest.text_repair import repair_text
from engine.types import Page

# pypdf reports repairs it made through ``logging``; with no handler configured, Python would print them on
# stderr (over a terminal UI). A NullHandler keeps them quiet unless the application configures logging
# (the Python logging HOWTO, "Configuring Logging for a Library").
logging.getLogger("pypdf").addHandler(logging.NullHandler())


def _ranges(numbers: list[int]) -> list[tuple[int, int]]:
    runs: list[tuple[int, int]] = []
    for n in numbers:
        if runs and runs[-1][1] == n - 1:
            runs[-1] = (runs[-1][0], n)
        else:
            runs.append((n, n))
    return runs


def _no_text_warnings(numbers: list[int], total: int) -> list[str]:
    if not numbers:
        return []
    if len(numbers) == total:
        return ["no text layer on any page (scanned document?)"]
    out = []
    for a, b in _ranges(numbers):
        if a == b:
            out.append(f"page {a} has no text layer (scanned image?)")
        else:
            out.append(f"pages {a}-{b} have no text layer (scanned images?)")
    return out


def _open_reader(data: bytes) -> tuple[Any, int]:
    """``(pypdf.PdfReader, page count)``, decrypted with the empty password when that works."""
    from pypdf import PasswordType, PdfReader
    from pypdf.errors import DependencyError

    try:
        reader = PdfReader(io.BytesIO(data), strict=False)
        if reader.is_encrypted:
            if reader.decrypt("") == PasswordType.NOT_DECRYPTED:
                raise UnreadableFile("encrypted PDF (needs a password)")
        count = len(reader.pages)
    except UnreadableFile:
        raise
    except DependencyError:
        raise UnreadableFile(
            "encrypted PDF (this encryption needs the optional 'cryptography' package to read)"
        ) from None
    except Exception:  # pypdf raises many types for damaged files
        raise UnreadableFile("not a valid PDF (truncated or damaged)") from None
    if count == 0:
        raise UnreadableFile("not a valid PDF (no pages found)")
    return reader, count


def read_pdf(
    data: bytes,
    max_pages: int = defaults.MAX_PDF_PAGES,
    max_seconds: float = defaults.MAX_FILE_SECONDS,
) -> tuple[tuple[Page, ...], list[str]]:
    """Pages and warnings of a PDF's bytes (see module docstring). Raises UnreadableFile."""
    if b"%PDF-" not in data[:1024]:  # the header may follow up to 1 KB of junk (common practice, no source)
        raise UnreadableFile("not a valid PDF (no PDF header)")
    reader, count = _open_reader(data)
    if count > max_pages:
        raise UnreadableFile(f"too many pages ({count}; the limit is {max_pages})")
    began = time.monotonic()
    pages: list[Page] = []
    empty: list[int] = []
    failed: list[int] = []
    warnings: list[str] = []
    for i in range(count):
        number = i + 1
        if i > 0 and time.monotonic() - began > max_seconds:  # page 1 is always read
            read = "only page 1 was" if i == 1 else f"only pages 1-{i} were"
            warnings.append(f"{read} read: the file took longer than {max_seconds:g} s (the limit)")
            break
        try:
            raw = reader.pages[i].extract_text() or ""
        except Exception:  # one bad page must not lose the rest
            failed.append(number)
            raw = ""
        text = repair_text(raw).text
        if text:
            pages.append(Page(number=number, text=text, locator=f"p. {number}"))
        else:
            if number not in failed:
                empty.append(number)
            pages.append(Page(number=number, text="", locator=f"p. {number}", has_text_layer=False))
    for a, b in _ranges(failed):
        span = f"page {a}" if a == b else f"pages {a}-{b}"
        warnings.append(f"{span}: text could not be extracted (damaged content)")
    if failed and len(failed) == len(pages):
        warnings = [w for w in warnings if "could not be extracted" not in w]
        warnings.append("no text could be extracted from any page (damaged content)")
    else:
        warnings = _no_text_warnings(empty, len(pages) - len(failed)) + warnings
    return tuple(pages), warnings
