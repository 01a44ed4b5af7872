"""The checklist sweep: fills every (document, question) cell, batches the reader, resumes, survives SIGKILL.

Uses the fake reader (tests/fakes.py) over small .txt folders. Expected values are this project's own sweep
contract (``engine.sweep`` module docstring), marked "(sweep spec, no outside source)"; the question hash is
checked against Python's hashlib SHA-256 (FIPS 180-4).
"""

from __future__ import annotations

import argparse
import hashlib
import importlib.util
import json
import math
import subprocess
import sys
import textwrap
from pathlib import Path

import pytest

from engine.checklist import load_checklist
from engine.cli_sweep import CELL_KEYS, add_sweep_parser, format_seconds, progress_line
from engine.indexer import open_index, refresh_index
from engine.review_store import ReviewStore
from engine.sweep import SweepProgress, run_sweep
from engine.training.synth_contracts import generate_windows
from engine.workspace import Workspace
from tests.fakes import FAKE_CALIBRATION, FakeReader

ROOT = Path(__file__).resolve().parents[1]
CHECKLIST = """\
# invented test checklist
term :: How long is the initial term of the agreement?
law :: Which law governs the agreement?
notice :: How much notice is required to terminate for convenience?
"""


class RecordingReader(FakeReader):
    """The fake reader, keeping every batch of pairs it was given."""

    def __init__(self) -> None:
        super().__init__()
        self.batches: list[list[tuple[str, str]]] = []

    def read_pairs(self, pairs, n_best=5):
        self.batches.append(list(pairs))
        return super().read_pairs(pairs, n_best)


def contract(seed: int, windows: int = 3) -> str:
    return "\n\n".join(w.context for w in generate_windows(windows, seed)) + "\n"


@pytest.fixture()
def folder(tmp_path) -> Path:
    docs = tmp_path / "docs"
    (docs / "leases").mkdir(parents=True)
    (docs / "alpha.txt").write_text(contract(11), encoding="utf-8")
    (docs / "leases" / "beta.txt").write_text(contract(12, 4), encoding="utf-8")
    (docs / "tiny.txt").write_text("Rent is payable monthly in advance.\n", encoding="utf-8")
    (tmp_path / "mini.checklist").write_text(CHECKLIST, encoding="utf-8")
    return docs


def checklist_of(folder: Path):
    return load_checklist(folder.parent / "mini.checklist")


def sweep(folder: Path, reader=None, **kwargs):
    refresh_index(folder)
    workspace = Workspace(folder, reader=reader or FakeReader(), calibration=FAKE_CALIBRATION)
    try:
        return run_sweep(workspace, checklist_of(folder), **kwargs), workspace
    finally:
        workspace.close()


def stored(folder: Path, name: str = "mini"):
    with ReviewStore(folder) as store:
        return store.cells(name)


def passage_counts(folder: Path) -> dict[str, int]:
    with open_index(folder) as index:
        return {d: len(index.scope_positions(doc=d)) for d in index.doc_names}


def test_sweep_fills_every_cell_reading_inside_each_document(folder):
    reader = RecordingReader()
    report, workspace = sweep(folder, reader)
    counts = passage_counts(folder)
    labels = ("term", "law", "notice")
    cells = stored(folder)
    # one cell per (document, item); documents x items in all (sweep spec, no outside source)
    assert sorted((c.doc_path, c.label) for c in cells) == sorted((d, lab) for d in counts for lab in labels)
    assert (report.cells_total, report.cells_swept, report.cells_skipped) == (9, 9, 0)
    assert report.abstained == sum(c.abstained for c in cells) and not report.stopped
    # each cell reads min(k, passages of its document) passages, zero-scored ones filling up: tiny.txt shares no
    # word with "Which law governs the agreement?" yet is still read (sweep spec, no outside source)
    assert report.windows_read == sum(min(4, n) for n in counts.values()) * len(labels)
    tiny_text = "Rent is payable monthly in advance."
    read = [pair for batch in reader.batches for pair in batch]
    assert ("Which law governs the agreement?", tiny_text) in read
    # the passages scoring above 0 come first, exactly as the ask pipeline's scoped search ranks them
    # (LoadedIndex.search, BM25 Okapi as rank-bm25 0.2.2 scores it)
    at = 0
    with open_index(folder) as index:
        for doc in sorted(counts):
            for item in checklist_of(folder).items:
                n = min(4, counts[doc])
                searched = [p.text for p, _ in index.search(item.question, 4, doc=doc)]
                assert [text for _, text in read[at: at + n]][: len(searched)] == searched
                at += n
    assert at == len(read)
    # answers are exact spans of their own document's page text (engine/types.py invariant, no outside source)
    with open_index(folder) as index:
        pages = {d: index.store.get_pages(d) for d in counts}
    for cell in cells:
        assert cell.answer is not None or cell.abstained  # no span at all only where the cell abstained
        if cell.answer is not None:
            page = next(p for p in pages[cell.doc_path] if p.locator == cell.locator and p.number == cell.page)
            assert page.text[cell.start:cell.end] == cell.answer
        # the stored question hash is SHA-256 of the UTF-8 question (FIPS 180-4, via hashlib)
        assert cell.question_hash == hashlib.sha256(cell.question.encode("utf-8")).hexdigest()


def test_reader_calls_are_batched_across_cells(folder):
    reader = RecordingReader()
    report, _ = sweep(folder, reader)
    # 9 cells, at most 4 pairs each (36 <= 64): one read_pairs call for the whole sweep (sweep spec, no source)
    assert len(reader.batches) == 1 and report.cells_swept == 9
    batched = {(c.doc_path, c.label): (c.answer, c.score) for c in stored(folder)}
    with ReviewStore(folder) as store:
        store.delete_cells_not_in("mini", ())
    one_by_one = RecordingReader()
    sweep(folder, one_by_one, batch_pairs=1)
    assert len(one_by_one.batches) == 9  # every cell flushed on its own
    # batching does not change any answer (sweep spec, no outside source)
    assert {(c.doc_path, c.label): (c.answer, c.score) for c in stored(folder)} == batched


def test_rerun_sweeps_nothing(folder):
    sweep(folder)
    before = [(c.cell_id, c.answer, c.swept_at) for c in stored(folder)]
    reader = RecordingReader()
    report, _ = sweep(folder, reader)
    # every cell up to date: nothing read, nothing written (sweep spec, no outside source)
    assert (report.cells_swept, report.cells_skipped, report.windows_read) == (0, 9, 0)
    assert reader.batches == []
    assert [(c.cell_id, c.answer, c.swept_at) for c in stored(folder)] == before


def accept_all(folder: Path) -> None:
    with ReviewStore(folder) as store:
        for cell in store.cells("mini"):
            store.set_cell_decision(cell.cell_id, "accepted", note="seen")


def test_editing_a_document_resweeps_only_its_cells_and_clears_their_decisions(folder):
    sweep(folder)
    accept_all(folder)
    (folder / "leases" / "beta.txt").write_text(contract(99, 2), encoding="utf-8")
    report, _ = sweep(folder)
    # only beta's three cells are swept again (sweep spec, no outside source)
    assert (report.cells_swept, report.cells_skipped) == (3, 6)
    for cell in stored(folder):
        edited = cell.doc_path == "leases/beta.txt"
        assert cell.decision == (None if edited else "accepted")
        assert cell.note == "seen"  # the review store keeps notes across re-sweeps (review store spec)


def test_editing_a_question_resweeps_only_its_column(folder):
    sweep(folder)
    accept_all(folder)
    path = folder.parent / "mini.checklist"
    path.write_text(CHECKLIST.replace("Which law governs the agreement?", "What is the governing law?"),
                    encoding="utf-8")
    report, _ = sweep(folder)
    assert (report.cells_swept, report.cells_skipped) == (3, 6)  # one column of 3 documents (sweep spec)
    for cell in stored(folder):
        assert cell.decision == (None if cell.label == "law" else "accepted")
        if cell.label == "law":
            assert cell.question == "What is the governing law?"


def test_removed_documents_and_questions_lose_their_cells(folder):
    sweep(folder)
    (folder / "tiny.txt").unlink()
    path = folder.parent / "mini.checklist"
    path.write_text(CHECKLIST.replace("notice :: How much notice is required to terminate for convenience?\n", ""),
                    encoding="utf-8")
    report, _ = sweep(folder)
    # cells of gone documents and labels are deleted; nothing is read (sweep spec, no outside source)
    assert (report.cells_total, report.cells_swept) == (4, 0)
    assert sorted((c.doc_path, c.label) for c in stored(folder)) == sorted(
        (d, lab) for d in ("alpha.txt", "leases/beta.txt") for lab in ("term", "law"))


def test_progress_and_should_stop(folder):
    seen: list[SweepProgress] = []
    report, _ = sweep(folder, progress=seen.append, should_stop=lambda: len(seen) > 1, batch_pairs=4)
    # progress starts at 0, then once per batch; should_stop is asked before each batch (sweep spec, no source)
    assert seen[0].done == 0 and seen[0].total == 9 and seen[0].eta_seconds is None
    assert report.stopped and report.cells_swept == seen[-1].done == len(stored(folder)) < 9
    rest, _ = sweep(folder, progress=seen.append)
    assert rest.cells_swept == 9 - report.cells_swept and rest.cells_skipped == report.cells_swept
    assert seen[-1].done == seen[-1].total == rest.cells_swept and seen[-1].eta_seconds == 0.0
    line = progress_line(SweepProgress(3, 9, 1.5, 4.0, "alpha.txt"))
    assert line.startswith("[3/9] 1.5 cells/s, ETA 0:04  alpha.txt")  # (CLI spec, no outside source)
    assert format_seconds(3725) == "1:02:05"  # 3725 s = 1 h 2 min 5 s (arithmetic)


def test_bad_arguments(folder):
    with pytest.raises(ValueError, match="top_k"):
        sweep(folder, top_k=0)
    with pytest.raises(ValueError, match="batch_pairs"):
        sweep(folder, batch_pairs=0)


KILL_SCRIPT = textwrap.dedent("""
    import os, sys
    sys.path.insert(0, {root!r})
    from engine.checklist import load_checklist
    from engine.sweep import run_sweep
    from engine.workspace import Workspace
    from tests.fakes import FAKE_CALIBRATION, FakeReader

    class KillingReader(FakeReader):
        def read_pairs(self, pairs, n_best=5):
            if self.calls == 2:  # the third batch: killed while reading it
                os.kill(os.getpid(), 9)
            return super().read_pairs(pairs, n_best)

    workspace = Workspace({folder!r}, reader=KillingReader(), calibration=FAKE_CALIBRATION)
    run_sweep(workspace, load_checklist({checklist!r}), batch_pairs=4,
              progress=lambda p: print(p.done, flush=True))
""")


def test_sigkill_midway_loses_at_most_the_batch_in_flight(folder):
    refresh_index(folder)
    script = KILL_SCRIPT.format(root=str(ROOT), folder=str(folder), checklist=str(folder.parent / "mini.checklist"))
    proc = subprocess.run([sys.executable, "-c", script], capture_output=True, text=True, timeout=120)
    assert proc.returncode == -9, proc.stderr  # killed by SIGKILL (POSIX: negative signal number)
    reported = [int(x) for x in proc.stdout.split()]
    committed = stored(folder)
    # two batches finished and were reported; exactly their cells are stored (sweep spec, no outside source)
    assert len(reported) == 3 and reported[-1] == len(committed) and 0 < len(committed) < 9
    report, _ = sweep(folder)
    assert (report.cells_swept, report.cells_skipped) == (9 - len(committed), len(committed))
    final = stored(folder)
    keys = [(c.doc_path, c.label) for c in final]
    assert len(keys) == len(set(keys)) == 9  # no duplicates, nothing lost
    assert set(keys) == {(d, lab) for d in ("alpha.txt", "leases/beta.txt", "tiny.txt")
                         for lab in ("term", "law", "notice")}
    # a killed-then-resumed sweep stores the same cells as an uninterrupted one (sweep spec, no outside source)
    resumed = {(c.doc_path, c.label): (c.answer, c.score, c.abstained) for c in final}
    with ReviewStore(folder) as store:
        store.delete_cells_not_in("mini", ())
    sweep(folder)
    assert {(c.doc_path, c.label): (c.answer, c.score, c.abstained) for c in stored(folder)} == resumed


def run_cli(argv: list[str]) -> int:
    parser = argparse.ArgumentParser(prog="excerptor")
    add_sweep_parser(parser.add_subparsers(dest="command", required=True))
    args = parser.parse_args(argv)
    return args.handler(args)


@pytest.fixture()
def fake_default_reader(monkeypatch):
    import engine.workspace

    monkeypatch.setattr(engine.workspace, "load_default_reader",
                        lambda quantize=None: (FakeReader(), FAKE_CALIBRATION))


def test_cli_json(folder, fake_default_reader, capsys):
    assert run_cli(["sweep", str(folder), "--checklist", str(folder.parent / "mini.checklist"), "--json"]) == 0
    obj = json.loads(capsys.readouterr().out)
    # report fields plus cells with the documented keys (CLI spec, no outside source)
    assert {"checklist", "cells_total", "cells_swept", "cells_skipped", "abstained", "seconds", "windows_read",
            "stopped", "cells"} <= set(obj)
    assert obj["checklist"] == "mini" and obj["cells_swept"] == 9 and len(obj["cells"]) == 9
    for cell in obj["cells"]:
        assert tuple(cell) == CELL_KEYS
        assert cell["answer"] is not None or cell["abstained"]
        assert cell["below_threshold"] == (cell["abstained"] and cell["answer"] is not None)
        assert cell["score"] is None or 0.0 <= cell["score"] <= 1.0
    assert run_cli(["sweep", str(folder), "--checklist", str(folder.parent / "mini.checklist")]) == 0
    out = capsys.readouterr().out
    assert "swept 0, up to date 9" in out and "leases/beta.txt" in out


def test_cli_out_rejects_unknown_extension(folder, fake_default_reader):
    with pytest.raises(ValueError, match="--out must end in"):
        run_cli(["sweep", str(folder), "--checklist", str(folder.parent / "mini.checklist"), "--out", "grid.pdf"])


def test_cli_out_csv(folder, fake_default_reader, capsys):
    pytest.importorskip("engine.export_log")
    out = folder.parent / "grid.csv"
    assert run_cli(["sweep", str(folder), "--checklist", str(folder.parent / "mini.checklist"), "--out", str(out)]) == 0
    import csv

    with open(out, newline="", encoding="utf-8-sig") as f:
        rows = list(csv.DictReader(f))
    assert len(rows) == 9  # one row per cell of this sweep (CLI spec, no outside source)
    assert {r["source"] for r in rows} == {"sweep:mini"}
    # an existing --out is refused before sweeping, replaced with --overwrite (CLI spec, no outside source)
    with pytest.raises(ValueError, match="already exists"):
        run_cli(["sweep", str(folder), "--checklist", str(folder.parent / "mini.checklist"), "--out", str(out)])
    md = folder.parent / "grid.md"
    md.write_text("old", encoding="utf-8")
    assert run_cli(["sweep", str(folder), "--checklist", str(folder.parent / "mini.checklist"), "--out", str(md),
                    "--overwrite"]) == 0
    assert md.read_text(encoding="utf-8") != "old"


def test_bench_runs_end_to_end_with_the_fake_reader(capsys):
    spec = importlib.util.spec_from_file_location("bench_sweep", ROOT / "bench" / "bench_sweep.py")
    bench = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(bench)
    assert bench.main(["--fake", "--docs", "2", "--limit-questions", "2", "--json"]) == 0
    obj = json.loads(capsys.readouterr().out)
    # 2 documents x 2 questions per column (bench spec, no outside source)
    assert [r["cells"] for r in obj["rows"]] == [4, 4] and obj["ratio_cells_per_s"] > 0
    assert all(math.isfinite(r["windows_per_s"]) and r["windows"] > 0 for r in obj["rows"])


def test_an_abstaining_cell_keeps_its_closest_span_below_the_threshold(folder):
    # A calibration that abstains unless the best span beats null by 100: every cell abstains, and a cell whose
    # document gave the reader any span keeps the best one, marked below the threshold and low confidence, as an
    # exact span of its page text (engine/types.py invariant, no outside source).
    from dataclasses import replace

    strict = replace(FAKE_CALIBRATION, null_margin_threshold=-100.0)
    refresh_index(folder)
    workspace = Workspace(folder, reader=FakeReader(), calibration=strict)
    try:
        report = run_sweep(workspace, checklist_of(folder))
        cells = stored(folder)
        assert report.abstained == len(cells) == 9 and all(c.abstained for c in cells)
        kept = [c for c in cells if c.answer is not None]
        assert kept and all(c.below_threshold and c.low_confidence for c in kept)
        with open_index(folder) as index:
            for cell in kept:
                page = next(p for p in index.store.get_pages(cell.doc_path) if p.locator == cell.locator)
                assert page.text[cell.start:cell.end] == cell.answer
    finally:
        workspace.close()
