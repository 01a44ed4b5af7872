"""Read PDFs in a child process, so that one page that hangs inside pypdf can be stopped.

The soft limit (``max_seconds``) is checked by ``read_pdf`` between pages. The hard limit kills the child when
no answer came within ``max_seconds * 2 + HARD_LIMIT_GRACE`` seconds; the next PDF starts a fresh child.
Messages are JSON and raw bytes over a pipe (no pickle): request = options JSON, then the file's bytes;
reply = ``{"ok": true, "pages": [[number, text, locator, has_text_layer], ...], "warnings": [...]}`` or
``{"ok": false, "reason": "..."}``.
"""

from __future__ import annotations

import importlib
import json
import multiprocessing
import threading

from engine.ingest import UnreadableFile
from engine.types import Page

HARD_LIMIT_GRACE = 10.0
DEFAULT_TARGET = "engine.ingest.pdf_pages:read_pdf"


def _serve(conn, target: str) -> None:  # runs in the child
    module, _, name = target.partition(":")
    read = getattr(importlib.import_module(module), name)
    while True:
        try:
            options = json.loads(conn.recv_bytes())
            data = conn.recv_bytes()
        except (EOFError, OSError):
            return
        try:
            pages, warnings = read(data, max_pages=options["max_pages"], max_seconds=options["max_seconds"])
            reply = {"ok": True, "warnings": list(warnings),
                     "pages": [[p.number, p.text, p.locator, p.has_text_layer] for p in pages]}
        except UnreadableFile as exc:
            reply = {"ok": False, "reason": str(exc)}
        except MemoryError:
            reply = {"ok": False, "reason": "file could not be read (out of memory)"}
        except Exception as exc:  # noqa: BLE001 - reported as one line, the child keeps serving
            reply = {"ok": False, "reason": f"file could not be read ({type(exc).__name__})"}
        conn.send_bytes(json.dumps(reply).encode("utf-8"))


class PdfWorker:
    """One reusable child process; thread-safe (one PDF at a time)."""

    def __init__(self, target: str = DEFAULT_TARGET) -> None:
        self.target = target
        self._lock = threading.Lock()
        self._process = None
        self._conn = None

    def _ensure(self) -> None:
        if self._process is not None and self._process.is_alive():
            return
        context = multiprocessing.get_context("spawn")
        parent, child = context.Pipe()
        process = context.Process(target=_serve, args=(child, self.target), daemon=True,
                                  name="excerptor-pdf-reader")
        process.start()
        child.close()
        self._process, self._conn = process, parent

    def stop(self) -> None:
        if self._process is not None:
            self._process.kill()
            self._process.join(timeout=5)
        self._process = self._conn = None

    def read(self, data: bytes, max_pages: int, max_seconds: float) -> tuple[tuple[Page, ...], list[str]]:
        hard_limit = max_seconds * 2 + HARD_LIMIT_GRACE
        with self._lock:
            self._ensure()
            try:
                self._conn.send_bytes(json.dumps({"max_pages": max_pages, "max_seconds": max_seconds}).encode())
                self._conn.send_bytes(data)
                ready = self._conn.poll(hard_limit)
                raw = self._conn.recv_bytes() if ready else None
            except (EOFError, OSError, BrokenPipeError):
                self.stop()
                raise UnreadableFile("not a valid PDF (the reader crashed on it)") from None
            if raw is None:
                self.stop()
                raise UnreadableFile(f"reading the PDF took longer than {hard_limit:g} s (the limit); stopped")
        reply = json.loads(raw)
        if not reply["ok"]:
            raise UnreadableFile(reply["reason"])
        pages = tuple(Page(number=n, text=t, locator=loc, has_text_layer=bool(h)) for n, t, loc, h in reply["pages"])
        return pages, list(reply["warnings"])


_shared: PdfWorker | None = None
_shared_lock = threading.Lock()


def shared_worker() -> PdfWorker:
    global _shared
    with _shared_lock:
        if _shared is None:
            _shared = PdfWorker()
        return _shared
