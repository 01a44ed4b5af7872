"""Parse one file into a ``Document``: size and page limits, hashing, dispatch by extension.

``parse_file`` never raises for a bad file. It returns ``(Document, problems)`` where the non-fatal
problems (``fatal=False``) repeat ``Document.warnings``, or ``(None, [one fatal IngestProblem])``.
``sha256`` is the hex SHA-256 (FIPS 180-4) of the file's bytes as read.
"""

from __future__ import annotations

import hashlib
import os
from pathlib import Path

from engine import defaults
from engine.ingest import UnreadableFile
from engine.ingest.docx_file import read_docx
from engine.ingest.pdf_pages import read_pdf
from engine.ingest.text_files import read_text_file
from engine.types import Document, IngestProblem, Page

KIND_BY_SUFFIX: dict[str, str] = {".pdf": "pdf", ".txt": "txt", ".md": "md", ".docx": "docx"}


def _mb(n: int) -> str:
    """A size for people: whole MB (MiB), or whole KB (KiB) under 1 MB, so small limits never read "0 MB"."""
    if n < 1024 * 1024:
        return f"{n / 1024:.0f} KB"
    return f"{n / (1024 * 1024):.0f} MB"


def _read_bytes(abs_path: Path, max_bytes: int) -> tuple[bytes, os.stat_result]:
    try:
        st = abs_path.stat()
    except FileNotFoundError:
        raise UnreadableFile("file not found (moved or deleted?)") from None
    except PermissionError:
        raise UnreadableFile("file could not be read (permission denied)") from None
    except OSError as exc:
        raise UnreadableFile(f"file could not be read ({exc.strerror or 'error'})") from None
    if st.st_size > max_bytes:
        raise UnreadableFile(f"file too large ({_mb(st.st_size)}; the limit is {_mb(max_bytes)})")
    if st.st_size == 0:
        raise UnreadableFile("empty file (0 bytes)")
    try:
        with open(abs_path, "rb") as fh:
            data = fh.read(max_bytes + 1)
    except PermissionError:
        raise UnreadableFile("file could not be read (permission denied)") from None
    except IsADirectoryError:
        raise UnreadableFile("not a file (a folder)") from None
    except OSError as exc:
        raise UnreadableFile(f"file could not be read ({exc.strerror or 'error'})") from None
    if len(data) > max_bytes:
        raise UnreadableFile(f"file too large (over {_mb(max_bytes)}, the limit)")
    if not data:
        raise UnreadableFile("empty file (0 bytes)")
    return data, st


def _pages(
    kind: str, suffix: str, data: bytes, max_pages: int, max_bytes: int, max_seconds: float
) -> tuple[tuple[Page, ...], list[str]]:
    if kind == "pdf":
        if defaults.PDF_IN_CHILD_PROCESS:
            from engine.ingest.pdf_worker import shared_worker

            return shared_worker().read(data, max_pages, max_seconds)
        return read_pdf(data, max_pages=max_pages, max_seconds=max_seconds)
    if kind == "docx":
        return read_docx(data, max_unpacked=max_bytes)
    return read_text_file(data, suffix)


def parse_file(
    abs_path: Path,
    rel_path: str,
    *,
    max_bytes: int | None = None,
    max_pdf_pages: int | None = None,
    max_seconds: float | None = None,
) -> tuple[Document | None, list[IngestProblem]]:
    """Parse ``abs_path`` (reported as ``rel_path``); see the module docstring.

    A limit left as None is read from ``engine.defaults`` at call time (MAX_FILE_BYTES, MAX_PDF_PAGES,
    MAX_FILE_SECONDS); ``max_bytes`` also bounds a .docx package's unpacked size.
    """
    max_bytes = defaults.MAX_FILE_BYTES if max_bytes is None else max_bytes
    max_pdf_pages = defaults.MAX_PDF_PAGES if max_pdf_pages is None else max_pdf_pages
    max_seconds = defaults.MAX_FILE_SECONDS if max_seconds is None else max_seconds
    abs_path = Path(abs_path)
    suffix = abs_path.suffix.lower()
    kind = KIND_BY_SUFFIX.get(suffix)
    if kind is None:
        return None, [IngestProblem(rel_path, f"unsupported file type ({suffix or 'no extension'})")]
    try:
        data, st = _read_bytes(abs_path, max_bytes)
        pages, warnings = _pages(kind, suffix, data, max_pdf_pages, max_bytes, max_seconds)
    except UnreadableFile as exc:
        return None, [IngestProblem(rel_path, str(exc))]
    except MemoryError:
        return None, [IngestProblem(rel_path, "file could not be read (out of memory)")]
    except Exception as exc:  # last line of defence: a parser bug must not stop a whole folder
        return None, [IngestProblem(rel_path, f"file could not be read ({type(exc).__name__})")]
    doc = Document(
        path=rel_path,
        kind=kind,
        pages=pages,
        size=len(data),
        mtime_ns=st.st_mtime_ns,
        sha256=hashlib.sha256(data).hexdigest(),
        warnings=tuple(warnings),
    )
    return doc, [IngestProblem(rel_path, w, fatal=False) for w in warnings]
