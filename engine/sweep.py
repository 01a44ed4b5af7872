"""The checklist sweep: every checklist question asked of every indexed document, one stored cell per pair.

A cell (document d, item q):
1. retrieval inside d only: the top ``k`` passages of d by BM25, best first; when fewer than ``k`` passages of d
   score above 0 (tiny documents, no shared terms) the rest of d's passages fill up to ``k`` in document order
   (``Bm25Index.top_k(drop_zero=False)``: positive scores first, then ties broken by lower position), so the reader
   always reads something;
2. reading: the (question, passage) pairs of many cells go to the reader in ONE ``read_pairs`` call (a batch of
   about ``batch_pairs`` pairs, crossing document boundaries), then the readings are split back per cell;
3. ranking: ``rank_answers(..., top_n=1)``; the cell keeps the best answer, or records an abstention together with
   the closest span below the threshold (``AskResult.shown``), so a reviewer still sees where to look.

Resumable: a cell is skipped when the store's ``done_keys`` entry for (d, q.label) equals (d's sha256,
sha256(question)). Cells are written right after their batch is read, so a killed sweep loses at most the batch
in flight. After the sweep (also when stopped early) cells whose document or label is no longer present are
deleted. ``should_stop`` is checked before each batch is read.
"""

from __future__ import annotations

import time
from dataclasses import dataclass
from typing import TYPE_CHECKING, Callable

from engine.answering import ScoredPassage, rank_answers
from engine.checklist import Checklist, ChecklistItem
from engine.review_store import ReviewStore, question_hash
from engine.text_tokens import tokenize_for_search

if TYPE_CHECKING:
    from engine.workspace import Workspace

BATCH_PAIRS = 64  # reader pairs per read_pairs call (4 cells x 16 pairs at top_k=4; no source: a size that fills
# several READER_BATCH_SIZE model batches while losing little work on a kill)
N_BEST = 5  # spans per reading, as the ask pipeline uses


@dataclass(frozen=True)
class SweepProgress:
    """``done``/``total`` count cells to sweep this run (skipped cells are in neither)."""

    done: int
    total: int
    cells_per_second: float
    eta_seconds: float | None  # None until the first batch has been timed
    current_doc: str


@dataclass(frozen=True)
class SweepReport:
    checklist: str
    cells_total: int  # documents x items
    cells_swept: int  # read and written this run
    cells_skipped: int  # already up to date
    abstained: int  # of the cells swept this run
    seconds: float
    windows_read: int  # the reader's ``windows_read`` delta (0 if it does not count)
    stopped: bool  # should_stop ended the run early


@dataclass(frozen=True)
class _Cell:
    doc_path: str
    doc_sha256: str
    item: ChecklistItem
    passages: tuple[ScoredPassage, ...]


class _DocPassages:
    """One document's BM25 positions and passages, fetched once and reused for every question."""

    def __init__(self, index, doc_path: str) -> None:
        self.index = index
        self.doc = doc_path
        self.positions = index.scope_positions(doc=doc_path)
        ids = [int(index.passage_ids[pos]) for pos in self.positions]
        self.by_id = index.store.get_passages(ids)

    def retrieve(self, question: str, k: int) -> tuple[ScoredPassage, ...]:
        """Top ``k`` passages of the document, zero-scored ones filling up (see the module docstring)."""
        hits = self.index.bm25.top_k(tokenize_for_search(question), k, candidate_ids=self.positions,
                                     drop_zero=False)
        out = []
        for pos, score in hits:
            passage = self.by_id.get(int(self.index.passage_ids[pos]))
            if passage is not None:  # gone since the BM25 file was built
                out.append(ScoredPassage(passage, max(0.0, float(score))))
        return tuple(out)


def _plan(workspace, checklist: Checklist, done: dict) -> tuple[list[tuple[str, str]], set, dict[str, str], int]:
    """(documents with their sha256, every expected (doc, label) key, label -> question hash, cells up to date)."""
    shas = {d.path: d.sha256 for d in workspace.index.store.list_documents()}
    docs = [(d, shas[d]) for d in workspace.documents() if d in shas]
    keys = {(d, item.label) for d, _ in docs for item in checklist.items}
    hashes = {item.label: question_hash(item.question) for item in checklist.items}
    skipped = sum(1 for d, sha in docs for item in checklist.items
                  if done.get((d, item.label)) == (sha, hashes[item.label]))
    return docs, keys, hashes, skipped


def run_sweep(
    workspace: Workspace,
    checklist: Checklist,
    *,
    progress: Callable[[SweepProgress], None] | None = None,
    should_stop: Callable[[], bool] | None = None,
    top_k: int = 4,
    batch_pairs: int = BATCH_PAIRS,
) -> SweepReport:
    """Sweep ``checklist`` over every document of ``workspace`` (see the module docstring)."""
    if top_k < 1:
        raise ValueError(f"top_k must be >= 1 (got {top_k})")
    if batch_pairs < 1:
        raise ValueError(f"batch_pairs must be >= 1 (got {batch_pairs})")
    started = time.perf_counter()
    reader = workspace.ensure_reader()
    calibration = workspace.calibration
    windows_before = getattr(reader, "windows_read", None)
    index = workspace.index
    with ReviewStore(workspace.folder) as store:
        done = store.done_keys(checklist.name)
        docs, keys, hashes, skipped = _plan(workspace, checklist, done)
        total = len(docs) * len(checklist.items) - skipped
        swept = abstained = 0
        stopped = False

        def report(current_doc: str) -> None:
            if progress is None:
                return
            elapsed = time.perf_counter() - started
            rate = swept / elapsed if swept and elapsed > 0 else 0.0
            eta = (total - swept) / rate if rate > 0 else (0.0 if swept == total else None)
            progress(SweepProgress(swept, total, round(rate, 3), None if eta is None else round(eta, 1), current_doc))

        def flush(batch: list[_Cell]) -> None:
            nonlocal swept, abstained
            pairs = [(cell.item.question, sp.passage.text) for cell in batch for sp in cell.passages]
            readings = reader.read_pairs(pairs, n_best=N_BEST) if pairs else []
            if len(readings) != len(pairs):
                raise ValueError(f"the reader returned {len(readings)} readings for {len(pairs)} pairs")
            at = 0
            for cell in batch:
                n = len(cell.passages)
                result = rank_answers(cell.item.question, cell.passages, readings[at: at + n], calibration, top_n=1)
                at += n
                answer = result.shown[0] if result.shown else None
                store.upsert_cell(checklist.name, cell.doc_path, cell.doc_sha256, cell.item.label,
                                  cell.item.question, answer, result.abstained)
                swept += 1
                abstained += result.abstained
            report(batch[-1].doc_path)

        report(docs[0][0] if docs else "")
        batch: list[_Cell] = []
        n_pairs = 0
        for doc_path, sha in docs:
            if stopped:
                break
            todo = [item for item in checklist.items
                    if done.get((doc_path, item.label)) != (sha, hashes[item.label])]
            if not todo:
                continue
            doc_passages = _DocPassages(index, doc_path)
            for item in todo:
                cell = _Cell(doc_path, sha, item, doc_passages.retrieve(item.question, top_k))
                batch.append(cell)
                n_pairs += len(cell.passages)
                if n_pairs >= batch_pairs:
                    if should_stop is not None and should_stop():
                        stopped = True
                        break
                    flush(batch)
                    batch, n_pairs = [], 0
        if batch and not stopped:
            if should_stop is not None and should_stop():
                stopped = True
            else:
                flush(batch)
        store.delete_cells_not_in(checklist.name, keys)
    windows_after = getattr(reader, "windows_read", None)
    windows = windows_after - windows_before if isinstance(windows_before, int) and isinstance(windows_after, int) else 0
    return SweepReport(
        checklist=checklist.name,
        cells_total=len(docs) * len(checklist.items),
        cells_swept=swept,
        cells_skipped=skipped,
        abstained=abstained,
        seconds=round(time.perf_counter() - started, 4),
        windows_read=windows,
        stopped=stopped,
    )
