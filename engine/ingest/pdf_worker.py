"""Read PDFs in a child process, so that one page that hangs inside pypdf can be stopped.

The soft limit (``max_seconds``) is checked by ``read_pdf`` between pages. The hard limit kills the child when
no answer came within ``max_seconds * 2 + HARD_LIMIT_GRACE`` seconds; the next PDF starts a fresh child.
Messages are length-prefixed frames of JSON and raw bytes over the child's stdin/stdout (no pickle): request = options JSON, then the file's bytes;
reply = ``{"ok": true, "pages": [[number, text, locator, has_text_layer], ...], "warnings": [...]}`` or
``{"ok": false, "reason": "..."}``.
"""

from __future__ import annotations

import importlib
import json
import os
import select
import struct
import subprocess
import sys
import threading
from pathlib import Path

from engine.ingest import UnreadableFile
from engine.types import Page

HARD_LIMIT_GRACE = 10.0
DEFAULT_TARGET = "engine.ingest.pdf_pages:read_pdf"
_FRAME = struct.Struct(">Q")  # every message: an 8-byte big-endian length, then that many bytes


def _write_frame(stream, payload: bytes) -> None:
    stream.write(_FRAME.pack(len(payload)) + payload)
    stream.flush()


def _read_exact(stream, n: int) -> bytes:
    chunks, left = [], n
    while left:
        chunk = stream.read(left)
        if not chunk:
            raise EOFError("pipe closed")
        chunks.append(chunk)
        left -= len(chunk)
    return b"".join(chunks)


def _read_frame(stream) -> bytes:
    (n,) = _FRAME.unpack(_read_exact(stream, _FRAME.size))
    return _read_exact(stream, n)


def _serve(target: str) -> None:  # runs in the child: frames on stdin, replies on stdout
    module, _, name = target.partition(":")
    read = getattr(importlib.import_module(module), name)
    source, sink = sys.stdin.buffer, sys.stdout.buffer
    while True:
        try:
            options = json.loads(_read_frame(source))
            data = _read_frame(source)
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
        _write_frame(sink, json.dumps(reply).encode("utf-8"))


class PdfWorker:
    """One reusable child process (a plain subprocess with pipes, so it works under any host that replaces
    ``sys.stderr``, such as a terminal UI); thread-safe, one PDF at a time."""

    def __init__(self, target: str = DEFAULT_TARGET) -> None:
        self.target = target
        self._lock = threading.Lock()
        self._process: subprocess.Popen | None = None

    def _ensure(self) -> subprocess.Popen:
        if self._process is not None and self._process.poll() is None:
            return self._process
        root = str(Path(__file__).resolve().parents[2])
        env = dict(os.environ, PYTHONPATH=os.pathsep.join([root, *filter(None, [os.environ.get("PYTHONPATH")])]))
        self._process = subprocess.Popen(
            [sys.executable, "-m", "engine.ingest.pdf_worker", self.target],
            stdin=subprocess.PIPE, stdout=subprocess.PIPE, stderr=subprocess.DEVNULL, env=env, cwd=root,
        )
        return self._process

    def stop(self) -> None:
        if self._process is not None:
            self._process.kill()
            self._process.wait(timeout=5)
            for stream in (self._process.stdin, self._process.stdout):
                if stream:
                    stream.close()
        self._process = None

    def read(self, data: bytes, max_pages: int, max_seconds: float) -> tuple[tuple[Page, ...], list[str]]:
        hard_limit = max_seconds * 2 + HARD_LIMIT_GRACE
        with self._lock:
            process = self._ensure()
            try:
                _write_frame(process.stdin, json.dumps({"max_pages": max_pages, "max_seconds": max_seconds}).encode())
                _write_frame(process.stdin, data)
                ready, _, _ = select.select([process.stdout], [], [], hard_limit)
                raw = _read_frame(process.stdout) if ready else None
            except (EOFError, OSError):
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


if __name__ == "__main__":
    _serve(sys.argv[1] if len(sys.argv) > 1 else DEFAULT_TARGET)
