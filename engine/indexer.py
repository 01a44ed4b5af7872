"""Incremental indexing of a folder into FOLDER/.excerptor/ (SQLite store + BM25 statistics file).

A refresh:
1. lists candidate files (the walker), then for each file, checking ``should_stop`` between files:
   - size and mtime_ns unchanged -> unchanged (a file that failed before with the same stat is not retried,
     unless the ingest limits changed since: see ``ingest_settings_key``);
   - same size, new mtime, same sha256 -> only the stat is updated;
   - otherwise -> parsed, cut into passages, tokenised and stored (one transaction per file);
2. drops documents whose files are gone (always: the listing is complete even when stopped early);
3. if anything changed, rebuilds BM25 from the stored token lists (``engine.bm25_file``): written as
   ``bm25-<generation>.npz`` (temp file + os.replace), then meta points at it in one transaction, then older files
   are deleted. Until that moment the previous file and meta stay valid, so an interrupted run leaves a usable
   index.
BM25 position i is the i-th passage in passage_id order; the file carries the position -> passage_id and
position -> document maps, so it stays self-consistent even if the store moved on after it was built.
"""

from __future__ import annotations

import contextlib
import dataclasses
import time
from collections.abc import Callable, Iterator, Sequence
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from engine import defaults
from engine.bm25 import Bm25Index
from engine.bm25_file import bm25_file_ok, load_bm25, rebuild_bm25, sha256_file
from engine.index_store import IndexStore, StoredProblem
from engine.text_tokens import tokenize_for_search
from engine.types import Document, IngestProblem, Passage

__all__ = ["IndexProgress", "IndexReport", "LoadedIndex", "index_dir", "open_index", "refresh_index", "refresh_lock"]


@dataclass(frozen=True)
class IndexProgress:
    done: int  # files handled so far
    total: int  # files found
    current_file: str  # relative path being handled ("" when finished)


@dataclass(frozen=True)
class IndexReport:
    indexed: tuple[str, ...]  # parsed and stored this run
    unchanged: tuple[str, ...]
    removed: tuple[str, ...]  # gone from the folder (or no longer readable)
    failed: tuple[IngestProblem, ...]  # fatal problems: these files are not in the index
    warnings: tuple[IngestProblem, ...]  # non-fatal problems of files read this run
    seconds: float
    n_passages: int  # passages in the index after the run
    stopped: bool = False  # should_stop ended the run before every file was handled


# Ingest entry points, looked up at call time (tests replace these).
def _walk(root: Path, problems: list[IngestProblem]) -> Iterator[tuple[Path, str]]:
    from engine.ingest.walker import walk_folder

    return walk_folder(root, problems=problems)


def _parse(abs_path: Path, rel_path: str) -> tuple[Document | None, list[IngestProblem]]:
    from engine.ingest.parse import parse_file

    return parse_file(abs_path, rel_path)


def _split(doc: Document) -> list[Passage]:
    from engine.passages import split_passages

    return split_passages(doc)


def index_dir(folder: Path) -> Path:
    return Path(folder) / defaults.INDEX_DIR_NAME


def _as_problems(doc: Document, problems: list[IngestProblem]) -> list[IngestProblem]:
    """Parser problems plus the document's own warnings (without repeating a reason)."""
    out = list(problems)
    seen = {p.reason for p in out}
    out += [IngestProblem(doc.path, w, fatal=False) for w in doc.warnings if w not in seen]
    return out


def ingest_settings_key() -> str:
    """The limits a failure depends on; a failed file is retried when this differs from the stored key."""
    return (f"bytes={defaults.MAX_FILE_BYTES};seconds={defaults.MAX_FILE_SECONDS};"
            f"pdf_pages={defaults.MAX_PDF_PAGES};pdf_child={defaults.PDF_IN_CHILD_PROCESS}")


class _Run:
    """State of one refresh: the store, what it knew before, and what happened to each file."""

    def __init__(self, store: IndexStore) -> None:
        self.store = store
        self.known = {d.path: d for d in store.list_documents()}
        self.old_failures: dict[str, list[StoredProblem]] = {}
        for sp in store.list_problems():
            if sp.problem.fatal:
                self.old_failures.setdefault(sp.problem.path, []).append(sp)
        self.changed = store.get_meta("dirty") == "1"  # a previous run stopped before its BM25 rebuild
        self.settings = ingest_settings_key()
        if store.get_meta("ingest_settings") != self.settings:  # limits changed: failed files get another try
            self.old_failures = {}
        self.indexed: list[str] = []
        self.unchanged: list[str] = []
        self.removed: list[str] = []
        self.failed: list[IngestProblem] = []
        self.warnings: list[IngestProblem] = []

    def _mark_dirty(self) -> None:
        if not self.changed:
            self.store.set_meta({"dirty": "1"})
        self.changed = True

    def remove(self, rel: str) -> None:
        self._mark_dirty()
        self.store.delete_document(rel)
        self.removed.append(rel)

    def report(self, problems: list[IngestProblem]) -> None:
        self.failed += [p for p in problems if p.fatal]
        self.warnings += [p for p in problems if not p.fatal]

    def fail(self, rel: str, problems: list[IngestProblem], size: int | None, mtime_ns: int | None) -> None:
        if not any(p.fatal for p in problems):
            problems = [*problems, IngestProblem(rel, "could not read the file")]
        if rel in self.known:  # stale content must not be served
            self.remove(rel)
        self.store.record_problems(rel, problems, size, mtime_ns)
        self.report(problems)

    def handle(self, abs_path: Path, rel: str) -> None:
        try:
            st = abs_path.stat()
        except FileNotFoundError:  # listed, then deleted or moved before it was reached
            self.fail(rel, [IngestProblem(rel, "file not found (moved or deleted?)")], None, None)
            return
        except OSError as exc:
            self.fail(rel, [IngestProblem(rel, f"cannot read the file's details ({exc.strerror or exc})")], None, None)
            return
        stat = (st.st_size, st.st_mtime_ns)
        prev = self.known.get(rel)
        if prev is not None and (prev.size, prev.mtime_ns) == stat:
            self.unchanged.append(rel)
            return
        if prev is not None and prev.size == st.st_size:
            try:
                same = sha256_file(abs_path) == prev.sha256.lower()
            except OSError:
                same = False
            if same:
                self.store.update_stat(rel, *stat)
                self.unchanged.append(rel)
                return
        fails = self.old_failures.get(rel)
        if prev is None and fails and all((f.size, f.mtime_ns) == stat for f in fails):
            self.failed += [f.problem for f in fails]  # the same bad file as last time: not retried
            return
        try:
            doc, problems = _parse(abs_path, rel)
            problems = list(problems)
            if doc is not None:
                if doc.path != rel:
                    doc = dataclasses.replace(doc, path=rel)
                passages = _split(doc)
                tokens = [tokenize_for_search(p.text) for p in passages]
        except Exception as exc:  # noqa: BLE001 - one bad file must not stop the folder
            doc, problems = None, [IngestProblem(rel, f"could not read the file ({type(exc).__name__}: {exc})")]
        if doc is None:
            self.fail(rel, problems, *stat)
            return
        problems = _as_problems(doc, problems)
        self._mark_dirty()
        self.store.upsert_document(doc, passages, tokens, problems)
        self.indexed.append(rel)
        self.report(problems)

    def finish(self, seen: set[str], walk_problems: list[IngestProblem]) -> None:
        """Drop vanished documents, record the walker's problems, forget problems of vanished files."""
        for rel in sorted(set(self.known) - seen):
            self.remove(rel)
        by_path: dict[str, list[IngestProblem]] = {}
        for p in walk_problems:
            by_path.setdefault(p.path, []).append(p)
        for path, problems in by_path.items():
            if path not in seen:
                self.store.record_problems(path, problems)
            self.report(problems)
        stale = {sp.problem.path for sp in self.store.list_problems()} - seen - set(by_path)
        self.store.clear_problems(stale)


@contextlib.contextmanager
def refresh_lock(idir: Path) -> Iterator[None]:
    """Hold an exclusive advisory lock on IDIR/refresh.lock: two refreshes of one folder run one after the other.

    Where ``fcntl`` is missing (Windows) this is a no-op; the BM25 switch-over stays atomic either way.
    """
    try:
        import fcntl
    except ImportError:  # pragma: no cover - not POSIX
        yield
        return
    with open(idir / "refresh.lock", "a+b") as handle:
        fcntl.flock(handle.fileno(), fcntl.LOCK_EX)
        try:
            yield
        finally:
            fcntl.flock(handle.fileno(), fcntl.LOCK_UN)


def refresh_index(
    folder: Path,
    progress: Callable[[IndexProgress], None] | None = None,
    should_stop: Callable[[], bool] | None = None,
) -> IndexReport:
    """Bring FOLDER/.excerptor up to date with the files in FOLDER (see the module docstring)."""
    t0 = time.perf_counter()
    folder = Path(folder)
    if not folder.is_dir():
        raise ValueError(f"refresh_index needs an existing folder (got {str(folder)!r})")
    idir = index_dir(folder)
    idir.mkdir(exist_ok=True)
    stopped = False
    with refresh_lock(idir), IndexStore(idir / defaults.INDEX_DB_NAME) as store:
        run = _Run(store)
        walk_problems: list[IngestProblem] = []
        prefix = defaults.INDEX_DIR_NAME + "/"
        files = [(a, r) for a, r in _walk(folder, walk_problems) if not r.startswith(prefix)]
        for i, (abs_path, rel) in enumerate(files):
            if should_stop is not None and should_stop():
                stopped = True
                break
            if progress is not None:
                progress(IndexProgress(i, len(files), rel))
            run.handle(abs_path, rel)
        run.finish({r for _, r in files}, walk_problems)
        if not stopped:  # every file was seen under these limits; a stopped run retries again next time
            store.set_meta({"ingest_settings": run.settings})
        if run.changed or not bm25_file_ok(store, idir):
            rebuild_bm25(store, idir)
        n_passages = store.count_passages()
    if progress is not None:
        progress(IndexProgress(len(files), len(files), ""))
    return IndexReport(
        indexed=tuple(run.indexed),
        unchanged=tuple(run.unchanged),
        removed=tuple(run.removed),
        failed=tuple(run.failed),
        warnings=tuple(run.warnings),
        seconds=time.perf_counter() - t0,
        n_passages=n_passages,
        stopped=stopped,
    )


class LoadedIndex:
    """An open index: store + BM25 + position maps. ``stale``: files changed after the BM25 file was built."""

    def __init__(
        self,
        folder: Path,
        store: IndexStore,
        bm25: Bm25Index,
        passage_ids: np.ndarray,
        doc_names: list[str],
        doc_of_pos: np.ndarray,
        generation: int,
        stale: bool,
    ) -> None:
        if not (len(passage_ids) == len(doc_of_pos) == bm25.n_passages):
            raise ValueError(f"position maps do not fit the BM25 index (got {len(passage_ids)}, {bm25.n_passages})")
        self.folder, self.store, self.bm25 = folder, store, bm25
        self.passage_ids, self.doc_names, self.doc_of_pos = passage_ids, doc_names, doc_of_pos
        self.generation, self.stale = generation, stale

    def close(self) -> None:
        self.store.close()

    def __enter__(self) -> LoadedIndex:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()

    @staticmethod
    def _clean(path: str) -> str:
        path = path.replace("\\", "/").strip()
        while path.startswith("./"):
            path = path[2:]
        return path.strip("/")

    def resolve_doc(self, doc: str) -> str:
        """An indexed document's relative path, from that path or (if unique) its file name."""
        name = self._clean(doc)
        if name in self.doc_names:
            return name
        for norm in (str, str.casefold):  # exact file name first, then ignoring letter case
            hits = [d for d in self.doc_names if norm(d.rsplit("/", 1)[-1]) == norm(name)]
            if len(hits) == 1:
                return hits[0]
            if len(hits) > 1:
                raise ValueError(f"document name {doc!r} is ambiguous (got {', '.join(hits[:5])})")
        raise ValueError(f"no indexed document matches {doc!r}")

    def scope_positions(self, doc: str | None = None, subfolder: str | None = None) -> np.ndarray | None:
        """BM25 positions inside the scope (None: the whole folder)."""
        if doc is None and subfolder is None:
            return None
        allowed = np.ones(len(self.doc_names), dtype=bool)
        if doc is not None:
            allowed[:] = False
            allowed[self.doc_names.index(self.resolve_doc(doc))] = True
        if subfolder is not None:
            sub = self._clean(subfolder)
            if sub not in ("", "."):
                inside = np.array([d.startswith(sub + "/") for d in self.doc_names], dtype=bool)
                if not inside.any():
                    raise ValueError(f"no indexed document under subfolder {subfolder!r}")
                allowed &= inside
        return np.flatnonzero(allowed[self.doc_of_pos]) if len(self.doc_of_pos) else np.zeros(0, np.int64)

    def search(
        self, query: str, k: int, doc: str | None = None, subfolder: str | None = None
    ) -> list[tuple[Passage, float]]:
        """Top ``k`` passages for ``query`` by BM25, best first, within the scope (see the tiny-corpus note)."""
        candidates = self.scope_positions(doc, subfolder)
        hits = self.bm25.top_k(tokenize_for_search(query), k, candidate_ids=candidates)
        # In a tiny corpus rank-bm25's epsilon floor can leave every matching passage with a score <= 0 (terms in
        # more than half the passages); then the passages that share a term with the query are still returned.
        positive = [(pos, score) for pos, score in hits if score > 0]
        if not positive:
            positive = [(pos, score) for pos, score in self.bm25.top_k(tokenize_for_search(query), k,
                                                                        candidate_ids=candidates, drop_zero=False)
                        if score != 0]
        return self._passages(positive)

    def _passages(self, hits: Sequence[tuple[int, float]]) -> list[tuple[Passage, float]]:
        found = self.store.get_passages([int(self.passage_ids[pos]) for pos, _ in hits])
        out = []
        for pos, score in hits:
            passage = found.get(int(self.passage_ids[pos]))
            if passage is not None:  # gone since the BM25 file was built
                out.append((passage, score))
        return out


def open_index(folder: Path) -> LoadedIndex:
    """Open FOLDER's index for searching. Rebuilds the BM25 file from the store if it is missing or damaged,
    or if the last refresh stopped before its BM25 rebuild (each stored file is a complete transaction, so the
    store is always a consistent view; a stale BM25 file could only hide its newer passages).

    Raises FileNotFoundError when the folder has never been indexed.
    """
    idir = index_dir(folder)
    db = idir / defaults.INDEX_DB_NAME
    if not db.is_file():
        raise FileNotFoundError(f"no index in {str(folder)!r}: refresh it first")
    store = IndexStore(db)
    try:
        loaded = None
        if bm25_file_ok(store, idir) and store.get_meta("dirty") != "1":
            try:
                loaded = load_bm25(idir / str(store.get_meta("bm25_file")))
            except (ValueError, KeyError):
                loaded = None
        if loaded is None:
            loaded = load_bm25(rebuild_bm25(store, idir))
    except BaseException:
        store.close()
        raise
    bm25, passage_ids, doc_names, doc_of_pos = loaded
    return LoadedIndex(
        folder=Path(folder),
        store=store,
        bm25=bm25,
        passage_ids=passage_ids,
        doc_names=doc_names,
        doc_of_pos=doc_of_pos,
        generation=store.generation,
        stale=store.get_meta("dirty") == "1",
    )
