"""Sweep speed: cells/s and reader windows/s of a checklist sweep, int8 reader vs fp32 reader.

    python bench/bench_sweep.py [--docs 20] [--limit-questions Q] [--checklist FILE] [--folder DIR] [--fake] [--json]

Builds a folder of ``--docs`` synthetic contracts (.txt; invented clauses from
``engine.training.synth_contracts``), indexes it once, then sweeps the checklist (default: the starter checklist)
with each reader under its own checklist name, so neither run skips cells of the other:
- int8: the calibration's default quantisation (``all-per-token`` when the calibration says ``none``);
- fp32: ``TransformerReader(quantize="none")``.
cells/s = cells swept / sweep seconds; windows/s = reader windows / sweep seconds; ratio = int8 / fp32.
Each reader reads one small warm-up pair before it is timed.

Needs the committed reader (engine.defaults.READER_MODEL_DIR); without it the bench says so and exits 0. ``--fake`` uses the
test stand-in reader for both columns (checks the plumbing, measures nothing about the model).
"""

from __future__ import annotations

import argparse
import dataclasses
import json
import sys
import tempfile
from pathlib import Path
from typing import Callable

ROOT = Path(__file__).resolve().parents[1]
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

from engine import defaults  # noqa: E402
from engine.checklist import Checklist, load_checklist  # noqa: E402
from engine.indexer import refresh_index  # noqa: E402
from engine.review_store import ReviewStore  # noqa: E402
from engine.sweep import run_sweep  # noqa: E402
from engine.training.synth_contracts import generate_windows  # noqa: E402
from engine.workspace import Workspace  # noqa: E402

DEFAULT_CHECKLIST = ROOT / "checklists" / "commercial.checklist"
WINDOWS_PER_DOC = 6  # about 1,000 words, 6-8 passages per document


def contract_text(seed: int, windows: int = WINDOWS_PER_DOC) -> str:
    """One synthetic contract: a title line, then ``windows`` generated clause blocks."""
    parts = generate_windows(windows, seed)
    title = parts[0].title.split(" - ")[0].upper()
    return title + "\n\n" + "\n\n".join(w.context for w in parts) + "\n"


def write_folder(folder: Path, n_docs: int, seed: int = 0) -> list[Path]:
    if n_docs < 1:
        raise ValueError(f"--docs must be >= 1 (got {n_docs})")
    folder.mkdir(parents=True, exist_ok=True)
    paths = []
    for i in range(n_docs):
        path = folder / f"contract_{i + 1:03d}.txt"
        path.write_text(contract_text(seed * 100_003 + i), encoding="utf-8")
        paths.append(path)
    return paths


ReaderFactory = Callable[[], tuple[object, object]]


def reader_factories(fake: bool) -> list[tuple[str, ReaderFactory]] | None:
    """(column, factory) for int8 and fp32; None when the committed reader is missing."""
    if fake:
        from tests.fakes import FAKE_CALIBRATION, FakeReader

        return [("int8", lambda: (FakeReader(), FAKE_CALIBRATION)), ("fp32", lambda: (FakeReader(), FAKE_CALIBRATION))]
    from engine.calibration import load_calibration
    from engine.reader.transformer_reader import TransformerReader, default_model_dir

    model_dir = default_model_dir()
    if not (model_dir / "config.json").is_file():
        return None
    calibration = load_calibration(model_dir)
    int8 = calibration.default_quantize if calibration.default_quantize != "none" else "all-per-token"
    return [("int8", lambda: (TransformerReader(model_dir, quantize=int8), calibration)),
            ("fp32", lambda: (TransformerReader(model_dir, quantize="none"), calibration))]


def measure(folder: Path, checklist: Checklist, column: str, factory: ReaderFactory) -> dict:
    reader, calibration = factory()
    reader.read_pairs([("How long is the term?", "The term is two (2) years from the Effective Date.")])
    named = dataclasses.replace(checklist, name=f"{checklist.name}-bench-{column}")
    with ReviewStore(folder) as store:
        store.delete_cells_not_in(named.name, ())  # start from an empty grid
    workspace = Workspace(folder, reader=reader, calibration=calibration)
    try:
        report = run_sweep(workspace, named)
    finally:
        workspace.close()
    seconds = max(report.seconds, 1e-9)
    return {"column": column, "reader": getattr(reader, "name", type(reader).__name__),
            "cells": report.cells_swept, "seconds": round(report.seconds, 3),
            "cells_per_s": round(report.cells_swept / seconds, 2), "windows": report.windows_read,
            "windows_per_s": round(report.windows_read / seconds, 2), "abstained": report.abstained}


def ratio(a: float, b: float) -> float | None:
    return round(a / b, 3) if b else None


def print_table(rows: list[dict], n_docs: int, n_questions: int, n_passages: int) -> None:
    print(f"sweep bench: {n_docs} documents x {n_questions} questions ({n_passages} passages)")
    print(f"{'column':<7}{'reader':<28}{'cells':>7}{'seconds':>10}{'cells/s':>10}{'windows':>9}{'windows/s':>11}")
    for r in rows:
        print(f"{r['column']:<7}{r['reader'][:27]:<28}{r['cells']:>7}{r['seconds']:>10.2f}{r['cells_per_s']:>10.2f}"
              f"{r['windows']:>9}{r['windows_per_s']:>11.2f}")
    a, b = rows
    print(f"int8 / fp32: cells/s x{ratio(a['cells_per_s'], b['cells_per_s'])}, "
          f"windows/s x{ratio(a['windows_per_s'], b['windows_per_s'])}")


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--docs", type=int, default=20, help="synthetic documents (default 20)")
    parser.add_argument("--limit-questions", type=int, default=None, help="first Q checklist questions only")
    parser.add_argument("--checklist", type=Path, default=DEFAULT_CHECKLIST)
    parser.add_argument("--folder", type=Path, default=None, help="build the documents here and keep them")
    parser.add_argument("--seed", type=int, default=0)
    parser.add_argument("--fake", action="store_true", help="the test stand-in reader (plumbing check only)")
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    args = parser.parse_args(argv)
    if args.limit_questions is not None and args.limit_questions < 1:
        raise SystemExit(f"--limit-questions must be >= 1 (got {args.limit_questions})")
    factories = reader_factories(args.fake)
    if factories is None:
        print(f"bench_sweep: no trained reader in {defaults.READER_MODEL_DIR} (config.json missing); nothing measured. "
              "Train or install the reader, or run with --fake to check the plumbing.")
        return 0
    checklist = load_checklist(args.checklist)
    if args.limit_questions is not None:
        checklist = dataclasses.replace(checklist, items=checklist.items[: args.limit_questions])
    with tempfile.TemporaryDirectory(prefix="excerptor-bench-") as tmp:
        folder = args.folder or Path(tmp) / "docs"
        write_folder(folder, args.docs, args.seed)
        index = refresh_index(folder)
        rows = [measure(folder, checklist, column, factory) for column, factory in factories]
    if args.json:
        print(json.dumps({"docs": args.docs, "questions": len(checklist.items), "passages": index.n_passages,
                          "rows": rows, "ratio_cells_per_s": ratio(rows[0]["cells_per_s"], rows[1]["cells_per_s"]),
                          "ratio_windows_per_s": ratio(rows[0]["windows_per_s"], rows[1]["windows_per_s"])}))
    else:
        print_table(rows, args.docs, len(checklist.items), index.n_passages)
    return 0


if __name__ == "__main__":
    sys.exit(main())
