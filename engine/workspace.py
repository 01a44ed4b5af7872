"""One folder under review: its index, the reader, and asking. The narrow interface the CLI and the UI use.

The reader is loaded lazily, once, and reused. Tests pass their own reader (anything with ``read_pairs``).
"""

from __future__ import annotations

import threading
from pathlib import Path
from typing import Callable

from engine import defaults
from engine.answering import Answerer
from engine.calibration import Calibration, load_calibration
from engine.indexer import IndexProgress, IndexReport, LoadedIndex, open_index, refresh_index
from engine.reader.interface import SpanReader
from engine.types import AskResult, Page

CAUTION = (
    "Answers are extracted automatically from your documents. They are not legal advice. "
    "Check every answer against its source; qualified counsel and local rules decide."
)


def load_default_reader(quantize: str | None = None) -> tuple[SpanReader, Calibration]:
    """The committed reader and its calibration, loaded offline."""
    from engine.reader.transformer_reader import TransformerReader, default_model_dir

    model_dir = default_model_dir()
    calibration = load_calibration(model_dir)
    reader = TransformerReader(model_dir, quantize=quantize or calibration.default_quantize)
    return reader, calibration


class Workspace:
    """A folder, its index and a reader. Thread-safe for one writer (refresh) and one reader (ask) at a time."""

    def __init__(
        self,
        folder: Path | str,
        reader: SpanReader | None = None,
        calibration: Calibration | None = None,
        reader_factory: Callable[[], tuple[SpanReader, Calibration]] | None = None,
    ) -> None:
        self.folder = Path(folder).resolve()
        if not self.folder.is_dir():
            raise ValueError(f"not a folder: {folder} (got a path that is not a directory)")
        self._reader = reader
        self._calibration = calibration or (Calibration() if reader is not None else None)
        self._reader_factory = reader_factory or load_default_reader
        self._index: LoadedIndex | None = None
        self._lock = threading.RLock()

    # Index -----------------------------------------------------------------
    def refresh(self, progress: Callable[[IndexProgress], None] | None = None,
                should_stop: Callable[[], bool] | None = None) -> IndexReport:
        report = refresh_index(self.folder, progress=progress, should_stop=should_stop)
        with self._lock:
            if self._index is not None:
                self._index.close()
            self._index = None
        return report

    @property
    def index(self) -> LoadedIndex:
        with self._lock:
            if self._index is None:
                self._index = open_index(self.folder)
            return self._index

    def documents(self) -> list[str]:
        return list(self.index.doc_names)

    def subfolders(self) -> list[str]:
        folders = {d.rsplit("/", 1)[0] for d in self.documents() if "/" in d}
        return sorted(folders)

    def pages(self, doc_path: str) -> list[Page]:
        """Every page of a document, in order, as stored (offsets in citations index ``Page.text``)."""
        return self.index.store.get_pages(self.index.resolve_doc(doc_path))

    # Reader ----------------------------------------------------------------
    @property
    def reader_loaded(self) -> bool:
        return self._reader is not None

    def ensure_reader(self) -> SpanReader:
        with self._lock:
            if self._reader is None:
                self._reader, self._calibration = self._reader_factory()
            return self._reader

    @property
    def calibration(self) -> Calibration:
        self.ensure_reader()
        assert self._calibration is not None
        return self._calibration

    def answerer(self, top_k: int = defaults.TOP_K_PASSAGES) -> Answerer:
        return Answerer(self.index, self.ensure_reader(), self.calibration, top_k)

    def ask(self, question: str, *, top_n: int = defaults.TOP_N_ANSWERS, doc: str | None = None,
            subfolder: str | None = None) -> AskResult:
        return self.answerer().ask(question, top_n=top_n, doc=doc, subfolder=subfolder)

    def close(self) -> None:
        with self._lock:
            if self._index is not None:
                self._index.close()
                self._index = None
